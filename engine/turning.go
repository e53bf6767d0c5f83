package engine

import (
	"math"

	"clatter/shapes"
)

// Turning supports. A step moves a body by its velocity along a straight
// line, but the material of a turning kinematic body (a turntable, a
// tilting table) moves along an arc: over a step of length dt a point at
// r from its axis goes along the chord, (R(w dt) - I) r / dt on average,
// not at w x r. Matching a part's velocity to w x r by friction, as a
// contact does, sends the part along the tangent, and each step leaves it
// r (w dt)^2 / 2 farther out: a block that friction holds on a turntable
// (mu g > r w^2, the condition for it to turn with the table; Meriam and
// Kraige, Engineering Mechanics: Dynamics, particle kinetics in normal and
// tangential coordinates) drifted outward at r w^2 dt / 2 (1.4 mm/s at
// r = 0.3 m, w = 3 rad/s and 1 ms; 27 mm/s at 1/60 s). A contact with a
// turning kinematic body therefore drives the tangential velocity toward
// the chord velocity of the body's material point, as a conveyor drives
// it toward its belt speed (contact.Point.SurfaceVelocity): the part then
// ends the step where the support's material point ends it, and friction
// supplies the centripetal impulse m r w^2 dt that it must.

// A body held by a joint (a free turntable on a revolute joint, turning
// by its own inertia or driven by a motor) carries a part the same way:
// the integration turns it at its spin about its centre of mass
// (integrate), so over the step its material point at x moves along the
// chord of that turn, and a part held on it drifted r (w dt)^2 / 2 outward
// a step as on a kinematic table. Its spin at the start of the step stands
// for the step's (the solve changes it by the step's torques, a change of
// the next order). A free body is not a support in this sense: one that
// rolls on what it touches leaves the contact with a new material point
// each instant, whose chord (rising from the surface) is not the velocity
// friction must match; rolling is left to the velocities at the instant.

// turns reports whether body id turns as a support: a kinematic body that
// turns, or a dynamic body held by a joint that turns.
func (w *World) turns(id BodyID) bool {
	if w.b.spin[id] == (shapes.Vec3{}) {
		return false
	}
	switch w.b.kind[id] {
	case Kinematic:
		return true
	case Dynamic:
		h := w.mech.held
		return int(id) < len(h) && h[id]
	}
	return false
}

// turnLead is the velocity of body id's material point at world point x
// averaged over a step of length dt (its chord over the step) less its
// velocity now, for a support that turns at its spin about its position
// throughout the step (integrateQuat; turns): with k the unit axis, theta = |w| dt
// and r = x - pos, (R(theta) - I) r = sin(theta) k x r + (1 - cos(theta))
// k x (k x r) (Rodrigues' rotation formula).
func (w *World) turnLead(id BodyID, x shapes.Vec3, dt float64) shapes.Vec3 {
	if !w.turns(id) {
		return shapes.Vec3{}
	}
	s := w.b.spin[id]
	l := s.Len()
	k := s.Mul(1 / l)
	kr := k.Cross(x.Sub(w.b.pos[id]))
	sn, hs := math.Sin(l*dt), math.Sin(l*dt/2)
	// 1 - cos(theta) as 2 sin^2(theta/2): no cancellation for small turns.
	return kr.Mul(sn/dt - l).Add(k.Cross(kr).Mul(2 * hs * hs / dt))
}

// turnSurface is the part of a contact's SurfaceVelocity between a and b at
// world point x that their turning gives: the velocity that friction drives
// b's material velocity minus a's toward, as surfaceVelocity's conveyors.
func (w *World) turnSurface(a, b BodyID, x shapes.Vec3, dt float64) shapes.Vec3 {
	return w.turnLead(a, x, dt).Sub(w.turnLead(b, x, dt))
}
