package collide

import (
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// TestRollingRefreshFollowsSupport rolls a ball, a capsule and a cylinder
// lying on its side across a box's top face without slipping (the centre
// moves r theta as the part turns by theta), in steps small enough that
// most queries are refreshed. The touching point of a round part on a
// face is its support point along the face's normal, straight under its
// axis (the support mapping of G. van den Bergen, "Collision Detection in
// Interactive 3D Environments", 2003, chapter 4, from memory), however far
// it has rolled: a refreshed point must stay on it, not lag behind with the
// material point of the last full query (which had lagged by the whole
// distance rolled since, up to the motion limit, 2e-5 m here).
func TestRollingRefreshFollowsSupport(t *testing.T) {
	// rollTol: the refreshed point and the fresh one are both found from
	// the same exact surfaces; they differ by rounding of the poses and
	// of the kept normal, far below the 2e-5 m lag this test catches.
	const rollTol = 1e-10
	const margin = 1e-3
	slab := shapes.Box{Half: vec3{0.2, 0.2, 0.02}}
	slabAt := shapes.Pose{Position: vec3{0, 0, -0.02}, Orientation: mgl64.QuatIdent()}
	side := mgl64.QuatRotate(math.Pi/2, vec3{1, 0, 0}) // axis along world y
	parts := []struct {
		name string
		s    shapes.Shape
		q    shapes.Quat
		r    float64
	}{
		{"ball", shapes.Sphere{Radius: 0.02}, mgl64.QuatIdent(), 0.02},
		{"capsule", shapes.Capsule{Radius: 0.02, HalfLength: 0.03}, side, 0.02},
		{"cylinder on its side", shapes.Cylinder{Radius: 0.02, HalfLength: 0.03}, side, 0.02},
	}
	for _, p := range parts {
		t.Run(p.name, func(t *testing.T) {
			kept, fresh := NewDetector(), NewDetector()
			kept.SetPersistence(persistSlop)
			var r1, r3 []Manifold
			const steps, ds = 200, 1e-6 // m rolled a step
			for s := 0; s < steps; s++ {
				x := ds * float64(s)
				// Rolling along +x turns the part about +y by x / r.
				q := mgl64.QuatRotate(x/p.r, vec3{0, 1, 0}).Mul(p.q)
				pb := shapes.Pose{Position: vec3{x, 0, p.r - 5e-5}, Orientation: q}
				r1 = kept.CollidePair(r1[:0], 7, slab, slabAt, p.s, pb, margin)
				r3 = fresh.Collide(r3[:0], slab, slabAt, p.s, pb, margin)
				kept.NextStep()
				if len(r1) != 1 || len(r3) != 1 || r1[0].Count != r3[0].Count {
					t.Fatalf("step %d: kept %+v, fresh %+v", s, r1, r3)
				}
				for _, q := range r3[0].Points[:r3[0].Count] {
					best := math.Inf(1)
					for _, k := range r1[0].Points[:r1[0].Count] {
						best = min(best, k.Position.Sub(q.Position).Len())
					}
					if best > rollTol {
						t.Fatalf("step %d (rolled %.3g m): fresh point %v, nearest kept %.3g m off", s, x, q.Position, best)
					}
				}
			}
			if st := kept.Stats(); st.Persisted < steps/2 {
				t.Errorf("%d of %d queries refreshed: the test does not test the refresh", st.Persisted, steps)
			}
		})
	}
}
