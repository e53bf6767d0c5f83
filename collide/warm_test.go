package collide

import (
	"math"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// gjkWarmTol, relative to the distance: GJK stops once its lower bound is
// within gjkRelTol (squared scale) of its upper bound, so from any start it
// reports the distance to about half of that, 5e-14; a thousand times that
// leaves room for rounding of the support points.
const gjkWarmTol = 5e-11

// TestGJKWarmStart: GJK started from the directions of the simplex that a
// query at a nearby pose ended with reports the same distance and overlap as
// a cold start (a property of GJK from any start simplex; van den Bergen
// 2003), in at most as many iterations, and an overlapping pair's start
// encloses the origin at once.
func TestGJKWarmStart(t *testing.T) {
	hex := prismHull(t, 6, 0.03, 0.02)
	rot := func(angle float64, axis vec3) mat3 {
		return mat3(shapes.RotationMatrix(mgl64.QuatRotate(angle, axis.Normalize())))
	}
	cases := []struct {
		name    string
		a, b    shapes.Shape
		pb      vec3
		overlap bool
	}{
		{"hulls apart", hex, hex, vec3{0.05, 0.02, 0.045}, false},
		{"hulls overlapping", hex, hex, vec3{0.04, 0.01, 0.035}, true},
		{"box and cylinder apart", shapes.Box{Half: vec3{0.04, 0.03, 0.02}}, shapes.Cylinder{Radius: 0.02, HalfLength: 0.03}, vec3{0.03, 0.05, 0.06}, false},
		{"box and cylinder overlapping", shapes.Box{Half: vec3{0.04, 0.03, 0.02}}, shapes.Cylinder{Radius: 0.02, HalfLength: 0.03}, vec3{0.03, 0.02, 0.04}, true},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			d := NewDetector()
			var a, b view
			a.setConvex(tc.a, rot(0.3, vec3{1, 2, 3}), vec3{})
			b.setConvex(tc.b, rot(0.7, vec3{-2, 1, 1}), tc.pb)
			d.gjk(&a, &b, false)
			dirs := make([]vec3, d.smp.n)
			copy(dirs, d.smp.dir[:d.smp.n])
			// Next step: B has moved by a micrometre and turned a little.
			b.setConvex(tc.b, rot(0.7001, vec3{-2, 1, 1}), tc.pb.Add(vec3{1e-6, -1e-6, 0}))
			cold := d.gjk(&a, &b, false)
			warm := d.gjkFrom(&a, &b, false, dirs)
			if cold.overlap != tc.overlap || warm.overlap != tc.overlap {
				t.Fatalf("overlap cold %v, warm %v, want %v", cold.overlap, warm.overlap, tc.overlap)
			}
			if math.Abs(warm.dist-cold.dist) > gjkWarmTol*cold.dist {
				t.Errorf("distance warm %.15g, cold %.15g", warm.dist, cold.dist)
			}
			if warm.iters > cold.iters {
				t.Errorf("warm start took %d iterations, cold %d", warm.iters, cold.iters)
			}
			t.Logf("iterations cold %d, warm %d", cold.iters, warm.iters)
			if tc.overlap && warm.iters != 1 {
				t.Errorf("an overlapping pair's warm start took %d iterations, want 1", warm.iters)
			}
		})
	}
}
