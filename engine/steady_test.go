package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// slowAccelTol is the largest relative error of the distance a slowly
// accelerating body covers: 2 percent. Semi-implicit Euler covers
// a t (t + dt) / 2 against a t^2 / 2, 0.4 percent after 4 s at 1/60 s;
// the rest is the friction cone's and the solver's accuracy, which
// TestInclineSlides holds to 1 percent of the acceleration.
const slowAccelTol = 0.02

func TestSlowAccelerationDoesNotSleep(t *testing.T) {
	// Bodies that accelerate more slowly than RestSpeed / RestTime (0.02
	// m/s^2 with the defaults) stay slower than RestSpeed for RestTime; they
	// must still not rest, sleep and stop. A block on an incline just
	// steeper than its friction angle slides with a = g (sin th - mu cos th)
	// (Coulomb friction; Meriam and Kraige, Engineering Mechanics:
	// Dynamics), a uniform ball rolling without slipping down a slope
	// accelerates at a = (5/7) g sin th (Beer and Johnston, Vector Mechanics
	// for Engineers: Dynamics). From rest, after t it has covered a t^2 / 2.
	const seconds = 4.0
	const h, r, mu = 0.05, 0.02, 0.3
	for _, c := range []struct {
		name string
		ball bool
		a    float64 // the acceleration the case is built for, m/s^2
		dt   float64
	}{
		{"block a = 0.01 at 1 ms", false, 0.01, 1e-3},
		{"block a = 0.002 at 1 ms", false, 0.002, 1e-3},
		{"block a = 0.002 at 1/60 s", false, 0.002, 1.0 / 60},
		{"block a = 5e-4 at 1/60 s", false, 5e-4, 1.0 / 60},
		{"ball a = 0.002 at 1 ms", true, 0.002, 1e-3},
		{"ball a = 5e-4 at 1/60 s", true, 5e-4, 1.0 / 60},
	} {
		t.Run(c.name, func(t *testing.T) {
			var th, want float64
			if c.ball {
				th = math.Asin(c.a / (5.0 / 7 * g0))
				want = 5.0 / 7 * g0 * math.Sin(th)
			} else {
				// sin th - mu cos th = a / g: th = atan(mu) + asin(a / (g sqrt(1 + mu^2))).
				th = math.Atan(mu) + math.Asin(c.a/(g0*math.Sqrt(1+mu*mu)))
				want = g0 * (math.Sin(th) - mu*math.Cos(th))
			}
			w, mat := floorWorld(t, DefaultConfig(), th, Material{Friction: mu})
			def := BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{h, h, h}}, Density: 1000, Material: mat,
				Position: shapes.Vec3{0, 0, h}}
			if c.ball {
				def = BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: 1000, Material: mat, Position: shapes.Vec3{0, 0, r}}
			}
			id := mustAdd(t, w, def)
			run(t, w, c.dt, seconds, nil)
			got, ref := w.Position(id)[0], want*seconds*seconds/2
			if e := relErr(got, ref); !(e <= slowAccelTol) {
				t.Errorf("covered %.5f m in %g s, want %.5f (a = %.3g m/s^2; error %.3g; awake %v)", got, seconds, ref, want, e, w.Awake(id))
			}
		})
	}
}
