package contact

// The bounce threshold of a point that persists from the last step.
//
// A contact point that stays on a turning body (a plank pivoting on its
// edge, a box rocking on a corner) keeps no fixed lever arm: within a step
// the arm turns, and the point's velocity along the normal changes by the
// centripetal acceleration omega x (omega x r) along it times the step,
// though nothing strikes. The velocity solve ends each step with the point
// at rest along the normal, so the next step finds it approaching by that
// much. Settings.BounceSteps steps of that acceleration are added to its
// threshold, as the engine's threshold holds steps of gravity; a point new
// this step (a corner arriving from flight) has no such history and keeps
// the plain threshold.

// A point whose rebound the step cannot resolve (e times its approach no
// faster than Settings.ReboundThreshold, r) bounces by nothing that the
// step shows, and with e = 0 by nothing at all: Settings.InelasticThreshold
// sets the speed above which its arrival still counts as an impact (and is
// solved and reported as one). The threshold for restitution e is thus
// max(t, min(InelasticThreshold, r / e)): t where the rebound resolves,
// InelasticThreshold for e = 0.

// bounceThreshold is point ps's bounce threshold, m/s, in a step of dt s.
func (s *Solver) bounceThreshold(ps *pstate, dt float64) float64 {
	set := &s.Settings
	t := set.BounceThreshold
	if ps.found {
		t += set.BounceSteps * dt * ps.turn
	}
	if set.InelasticThreshold > t {
		r := t
		if set.ReboundThreshold > r {
			r = set.ReboundThreshold
		}
		if ps.e > 0 {
			return max(t, min(set.InelasticThreshold, r/ps.e))
		}
		return set.InelasticThreshold
	}
	return t
}

// turnAcceleration is the size of the normal part of the centripetal
// acceleration omega x (omega x r) = omega (omega . r) - r |omega|^2 of the
// point at lever arm r on body b, m/s^2.
//
// A body that does not turn (a floor, a part that slides) gives 0 without
// the products: they would give a zero too, perhaps -0, which the
// threshold it is added to (bounceThreshold, a sum with t >= 0) cannot
// tell from 0.
func turnAcceleration(b *Body, r, n *vec) float64 {
	w := &b.W
	if *w == (vec{}) {
		return 0
	}
	wr, ww, wn, rn := dot3(w, r), dot3(w, w), dot3(w, n), dot3(r, n)
	a := wn*wr - rn*ww
	if a < 0 {
		return -a
	}
	return a
}
