package engine

import (
	"testing"

	"clatter/shapes"
)

// driftTol: a body in free flight without gravity moves x0 + v t exactly
// but for the rounding of the sum of its steps.
const driftTol = 1e-12

func TestSlowDrifterKeepsMoving(t *testing.T) {
	// Without gravity, a body that nothing touches keeps its velocity
	// (Newton's first law; any mechanics text), however slow: below the
	// rest thresholds it counts as resting, but it must not be stopped.
	for _, c := range []struct {
		name string
		v, w shapes.Vec3
	}{
		{"creeping box", shapes.Vec3{4e-3, 0, 0}, shapes.Vec3{}},                // below the 5 mm/s rest speed
		{"turning slowly", shapes.Vec3{1e-3, 2e-3, 0}, shapes.Vec3{0, 0, 0.01}}, // and the 0.05 rad/s rest spin
	} {
		t.Run(c.name, func(t *testing.T) {
			w := newTestWorld(t, Config{})
			id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.01, 0.01, 0.01}}, Density: 1000,
				Velocity: c.v, Spin: c.w})
			const dt, seconds = 1e-3, 1.0
			run(t, w, dt, seconds, nil)
			if !w.Awake(id) {
				t.Error("the drifting body fell asleep")
			}
			want := c.v.Mul(seconds)
			if d := w.Position(id).Sub(want).Len(); d > driftTol+1e-9*want.Len() {
				t.Errorf("at %v m after %g s, want %v m (off by %.3g m)", w.Position(id), seconds, want, d)
			}
			if got := w.Velocity(id); got.Sub(c.v).Len() > driftTol {
				t.Errorf("velocity %v m/s, want %v", got, c.v)
			}
		})
	}
}
