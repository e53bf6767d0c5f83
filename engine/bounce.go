package engine

import "math"

// The bounce threshold: the approach speed that separates impacts, which
// get Newton restitution, from contacts that merely arrive, which do not.
//
// Newton's law has no threshold (restitution e at every speed; Goldsmith,
// "Impact", 1960, ch. 1), so the threshold comes from what a step can tell
// apart. Between impacts a contact's approach changes by what acts on it
// within a step: |g| dt from gravity, and, at a point that stays on a
// turning body, its centripetal acceleration along the normal times dt
// (contact's bounce.go; a pivoting plank's edge approaches by omega^2 r dt).
// A part that lost its support for one step (a solve that left it a hair
// above) comes back at |g| dt and must not bounce; bounceGravitySteps = 1.5
// of each keeps a margin over that, while a part that fell for two steps
// or more, in flight long enough to count, bounces (a 5 mm drop at 1/120 s
// lasts 3.8 steps). A rebound at the threshold with e = 0.8 flies 2.4
// steps. A fixed speed is wrong at one end of the scales: 0.1 m/s stopped
// every bounce of a 1 mm part dropped 0.4 mm (which 0.1 ms resolves in 100
// steps), and was below |g| dt at 1/60 s. Tied to the step, the threshold
// shrinks as the step is halved and the results converge.
//
// A rebound that the step cannot resolve (e times the approach below
// reboundGravitySteps steps of gravity, a flight under 6 steps, and every
// arrival with e = 0) is an impact only above inelasticImpact, or above
// that rebound speed over e where that is lower: an
// inelastic arrival leaves nothing to bounce, and below that speed it is
// left, as before, to the velocity solve, whose friction acts with the
// step's weight (the conveying speed of a part hopping on a vibrating track
// agrees with the particle model of Redford and Boothroyd, 1967, so; taken
// as impacts, its slow landings carried it 10 percent faster, and a block
// with e = 0.2 on a feeder 26 percent faster when rebounds of 1.5 steps of
// gravity counted), and a part
// settling on a woken pile, whose arrivals reach 2.2 |g| dt at 1 ms, is not
// rattled by impacts.
const (
	bounceGravitySteps  = 1.5
	reboundGravitySteps = 3
	inelasticImpact     = 0.1 // m/s
)

// bounceThreshold is the contact solver's threshold, m/s, the steps of a
// turning point's acceleration added to it, the inelastic threshold and the
// slowest resolved rebound, m/s, for a step of dt s: Config.BounceThreshold
// alone if set, else bounceGravitySteps steps of gravity and of the turn,
// inelasticImpact and reboundGravitySteps steps of gravity. Without gravity
// nothing presses parts together between impacts, and the floor is the
// solver's velocity tolerance, below which a speed is rounding.
func (w *World) bounceThreshold(dt float64) (threshold, steps, inelastic, rebound float64) {
	if w.cfg.BounceThreshold > 0 {
		return w.cfg.BounceThreshold, 0, 0, 0
	}
	g, floor := w.cfg.Gravity.Len(), w.collision.solver.Settings.Tolerance
	return math.Max(bounceGravitySteps*g*dt, floor), bounceGravitySteps, inelasticImpact, math.Max(reboundGravitySteps*g*dt, floor)
}

// softBounceThreshold is the approach speed, m/s, below which a compliant
// contact is a gentle touch: no restitution, no impact event. Compliant
// contacts are sub-stepped on their own period (compliant.go), so the step
// does not limit what they resolve; the default 0.1 m/s is a rebound of
// 0.5 mm with e = 1, below what a cushion test reads.
func (w *World) softBounceThreshold() float64 {
	if w.cfg.BounceThreshold > 0 {
		return w.cfg.BounceThreshold
	}
	return defaultSoftBounce
}

// defaultSoftBounce, m/s: see softBounceThreshold.
const defaultSoftBounce = 0.1
