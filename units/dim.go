package units

import (
	"fmt"
	"strings"
)

// Dim is the physical dimension of a quantity: the exponents of length,
// mass, time and angle.
type Dim struct{ L, M, T, A int8 }

// The dimensions of the quantities clatter reads.
var (
	Dimensionless = Dim{}
	Length        = Dim{L: 1}
	Mass          = Dim{M: 1}
	Time          = Dim{T: 1}
	Speed         = Dim{L: 1, T: -1}
	Acceleration  = Dim{L: 1, T: -2}
	Density       = Dim{L: -3, M: 1}
	Angle         = Dim{A: 1}
	AngularSpeed  = Dim{A: 1, T: -1}
	Impulse       = Dim{L: 1, M: 1, T: -1}
	Frequency     = Dim{T: -1}
	Force         = Dim{L: 1, M: 1, T: -2}
	Torque        = Dim{L: 2, M: 1, T: -2}
	// Stiffness is a force per length (N/m); Pressure a force per area
	// (Pa), as for an elastic modulus.
	Stiffness = Dim{M: 1, T: -2}
	Pressure  = Dim{L: -1, M: 1, T: -2}
)

// dimNames describe the dimensions in messages, with an example of each.
var dimNames = map[Dim][2]string{
	Dimensionless: {"a plain number", "0.5"},
	Length:        {"a length", `"2 mm"`},
	Mass:          {"a mass", `"500 g"`},
	Time:          {"a time", `"0.5 s"`},
	Speed:         {"a speed", `"1.5 m/s"`},
	Acceleration:  {"an acceleration", `"9.81 m/s2"`},
	Density:       {"a density", `"1.05 g/cm3"`},
	Angle:         {"an angle", `"30 deg"`},
	AngularSpeed:  {"an angular speed", `"2 rad/s"`},
	Impulse:       {"an impulse", `"0.002 kg m/s"`},
	Frequency:     {"a frequency", `"50 Hz"`},
	Force:         {"a force", `"20 N"`},
	Torque:        {"a torque", `"0.5 N m"`},
	Stiffness:     {"a stiffness", `"40 N/mm"`},
	Pressure:      {"a modulus", `"2.4 GPa"`},
}

// String names the dimension for messages: "a length", or the exponents
// ("length^2 mass") for a dimension without a name.
func (d Dim) String() string {
	if n, ok := dimNames[d]; ok {
		return n[0]
	}
	var parts []string
	for _, p := range []struct {
		name string
		e    int8
	}{{"length", d.L}, {"mass", d.M}, {"time", d.T}, {"angle", d.A}} {
		switch {
		case p.e == 1:
			parts = append(parts, p.name)
		case p.e != 0:
			parts = append(parts, fmt.Sprintf("%s^%d", p.name, p.e))
		}
	}
	return strings.Join(parts, " ")
}

// Example returns a quantity of dimension d as a scene would write it,
// such as `"2 mm"`, or "" for a dimension without a name.
func (d Dim) Example() string {
	if n, ok := dimNames[d]; ok {
		return n[1]
	}
	return ""
}

// Times returns the dimension of a product of quantities of d and e.
func (d Dim) Times(e Dim) Dim { return Dim{d.L + e.L, d.M + e.M, d.T + e.T, d.A + e.A} }

// Per returns the dimension of a quantity of d divided by one of e.
func (d Dim) Per(e Dim) Dim { return Dim{d.L - e.L, d.M - e.M, d.T - e.T, d.A - e.A} }

// Pow returns the dimension of a quantity of d raised to the power k.
func (d Dim) Pow(k int8) Dim { return Dim{d.L * k, d.M * k, d.T * k, d.A * k} }
