package engine

import "math"

// The slip speed: the tangential speed above which a new contact starts
// sliding (kinetic friction) rather than sticking (contact.Settings
// SlipSpeed).
//
// What a step can tell apart sets it, as it sets the bounce threshold
// (bounce.go): a part set down at rest reaches at most |g| dt along its
// support in its first step, from gravity, and must start sticking, or a
// block that static friction holds would slide off for two steps;
// slipGravitySteps = 1.5 keeps a margin over that. A part that arrives
// faster is sliding and takes the kinetic coefficient at once. The fixed
// 0.1 m/s it replaces was above the whole speed of small parts: a 1 mm
// cube launched along the floor at 50 mm/s, half of sqrt(g L), started
// sticking and kept the static coefficient for two steps before it was
// seen to slide, and at 1 ms it stopped after 0.80 of the distance
// v0^2/(2 mu g) (measured), where a 1 m cube launched at half its
// sqrt(g L) slides 0.998 of it. At 1/60 s the fixed speed was also below
// one step of gravity. Tied to the step, a part launched slower than the
// threshold keeps the static coefficient for at most two steps of
// (mu_s - mu_k) g dt, which vanishes as the step is halved.
const slipGravitySteps = 1.5

// slipSpeed is the solver's slip speed, m/s, for a step of dt s:
// slipGravitySteps steps of gravity; without gravity the solver's velocity
// tolerance, below which a speed is rounding.
func (w *World) slipSpeed(dt float64) float64 {
	return math.Max(slipGravitySteps*w.cfg.Gravity.Len()*dt, w.collision.solver.Settings.Tolerance)
}
