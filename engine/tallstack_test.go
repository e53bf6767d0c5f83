package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// Tall stacks: towers of more points than the contact solver's dense direct
// solve takes (contact.Settings.MaxBlock), held by its banded direct solve.

// maxTowerSway is the horizontal drift allowed to any box of a tower in 3 s
// kept awake: a tenth of the 1 mm in 10 s that stacks must meet
// (maxStackDrift), and half the slop. A tower left to the iterative sweeps
// sways by centimetres (measured before the banded solve: 26 boxes of 10 cm
// 1.5 cm in 10 s at 1 ms; 30 boxes collapse at 1/120 s).
const maxTowerSway = 1e-4

// towerSwayPerSize bounds the sway of a tower of small boxes in proportion
// to their width: a thousandth, which is maxTowerSway for boxes of 10 cm,
// so that a tower of 1 mm boxes is held to the same tilt of its faces
// (1e-3 rad) and not to a tenth of its width. The bound is the smaller of
// the two.
const towerSwayPerSize = 1e-3

// towerLoadTol is the relative error allowed in the load carried by each
// face of a tower: ten times the solver's relative stopping test
// (contact.Settings.Convergence, 1e-4), by which the sweeps that follow the
// direct solve may leave its normal impulses.
const towerLoadTol = 1e-3

// towerCase is a tower of n equal boxes (or another shape with flat ends),
// each set on the one below on a floor tilted by tilt (degrees; gravity is
// turned instead, floorWorld), run for seconds at step dt.
type towerCase struct {
	name    string
	n       int
	half    shapes.Vec3  // the box's half sizes: half[2] is half its height
	shape   shapes.Shape // the box of half if nil
	dense   [2]float64   // densities of even and odd boxes, kg/m^3
	dt      float64
	rest    float64 // restitution
	tilt    float64 // degrees
	seconds float64 // 3 if 0
	sleep   bool    // sleeping on: the tower must fall asleep where it stands
	gap     float64 // each box set this far (m) above the one below, to land on it
}

