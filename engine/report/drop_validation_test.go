package report_test

import (
	"fmt"
	"math"
	"testing"

	"clatter/engine"
	"clatter/engine/pack"
	"clatter/engine/report"
	"clatter/engine/scene"
)

const g0 = 9.80665 // standard gravity, m/s^2 (the engine's default)

// speedTol is the impact-speed check, 0.1 % of sqrt(2 g h). The drop
// report gives the speed at first contact from the free fall, exact but
// for rounding; the solver's own impact speed is short of it by the
// semi-implicit Euler step's g dt / (2 v) (about 0.05 % at dt = 0.25 ms
// and 2.4 m/s), so at that step it too is within 0.1 %.
const speedTol = 1e-3

// aboveTol: the centre of mass vertically above the struck corner or edge
// and the lowest point at the drop height, to 1e-9 m (rounding of the
// placement, the standards' rule held exactly).
const aboveTol = 1e-9

func dropScene(strike, height, step string) string {
	return fmt.Sprintf(`
[world]
step = %q
duration = 1.2
[material.board]
friction = 0.5
restitution = 0.3
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
position = [0, 0, -0.25]
material = "board"
[[body]]
name = "carton"
shape = { box = [0.4, 0.3, 0.25] }
mass = 12
center_of_mass = [0.03, -0.02, -0.04]
material = "board"
position = [0.5, -0.2, 3]
[drop]
body = "carton"
strike = %q
height = %s
`, step, strike, height)
}

// A free fall from rest through h strikes at sqrt(2 g h) (Galileo; any
// mechanics text), whatever the struck feature; the drop starts with the
// centre of mass above the struck edge or corner (ASTM D5276, ISTA 1A).
func TestDropStrikesAtTheFreeFallSpeed(t *testing.T) {
	for _, c := range []struct {
		strike, height string
		h              float64 // m
	}{
		{"corner 2-3-5", `"by mass"`, 0.610}, // 12 kg: 610 mm in the ISTA 1A table
		{"edge 3-5", `"300 mm"`, 0.3},
		{"edge 1-6", `"300 mm"`, 0.3},
		{"face 3", `0.76`, 0.76},
		{"face 2", `0.1`, 0.1},
	} {
		s := parseText(t, dropScene(c.strike, c.height, "0.25 ms"), "drop.toml", "")
		checkPlacement(t, s, c.strike, c.h)
		sum := runScene(t, s)
		d := sum.Drop
		want := math.Sqrt(2 * g0 * c.h)
		if len(d.Impacts) == 0 {
			t.Fatalf("%s: no impacts", c.strike)
		}
		t.Logf("%s from %g m: impact_speed %.6f, first event %.6f, sqrt(2 g h) %.6f m/s", c.strike, c.h, d.ImpactSpeed, d.Impacts[0].NormalSpeed, want)
		for what, got := range map[string]float64{"impact_speed": d.ImpactSpeed, "the first impact's normal_speed": d.Impacts[0].NormalSpeed} {
			if math.Abs(got-want) > speedTol*want {
				t.Errorf("%s: %s %.6f m/s, sqrt(2 g h) = %.6f", c.strike, what, got, want)
			}
		}
		if f := d.Impacts[0].Feature; f == nil || *f != c.strike {
			t.Errorf("%s: first impact struck %v", c.strike, f)
		}
	}
}

// checkPlacement checks the dropped body's starting pose: lowest point at
// height h above the floor, centre of mass above the struck edge or corner.
func checkPlacement(t *testing.T, s *scene.Scene, strike string, h float64) {
	t.Helper()
	b := s.Bodies[s.BodyIndex("carton")]
	ft, _ := pack.ParseFeature(strike)
	low, _ := pack.Lowest(b.Shape, b.Props.Center, b.Orientation, s.Drop.Up)
	if got := b.Position[2] - low - (-0.25); math.Abs(got-h) > aboveTol {
		t.Errorf("%s: lowest point %.12f m above the floor, want %g", strike, got, h)
	}
	if len(ft) == 1 {
		return
	}
	foot := ft.Point(b.Shape.Bounds(), b.Props.Center) // shape axes
	v := b.Orientation.Rotate(b.Props.Center.Sub(foot))
	if horiz := math.Hypot(v[0], v[1]); horiz > aboveTol {
		t.Errorf("%s: centre of mass %.3g m off the vertical through the struck feature", strike, horiz)
	}
}

