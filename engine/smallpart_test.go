package engine

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// TestSmallPartsAtCoarseSteps drops small cubes, tilted, from 0.3 m onto a
// thin static plate and onto the floor at coarse steps, with restitution
// from 0 to 0.9. A cube at rest lies on a face: its centre is half its size
// above the support (statics of a rigid cube; any mechanics text). It may
// sink by at most the contact slop (0.2 mm), the solver's allowance. A fast
// spinning impact at a coarse step once left a cube sunk 70 percent of its
// size on one corner, never settling: the manifold reduction kept two
// shallow corners instead of the second deep one.
func TestSmallPartsAtCoarseSteps(t *testing.T) {
	const slopTol = 2e-4 // the default contact slop
	const plateTop = 0.0505
	for _, dt := range []float64{1.0 / 60, 1.0 / 30} {
		for _, size := range []float64{0.002, 0.005, 0.01} {
			for _, e := range []float64{0, 0.5, 0.9} {
				for _, onPlate := range []bool{false, true} {
					name := fmt.Sprintf("dt %.4g, %g mm cube, e %g, on plate %v", dt, size*1000, e, onPlate)
					w, mat := floorWorld(t, Config{}, 0, Material{Friction: 0.5, Restitution: e})
					support := 0.0
					if onPlate {
						support = plateTop
						mustAdd(t, w, BodyDef{Name: "plate", Kind: Static, Shape: shapes.Box{Half: shapes.Vec3{1, 1, 0.0005}}, Material: mat, Position: shapes.Vec3{0, 0, 0.05}})
					}
					h := size / 2
					id := mustAdd(t, w, BodyDef{Name: "cube", Shape: shapes.Box{Half: shapes.Vec3{h, h, h}}, Density: 1000, Material: mat,
						Position: shapes.Vec3{0, 0, 0.3}, Orientation: mgl64.QuatRotate(0.7, shapes.Vec3{1, 2, 0}.Normalize())})
					run(t, w, dt, 4, nil)
					if ok, _ := w.Settled(); !ok {
						t.Errorf("%s: not settled after 4 s", name)
					}
					if z := w.Position(id)[2] - support; math.Abs(z-h) > slopTol {
						t.Errorf("%s: centre %.3f mm above its support, want %.3f mm (a face down) within the slop", name, z*1000, h*1000)
					}
				}
			}
		}
	}
}
