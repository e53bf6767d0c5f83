package units

import (
	"math"
	"testing"
)

// TestTable checks sizes against their definitions. Sources: the inch and
// the pound, international yard and pound agreement (1959); the others,
// the SI Brochure (BIPM, 9th edition, 2019), tables 8 and 9 of units
// accepted for use with the SI, and its prefixes. They are exact, so the
// check is equality of the float64 of the defining value.
func TestTable(t *testing.T) {
	for _, c := range []struct {
		name string
		si   float64
		dim  Dim
	}{
		{"in", 0.0254, Length},
		{"ft", 0.3048, Length},
		{"mm", 0.001, Length},
		{"µm", 1e-6, Length},
		{"lb", 0.45359237, Mass},
		{"g", 0.001, Mass},
		{"min", 60, Time},
		{"h", 3600, Time},
		{"deg", math.Pi / 180, Angle},
		{"rev", 2 * math.Pi, Angle},
		{"rpm", 2 * math.Pi / 60, AngularSpeed},
		{"GPa", 1e9, Pressure},
	} {
		u, ok := Lookup(c.name)
		if !ok || u.SI != c.si || u.Dim != c.dim {
			t.Errorf("Lookup(%q) = %v, %v; want {%v %v}", c.name, u, ok, c.si, c.dim)
		}
	}
	if _, ok := Lookup("furlong"); ok {
		t.Error("Lookup found a unit that is not in the table")
	}
}

// TestFileUnits checks that the units a file's plain numbers may be in
// are lengths and masses of the table.
func TestFileUnits(t *testing.T) {
	for _, c := range []struct {
		names []string
		dim   Dim
	}{{FileLengths, Length}, {FileMasses, Mass}} {
		for n, si := range Sizes(c.names) {
			if u, _ := Lookup(n); u.Dim != c.dim || u.SI != si {
				t.Errorf("file unit %q is %v, want %v", n, u, c.dim)
			}
		}
	}
}

// TestDimAlgebra checks products and quotients of dimensions against the
// SI's derived units (SI Brochure, table 4): N = kg m s^-2, Pa = N m^-2,
// kg/m3 for a density.
func TestDimAlgebra(t *testing.T) {
	for _, c := range []struct {
		name      string
		got, want Dim
	}{
		{"density", Mass.Per(Length.Pow(3)), Density},
		{"force", Mass.Times(Acceleration), Force},
		{"pressure", Force.Per(Length.Pow(2)), Pressure},
		{"stiffness", Force.Per(Length), Stiffness},
		{"torque", Force.Times(Length), Torque},
		{"impulse", Force.Times(Time), Impulse},
	} {
		if c.got != c.want {
			t.Errorf("%s: got %v, want %v", c.name, c.got, c.want)
		}
	}
	if Length.String() != "a length" || (Dim{L: 2, M: 1}).String() != "length^2 mass" {
		t.Errorf("names: %q, %q", Length.String(), Dim{L: 2, M: 1}.String())
	}
}
