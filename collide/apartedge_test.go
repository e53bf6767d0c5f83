package collide

import (
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// TestBoxHullEdgeHintProvesApart holds a box and a hull (a cube's) apart
// edge across edge: the box turned 45 degrees about x has an edge on top
// along x, the hull above turned 45 degrees about y an edge at the bottom
// along y, so that only the axis across both edges (z) separates them
// (every face axis sees their extents overlap: the separating-axis
// theorem's edge-edge case, Ericson, "Real-Time Collision Detection",
// 2005, sec. 4.4.1). As the hull creeps and turns a little, the gap
// measured along the remembered edge pair (hintGap) must stay the true
// one, so that CollidePair proves the pair apart from it without the
// whole test, and CollidePair must return what Collide returns (nothing).
func TestBoxHullEdgeHintProvesApart(t *testing.T) {
	const c, gap, margin = 0.03, 3e-3, 1e-3
	// gapTol: rounding of lengths of 0.1 m through a rotation and two
	// supports, some 1e-17 m each.
	const gapTol = 1e-15
	box := shapes.Box{Half: vec3{c, c, c}}
	hull := boxHull(t, vec3{c, c, c})
	top := c * math.Sqrt2
	for _, swap := range []bool{false, true} {
		kept, plain := NewDetector(), NewDetector()
		var r1, r2 []Manifold
		var hint pairHint
		const steps = 100
		for s := 0; s < steps; s++ {
			x := 1e-5 * float64(s)
			pa := shapes.Pose{Orientation: mgl64.QuatRotate(math.Pi/4, vec3{1, 0, 0})}
			pb := shapes.Pose{Position: vec3{x, -x, 2*top + gap},
				Orientation: mgl64.QuatRotate(1e-4*float64(s), vec3{0, 0, 1}).Mul(mgl64.QuatRotate(math.Pi/4, vec3{0, 1, 0}))}
			var a, b shapes.Shape = box, hull
			if swap {
				a, b, pa, pb = hull, box, pb, pa
			}
			r1 = kept.CollidePair(r1[:0], 5, a, pa, b, pb, margin)
			r2 = plain.Collide(r2[:0], a, pa, b, pb, margin)
			if s == 0 {
				if len(kept.cache.cur) != 1 || kept.cache.cur[0].kind != hintEdge {
					t.Fatalf("swap %v: the test separated them by %+v, not an edge pair", swap, kept.cache.cur)
				}
				hint = kept.cache.cur[0]
			}
			// The gap along the edge pair's axis is the height of the
			// hull's bottom edge above the box's top edge: gap, by
			// construction, however far the hull has crept or turned
			// about z.
			if g, ok := hintGap(&hint, a, pa, b, pb); !ok || math.Abs(g-gap) > gapTol {
				t.Fatalf("swap %v step %d: gap along the remembered edges %.15g (ok %v), want %g", swap, s, g, ok, gap)
			}
			kept.NextStep()
			if !sameManifolds(r1, r2) || len(r2) != 0 {
				t.Fatalf("swap %v step %d: remembered %+v, fresh %+v", swap, s, r1, r2)
			}
		}
	}
}
