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
// That holds while each composition turns the body little (its energy
// error is then bounded, not growing); freeSubSteps splits a step that
// would turn it far into equal sub-steps that do not.
//
// q is the rotation from the principal frame to the world, moments the
// principal moments of inertia and spin the world angular velocity.
func freeRotation(q shapes.Quat, moments, spin shapes.Vec3, dt float64) (shapes.Quat, shapes.Vec3) {
	if k, ok := topAxis(moments); ok {
		return topRotation(q, moments, spin, k, dt) // symtop.go
	}
	// Angular momentum in the principal frame.
	wb := qrotateInv(&q, &spin)
	pi := shapes.Vec3{moments[0] * wb[0], moments[1] * wb[1], moments[2] * wb[2]}
	n := freeSubSteps(&pi, &moments, dt) // (substep.go)
	if n > 1 {
		dt /= float64(n)
	}
	h := dt / 2
	for ; n > 0; n-- {
		principalRotate(&q, &pi, &moments, 0, h)
		principalRotate(&q, &pi, &moments, 1, h)
		principalRotate(&q, &pi, &moments, 2, dt)
		principalRotate(&q, &pi, &moments, 1, h)
		principalRotate(&q, &pi, &moments, 0, h)
	}
	q = q.Normalize()
	wb = shapes.Vec3{pi[0] / moments[0], pi[1] / moments[1], pi[2] / moments[2]}
	return q, qrotate(&q, &wb)
}

// principalRotate is the exact flow of the k-th principal term for time t:
// the body turns about principal axis k by theta = t pi_k / I_k and the
// body-frame momentum turns the opposite way. It updates q and pi in place:
// passing them by value made freeRotation half again as slow.
func principalRotate(q *shapes.Quat, pi, moments *shapes.Vec3, k int, t float64) {
	theta := t * pi[k] / moments[k]
	if theta == 0 {
		return
	}
	s, c := sincos(theta / 2)
	var r shapes.Quat
	r.W = c
	r.V[k] = s
	// pi <- Rot_k(-theta) pi
	i, j := nextAxis[k], nextAxis[nextAxis[k]] // (k+1)%3, (k+2)%3 without the divisions
	sn, cs := sincos(theta)
	pi[i], pi[j] = cs*pi[i]+sn*pi[j], -sn*pi[i]+cs*pi[j]
	*q = qmul(q, &r)
}

// nextAxis is the axis after each principal axis, cyclically.
var nextAxis = [3]int{1, 2, 0}

// tinyTurn bounds the angles whose sine and cosine math.Sincos rounds to
// the angle itself and to 1: below 2^-27 its polynomials add to x a term
// of relative size x^2/6 < 2^-56, and take from 1 a term of 0.5 x^2 <
// 2^-55, both under half a unit in the last place. 2^-28 leaves a factor
// of two to spare.
const tinyTurn = 0x1p-28

// sincos is math.Sincos, bit for bit. A part resting on a floor turns by
// nanoradians a step, so the free rotation's ten calls mostly ask for
// angles below tinyTurn, whose answer is known.
func sincos(x float64) (sin, cos float64) {
	a := math.Abs(x)
	switch {
	case a < tinyTurn:
		return x, 1
	case a*(4/math.Pi) < 1: // the first octant; false for NaN
		return sincosOctant(x, a) // octant.go
	}
	return math.Sincos(x)
}

// integrateQuat turns q by the small rotation w*dt (world frame), for the
// position-correction pseudo-velocities.
func integrateQuat(q shapes.Quat, w shapes.Vec3, dt float64) shapes.Quat {
	l := w.Len()
	a := l * dt
	if a == 0 {
		return q
	}
	s, c := sincos(a / 2)
	inv := 1 / l // w.Normalize() without a second square root
	r := shapes.Quat{W: c, V: shapes.Vec3{w[0] * inv * s, w[1] * inv * s, w[2] * inv * s}}
	return qmul(&r, &q).Normalize()
}

// The quaternion and matrix products of the step loop, with the arithmetic
// of the shapes.Quat and shapes.Mat3 methods (the same roundings) but
// taking pointers: the methods pass and return their operands by value and
// are not inlined, which made them a tenth of a hundred-link chain's step.

// qmul is a.Mul(b).
func qmul(a, b *shapes.Quat) shapes.Quat {
	return shapes.Quat{
		W: a.W*b.W - (a.V[0]*b.V[0] + a.V[1]*b.V[1] + a.V[2]*b.V[2]),
		V: shapes.Vec3{
			a.V[1]*b.V[2] - a.V[2]*b.V[1] + b.V[0]*a.W + a.V[0]*b.W,
			a.V[2]*b.V[0] - a.V[0]*b.V[2] + b.V[1]*a.W + a.V[1]*b.W,
			a.V[0]*b.V[1] - a.V[1]*b.V[0] + b.V[2]*a.W + a.V[2]*b.W,
		},
	}
}

// qmulConj is a.Mul(b.Conjugate()).
func qmulConj(a, b *shapes.Quat) shapes.Quat {
	c := shapes.Quat{W: b.W, V: shapes.Vec3{b.V[0] * -1, b.V[1] * -1, b.V[2] * -1}}
	return qmul(a, &c)
}

// qrotate is q.Rotate(v).
func qrotate(q *shapes.Quat, v *shapes.Vec3) shapes.Vec3 {
	return qrotateBy(q.W, &q.V, v)
}

// qrotateInv is q.Conjugate().Rotate(v).
func qrotateInv(q *shapes.Quat, v *shapes.Vec3) shapes.Vec3 {
	u := shapes.Vec3{q.V[0] * -1, q.V[1] * -1, q.V[2] * -1}
	return qrotateBy(q.W, &u, v)
}

func qrotateBy(w float64, u, v *shapes.Vec3) shapes.Vec3 {
	c := shapes.Vec3{u[1]*v[2] - u[2]*v[1], u[2]*v[0] - u[0]*v[2], u[0]*v[1] - u[1]*v[0]}
	w2 := 2 * w
	t := shapes.Vec3{u[0] * 2, u[1] * 2, u[2] * 2}
	return shapes.Vec3{
		v[0] + c[0]*w2 + (t[1]*c[2] - t[2]*c[1]),
		v[1] + c[1]*w2 + (t[2]*c[0] - t[0]*c[2]),
		v[2] + c[2]*w2 + (t[0]*c[1] - t[1]*c[0]),
	}
}

// mat3Mul is a.Mul3(b), column-major, with the same sums in the same order.
func mat3Mul(a, b *shapes.Mat3) shapes.Mat3 {
	return shapes.Mat3{
		a[0]*b[0] + a[3]*b[1] + a[6]*b[2],
		a[1]*b[0] + a[4]*b[1] + a[7]*b[2],
		a[2]*b[0] + a[5]*b[1] + a[8]*b[2],
		a[0]*b[3] + a[3]*b[4] + a[6]*b[5],
		a[1]*b[3] + a[4]*b[4] + a[7]*b[5],
		a[2]*b[3] + a[5]*b[4] + a[8]*b[5],
		a[0]*b[6] + a[3]*b[7] + a[6]*b[8],
		a[1]*b[6] + a[4]*b[7] + a[7]*b[8],
		a[2]*b[6] + a[5]*b[7] + a[8]*b[8],
	}
}
