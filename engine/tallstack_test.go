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

// towerLoadTol is the relative error allowed in the load carried by each
// face of a tower: ten times the solver's relative stopping test
// (contact.Settings.Convergence, 1e-4), by which the sweeps that follow the
// direct solve may leave its normal impulses.
const towerLoadTol = 1e-3

func TestTallTowersStand(t *testing.T) {
	// A tower of equal boxes, each set on the one below, is at rest
	// (statics: every box carries the weight of those above it, Newton's
	// third law at each face; e.g. J. L. Meriam and L. G. Kraige,
	// "Engineering Mechanics: Statics", chapter 3). It must stay at rest at
	// fine and coarse steps, for odd sizes and unequal masses.
	cases := []struct {
		name  string
		n     int
		half  shapes.Vec3
		dense [2]float64 // densities of even and odd boxes, kg/m^3
		dt    float64
	}{
		{"26 boxes of 10 cm, 1 ms", 26, shapes.Vec3{0.05, 0.05, 0.05}, [2]float64{500, 500}, 1e-3},
		{"40 boxes of 10 cm, 1 ms", 40, shapes.Vec3{0.05, 0.05, 0.05}, [2]float64{500, 500}, 1e-3},
		{"40 boxes of 10 cm, 1/120 s", 40, shapes.Vec3{0.05, 0.05, 0.05}, [2]float64{500, 500}, 1.0 / 120},
		{"60 boxes of 10 cm, 1/120 s", 60, shapes.Vec3{0.05, 0.05, 0.05}, [2]float64{500, 500}, 1.0 / 120},
		{"30 boxes of 10 cm, 1/60 s", 30, shapes.Vec3{0.05, 0.05, 0.05}, [2]float64{500, 500}, 1.0 / 60},
		{"36 flat boxes 8x6x2 cm, 1/120 s", 36, shapes.Vec3{0.04, 0.03, 0.01}, [2]float64{700, 700}, 1.0 / 120},
		{"32 boxes, masses 1:10, 1 ms", 32, shapes.Vec3{0.05, 0.05, 0.05}, [2]float64{300, 3000}, 1e-3},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			cfg := DefaultConfig()
			cfg.NoSleep = true
			w, mat := floorWorld(t, cfg, 0, Material{Friction: 0.6})
			ids := make([]BodyID, c.n)
			starts := make([]shapes.Vec3, c.n)
			for i := range ids {
				starts[i] = shapes.Vec3{0, 0, c.half[2] * float64(2*i+1)}
				ids[i] = mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: c.half}, Density: c.dense[i%2], Material: mat, Position: starts[i]})
			}
			run(t, w, c.dt, 3, nil)
			for i, id := range ids {
				d := w.Position(id).Sub(starts[i])
				if sway := math.Hypot(d[0], d[1]); sway > maxTowerSway {
					t.Errorf("box %d swayed %.3g m", i, sway)
				}
				// Each face below may close by up to the slop.
				if d[2] < -float64(i+1)*DefaultSlop || d[2] > maxTowerSway {
					t.Errorf("box %d moved %.3g m up", i, d[2])
				}
			}
			// The load on each face: the weight of the boxes above it, as
			// an impulse per step.
			load := make([]float64, c.n)
			for _, p := range w.collision.points {
				hi := BodyID(max(p.A, p.B))
				for i, id := range ids {
					if id == hi {
						load[i] += p.NormalImpulse + p.ImpactImpulse
					}
				}
			}
			above := 0.0
			for i := c.n - 1; i >= 0; i-- {
				above += w.MassOf(ids[i]) * g0 * c.dt
				if e := relErr(load[i], above); e > towerLoadTol {
					t.Errorf("face under box %d carries %.6g N s per step, want %.6g (error %.2g)", i, load[i], above, e)
				}
			}
		})
	}
}
