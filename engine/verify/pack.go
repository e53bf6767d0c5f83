package verify

import (
	"fmt"
	"math"

	"clatter/engine"
	"clatter/engine/scene"
)

// packagingCases are the drop and tilt cases of packaging studies.
func packagingCases() []Case {
	return []Case{
		{
			Name: "carton dropped on corner 2-3-5 from the ISTA 1A height", Unit: "m/s",
			Reference: "v = sqrt(2 g h), h = 610 mm for 12 kg", Source: "free fall (any mechanics text); ISTA Procedure 1A drop-height table",
			Relative: true, Tolerance: 1e-3,
			Why: "the simulated speed at first contact: a semi-implicit Euler step falls short of the free fall by about g dt / 2, 0.07 percent at 0.5 ms",
			Run: cornerDropSpeed,
		},
		{
			Name: "plank strikes an edge, plastic and not slipping: spin after", Unit: "rad/s",
			Reference: "omega = m v d / I_edge", Source: "angular momentum about the struck edge (W. Goldsmith, Impact, 1960)",
			Relative: true, Tolerance: 0.02,
			Why: "the impact spreads over two 0.25 ms steps, in which gravity's torque adds about 0.2 percent",
			Run: func() (float64, float64, float64, error) { return plankDrop(false) },
		},
		{
			Name: "plank strikes an edge, then slaps down on the far one", Unit: "m/s",
			Reference: "v = 2a sqrt(omega^2 + 2 m g (h0 - c) / I_edge)", Source: "energy while pivoting on the edge (W. Goldsmith, Impact, 1960)",
			Relative: true, Tolerance: 0.02,
			Why: "the first impact's 0.2 percent and the step at which the far edge meets the floor",
			Run: func() (float64, float64, float64, error) { return plankDrop(true) },
		},
		{
			Name: "box with off-centre contents tips on a tilt table", Unit: "deg",
			Reference: "tan theta = (b/2 - e) / h_G", Source: "statics of a rigid block (e.g. Meriam and Kraige, Statics)",
			Tolerance: 0.5,
			Why:       "at 0.25 deg/s the table turns under 0.1 deg more while the box starts to turn, slowly at first",
			Run:       offCentreTip,
		},
	}
}

func cornerDropSpeed() (float64, float64, float64, error) {
	const text = `
units = { length = "mm", mass = "kg" }
[world]
step = "0.5 ms"
duration = 0.5
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "carton"
shape = { box = [400, 300, 250] }
mass = 12
center_of_mass = [30, -20, -40]
[drop]
body = "carton"
strike = "corner 2-3-5"
height = "by mass"
`
	sum, err := runScene(text, "verify-drop.toml")
	if err != nil {
		return 0, 0, 0, err
	}
	if len(sum.Drop.Impacts) == 0 {
		return 0, 0, 0, fmt.Errorf("the carton struck nothing in %g s", sum.Time)
	}
	// The solver's own speed at the first impact, not the drop report's
	// impact_speed, which follows from the free fall by formula.
	return math.Sqrt(2 * g * 0.61), sum.Drop.Impacts[0].NormalSpeed / 1000, math.NaN(), nil
}

// plankDrop drops a 0.4 x 0.3 x 0.2 m box turned 10 degrees about y from
// 0.2 m onto an edge; slap selects the far edge's speed over the spin
// after the first impact.
func plankDrop(slap bool) (float64, float64, float64, error) {
	const a, c, m, fall, h = 0.2, 0.1, 2.0, 0.2, 0.25e-3
	alpha := 10 * math.Pi / 180
	edgeZ := -a*math.Sin(alpha) - c*math.Cos(alpha)
	text := fmt.Sprintf(`
[world]
step = %g
duration = 1
until_settled = false
[material.grip]
friction = 3
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "grip"
[[body]]
name = "plank"
shape = { box = [%g, 0.3, %g] }
mass = %g
position = [0, 0, %.15g]
orientation = { axis = [0, 1, 0], angle = 10 }
material = "grip"
`, h, 2*a, 2*c, m, fall-edgeZ)
	s, err := scene.Parse([]byte(text), "verify-plank.toml", scene.Options{})
	if err != nil {
		return 0, 0, 0, err
	}
	w, ids, err := s.Build()
	if err != nil {
		return 0, 0, 0, err
	}
	iE := m*(4*a*a+4*c*c)/12 + m*(a*a+c*c)
	omega0 := m * math.Sqrt(2*g*fall) * (a*math.Cos(alpha) - c*math.Sin(alpha)) / iE
	h0 := a*math.Sin(alpha) + c*math.Cos(alpha)
	v1 := 2 * a * math.Sqrt(omega0*omega0+2*m*g*(h0-c)/iE)
	first := math.NaN()
	for w.Time() < 1 {
		if err := w.Step(h); err != nil {
			return 0, 0, 0, err
		}
		for _, e := range w.Events() {
			switch {
			case e.Kind != engine.Impact:
			case math.IsNaN(first):
				first = e.Time
				if !slap {
					return omega0, math.Abs(w.Spin(ids[1])[1]), math.NaN(), nil
				}
			case e.Time > first+0.01:
				return v1, e.Speed, math.NaN(), nil
			}
		}
	}
	return 0, 0, 0, fmt.Errorf("the plank did not strike twice")
}

func offCentreTip() (float64, float64, float64, error) {
	// A 0.2 x 0.2 x 0.4 m box, centre of mass 40 mm toward +x and 50 mm
	// below the middle, on a table turned to 20.3 degrees that tilts on
	// at 0.25 deg/s, +x downhill: tan theta = (0.1 - 0.04) / 0.15.
	const start = 20.3
	r := start * math.Pi / 180
	x := 0.04*math.Cos(r) + 0.15*math.Sin(r)
	z := -0.04*math.Sin(r) + 0.15*math.Cos(r)
	// The table turns about the through point on its top, so its centre,
	// 50 mm below that point, is turned with it.
	tx, tz := -0.05*math.Sin(r), -0.05*math.Cos(r)
	text := fmt.Sprintf(`
[world]
duration = 12
[material.grip]
friction = 1.5
[[body]]
name = "table"
driven = true
shape = { box = [1.2, 1.2, 0.1] }
position = [%[4]g, 0, %[5]g]
orientation = { axis = [0, 1, 0], angle = %[1]g }
material = "grip"
[[drive]]
body = "table"
tilt = { axis = [0, 1, 0], through = [0, 0, 0], rate = "0.25 deg/s" }
[[body]]
name = "box"
shape = { box = [0.2, 0.2, 0.4] }
mass = 3
center_of_mass = [0.04, 0, -0.05]
material = "grip"
position = [%.15[2]g, 0, %.15[3]g]
orientation = { axis = [0, 1, 0], angle = %[1]g }
`, start, x, z, tx, tz)
	sum, err := runScene(text, "verify-tilt.toml")
	if err != nil {
		return 0, 0, 0, err
	}
	want := math.Atan(0.06/0.15) * 180 / math.Pi
	b := sum.Bodies[0]
	if b.TippedAt == nil {
		return want, math.NaN(), math.NaN(), fmt.Errorf("the box did not tip")
	}
	return want, start + b.TippedAt.Tilt, math.NaN(), nil
}
