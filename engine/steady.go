package engine

import "clatter/shapes"

// Rest needs steady motion. A body counts as resting once it has been
// slower than RestSpeed and RestSpin for RestTime, and an island of
// resting bodies sleeps, its velocities set to zero until something wakes
// it. Slowness alone does not make a body rest: a block on an incline just
// steeper than its friction angle accelerates at g (sin th - mu cos th)
// and a ball on a slope of a few hundredths of a degree at (5/7) g sin th
// (Meriam and Kraige, Engineering Mechanics: Dynamics; Beer and Johnston,
// Vector Mechanics for Engineers: Dynamics, rolling without slipping),
// and either stays slower than RestSpeed for RestTime when that
// acceleration is below RestSpeed / RestTime (0.02 m/s^2 with the
// defaults). Put to sleep, it stopped for good, some centimetres short
// over a few seconds. A body at rest is one whose forces balance, so its
// velocity stays where it is: its rest time therefore starts again
// whenever its velocity, or its spin times its radius, has moved by more
// than steadyFraction of RestSpeed from what it was when its rest began.

// steadyFraction is the part of RestSpeed by which a resting body's
// velocity may move during its rest: 5 um/s with the defaults. Its floor
// is the noise in a resting body's velocity, which must not keep
// restarting its rest: a converged contact leaves less than the solver's
// Tolerance (0.1 um/s), and piles of 200 and 500 mixed parts in a bin had
// as many bodies asleep after 4 s as without the test (measured).
// A body accelerating more slowly than steadyFraction RestSpeed / RestTime
// (2e-5 m/s^2 with the defaults, two millionths of g) can still sleep; the
// test is independent of the step.
const steadyFraction = 1e-3

// steadyState holds, by body, the velocity and spin with which its rest began.
type steadyState struct {
	vel, spin []shapes.Vec3
}

// unsteady is called for an awake dynamic body below the rest thresholds.
// It reports whether the body's velocity or spin (times its radius) has
// changed by more than steadyFraction of RestSpeed since its rest began,
// and then starts the rest anew from them; a body whose rest begins now
// (restFor 0) keeps its velocities as the rest's start.
func (w *World) unsteady(id BodyID) bool {
	s := &w.steady
	for len(s.vel) < len(w.b.kind) {
		s.vel = append(s.vel, shapes.Vec3{})
		s.spin = append(s.spin, shapes.Vec3{})
	}
	v, sp := w.b.vel[id], w.b.spin[id]
	if w.b.restFor[id] == 0 {
		s.vel[id], s.spin[id] = v, sp
		return false
	}
	lim := steadyFraction * w.cfg.RestSpeed
	lim2, r := lim*lim, w.b.radius[id]
	if v.Sub(s.vel[id]).LenSqr() <= lim2 && sp.Sub(s.spin[id]).LenSqr()*r*r <= lim2 {
		return false
	}
	s.vel[id], s.spin[id] = v, sp
	return true
}
