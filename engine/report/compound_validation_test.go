package report_test

import (
	"math"
	"testing"
)

// restTol is the resting-height check: the solver leaves contacts
// penetrated by up to its slop (0.2 mm by default, engine.Config.Slop).
const restTol = 3e-4

// A T made of two box pieces, dropped stem first into the groove of a U
// fixture made of three box pieces, comes to rest with its crossbar on
// the walls' tops and its stem hanging free in the groove: the rest
// height follows from the geometry alone (crossbar underside on the wall
// tops). Its convex hull would fill the space between crossbar and stem
// and rest 70 mm higher, on the groove's edges; so only contact piece by
// piece gives this answer.
func TestTeeRestsInAGroove(t *testing.T) {
	const text = `
units = { length = "mm", mass = "kg" }
[world]
duration = 3
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "fixture"
static = true
shape = { pieces = [
  { box = [160, 100, 20], at = [0, 0, -10] },
  { box = [50, 100, 100], at = [-55, 0, 50] },
  { box = [50, 100, 100], at = [55, 0, 50] },
] }
[[body]]
name = "tee"
density = "2.7 g/cm3"
shape = { pieces = [
  { box = [200, 50, 20], at = [0, 0, 50] },
  { box = [40, 50, 80] },
] }
position = [0, 0, 140]
`
	s := parseText(t, text, "tee.toml", "")
	tee := s.Bodies[s.BodyIndex("tee")]
	// Centre of mass of the two pieces (volumes 200 x 50 x 20 at z = 50
	// and 40 x 50 x 80 at z = 0): (200000 x 50) / 360000 = 27.78 mm.
	comZ := 0.05 * 200e-6 / 360e-6
	// sumTol: a weighted mean of two exact products, rounding only.
	const sumTol = 1e-12 // m
	if got := tee.Props.Center[2]; math.Abs(got-comZ) > sumTol {
		t.Fatalf("centre of mass of the tee at z = %g m, the weighted mean of its pieces gives %g", got, comZ)
	}
	sum := runScene(t, s)
	b := body(t, sum, "tee")
	// The crossbar's underside, 40 mm above the tee's origin, on the wall
	// tops at 100 mm.
	want := 100 - 40 + comZ*1000
	t.Logf("tee's centre of mass at z = %.4f mm, geometry gives %.4f", b.Position[2], want)
	if math.Abs(b.Position[2]-want) > restTol*1000 {
		t.Errorf("tee rests with its centre of mass at z = %.4f mm, want %.4f (crossbar on the walls)", b.Position[2], want)
	}
}
