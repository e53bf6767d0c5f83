package contact

import (
	"fmt"
	"math"
	"testing"
)

// tolThreshold: a bounce threshold is a sum or a quotient of a few values
// of order 0.01 to 1, so it matches its closed form to an ulp or two.
const tolThreshold = 1e-15

// TestChainImpactWithinStep: a striker that closes a gap within the step
// onto the first of a row of touching balls. Its impact must travel along
// the row pair by pair in this step, e = 1 leaving the striker at rest and
// the last ball at the striking speed (the classic cradle result of
// sequential pair impacts, Guendelman, Bridson and Fedkiw 2003). Deferred
// to the next step instead, the velocity solve's stop pushed the whole row
// along with it, inelastically.
func TestChainImpactWithinStep(t *testing.T) {
	const v, dt = 1.0, 1e-3
	for _, gap := range []float64{0.3 * v * dt, 0.9 * v * dt} {
		t.Run(fmt.Sprint(gap), func(t *testing.T) {
			bodies, pts := cradle(4, 1, v, 1, 0, false)
			bodies[0].Position[0] -= gap
			pts[0].Separation = gap
			set := DefaultSettings()
			if _, err := NewSolver(set).Solve(dt, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
			want := []float64{0, 0, 0, v}
			for i := range bodies {
				if d := math.Abs(bodies[i].V[0] - want[i]); d > tolChain {
					t.Errorf("ball %d: %v, want %v", i, bodies[i].V[0], want[i])
				}
			}
			if d := linearMomentum(bodies)[0] - v; math.Abs(d) > tolExact {
				t.Errorf("momentum off by %g", d)
			}
		})
	}
}

// TestTurningPointThreshold: a point that persists on a spinning body gets
// BounceSteps steps of its centripetal acceleration along the normal added
// to its threshold. A unit sphere spinning at omega about y, touching the
// floor below its centre (r = (0, 0, -1), n = (0, 0, 1)): omega x (omega x r)
// = (0, 0, omega^2), so the term is omega^2 |r| (kinematics of a rigid body,
// any dynamics text).
func TestTurningPointThreshold(t *testing.T) {
	const omega, r, dt, steps, base = 3.0, 1.0, 1e-3, 3.0, 0.01
	b := sphereBody(1, r, vec{0, 0, r})
	b.W = vec{0, omega, 0}
	arm, n := vec{0, 0, -r}, vec{0, 0, 1}
	if got, want := turnAcceleration(&b, &arm, &n), omega*omega*r; math.Abs(got-want) > tolExact {
		t.Errorf("normal centripetal acceleration %g, want %g", got, want)
	}
	s := NewSolver(Settings{BounceThreshold: base, BounceSteps: steps})
	ps := pstate{turn: omega * omega * r}
	if got := s.bounceThreshold(&ps, dt); got != base {
		t.Errorf("new point: threshold %g, want the plain %g", got, base)
	}
	ps.found = true
	if got, want := s.bounceThreshold(&ps, dt), base+steps*dt*omega*omega*r; math.Abs(got-want) > tolThreshold {
		t.Errorf("persisting point: threshold %g, want %g", got, want)
	}
}

// TestInelasticThreshold: a point whose rebound e v the step cannot resolve
// (no faster than the rebound threshold r) is an impact only above
// InelasticThreshold, or r over e where that is lower:
// max(t, min(inelastic, r / e)).
func TestInelasticThreshold(t *testing.T) {
	const base, rebound, inelastic = 0.01, 0.02, 0.1
	s := NewSolver(Settings{BounceThreshold: base, InelasticThreshold: inelastic, ReboundThreshold: rebound})
	for _, c := range []struct{ e, want float64 }{
		{0, inelastic},       // nothing to bounce
		{0.1, inelastic},     // r / e = 0.2: the rebound never resolves below 0.1
		{0.4, rebound / 0.4}, // rebounds of 0.4 v resolve above 0.05
		{1, rebound},         // every rebound above r resolves
		{0.999999, rebound / 0.999999},
	} {
		ps := pstate{e: c.e}
		if got := s.bounceThreshold(&ps, 1e-3); math.Abs(got-c.want) > tolThreshold {
			t.Errorf("e = %g: threshold %g, want %g", c.e, got, c.want)
		}
	}
}
