package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// Pyramids of boxes kept awake: islands of hundreds of points whose
// contact graph is a lattice rather than a chain, held by the contact
// solver's banded direct solve with friction (contact/band.go) instead of
// its iterative sweeps.

// pyramidDriftPerSize bounds the displacement of any box of a pyramid kept
// awake, as a fraction of the box's width: 1e-5, a micrometre for boxes of
// 10 cm. A pyramid at rest with friction does not move at all (statics;
// K. Erleben, "Stable, Robust, and Versatile Multibody Dynamics
// Animation", PhD thesis, University of Copenhagen 2005, chapter on
// stacking): what the solver may leave is its regularisation's share,
// about 1e-9 of each impulse (contact.blockShift), measured here at 1e-15
// to 1e-10 m. Left to the sweeps, 10 rows of 10 cm boxes drifted 1.3 mm in
// 5 s at 1/60 s, 0.35 mm at 1/120 s and 5 um at 1 ms (measured), all above
// this bound.
const pyramidDriftPerSize = 1e-5

// pyramidCase is a pyramid of rows rows of cubes of half size half, each
// row offset by half a box on the one below with gaps of gap times the
// box's width between neighbours, densities dense for even and odd rows,
// run kept awake for seconds at step dt, with friction mu and restitution
// rest.
type pyramidCase struct {
	name    string
	rows    int
	half    float64
	gap     float64
	dense   [2]float64
	dt      float64
	seconds float64
	mu      float64 // friction, 0.6 if 0
	rest    float64 // restitution
}

func TestPyramidsKeptAwakeStand(t *testing.T) {
	// A pyramid of boxes, each box on the two below it, is at rest
	// (statics: every box's weight and the loads on it fall within its
	// supports, for any masses, Meriam and Kraige, "Engineering Mechanics:
	// Statics", chapters 3 and 5). It must stay where it is set, kept awake,
	// at coarse and fine steps, for boxes of 1 mm and of 1 m, and with rows
	// of unequal masses.
	even := [2]float64{500, 500}
	cases := []pyramidCase{
		{name: "10 rows of 10 cm, 1/60 s", rows: 10, half: 0.05, gap: 0.01, dense: even, dt: 1.0 / 60, seconds: 5},
		{name: "10 rows of 10 cm, 1/120 s", rows: 10, half: 0.05, gap: 0.01, dense: even, dt: 1.0 / 120, seconds: 5},
		{name: "10 rows of 10 cm, 1 ms", rows: 10, half: 0.05, gap: 0.01, dense: even, dt: 1e-3, seconds: 2},
		{name: "12 rows of 10 cm, 1/60 s", rows: 12, half: 0.05, gap: 0.01, dense: even, dt: 1.0 / 60, seconds: 5},
		{name: "10 rows of 1 m, 1/60 s", rows: 10, half: 0.5, gap: 0.01, dense: even, dt: 1.0 / 60, seconds: 5},
		// Gaps of a quarter box: a hundredth of 1 mm is within the slop,
		// and neighbours of one row would touch.
		{name: "10 rows of 1 mm, 1 ms", rows: 10, half: 0.0005, gap: 0.25, dense: even, dt: 1e-3, seconds: 2},
		{name: "10 rows, masses 1:10 by row, 1/60 s", rows: 10, half: 0.05, gap: 0.01, dense: [2]float64{500, 5000}, dt: 1.0 / 60, seconds: 5},
		{name: "5 rows, light on heavy 1:100, 1 ms", rows: 5, half: 0.05, gap: 0.01, dense: [2]float64{5000, 50}, dt: 1e-3, seconds: 2},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) { standPyramid(t, c) })
	}
}

// standPyramid runs pyramid c kept awake and checks that no box moved. It
// returns the world and the boxes, bottom row first.
func standPyramid(t *testing.T, c pyramidCase) (*World, []BodyID) {
	cfg := DefaultConfig()
	cfg.NoSleep = true
	mu := c.mu
	if mu == 0 {
		mu = 0.6
	}
	w, mat := floorWorld(t, cfg, 0, Material{Friction: mu, Restitution: c.rest})
	box := shapes.Box{Half: shapes.Vec3{c.half, c.half, c.half}}
	var ids []BodyID
	var starts []shapes.Vec3
	for row := 0; row < c.rows; row++ {
		n := c.rows - row
		for i := 0; i < n; i++ {
			x := (float64(i) - float64(n-1)/2) * 2 * c.half * (1 + c.gap)
			p := shapes.Vec3{x, 0, c.half * float64(2*row+1)}
			ids = append(ids, mustAdd(t, w, BodyDef{Name: "box", Shape: box, Density: c.dense[row%2], Material: mat, Position: p}))
			starts = append(starts, p)
		}
	}
	run(t, w, c.dt, c.seconds, nil)
	tol := pyramidDriftPerSize * 2 * c.half
	for i, id := range ids {
		if d := w.Position(id).Sub(starts[i]); d.Len() > tol || math.IsNaN(d.Len()) {
			t.Errorf("box %d moved %.3g m (%.3g m across, %.3g m up), want at most %.3g", i, d.Len(), math.Hypot(d[0], d[1]), d[2], tol)
		}
	}
	return w, ids
}
