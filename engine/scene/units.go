package scene

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"clatter/shapes"
	"clatter/units"
)

// Dim is the physical dimension of a quantity (package units).
type Dim = units.Dim

// The dimensions of the quantities a scene holds (package units).
var (
	Dimensionless = units.Dimensionless
	Length        = units.Length
	Mass          = units.Mass
	Time          = units.Time
	Speed         = units.Speed
	Acceleration  = units.Acceleration
	Density       = units.Density
	Angle         = units.Angle
	AngularSpeed  = units.AngularSpeed
	Impulse       = units.Impulse
	Frequency     = units.Frequency
	Force         = units.Force
	Torque        = units.Torque
	Stiffness     = units.Stiffness // a cushion's stiffness, N/m (stiffness.go)
	Pressure      = units.Pressure  // an elastic modulus, Pa (stiffness.go)
)

// LengthUnits and MassUnits are the units a scene's units table may name,
// with their sizes in metres and kilograms (from package units).
var (
	LengthUnits = units.Sizes(units.FileLengths)
	MassUnits   = units.Sizes(units.FileMasses)
)

// Units are the length and mass units of a scene's numbers (time is always
// s, angles degrees, angular velocity rad/s).
type Units struct {
	Length, Mass string
	// L is the length unit in metres, M the mass unit in kilograms.
	L, M float64
}

// SI is the default: metres and kilograms.
var SI = Units{Length: "m", Mass: "kg", L: 1, M: 1}

// NewUnits returns the units with the given names, which must be keys of
// LengthUnits and MassUnits.
func NewUnits(length, mass string) (Units, error) {
	l, ok := LengthUnits[length]
	if !ok {
		return Units{}, fmt.Errorf("unknown length unit %q%s", length, Suggest(length, units.FileLengths))
	}
	m, ok := MassUnits[mass]
	if !ok {
		return Units{}, fmt.Errorf("unknown mass unit %q%s", mass, Suggest(mass, units.FileMasses))
	}
	return Units{Length: length, Mass: mass, L: l, M: m}, nil
}

// Plain returns the size in SI of one unit of a plain number of dimension
// d in these units: lengths and masses in the scene's units, times in s,
// angles in degrees, angular speeds in rad/s.
func (u Units) Plain(d Dim) float64 {
	f := math.Pow(u.L, float64(d.L)) * math.Pow(u.M, float64(d.M))
	if d == Angle {
		f *= math.Pi / 180
	}
	return f
}

// FromSI converts an SI value of dimension d into these units (plain
// numbers as Plain describes).
func (u Units) FromSI(v float64, d Dim) float64 { return v / u.Plain(d) }

// VecFromSI converts a vector of dimension d from SI into these units.
func (u Units) VecFromSI(v shapes.Vec3, d Dim) [3]float64 {
	f := u.Plain(d)
	return [3]float64{v[0] / f, v[1] / f, v[2] / f}
}

// Symbol writes dimension d in these units, e.g. "mm/s" or "g mm/s".
func (u Units) Symbol(d Dim) string {
	var num, den []string
	add := func(name string, e int8) {
		switch {
		case e == 1:
			num = append(num, name)
		case e > 1:
			num = append(num, name+strconv.Itoa(int(e)))
		case e == -1:
			den = append(den, name)
		case e < -1:
			den = append(den, name+strconv.Itoa(int(-e)))
		}
	}
	add(u.Mass, d.M)
	add(u.Length, d.L)
	if d == Angle {
		add("deg", d.A)
	} else {
		add("rad", d.A)
	}
	add("s", d.T)
	s := strings.Join(num, " ")
	if s == "" {
		s = "1"
	}
	if len(den) > 0 {
		s += "/" + strings.Join(den, " ")
	}
	if d == Dimensionless {
		return ""
	}
	return s
}

