package engine

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"
)

// smallBounceApexTol: a rebound height against e^2 h. A deferred impact's
// arrival speed is rebuilt from the gap left at the last step (contact's
// held.go), and the apex is read at the first step with v <= 0; together
// measured within 0.6 percent for these cases. A threshold that stops the
// bounce misses by 100 percent.
const smallBounceApexTol = 0.02

// thresholdTol: a threshold is a product of g, the step and a count of
// steps, values of order 1e-3 to 10, so it matches its closed form to an
// ulp or two.
const thresholdTol = 1e-15

// smallBouncePeriodTol: the ratio of two successive flight times against e.
// Impacts fall on whole steps: two steps over the 11.6 ms second flight of
// the smallest case is 1.7 percent.
const smallBouncePeriodTol = 0.03

func TestBounceAtEveryScale(t *testing.T) {
	// A ball dropped from h with coefficient e rebounds to e^2 h and then
	// e^4 h, and each flight lasts e times the one before (Newton's law of
	// restitution; Meriam and Kraige, "Engineering Mechanics: Dynamics",
	// ch. 3, impact). The law has no speed below which it stops holding, so
	// a 1 mm ball dropped 0.4 mm (arriving at 89 mm/s) bounces as a 10 cm
	// ball dropped 0.5 m does, given a step that resolves its flight.
	cases := []struct {
		name    string
		r, h, e float64
		dt      float64
	}{
		{"1 mm ball from 0.4 mm at 0.1 ms", 0.5e-3, 0.4e-3, 0.8, 1e-4},
		{"1 mm ball from 2 mm at 0.1 ms", 0.5e-3, 2e-3, 0.8, 1e-4},
		{"10 cm ball from 0.5 m at 1 ms", 0.05, 0.5, 0.8, 1e-3},
		{"10 cm ball from 0.5 m at 1/60 s", 0.05, 0.5, 0.5, 1.0 / 60},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.3, Restitution: c.e})
			id := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: c.r}, Density: 1000, Material: mat,
				Position: shapes.Vec3{0, 0, c.r + c.h}})
			var apex, hits []float64
			prevV := 0.0
			fall := math.Sqrt(2 * c.h / g0)
			run(t, w, c.dt, fall*(1+2*c.e+2*c.e*c.e+2*c.e*c.e*c.e)+5*c.dt, func() {
				v := w.Velocity(id)[2]
				if prevV > 0 && v <= 0 {
					apex = append(apex, w.Position(id)[2]-c.r)
				}
				prevV = v
				for _, e := range w.Events() {
					if e.Kind == Impact {
						hits = append(hits, e.Time)
					}
				}
			})
			if len(apex) < 2 || len(hits) < 3 {
				t.Fatalf("%d rebounds and %d impacts; want 2 and 3 at least (e^2 h = %.3g m)", len(apex), len(hits), c.e*c.e*c.h)
			}
			for n, got := range apex[:2] {
				if want := math.Pow(c.e, 2*float64(n+1)) * c.h; relErr(got, want) > smallBounceApexTol {
					t.Errorf("rebound %d reached %.4g m, want e^%d h = %.4g m", n+1, got, 2*(n+1), want)
				}
			}
			if got := (hits[2] - hits[1]) / (hits[1] - hits[0]); relErr(got, c.e) > smallBouncePeriodTol {
				t.Errorf("flight times %.4g s then %.4g s: ratio %.4f, want e = %g", hits[1]-hits[0], hits[2]-hits[1], got, c.e)
			}
		})
	}
}

func TestBounceThresholdFollowsStep(t *testing.T) {
	// The threshold is 1.5 steps of gravity, whatever the gravity's
	// direction, with 1.5 steps of a turning point's acceleration, 0.1 m/s
	// for an arrival whose rebound the step cannot resolve, and three steps
	// of gravity as the slowest resolved rebound (bounce.go); a Config's
	// threshold replaces them all.
	for _, c := range []struct {
		cfg                             Config
		dt                              float64
		want, steps, inelastic, rebound float64
	}{
		{DefaultConfig(), 1e-3, 1.5 * StandardGravity * 1e-3, 1.5, 0.1, 3 * StandardGravity * 1e-3},
		{DefaultConfig(), 1.0 / 60, 1.5 * StandardGravity / 60, 1.5, 0.1, 3 * StandardGravity / 60},
		{Config{Gravity: shapes.Vec3{3, 0, -4}}, 1e-4, 1.5 * 5 * 1e-4, 1.5, 0.1, 3 * 5 * 1e-4},
		{Config{Gravity: shapes.Vec3{0, 0, -9.81}, BounceThreshold: 0.2}, 1e-3, 0.2, 0, 0, 0},
	} {
		t.Run(fmt.Sprint(c.cfg.Gravity, c.dt), func(t *testing.T) {
			w := newTestWorld(t, c.cfg)
			got, steps, inelastic, rebound := w.bounceThreshold(c.dt)
			if math.Abs(got-c.want) > thresholdTol || steps != c.steps || inelastic != c.inelastic || math.Abs(rebound-c.rebound) > thresholdTol {
				t.Errorf("threshold %g m/s, %g steps, inelastic %g m/s, rebound %g m/s; want %g, %g, %g, %g",
					got, steps, inelastic, rebound, c.want, c.steps, c.inelastic, c.rebound)
			}
		})
	}
	// Without gravity nothing presses resting parts together, and every
	// approach faster than the solver's rounding is an impact.
	w := newTestWorld(t, Config{})
	if got, _, _, _ := w.bounceThreshold(1e-3); !(got > 0 && got < 1e-6) {
		t.Errorf("threshold without gravity %g m/s, want a rounding floor in (0, 1e-6)", got)
	}
	if _, err := NewWorld(Config{BounceThreshold: -1}); err == nil {
		t.Error("a negative bounce threshold was accepted")
	}
}