// rotTol is the rotational-drop check, 2 %: the solver's impact spreads
// over two steps (a speculative contact, then the impact), during which
// gravity's torque about the edge adds m g d dt / I_e, 0.2 % at dt =
// 0.25 ms; the rest is the free fall's step error and iteration.
const rotTol = 0.02

// A rigid box falling flat-on-an-edge, tilted by alpha, strikes the floor
// with a perfectly plastic, non-slipping impact: angular momentum about
// the struck edge is conserved, m v d = I_e omega0 (d the horizontal
// distance from the edge to the centre of mass, I_e = I_G + m r^2), and it
// then pivots about the edge onto its far edge, which slaps down at
// omega1 * 2a, omega1^2 = omega0^2 + 2 m g (h0 - c) / I_e by energy
// (W. Goldsmith, Impact, 1960, ch. 2 on the impact of rigid bodies; the
// same case as any rigid-body dynamics text's falling-plank problem).
func TestRotationalEdgeDropOfARigidBox(t *testing.T) {
	const (
		a, c  = 0.2, 0.1 // half length along x and half height (m)
		alpha = 10 * math.Pi / 180
		fall  = 0.2 // free fall of the struck edge (m)
		m     = 2.0
	)
	// Centre of mass at the origin of the box; the edge (a, -c) lowest
	// after turning by alpha about +y.
	edgeZ := -a*math.Sin(alpha) - c*math.Cos(alpha)
	text := fmt.Sprintf(`
[world]
step = "0.25 ms"
duration = 0.6
until_settled = false
[material.grip]
friction = 3
restitution = 0
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "grip"
[[body]]
name = "box"
shape = { box = [%g, 0.3, %g] }
mass = %g
position = [0, 0, %.15g]
orientation = { axis = [0, 1, 0], angle = %.15g }
material = "grip"
`, 2*a, 2*c, m, fall-edgeZ, alpha*180/math.Pi)
	s := parseText(t, text, "plank.toml", "")
	w, ids, err := s.Build()
	if err != nil {
		t.Fatal(err)
	}
	id := ids[s.BodyIndex("box")]
	d := a*math.Cos(alpha) - c*math.Sin(alpha)
	iE := m*(4*a*a+4*c*c)/12 + m*(a*a+c*c)
	v := math.Sqrt(2 * g0 * fall)
	omega0 := m * v * d / iE
	h0 := a*math.Sin(alpha) + c*math.Cos(alpha)
	omega1 := math.Sqrt(omega0*omega0 + 2*m*g0*(h0-c)/iE)
	slap := omega1 * 2 * a

	var first, second *engine.Event
	var struck [2]string // the box's struck features, package numbering
	gotOmega := math.NaN()
	for w.Time() < 0.6 && second == nil {
		if err := w.Step(s.World.Step); err != nil {
			t.Fatal(err)
		}
		for _, e := range w.Events() {
			if e.Kind != engine.Impact {
				continue
			}
			switch {
			case first == nil:
				e := e
				first = &e
				gotOmega = math.Abs(w.Spin(id)[1])
				struck[0] = report.Features(w, e)[1].String()
			case e.Time > first.Time+0.01:
				e := e
				second = &e
				struck[1] = report.Features(w, e)[1].String()
			}
		}
	}
	if first == nil || second == nil {
		t.Fatalf("impacts: first %v, second %v", first, second)
	}
	t.Logf("omega after the first impact %.5f rad/s (m v d / I_e = %.5f); slap-down %.5f m/s (energy: %.5f)", gotOmega, omega0, second.Speed, slap)
	if math.Abs(gotOmega-omega0) > rotTol*omega0 {
		t.Errorf("angular velocity after the edge impact %.5f rad/s, conservation of angular momentum gives %.5f", gotOmega, omega0)
	}
	if math.Abs(second.Speed-slap) > rotTol*slap {
		t.Errorf("slap-down speed %.5f m/s, energy gives %.5f", second.Speed, slap)
	}
	// Turned about +y, the box's +x end is low: it strikes the edge of
	// its far end (6) and bottom (3), then slaps down flat on its bottom.
	if struck != [2]string{"edge 3-6", "face 3"} {
		t.Errorf("struck %q then %q, want edge 3-6 then face 3", struck[0], struck[1])
	}
}
