package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// TestLandingWithinSlop drops a flat steel box obliquely onto a surface
// from a gap within its slop, with a restitution so small that the bounce
// from the surface rises less than that gap (contact/landing.go). A rigid
// box landing flat on a face moves as a particle (its normal impulses
// spread over the face to balance the friction's moment): Newton's law
// sends it off the surface at e times its arrival speed ac relative to the
// surface (W. Goldsmith, "Impact", 1960, ch. 1), and Coulomb friction
// through the impact takes mu times the normal impulse (1 + e) m ac from
// its sliding speed u0 relative to the surface (W. J. Stronge, "Impact
// Mechanics", Cambridge University Press, 2000, ch. 5: a slide that does
// not stop within the impact keeps its direction):
//
//	u = u0 - mu (1 + e) ac,  v = e ac - g (t - t0)
//
// in the flight that follows, t0 the landing time. The surface is the
// static floor, and a track moving along x at a constant speed (the same
// case by Galilean invariance). The old code stopped the box at the gap
// with friction mu m ac and hung it there without friction until gravity
// brought it down.
func TestLandingWithinSlop(t *testing.T) {
	const (
		mu, e  = 0.3, 0.1
		u0, vz = 0.5, 0.3 // m/s, sliding and falling speeds relative to the surface
		gap    = 6e-5     // m: within the slop (1e-4 m) and closed within one step at 0.25 ms
		at     = 3e-3     // s: when the velocity is read, within the rebound's flight of 2 e ac / g = 6.2 ms
		// tolU: the landing is resolved to a step; the friction the
		// box's weight carries over one step, mu g dt, bounds what the
		// instant of landing within it changes (2.9 mm/s at 1 ms). The
		// old code was mu e ac = 9.1 mm/s slow.
		tolUSteps = 1.0
		// tolV: the rebound's start within the step moves the velocity
		// read at a fixed time by up to g dt (9.8 mm/s at 1 ms); the old
		// code was e ac = 30 mm/s low.
		tolVSteps = 1.0
	)
	half := shapes.Vec3{0.02, 0.015, 0.01}
	ac := math.Sqrt(vz*vz + 2*g0*gap) // arrival speed at the surface
	wantU := u0 - mu*(1+e)*ac
	for _, c := range []struct {
		name  string
		track float64 // m/s, the surface's speed along x
	}{{"static floor", 0}, {"moving track", 0.2}} {
		for _, dt := range []float64{1e-3, 5e-4, 2.5e-4} {
			w := newTestWorld(t, Config{Gravity: shapes.Vec3{0, 0, -g0}, NoSleep: true})
			mat, err := w.AddMaterial(Material{Name: "steel", Friction: mu, Restitution: e})
			if err != nil {
				t.Fatal(err)
			}
			kind := Static
			if c.track != 0 {
				kind = Kinematic
			}
			mustAdd(t, w, BodyDef{Name: "surface", Kind: kind, Shape: shapes.Box{Half: shapes.Vec3{1, 0.2, 0.01}}, Material: mat,
				Position: shapes.Vec3{0, 0, -0.01}, Velocity: shapes.Vec3{c.track, 0, 0}})
			id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: half}, Density: 7800, Material: mat,
				Position: shapes.Vec3{0, 0, half[2] + gap}, Velocity: shapes.Vec3{c.track + u0, 0, -vz}})
			run(t, w, dt, at, nil)
			v := w.Velocity(id)
			t0 := gap / vz // the landing, to within g t0^2 / (2 vz)
			wantV := e*ac - g0*(at-t0)
			u := v[0] - c.track
			if d := math.Abs(u - wantU); d > tolUSteps*mu*g0*dt {
				t.Errorf("%s, dt %g: sliding speed %.4f m/s after landing, want u0 - mu (1+e) ac = %.4f (off %.2g)", c.name, dt, u, wantU, d)
			}
			if d := math.Abs(v[2] - wantV); d > tolVSteps*g0*dt {
				t.Errorf("%s, dt %g: vertical speed %.4f m/s after landing, want e ac - g t = %.4f (off %.2g)", c.name, dt, v[2], wantV, d)
			}
		}
	}
}
