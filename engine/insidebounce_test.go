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

// insideDeepTol is the same bound for a bounce found deeper than the slop
// (at 1/60 s, where a step's travel is many slops): the position pass
// lifts a part sunk beyond its slop by a part of the excess without a
// velocity, which raises the apex by a part of the old error, more at
// small e, whose old error is the larger share of the apex (up to 0.26
// at e = 0.2, 0.12 at 0.5, 0.06 at 0.8, measured); 0.3.
const insideDeepTol = 0.3

// TestBounceFromInside starts a ball of diameter s a depth d inside the
// floor, moving down at the speed it would have after falling from a
// height s above the surface, a0 = sqrt(2 g (s + d)), as if the last step
// had carried it that deep (d below a0 dt), and measures the apex of its
// rebound: Newton's law of restitution at the surface (W. Goldsmith,
// "Impact", 1960, chapter 1) sends it up to e^2 s. The apex is taken from
// the last rising step, z + v^2 / (2 g), so that the step's sampling does
// not blur it. Sizes 1 mm to 10 m, steps 1 ms, 1/240 s and 1/60 s at 1 m
// scaled by s^(1/2) (dimensional analysis: the same case).
func TestBounceFromInside(t *testing.T) {
	for _, c := range []struct {
		frac float64 // depth, of the smaller of the slop and the last step's travel
		deep bool    // the depth is that of the last step's travel, where it exceeds the slop
	}{{0.3, false}, {0.9, false}, {0.9, true}} {
		for _, e := range []float64{0.2, 0.5, 0.8} {
			for _, dt0 := range []float64{1e-3, 1.0 / 240, 1.0 / 60} {
				for _, s := range sizeFactors {
					r, h, dt := 0.5*s, s, dt0*math.Sqrt(s)
					travel := math.Sqrt(2*g0*h) * dt
					d, tol := c.frac*min(SlopOf(r), travel), insideBounceTol
					if c.deep {
						if travel <= SlopOf(r) {
							continue
						}
						d, tol = c.frac*travel, insideDeepTol
					}
					got := bounceApex(t, s, e, d, dt)
					old := (1 - e*e) * d // the error of a bounce at e times the speed at the depth
					if rel := (got - e*e*h) / old; !(math.Abs(rel) <= tol) {
						t.Errorf("size %g m, e %g, step %.4g s at 1 m, %.3g slops deep: apex %.9g m, want e^2 h = %.9g m; error %.3g of (1 - e^2) d, want below %g",
							s, e, dt0, d/SlopOf(r), got, e*e*h, rel, tol)
					}
				}
			}
		}
	}
}

// restingHitSlack bounds, in units of g dt, how much faster than e times
// its approach a part resting sunk within its slop may leave when it is
// hit slowly, at restitution e: the depth its approach made in the last
// step, a0 dt, adds up to g dt (1 - e^2) / e, and the step's gravity up to
// g dt more; both vanish with the step. Counting all of the resting depth
// sent it back at its approach, as if elastic.
func restingHitSlack(e float64) float64 { return (1-e*e)/e + 1 }

// TestSlowHitOnSunkPart starts a ball a slop inside the floor, where a
// resting part may sit, moving down at 0.3 m/s at 1 m (scaled by s^(1/2)),
// which carries it a twentieth of that depth in a step: it must leave at e
// times its approach (Newton's law of restitution; Goldsmith 1960), not
// faster.
func TestSlowHitOnSunkPart(t *testing.T) {
	for _, e := range []float64{0.2, 0.5, 0.8} {
		for _, dt0 := range []float64{1e-3, 1.0 / 240} {
			for _, s := range sizeFactors {
				r, dt := 0.5*s, dt0*math.Sqrt(s)
				a0 := 0.3 * math.Sqrt(s)
				w, mat := scaleWorld(t, 0, 0.3, e)
				id := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: 1000, Material: mat,
					Position: shapes.Vec3{0, 0, r - SlopOf(r)}, Velocity: shapes.Vec3{0, 0, -a0}})
				up := 0.0
				for i := 0; i < 3 && up <= 0; i++ {
					if err := w.Step(dt); err != nil {
						t.Fatal(err)
					}
					up = w.Velocity(id)[2]
				}
				if lim := e*a0 + restingHitSlack(e)*g0*dt; !(up <= lim) {
					t.Errorf("size %g m, e %g, step %.4g s at 1 m: left at %.6g m/s after an approach of %.6g m/s, want at most e a0 + %.3g g dt = %.6g",
						s, e, dt0, up, a0, restingHitSlack(e), lim)
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