func TestTallTowersStand(t *testing.T) {
	// A tower of boxes, each set on the one below, is at rest (statics:
	// every box carries the weight of those above it, Newton's third law at
	// each face; e.g. J. L. Meriam and L. G. Kraige, "Engineering
	// Mechanics: Statics", chapter 3). It must stay at rest at fine and
	// coarse steps, for odd sizes and unequal masses, with restitution
	// (a resting contact is no impact), and on a floor tilted below both
	// the slip angle (tan 0.5 degrees and tan 2 degrees are far below the
	// friction 0.6; Meriam and Kraige, chapter 6) and the tip angle (the
	// boxes above any face have their centre of mass within the face while
	// k h tan(tilt) < half the width, k boxes of height h above it: 50
	// boxes of 10 cm at 0.5 degrees, 2.2 cm < 5 cm; 20 at 2 degrees, 3.5 cm
	// < 5 cm; Meriam and Kraige, chapter 5).
	cube := shapes.Vec3{0.05, 0.05, 0.05}
	even := [2]float64{500, 500}
	cases := []towerCase{
		{name: "26 boxes of 10 cm, 1 ms", n: 26, half: cube, dense: even, dt: 1e-3},
		{name: "40 boxes of 10 cm, 1 ms", n: 40, half: cube, dense: even, dt: 1e-3},
		{name: "40 boxes of 10 cm, 1/120 s", n: 40, half: cube, dense: even, dt: 1.0 / 120},
		{name: "60 boxes of 10 cm, 1/120 s", n: 60, half: cube, dense: even, dt: 1.0 / 120},
		{name: "30 boxes of 10 cm, 1/60 s", n: 30, half: cube, dense: even, dt: 1.0 / 60},
		{name: "36 flat boxes 8x6x2 cm, 1/120 s", n: 36, half: shapes.Vec3{0.04, 0.03, 0.01}, dense: [2]float64{700, 700}, dt: 1.0 / 120},
		{name: "32 boxes, masses 1:10, 1 ms", n: 32, half: cube, dense: [2]float64{300, 3000}, dt: 1e-3},
		// Towers that fell at 1/60 s before each step solved their friction
		// with the normal rows (contact/band.go).
		{name: "50 boxes of 10 cm, 1/60 s", n: 50, half: cube, dense: even, dt: 1.0 / 60},
		{name: "80 boxes of 10 cm, 1/60 s", n: 80, half: cube, dense: even, dt: 1.0 / 60},
		{name: "200 boxes of 10 cm, 1/60 s", n: 200, half: cube, dense: even, dt: 1.0 / 60},
		{name: "20 boxes of 10 cm, 1/60 s", n: 20, half: cube, dense: even, dt: 1.0 / 60},
		{name: "50 boxes, masses 1:10, 1/60 s", n: 50, half: cube, dense: [2]float64{500, 5000}, dt: 1.0 / 60},
		{name: "50 boxes, masses 10:1, 1/60 s", n: 50, half: cube, dense: [2]float64{5000, 500}, dt: 1.0 / 60},
		{name: "50 boxes of 1 m, 1/60 s", n: 50, half: shapes.Vec3{0.5, 0.5, 0.5}, dense: even, dt: 1.0 / 60},
		{name: "50 boxes of 1 mm, 1 ms", n: 50, half: shapes.Vec3{0.0005, 0.0005, 0.0005}, dense: even, dt: 1e-3, seconds: 1},
		// At 1/60 s the speculative margin, g dt^2 = 2.7 mm, reaches three
		// cubes of 1 mm up: their island is dense unless the banded solve
		// leaves out the points apart (contact/band.go).
		{name: "10 boxes of 1 mm, 1/60 s", n: 10, half: shapes.Vec3{0.0005, 0.0005, 0.0005}, dense: even, dt: 1.0 / 60},
		{name: "40 boxes of 1 mm, 1/60 s", n: 40, half: shapes.Vec3{0.0005, 0.0005, 0.0005}, dense: even, dt: 1.0 / 60},
		// Islands of more than 1024 points, once beyond the banded
		// solve's reach (contact/band.go), fell at 1/60 s: 50 cubes of 1 mm
		// have 1128 points with their speculative ones; 300 boxes, 1200.
		{name: "50 boxes of 1 mm, 1/60 s", n: 50, half: shapes.Vec3{0.0005, 0.0005, 0.0005}, dense: even, dt: 1.0 / 60},
		{name: "300 boxes of 10 cm, 1/60 s", n: 300, half: cube, dense: even, dt: 1.0 / 60},
		{name: "300 boxes of 1 m, 1/120 s", n: 300, half: shapes.Vec3{0.5, 0.5, 0.5}, dense: even, dt: 1.0 / 120},
		{name: "300 boxes, heavy on light 100:1, 1/60 s", n: 300, half: cube, dense: [2]float64{50, 5000}, dt: 1.0 / 60},
		{name: "300 boxes of 10 cm, 1 ms", n: 300, half: cube, dense: even, dt: 1e-3, seconds: 1},
		{name: "50 plates 20x20x2 cm, 1/60 s", n: 50, half: shapes.Vec3{0.1, 0.1, 0.01}, dense: even, dt: 1.0 / 60},
		{name: "50 boxes, restitution 0.5, 1/60 s", n: 50, half: cube, dense: even, dt: 1.0 / 60, rest: 0.5},
		{name: "50 boxes, restitution 0.9, 1/60 s", n: 50, half: cube, dense: even, dt: 1.0 / 60, rest: 0.9},
		{name: "50 boxes, floor tilted 0.5 degrees, 1/60 s", n: 50, half: cube, dense: even, dt: 1.0 / 60, tilt: 0.5},
		{name: "20 boxes, floor tilted 2 degrees, 1/60 s", n: 20, half: cube, dense: even, dt: 1.0 / 60, tilt: 2},
		{name: "50 boxes of 10 cm, 1/60 s, 60 s", n: 50, half: cube, dense: even, dt: 1.0 / 60, seconds: 60},
		{name: "50 boxes of 10 cm, 1/60 s, sleeping", n: 50, half: cube, dense: even, dt: 1.0 / 60, sleep: true},
		{name: "40 cylinders 10 cm across and high, 1/60 s", n: 40, half: cube, dense: even, dt: 1.0 / 60,
			shape: shapes.Cylinder{Radius: 0.05, HalfLength: 0.05}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) { standTower(t, c) })
	}
}

