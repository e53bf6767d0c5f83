package units

import (
	"math"
	"sort"
)

// Sizes of the length and mass units in metres and kilograms. The inch is
// 0.0254 m and the pound 0.45359237 kg exactly by definition
// (international yard and pound agreement, 1959).
const (
	Metre      = 1.0
	Centimetre = 1e-2
	Millimetre = 1e-3
	Micrometre = 1e-6
	Kilometre  = 1e3
	Inch       = 0.0254
	Foot       = 12 * Inch

	Kilogram  = 1.0
	Gram      = 1e-3
	Milligram = 1e-6
	Pound     = 0.45359237
)

// Unit is one named unit: its size in SI (radians for angles) and its
// dimension.
type Unit struct {
	SI  float64
	Dim Dim
}

var table = map[string]Unit{
	"m": {Metre, Length}, "cm": {Centimetre, Length}, "mm": {Millimetre, Length},
	"um": {Micrometre, Length}, "µm": {Micrometre, Length}, "km": {Kilometre, Length},
	"in": {Inch, Length}, "ft": {Foot, Length},
	"kg": {Kilogram, Mass}, "g": {Gram, Mass}, "mg": {Milligram, Mass}, "lb": {Pound, Mass},
	"s": {1, Time}, "ms": {1e-3, Time}, "min": {60, Time}, "h": {3600, Time},
	"N": {1, Force}, "Hz": {1, Frequency},
	"Pa": {1, Pressure}, "kPa": {1e3, Pressure}, "MPa": {1e6, Pressure}, "GPa": {1e9, Pressure},
	"rad": {1, Angle}, "deg": {math.Pi / 180, Angle}, "rev": {2 * math.Pi, Angle},
	"rpm": {2 * math.Pi / 60, AngularSpeed},
}

// FileLengths and FileMasses name the units a file's plain numbers may be
// in: the units table of a scene, the numbers of an STL file. They are a
// few common ones; a quantity written with its own unit may use any unit
// of the table.
var (
	FileLengths = []string{"cm", "in", "m", "mm"}
	FileMasses  = []string{"g", "kg", "lb"}
)

// Lookup returns the unit with the given name ("mm", "g", "deg").
func Lookup(name string) (Unit, bool) {
	u, ok := table[name]
	return u, ok
}

// Names returns the names of all units, sorted.
func Names() []string {
	k := make([]string, 0, len(table))
	for n := range table {
		k = append(k, n)
	}
	sort.Strings(k)
	return k
}

// Sizes returns the sizes in SI of the named units, which must be in the
// table, by name.
func Sizes(names []string) map[string]float64 {
	m := make(map[string]float64, len(names))
	for _, n := range names {
		u, ok := table[n]
		if !ok {
			panic("units: no unit named " + n)
		}
		m[n] = u.SI
	}
	return m
}
