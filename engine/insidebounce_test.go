package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// insideBounceTol bounds the error of a rebound that starts inside the
// surface within the slop, as a fraction of the error (1 - e^2) d that
// bouncing at e times the speed found at the depth d made: the bounce
// leaves at the speed that reaches the apex of the bounce from the surface
// and the world integrates free flight exactly, so what is left is
// rounding (below 1e-8 of it measured, at 10 m).
const insideBounceTol = 1e-6

// insideDeepTol is the same bound for a bounce found three slops deep:
// the position pass lifts a part sunk beyond its slop by a part of the
// excess without a velocity, which raises the apex by a part of the old
// error at 1 ms (measured 0.04 to 0.17 at 1 mm to 10 cm; rounding at
// coarser steps); a quarter.
const insideDeepTol = 0.25

// TestBounceFromInside starts a ball of diameter s a depth d inside the
// floor, moving down at the speed it would have after falling from a
// height s above the surface, sqrt(2 g (s + d)), and measures the apex of
// its rebound: Newton's law of restitution at the surface (W. Goldsmith,
// "Impact", 1960, chapter 1) sends it up to e^2 s. The apex is taken from
// the last rising step, z + v^2 / (2 g), so that the step's sampling does
// not blur it. Sizes 1 mm to 10 m, steps 1 ms, 1/240 s and 1/60 s at 1 m
// scaled by s^(1/2) (dimensional analysis: the same case).
func TestBounceFromInside(t *testing.T) {
	for _, c := range []struct {
		slops, tol float64 // depth in slops, tolerance
	}{{0.3, insideBounceTol}, {0.9, insideBounceTol}, {3, insideDeepTol}} {
		for _, e := range []float64{0.2, 0.5, 0.8} {
			for _, dt0 := range []float64{1e-3, 1.0 / 240, 1.0 / 60} {
				for _, s := range sizeFactors {
					r, h := 0.5*s, s
					d := c.slops * SlopOf(r)
					got := bounceApex(t, s, e, d, dt0*math.Sqrt(s))
					old := (1 - e*e) * d // the error of a bounce at e times the speed at the depth
					if rel := (got - e*e*h) / old; !(math.Abs(rel) <= c.tol) {
						t.Errorf("size %g m, e %g, step %.4g s at 1 m, %g slops deep: apex %.9g m, want e^2 h = %.9g m; error %.3g of (1 - e^2) d, want below %g",
							s, e, dt0, c.slops, got, e*e*h, rel, c.tol)
					}
				}
			}
		}
	}
}

// bounceApex starts a ball of diameter s a depth d inside the floor with
// the speed of a fall from s above the surface and returns the apex of its
// lowest point after the bounce, m.
func bounceApex(t *testing.T, s, e, d, dt float64) float64 {
	w, mat := scaleWorld(t, 0, 0.3, e)
	r := 0.5 * s
	id := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: 1000, Material: mat,
		Position: shapes.Vec3{0, 0, r - d}, Velocity: shapes.Vec3{0, 0, -math.Sqrt(2 * g0 * (s + d))}})
	zp, vp := 0.0, 0.0
	for i := 0; float64(i)*dt < 2*math.Sqrt(2*s/g0); i++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		z, v := w.Position(id)[2]-r, w.Velocity(id)[2]
		if vp > 0 && v <= 0 {
			return zp + vp*vp/(2*g0)
		}
		zp, vp = z, v
	}
	return math.NaN()
}