// standTower runs tower c and checks that it stands and that each face
// carries the weight above it.
func standTower(t *testing.T, c towerCase) {
	cfg := DefaultConfig()
	cfg.NoSleep = !c.sleep
	tilt := c.tilt * math.Pi / 180
	w, mat := floorWorld(t, cfg, tilt, Material{Friction: 0.6, Restitution: c.rest})
	ids := make([]BodyID, c.n)
	starts := make([]shapes.Vec3, c.n)
	shape := c.shape
	if shape == nil {
		shape = shapes.Box{Half: c.half}
	}
	for i := range ids {
		starts[i] = shapes.Vec3{0, 0, c.half[2] * float64(2*i+1)}
		at := starts[i].Add(shapes.Vec3{0, 0, c.gap * float64(i+1)})
		ids[i] = mustAdd(t, w, BodyDef{Name: "box", Shape: shape, Density: c.dense[i%2], Material: mat, Position: at})
	}
	seconds := c.seconds
	if seconds == 0 {
		seconds = 3
	}
	run(t, w, c.dt, seconds, nil)
	sway := min(maxTowerSway, towerSwayPerSize*2*min(c.half[0], c.half[1]))
	for i, id := range ids {
		d := w.Position(id).Sub(starts[i])
		if s := math.Hypot(d[0], d[1]); s > sway {
			t.Errorf("box %d swayed %.3g m, want at most %.3g", i, s, sway)
		}
		// Each face below may close by up to the slop; a box at rest does
		// not hop.
		if d[2] < -float64(i+1)*DefaultSlop || d[2] > sway {
			t.Errorf("box %d moved %.3g m up", i, d[2])
		}
		// A box moving faster than this leaves the sway bound within a
		// second.
		if v := w.Velocity(id).Len(); v > sway/1 {
			t.Errorf("box %d moves at %.3g m/s, want rest", i, v)
		}
		if c.sleep && w.Awake(id) {
			t.Errorf("box %d still awake after %g s", i, seconds)
		}
	}
	if !c.sleep {
		towerLoads(t, w, c, ids)
	}
}

// towerLoads checks the impulse of the last step on each face: the weight
// of the boxes above it, along the floor's normal times cos(tilt), and in
// the faces' friction times sin(tilt) (statics of a body on an incline,
// Meriam and Kraige, chapter 6).
func towerLoads(t *testing.T, w *World, c towerCase, ids []BodyID) {
	tilt := c.tilt * math.Pi / 180
	normal := make([]float64, c.n)
	friction := make([]shapes.Vec3, c.n)
	for _, p := range w.collision.points {
		hi := BodyID(max(p.A, p.B))
		for i, id := range ids {
			if id == hi {
				normal[i] += p.NormalImpulse + p.ImpactImpulse
				friction[i] = friction[i].Add(p.FrictionImpulse).Add(p.ImpactFriction)
			}
		}
	}
	above := 0.0
	for i := c.n - 1; i >= 0; i-- {
		above += w.MassOf(ids[i]) * g0 * c.dt
		if want := above * math.Cos(tilt); relErr(normal[i], want) > towerLoadTol {
			t.Errorf("face under box %d carries %.6g N s per step, want %.6g (error %.2g)", i, normal[i], want, relErr(normal[i], want))
		}
		if tilt == 0 {
			continue
		}
		if want, got := above*math.Sin(tilt), friction[i].Len(); relErr(got, want) > towerLoadTol {
			t.Errorf("face under box %d holds %.6g N s per step by friction, want %.6g (error %.2g)", i, got, want, relErr(got, want))
		}
	}
}