// ParseQuantity reads a number followed by a unit, such as "30 in",
// "1.2 g/cm3", "9.81 m/s2" or "0.002 kg m/s", and returns its value in SI
// (radians for angles) with its dimension. A unit is a product of unit
// names, each with an optional integer power ("cm3", "s^2"), and at most one
// "/", after which every factor divides. A string without a unit is a plain
// number (dimension Dimensionless).
func ParseQuantity(s string) (float64, Dim, error) {
	t := strings.TrimSpace(s)
	n := numberPrefix(t)
	if n == 0 {
		return 0, Dim{}, fmt.Errorf("%q does not start with a number", s)
	}
	v, err := strconv.ParseFloat(t[:n], 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, Dim{}, fmt.Errorf("%q does not start with a finite number", s)
	}
	f, d, err := parseUnit(strings.TrimSpace(t[n:]))
	if err != nil {
		return 0, Dim{}, fmt.Errorf("%q: %v", s, err)
	}
	return v * f, d, nil
}

// numberPrefix returns the length of the decimal number at the start of s.
func numberPrefix(s string) int {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i, digits = i+1, digits+1
	}
	if i < len(s) && s[i] == '.' {
		i++
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			i, digits = i+1, digits+1
		}
	}
	if digits == 0 {
		return 0
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		k := j
		for k < len(s) && s[k] >= '0' && s[k] <= '9' {
			k++
		}
		if k > j {
			i = k
		}
	}
	return i
}

// parseUnit reads a unit expression and returns its size in SI and its
// dimension.
func parseUnit(u string) (float64, Dim, error) {
	if u == "" {
		return 1, Dimensionless, nil
	}
	parts := strings.Split(u, "/")
	if len(parts) > 2 {
		return 0, Dim{}, fmt.Errorf("unit %q has more than one \"/\"; write e.g. \"m/s2\"", u)
	}
	f, d := 1.0, Dimensionless
	for side, p := range parts {
		sign := int8(1)
		if side == 1 {
			sign = -1
		}
		fields := strings.FieldsFunc(p, func(r rune) bool { return r == ' ' || r == '*' || r == '·' || r == '\t' })
		if len(fields) == 0 {
			return 0, Dim{}, fmt.Errorf("unit %q has nothing on one side of \"/\"", u)
		}
		for _, fld := range fields {
			if fld == "1" && side == 0 {
				continue
			}
			uf, ud, err := unitFactor(fld)
			if err != nil {
				return 0, Dim{}, err
			}
			if sign > 0 {
				f *= uf
			} else {
				f /= uf
			}
			if err := powersInRange(u, d, ud, sign); err != nil {
				return 0, Dim{}, err
			}
			if sign > 0 {
				d = d.Times(ud)
			} else {
				d = d.Per(ud)
			}
		}
	}
	if f == 0 || math.IsInf(f, 0) {
		return 0, Dim{}, fmt.Errorf("unit %q is beyond the range of numbers", u)
	}
	return f, d, nil
}

// unitFactor reads one unit name with an optional power: "cm3", "s^2", "m²".
func unitFactor(s string) (float64, Dim, error) {
	name, pow := s, 1
	switch {
	case strings.HasSuffix(s, "²"):
		name, pow = strings.TrimSuffix(s, "²"), 2
	case strings.HasSuffix(s, "³"):
		name, pow = strings.TrimSuffix(s, "³"), 3
	default:
		i := len(s)
		for i > 0 && (s[i-1] >= '0' && s[i-1] <= '9' || s[i-1] == '-') {
			i--
		}
		digits := s[i:]
		name = strings.TrimSuffix(s[:i], "^")
		if digits != "" {
			p, err := strconv.Atoi(digits)
			if err != nil || p == 0 || p > 9 || p < -9 {
				return 0, Dim{}, fmt.Errorf("bad power in unit %q", s)
			}
			pow = p
		}
	}
	def, ok := units.Lookup(name)
	if !ok {
		return 0, Dim{}, fmt.Errorf("unknown unit %q%s", name, Suggest(name, units.Names()))
	}
	return math.Pow(def.SI, float64(pow)), def.Dim.Pow(int8(pow)), nil
}
