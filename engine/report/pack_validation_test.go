package report_test

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"testing"

	"clatter/engine/report"
	"clatter/engine/scene"
)

// runText runs a scene given as text (its files in dir) without writing.
func runText(t *testing.T, text, dir string) *report.Summary {
	t.Helper()
	return runScene(t, parseText(t, text, "test.toml", dir))
}

// parseText reads a scene given as text, as file name in folder dir.
func parseText(t *testing.T, text, name, dir string) *scene.Scene {
	t.Helper()
	s, err := scene.Parse([]byte(text), name, scene.Options{Dir: dir})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// runScene runs a scene without writing.
func runScene(t *testing.T, s *scene.Scene) *report.Summary {
	t.Helper()
	sum, err := report.Run(context.Background(), s, report.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return sum
}

func body(t *testing.T, sum *report.Summary, name string) report.Body {
	t.Helper()
	for _, b := range sum.Bodies {
		if b.Name == name {
			return b
		}
	}
	t.Fatalf("no body %q in the summary", name)
	return report.Body{}
}

// tipTol is the tilt-table check: the table turns at 0.25 deg/s, and a
// box just past its tipping angle starts to turn slowly (its e-folding
// time sqrt(I_edge / (m g r)) is about 0.17 s): it takes a few tenths of
// a second to leave the 1e-3 rad of the onset, while the table turns on
// by less than 0.1 degree; half a degree bounds that with room.
const tipTol = 0.5

// A 200 x 200 x 400 mm box whose centre of mass is 40 mm off centre
// along x and 50 mm below the middle tips, on a tilting table, over its
// downhill edge when its centre of mass passes above it (statics of a
// rigid block, e.g. Meriam and Kraige, Engineering Mechanics: Statics,
// ch. 6): tan(theta) = (100 - 40) / 150 with the heavy side downhill,
// (100 + 40) / 150 the other way.
func TestOffCentreBoxTipsOnATiltTable(t *testing.T) {
	const a, e, hc = 0.1, 0.04, 0.15 // half base, offset, height of the centre of mass above the base (m)
	for _, c := range []struct {
		name  string
		axisY float64 // +1: +x (the heavy side) goes down
		want  float64 // deg
	}{
		{"heavy side downhill", 1, math.Atan((a-e)/hc) * 180 / math.Pi},
		{"heavy side uphill", -1, math.Atan((a+e)/hc) * 180 / math.Pi},
	} {
		t.Run(c.name, func(t *testing.T) {
			start := c.want - 1.5 // the table starts tilted, to keep the run short
			text := fmt.Sprintf(`
[world]
duration = 12
[material.grip]
friction = 1.5
[[body]]
name = "table"
driven = true
shape = { box = [1.2, 1.2, 0.1] }
position = [%[5]g, 0, %[6]g]
orientation = { axis = [0, %[1]g, 0], angle = %[2]g }
material = "grip"
[[drive]]
body = "table"
tilt = { axis = [0, %[1]g, 0], through = [0, 0, 0], rate = "0.25 deg/s" }
[[body]]
name = "box"
shape = { box = [0.2, 0.2, 0.4] }
mass = 3
center_of_mass = [0.04, 0, -0.05]
material = "grip"
position = [%[3]g, 0, %[4]g]
orientation = { axis = [0, %[1]g, 0], angle = %[2]g }
`, c.axisY, start, comX(start, c.axisY), comZ(start, c.axisY), tableX(start, c.axisY), tableZ(start, c.axisY))
			sum := runText(t, text, "")
			b := body(t, sum, "box")
			if b.TippedAt == nil {
				t.Fatalf("the box did not tip (slid_at %v)", b.SlidAt)
			}
			got := start + b.TippedAt.Tilt
			t.Logf("tipped at %.3f deg; statics %.3f", got, c.want)
			if math.Abs(got-c.want) > tipTol {
				t.Errorf("tipped at %.3f deg, statics gives %.3f (tolerance %g)", got, c.want, tipTol)
			}
			if b.SlidAt != nil && b.SlidAt.Time < b.TippedAt.Time {
				t.Errorf("slid at %v before it tipped at %v", b.SlidAt, b.TippedAt)
			}
		})
	}
}

// comX and comZ place the box's centre of mass, (0.04, 0, -0.05) in its
// axes with its base on the table top (z = 0 at the through point), the
// whole turned by angle deg about (0, s, 0).
func comX(deg, s float64) float64 {
	x, _ := turned(0.04, 0.2-0.05, deg*s)
	return x
}

func comZ(deg, s float64) float64 {
	_, z := turned(0.04, 0.2-0.05, deg*s)
	return z
}

// tableX and tableZ place the table's centre, 0.05 below the through point
// on its top, turned with it.
func tableX(deg, s float64) float64 {
	x, _ := turned(0, -0.05, deg*s)
	return x
}

func tableZ(deg, s float64) float64 {
	_, z := turned(0, -0.05, deg*s)
	return z
}

// turned rotates (x, z) by deg about +y.
func turned(x, z, deg float64) (float64, float64) {
	r := deg * math.Pi / 180
	return x*math.Cos(r) + z*math.Sin(r), -x*math.Sin(r) + z*math.Cos(r)
}

// shoveTol is the shove check's margin either side of the threshold, as
// a fraction of the base. The pusher moves at 5 mm/s, slow enough for
// statics: it meets the block with an impact that slides the block a
// little before it can tip, by far less than the 1 mm of a slides event
// (at 20 mm/s it slides about 1.2 mm).
const shoveTol = 0.05

// A block of base b pushed slowly by a frictionless pusher at height h
// tips when h > b / (2 mu_s) (the pushing force needed to tip it, W b /
// (2 h), is less than the friction mu_s W that holds it) and slides below
// (statics of a rigid block; Meriam and Kraige, Statics, ch. 6).
func TestShoveTipsAboveAndSlidesBelowTheThreshold(t *testing.T) {
	const b, mu = 0.1, 0.5
	threshold := b / (2 * mu)
	dir := t.TempDir()
	path := "time,x,y,z\n0,0,0,0\n0.1,0,0,0\n2.1,0.01,0,0\n"
	if err := os.WriteFile(filepath.Join(dir, "push.csv"), []byte(path), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		h    float64
		tips bool
	}{{threshold + shoveTol*b, true}, {threshold - shoveTol*b, false}} {
		text := fmt.Sprintf(`
[world]
duration = 2.3
until_settled = false
[material.floor]
friction = %[1]g
[material.slick]
friction = 0
[[pair]]
materials = ["slick", "floor"]
friction = 0
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "floor"
[[body]]
name = "block"
shape = { box = [0.1, 0.1, 0.3] }
mass = 2
position = [0, 0, 0.15]
material = "floor"
[[body]]
name = "pusher"
driven = true
shape = { box = [0.02, 0.2, 0.004] }
position = [-0.0605, 0, %[2]g]
material = "slick"
[[drive]]
body = "pusher"
path = "push.csv"
`, mu, c.h)
		sum := runText(t, text, dir)
		bl := body(t, sum, "block")
		t.Logf("h = %.4g m: tipped_at %+v, slid_at %+v", c.h, bl.TippedAt, bl.SlidAt)
		tipped := bl.TippedAt != nil && (bl.SlidAt == nil || bl.TippedAt.Time <= bl.SlidAt.Time)
		slid := bl.SlidAt != nil && (bl.TippedAt == nil || bl.SlidAt.Time < bl.TippedAt.Time)
		if c.tips && !tipped || !c.tips && !slid {
			t.Errorf("pushed at h = %.4g m (threshold %.4g): tipped_at %+v, slid_at %+v; want it to %s first", c.h, threshold, bl.TippedAt, bl.SlidAt, map[bool]string{true: "tip", false: "slide"}[c.tips])
		}
	}
}

// periodTol is the pendulum check: at 2 degrees amplitude the period
// exceeds the small-angle one by theta0^2/16 = 7.6e-5 (any mechanics
// text), and the step of 0.5 ms resolves the zero crossings to 1e-4 of a
// period over ten swings; 0.2 % is twice their sum with room.
const periodTol = 2e-3

// A physical pendulum whose centre of mass is off its shape's centre:
// T = 2 pi sqrt(I_O / (m g d)), I_O the inertia about the pivot (parallel
// axis: I_G + m d^2), d the pivot to centre of mass distance (e.g.
// Halliday, Resnick and Walker, Fundamentals of Physics, ch. 15).
func TestPendulumWithAnOffsetCentreOfMass(t *testing.T) {
	// A 0.6 m bar hung at its top end; its centre of mass is 0.1 m below
	// its middle (a weight at the bottom), and its inertia is given.
	const m, iG, d = 2.0, 0.05, 0.4
	text := fmt.Sprintf(`
[world]
step = "0.5 ms"
duration = 20
until_settled = false
[[body]]
name = "bar"
shape = { box = [0.04, 0.04, 0.6] }
mass = %g
center_of_mass = [0, 0, -0.1]
inertia = [[%[2]g, 0, 0], [0, %[2]g, 0], [0, 0, 0.001]]
position = [%[3]g, 0, %[4]g]
orientation = { axis = [0, 1, 0], angle = 2 }
[[joint]]
name = "pivot"
kind = "revolute"
bodies = ["bar"]
at = [0, 0, 0]
axis = [0, 1, 0]
`, m, iG, -d*math.Sin(2*math.Pi/180), -d*math.Cos(2*math.Pi/180))
	s := parseText(t, text, "pendulum.toml", "")
	w, ids, err := s.Build()
	if err != nil {
		t.Fatal(err)
	}
	g := 9.80665
	want := 2 * math.Pi * math.Sqrt((iG+m*d*d)/(m*g*d))
	var crossings []float64
	prev := w.Position(ids[0])[0]
	for w.Time() < 12*want {
		if err := w.Step(s.World.Step); err != nil {
			t.Fatal(err)
		}
		x := w.Position(ids[0])[0]
		if prev < 0 && x >= 0 {
			crossings = append(crossings, w.Time()-s.World.Step*x/(x-prev))
		}
		prev = x
	}
	if len(crossings) < 11 {
		t.Fatalf("only %d crossings", len(crossings))
	}
	got := (crossings[10] - crossings[0]) / 10
	t.Logf("period %.6f s; 2 pi sqrt(I/(m g d)) = %.6f s", got, want)
	if math.Abs(got-want) > periodTol*want {
		t.Errorf("period %.6f s, T = 2 pi sqrt(I/(m g d)) gives %.6f s", got, want)
	}
}
