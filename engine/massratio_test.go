package engine

import (
	"fmt"
	"testing"

	"clatter/shapes"
)

// maxRatioCreep is how far a box of a resting stack may move, in any
// direction, in the 20 s of TestMassRatioStacksStayPut: 1 um, a thousandth
// of the 1 mm stacks must meet (maxStackDrift) and a two-hundredth of the
// slop, so that creep at a steady speed shows long before it reaches
// either. A stack of equal boxes moves some nanometres; with masses 1:100:
// 10000 the direct solve's regularising shift sank every face at 4.8 um/s
// at 1/30 s (measured before its refinement step, contact/refine.go).
const maxRatioCreep = 1e-6

// TestMassRatioStacksStayPut sets three boxes of 20 x 20 x 10 cm on each
// other on a floor, with masses in ratios of up to 1:10000 (light on heavy,
// heavy on light, a light box between heavy ones), kept awake with
// restitution 0.9. Statics: each stays where it is set and each face
// carries the weight above it (J. L. Meriam and L. G. Kraige, "Engineering
// Mechanics: Statics", chapter 3), at coarse and fine steps alike.
func TestMassRatioStacksStayPut(t *testing.T) {
	half := shapes.Vec3{0.1, 0.1, 0.05}
	ratios := []struct {
		name  string
		dense [3]float64 // kg/m^3, bottom to top
	}{
		{"heavy on light 1:100:10000", [3]float64{1, 100, 10000}},
		{"light on heavy 10000:100:1", [3]float64{10000, 100, 1}},
		{"light between heavy 1000:1:1000", [3]float64{1000, 1, 1000}},
		{"heavy between light 1:1000:1", [3]float64{1, 1000, 1}},
	}
	for _, r := range ratios {
		for _, dt := range []float64{1.0 / 30, 1.0 / 60, 1e-3} {
			t.Run(fmt.Sprintf("%s at %.3g s", r.name, dt), func(t *testing.T) {
				c := towerCase{n: 3, half: half, dt: dt, rest: 0.9}
				cfg := DefaultConfig()
				cfg.NoSleep = true
				w, mat := floorWorld(t, cfg, 0, Material{Friction: 0.5, Restitution: c.rest})
				ids := make([]BodyID, c.n)
				starts := make([]shapes.Vec3, c.n)
				for i := range ids {
					starts[i] = shapes.Vec3{0, 0, half[2] * float64(2*i+1)}
					ids[i] = mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: half}, Density: r.dense[i], Material: mat, Position: starts[i]})
				}
				run(t, w, dt, 20, nil)
				for i, id := range ids {
					if d := w.Position(id).Sub(starts[i]); d.Len() > maxRatioCreep {
						t.Errorf("box %d (%g kg) moved %.3g m (%.3g, %.3g, %.3g), want at most %.3g",
							i, w.MassOf(id), d.Len(), d[0], d[1], d[2], maxRatioCreep)
					}
				}
				towerLoads(t, w, c, ids)
			})
		}
	}
}
