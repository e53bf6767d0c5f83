package contact

import "math"

// What a deferred impact holds back.
//
// A point that closes its gap within the step, but is not yet touching, is
// stopped at the gap by the velocity solve and bounces the next step with e
// times its arrival speed (impacts). The stop takes approach, and so
// energy, out of the motion; the bounce gives it back. Where the bodies'
// motion carries on as it was between the steps, the two match. Where it
// does not, Newton's target e times the first arrival speed gives back more
// than the stops took, and the impact gains energy, which an impact with
// e <= 1 never does (Stronge, "Impact Mechanics", Cambridge University
// Press, 2000: the work of the normal impulse in restitution is at most e^2
// times the energy absorbed in compression). Seen in a bin of parts with
// e = 1: a box turning about its landing corner reached the gap more slowly
// than it left it, was stopped a second time, and bounced with its first
// speed; a third of the bin's energy appeared in one step.
//
// So a deferred bounce reverses no more approach than its stops removed:
// a stop that took the point's approach from a0 to a1 removed a0^2 - a1^2
// (its work, lambda (a0 + a1) / 2, on the effective mass it showed,
// lambda / (a0 - a1), times two), and the approach that the bounce
// reverses is at most sqrt(a1^2 + the sum over the stops of a0^2 - a1^2),
// a1 of the last stop. The approach a0 at a stop is the larger of the
// arrival speed, with which the bodies reach the gap in the world's exact
// free flight, and the approach before the velocity solve with the step's
// forces. With one stop the bound is a0, so it is never below Newton's
// arrival speed: a clean deferred impact is left as it was. With two stops
// the approach lost between them to the bodies' own turning is not given
// back.

// heldRelTol is how far Newton's arrival speed may exceed the bound before
// the bound takes over. In a clean deferred impact (one stop, from the
// arrival speed) the bound is that speed computed another way,
// sqrt(a1^2 + (a0 - a1)(a0 + a1)), equal up to a few roundings (1e-15
// relative); at 1e-9 such impacts keep Newton's speed bit for bit, and at
// most 2e-9 of an impact's energy can pass the bound.
const heldRelTol = 1e-9

// noteStops completes a0 of stopHeld for the points whose impact is
// deferred: impacts left their arrival speed in aStart, and the approach
// before the velocity solve, this step's forces included, may be larger.
func (s *Solver) noteStops() {
	for i := range s.pts {
		if ps := &s.pts[i]; ps.deferred > 0 {
			ps.aStart = max(ps.aStart, -s.nrows[i].cdot(s.sl.vel))
		}
	}
}

// stopHeld is the approach that the velocity solve's stop of a deferred
// point removed, a0^2 - a1^2, when its normal impulse lambda took the
// point's approach from a0 to a1. Never negative.
func stopHeld(lambda, a0, a1 float64) float64 {
	if !(lambda > 0) {
		return 0
	}
	return max((a0-a1)*(a0+a1), 0)
}

// heldArrival is the approach speed that a deferred impact with Newton
// arrival speed arrival reverses: at most sqrt(left^2 + held), held the sum
// of stopHeld over its stops and left the approach the last one left.
func heldArrival(arrival, left, held float64) float64 {
	bound := math.Sqrt(left*left + held)
	if arrival > bound*(1+heldRelTol) {
		return bound
	}
	return arrival
}
