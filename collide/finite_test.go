package collide

import (
	"math"
	"testing"

	"clatter/shapes"
)

// TestFinitePose checks finite and finitePose against the definition, a
// component-wise math.IsNaN and math.IsInf test (the reference), for a
// NaN or an infinity in every component and for the largest finite values,
// whose sum overflows though each is finite (a test that added the
// components first would call them infinite).
func TestFinitePose(t *testing.T) {
	ref := func(p shapes.Pose) bool {
		for _, x := range []float64{p.Position[0], p.Position[1], p.Position[2],
			p.Orientation.W, p.Orientation.V[0], p.Orientation.V[1], p.Orientation.V[2]} {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return false
			}
		}
		return true
	}
	values := []float64{0, math.Copysign(0, -1), 1, -2.5, math.MaxFloat64, -math.MaxFloat64,
		math.SmallestNonzeroFloat64, math.NaN(), math.Inf(1), math.Inf(-1)}
	base := shapes.Pose{Position: shapes.Vec3{math.MaxFloat64, math.MaxFloat64, math.MaxFloat64},
		Orientation: shapes.Quat{W: math.MaxFloat64, V: shapes.Vec3{math.MaxFloat64, math.MaxFloat64, math.MaxFloat64}}}
	for k := 0; k < 7; k++ {
		for _, x := range values {
			p := base
			comp := []*float64{&p.Position[0], &p.Position[1], &p.Position[2],
				&p.Orientation.W, &p.Orientation.V[0], &p.Orientation.V[1], &p.Orientation.V[2]}
			*comp[k] = x
			if got, want := finitePose(p), ref(p); got != want {
				t.Errorf("component %d = %v: finitePose %v, want %v", k, x, got, want)
			}
			if k < 3 {
				if got, want := finite(p.Position), ref(shapes.Pose{Position: p.Position}); got != want {
					t.Errorf("finite(%v) = %v, want %v", p.Position, got, want)
				}
			}
		}
	}
}
