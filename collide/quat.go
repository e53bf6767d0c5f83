package collide

import "github.com/go-gl/mathgl/mgl64"

// Quaternion products of the pair memory (persist.go), with the arithmetic
// of the mgl64.Quat methods, operation for operation, so the results are the
// same to the bit, but taking pointers: the methods pass their operands by
// value and are not inlined, which made the motion test of a refreshed pair
// a third of its cost.

// qmulConjA is a.Conjugate().Mul(b).
func qmulConjA(a, b *mgl64.Quat) mgl64.Quat {
	u := vec3{a.V[0] * -1, a.V[1] * -1, a.V[2] * -1}
	return mgl64.Quat{
		W: a.W*b.W - (u[0]*b.V[0] + u[1]*b.V[1] + u[2]*b.V[2]),
		V: vec3{
			u[1]*b.V[2] - u[2]*b.V[1] + b.V[0]*a.W + u[0]*b.W,
			u[2]*b.V[0] - u[0]*b.V[2] + b.V[1]*a.W + u[1]*b.W,
			u[0]*b.V[1] - u[1]*b.V[0] + b.V[2]*a.W + u[2]*b.W,
		},
	}
}

// qrotateConj is q.Conjugate().Rotate(v).
func qrotateConj(q *mgl64.Quat, v vec3) vec3 {
	u := vec3{q.V[0] * -1, q.V[1] * -1, q.V[2] * -1}
	c := vec3{u[1]*v[2] - u[2]*v[1], u[2]*v[0] - u[0]*v[2], u[0]*v[1] - u[1]*v[0]}
	w2 := 2 * q.W
	t := vec3{u[0] * 2, u[1] * 2, u[2] * 2}
	return vec3{
		v[0] + c[0]*w2 + (t[1]*c[2] - t[2]*c[1]),
		v[1] + c[1]*w2 + (t[2]*c[0] - t[0]*c[2]),
		v[2] + c[2]*w2 + (t[0]*c[1] - t[1]*c[0]),
	}
}
