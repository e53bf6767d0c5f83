package engine

import (
	"math"

	"clatter/shapes"
)

// freeRotation advances the orientation of a torque-free rigid body by dt
// and returns its new world angular velocity, by the symplectic splitting
// of A. Dullweber, B. Leimkuhler and R. McLachlan, "Symplectic splitting
// methods for rigid body molecular dynamics", J. Chem. Phys. 107, 1997: the
// kinetic energy is split into the three principal terms, each an exact
// rotation about one principal axis, composed as R1(h/2) R2(h/2) R3(h)
// R2(h/2) R1(h/2). The world angular momentum is conserved to rounding and
// the energy error stays bounded, so spinning parts neither gain energy nor
// drift off their axis, and the intermediate-axis flip appears as it should.
//
// q is the rotation from the principal frame to the world, moments the
// principal moments of inertia and spin the world angular velocity.
func freeRotation(q shapes.Quat, moments, spin shapes.Vec3, dt float64) (shapes.Quat, shapes.Vec3) {
	// Angular momentum in the principal frame.
	wb := q.Conjugate().Rotate(spin)
	pi := shapes.Vec3{moments[0] * wb[0], moments[1] * wb[1], moments[2] * wb[2]}
	h := dt / 2
	q, pi = principalRotate(q, pi, moments, 0, h)
	q, pi = principalRotate(q, pi, moments, 1, h)
	q, pi = principalRotate(q, pi, moments, 2, dt)
	q, pi = principalRotate(q, pi, moments, 1, h)
	q, pi = principalRotate(q, pi, moments, 0, h)
	q = q.Normalize()
	wb = shapes.Vec3{pi[0] / moments[0], pi[1] / moments[1], pi[2] / moments[2]}
	return q, q.Rotate(wb)
}

// principalRotate is the exact flow of the k-th principal term for time t:
// the body turns about principal axis k by theta = t pi_k / I_k and the
// body-frame momentum turns the opposite way.
func principalRotate(q shapes.Quat, pi, moments shapes.Vec3, k int, t float64) (shapes.Quat, shapes.Vec3) {
	theta := t * pi[k] / moments[k]
	if theta == 0 {
		return q, pi
	}
	s, c := math.Sincos(theta / 2)
	var r shapes.Quat
	r.W = c
	r.V[k] = s
	// pi <- Rot_k(-theta) pi
	i, j := (k+1)%3, (k+2)%3
	sn, cs := math.Sincos(theta)
	pi[i], pi[j] = cs*pi[i]+sn*pi[j], -sn*pi[i]+cs*pi[j]
	return q.Mul(r), pi
}

// integrateQuat turns q by the small rotation w*dt (world frame), for the
// position-correction pseudo-velocities.
func integrateQuat(q shapes.Quat, w shapes.Vec3, dt float64) shapes.Quat {
	a := w.Len() * dt
	if a == 0 {
		return q
	}
	s, c := math.Sincos(a / 2)
	r := shapes.Quat{W: c, V: w.Normalize().Mul(s)}
	return r.Mul(q).Normalize()
}
