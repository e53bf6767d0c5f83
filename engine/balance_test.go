package engine

import (
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

func TestBalancedOnEdgeAndCorner(t *testing.T) {
	// A cube set down with its centre of mass exactly above a corner or an
	// edge is in (unstable) equilibrium: the floor's reaction passes through
	// the centre of mass, so it has no moment and the cube stays there
	// (statics of a rigid body, any mechanics text). It comes to rest, but
	// not on a face: Balanced must say so. Set down flat it rests on a face.
	const h = 0.025
	diag := shapes.Vec3{1, 1, 1}.Normalize()
	cases := []struct {
		name   string
		q      shapes.Quat
		height float64 // of the centre of mass above the lowest point
		shape  shapes.Shape
		want   Balance
	}{
		{"corner", mgl64.QuatBetweenVectors(diag, shapes.Vec3{0, 0, 1}), h * math.Sqrt(3), shapes.Box{Half: shapes.Vec3{h, h, h}}, OnCorner},
		{"edge", mgl64.QuatRotate(math.Pi/4, shapes.Vec3{1, 0, 0}), h * math.Sqrt2, shapes.Box{Half: shapes.Vec3{h, h, h}}, OnEdge},
		{"face", mgl64.QuatIdent(), h, shapes.Box{Half: shapes.Vec3{h, h, h}}, NotBalanced},
		{"ball", mgl64.QuatIdent(), h, shapes.Sphere{Radius: h}, NotBalanced},
	}
	for _, c := range cases {
		for _, drop := range []float64{0, 0.01} {
			w, mat := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.5})
			id := mustAdd(t, w, BodyDef{Name: c.name, Shape: c.shape, Density: 500, Material: mat,
				Position: shapes.Vec3{0, 0, c.height + drop}, Orientation: c.q})
			for n := 0; n < 3000; n++ {
				if err := w.Step(1e-3); err != nil {
					t.Fatal(err)
				}
				if ok, _ := w.Settled(); ok {
					break
				}
			}
			if ok, _ := w.Settled(); !ok {
				t.Errorf("%s, dropped %g m: did not settle in 3 s", c.name, drop)
				continue
			}
			if got := w.Balanced(id); got != c.want {
				t.Errorf("%s, dropped %g m: Balanced = %v, want %v", c.name, drop, got, c.want)
			}
		}
	}
}
