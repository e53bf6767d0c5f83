package scene

import (
	"math"
	"strings"
	"testing"
)

// unitTol: conversions are products of exact decimal factors; only
// rounding of float64 remains.
const unitTol = 1e-12

func TestParseQuantity(t *testing.T) {
	// Reference factors: the metre and kilogram (SI); the inch 0.0254 m and
	// the pound 0.45359237 kg exactly (international yard and pound
	// agreement, 1959); the degree pi/180 rad.
	for _, c := range []struct {
		in   string
		want float64
		dim  Dim
	}{
		{"30 in", 30 * 0.0254, Length},
		{"2 mm", 0.002, Length},
		{"2mm", 0.002, Length},
		{"1.5e2 cm", 1.5, Length},
		{"500 g", 0.5, Mass},
		{"0.5 kg", 0.5, Mass},
		{"2 lb", 2 * 0.45359237, Mass},
		{"1.2 g/cm3", 1200, Density},
		{"1.2 g/cm^3", 1200, Density},
		{"7800 kg/m3", 7800, Density},
		{"9.81 m/s2", 9.81, Acceleration},
		{"9806.65 mm/s^2", 9.80665, Acceleration},
		{"3 m/s", 3, Speed},
		{"-2.5 mm/s", -0.0025, Speed},
		{"5 ms", 0.005, Time},
		{"30 deg", math.Pi / 6, Angle},
		{"1 rad", 1, Angle},
		{"60 rpm", 2 * math.Pi, AngularSpeed},
		{"2 rad/s", 2, AngularSpeed},
		{"0.002 kg m/s", 0.002, Impulse},
		{"2 g*mm/s", 2e-6, Impulse},
		{"3 N s", 3, Impulse},
		{"0.7", 0.7, Dimensionless},
	} {
		got, d, err := ParseQuantity(c.in)
		if err != nil {
			t.Errorf("%q: %v", c.in, err)
			continue
		}
		if d != c.dim || math.Abs(got-c.want) > unitTol*math.Max(1, math.Abs(c.want)) {
			t.Errorf("%q = %.15g (%s), want %.15g (%s)", c.in, got, d, c.want, c.dim)
		}
	}
}

func TestParseQuantityErrors(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"mm", "does not start with a number"},
		{"", "does not start with a number"},
		{"3 furlong", `unknown unit "furlong"`},
		{"3 m/s/s", "more than one"},
		{"3 m/", "nothing on one side"},
		{"1e999 m", "finite"},
		{"2 kgg", `did you mean "kg"?`},
	} {
		_, _, err := ParseQuantity(c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want one containing %q", c.in, err, c.want)
		}
	}
}

func TestUnitsRoundTrip(t *testing.T) {
	// A plain number in the file's units converts to SI by Plain and back by
	// FromSI: mm and g give densities in g/mm3 (1 g/mm3 = 1e6 kg/m3),
	// impulses in g mm/s (1e-6 kg m/s).
	u, err := NewUnits("mm", "g")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		d    Dim
		want float64
	}{
		{Length, 1e-3}, {Mass, 1e-3}, {Density, 1e6}, {Impulse, 1e-6}, {Speed, 1e-3},
		{Acceleration, 1e-3}, {Angle, math.Pi / 180}, {AngularSpeed, 1}, {Time, 1},
	} {
		if got := u.Plain(c.d); math.Abs(got-c.want) > unitTol*c.want {
			t.Errorf("Plain(%s) = %g, want %g", c.d, got, c.want)
		}
		if got := u.FromSI(u.Plain(c.d)*3, c.d); math.Abs(got-3) > unitTol {
			t.Errorf("round trip of %s: %g", c.d, got)
		}
	}
	if s := u.Symbol(Speed); s != "mm/s" {
		t.Errorf("speed symbol %q", s)
	}
	if s := u.Symbol(Impulse); s != "g mm/s" {
		t.Errorf("impulse symbol %q", s)
	}
	if _, err := NewUnits("mm", "stone"); err == nil {
		t.Error("NewUnits accepted an unknown mass unit")
	}
}

func TestNearest(t *testing.T) {
	cands := []string{"friction", "static_friction", "restitution"}
	for _, c := range []struct {
		in, want string
		ok       bool
	}{
		{"fricton", "friction", true},
		{"friciton", "friction", true}, // a swap of two letters is one slip
		{"Friction", "friction", true},
		{"restitutoin", "restitution", true},
		{"static", "static_friction", false},
		{"colour", "", false},
	} {
		got, ok := Nearest(c.in, cands)
		if ok != c.ok || (ok && got != c.want) {
			t.Errorf("Nearest(%q) = %q %v, want %q %v", c.in, got, ok, c.want, c.ok)
		}
	}
	// Reference distances (Levenshtein's, with Damerau's transposition):
	// kitten/sitting 3, ab/ba 1, ""/abc 3.
	for _, c := range []struct {
		a, b string
		d    int
	}{{"kitten", "sitting", 3}, {"ab", "ba", 1}, {"", "abc", 3}, {"step", "stpe", 1}} {
		if got := editDistance(c.a, c.b); got != c.d {
			t.Errorf("editDistance(%q, %q) = %d, want %d", c.a, c.b, got, c.d)
		}
	}
}
