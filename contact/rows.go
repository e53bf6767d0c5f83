package contact

import (
	"math"

	"clatter/shapes"
)

// Rows in solver form.
//
// The sweeps spend their time reading rows and the velocities of the two
// bodies each row joins, so both are kept small and contiguous: rows in
// slices in sweep order, velocities in the solver's compact body array
// (bodies.go), indexed by slot. A contact row (normal, tangent, a patch's
// tangent or twist) needs no general Jacobian: its linear parts are -d and
// d, so it stores d once beside the lever-arm terms, the bodies' inverse
// masses and the products of the lever-arm terms with the inverse inertias,
// 176 bytes where the general form takes 248: the linear products d InvMass
// are formed where they are used, rounded as stored ones would be. Joint
// rows keep the general form (jrow).

// crow is one scalar contact row between slots a and b: the Jacobian
// (-d, -cA, d, cB) on (V_A, W_A, V_B, W_B), so Cdot is the velocity of B
// relative to A along d plus the angular terms. For a contact along a unit
// direction d at lever arms rA, rB, cA = rA x d and cB = rB x d; a twist row
// has d = 0 and cA = cB = the scaled normal.
//
// The fields of each body come together (B's first: the second body of a
// contact is the moving one more often), so that a row against the fixed
// slot (bodies.go), which skips that side, reads two cache lines of its
// four.
type crow struct {
	a, b   int32
	k      float64 // J M^-1 J^T
	mass   float64 // 1/k, 0 if the row cannot move anything
	target float64
	lambda float64
	mA, mB float64 // InvMass of A and B: the linear M^-1 parts are d mA, d mB
	d      vec     // linear direction, on B (-d on A)
	cB     vec     // angular part on B
	wB     vec     // M^-1 part on B: InvInertia_B cB
	cA     vec     // angular part on A (-cA)
	wA     vec     // M^-1 part on A: InvInertia_A cA
}

// setup fills r for slots a, b of bodies A, B from its direction and lever
// terms. Every product is rounded as the general form J, M^-1 J^T would
// round it (the negations are exact), so both forms give the same bits.
func (r *crow) setup(A, B *Body, a, b int32, d, cA, cB *vec) {
	r.a, r.b = a, b
	r.d, r.cA, r.cB = *d, *cA, *cB
	r.finish(A, B)
}

// setupContact is setup for a contact row along unit direction n at lever
// arms rA and rB: cA = rA x n, cB = rB x n.
func (r *crow) setupContact(A, B *Body, a, b int32, n, rA, rB *vec) {
	r.a, r.b = a, b
	r.d[0], r.d[1], r.d[2] = n[0], n[1], n[2]
	r.cA[0], r.cA[1], r.cA[2] = rA[1]*n[2]-rA[2]*n[1], rA[2]*n[0]-rA[0]*n[2], rA[0]*n[1]-rA[1]*n[0]
	r.cB[0], r.cB[1], r.cB[2] = rB[1]*n[2]-rB[2]*n[1], rB[2]*n[0]-rB[0]*n[2], rB[0]*n[1]-rB[1]*n[0]
	r.finish(A, B)
}

// finish fills the rest of r from its Jacobian.
func (r *crow) finish(A, B *Body) {
	// Component by component: a vec built on the stack and copied costs
	// a stalled store forward per field here.
	r.mA, r.mB = A.InvMass, B.InvMass
	mulMatTo(&r.wA, &A.InvInertia, &r.cA)
	mulMatTo(&r.wB, &B.InvInertia, &r.cB)
	r.k = dotM(&r.d, &r.d, r.mA) + dot3(&r.cA, &r.wA) + dotM(&r.d, &r.d, r.mB) + dot3(&r.cB, &r.wB)
	r.mass = 0
	if r.k > 0 && !math.IsInf(r.k, 1) {
		r.mass = 1 / r.k
	}
	r.lambda = 0
}

// dotM is a . (b m), the dot product with a row's linear M^-1 part b m,
// rounded as if b m were stored.
func dotM(a, b *vec, m float64) float64 {
	return a[0]*(b[0]*m) + a[1]*(b[1]*m) + a[2]*(b[2]*m)
}

// addM adds (a m) x to v, the linear velocity change of a row's impulse x
// (a m its linear M^-1 part), rounded as addScaled(v, a m, x) would.
func addM(v *vec, a *vec, m, x float64) {
	v[0] += a[0] * m * x
	v[1] += a[1] * m * x
	v[2] += a[2] * m * x
}

// mulMatTo sets dst to m.Mul3x1(v), with its roundings.
func mulMatTo(dst *vec, m *shapes.Mat3, v *vec) {
	dst[0] = m[0]*v[0] + m[3]*v[1] + m[6]*v[2]
	dst[1] = m[1]*v[0] + m[4]*v[1] + m[7]*v[2]
	dst[2] = m[2]*v[0] + m[5]*v[1] + m[8]*v[2]
}

// mulMat is m.Mul3x1(v) written out, with its roundings.
func mulMat(m *shapes.Mat3, v *vec) vec {
	return vec{m[0]*v[0] + m[3]*v[1] + m[6]*v[2], m[1]*v[0] + m[4]*v[1] + m[7]*v[2], m[2]*v[0] + m[5]*v[1] + m[8]*v[2]}
}

// cdot is the row's velocity on the velocities vel (the real ones, the
// pseudo-velocities or the force velocities).
func (r *crow) cdot(vel []sbody) float64 {
	return rowVel(&vel[r.a], &vel[r.b], r)
}

// rowVel is the velocity of row r on its bodies' velocities A and B. The
// fixed slot's velocity is zero: its terms are left out, which changes at
// most the sign of a zero result.
func rowVel(A, B *sbody, r *crow) float64 {
	v := 0.0
	if r.a != fixedSlot {
		v = -dot3(&r.d, &A.v) - dot3(&r.cA, &A.w)
	}
	if r.b != fixedSlot {
		v += dot3(&r.d, &B.v)
		v += dot3(&r.cB, &B.w)
	}
	return v
}

// apply adds the velocity changes of impulse x along the row to vel.
func (r *crow) apply(vel []sbody, x float64) {
	A, B := &vel[r.a], &vel[r.b]
	applyPair(A, B, r, x)
}

// applyPair is apply on the row's two bodies A and B. The fixed slot
// does not move.
func applyPair(A, B *sbody, r *crow, x float64) {
	if r.a != fixedSlot {
		A.v[0] -= r.d[0] * r.mA * x
		A.v[1] -= r.d[1] * r.mA * x
		A.v[2] -= r.d[2] * r.mA * x
		A.w[0] -= r.wA[0] * x
		A.w[1] -= r.wA[1] * x
		A.w[2] -= r.wA[2] * x
	}
	if r.b != fixedSlot {
		B.v[0] += r.d[0] * r.mB * x
		B.v[1] += r.d[1] * r.mB * x
		B.v[2] += r.d[2] * r.mB * x
		B.w[0] += r.wB[0] * x
		B.w[1] += r.wB[1] * x
		B.w[2] += r.wB[2] * x
	}
}

// coupling is the velocity change of row q per unit impulse of row p.
func coupling(q, p *crow) float64 {
	c := 0.0
	if q.a == p.a {
		c += dotM(&q.d, &p.d, p.mA) + dot3(&q.cA, &p.wA)
	} else if q.a == p.b {
		c += -dotM(&q.d, &p.d, p.mB) - dot3(&q.cA, &p.wB)
	}
	if q.b == p.a {
		c += -dotM(&q.d, &p.d, p.mA) - dot3(&q.cB, &p.wA)
	} else if q.b == p.b {
		c += dotM(&q.d, &p.d, p.mB) + dot3(&q.cB, &p.wB)
	}
	return c
}

// solveScalar is one projected Gauss-Seidel update of a row with its own
// accumulator: the impulse that brings Cdot to target, with the accumulated
// impulse (not the increment) clamped to [lo, hi] (Catto 2005). It returns
// the velocity change along the row.
func solveScalar(vel []sbody, r *crow, target, lo, hi float64, lambda *float64) float64 {
	if r.mass == 0 {
		return 0
	}
	A, B := &vel[r.a], &vel[r.b]
	cdot := rowVel(A, B, r)
	old := *lambda
	nl := min(max(old+r.mass*(target-cdot), lo), hi)
	x := nl - old
	if x == 0 {
		return 0
	}
	*lambda = nl
	applyPair(A, B, r, x)
	return math.Abs(x) * r.k
}

// solveNormal is solveScalar for a normal row: its own target and
// accumulator, impulse >= 0. It is the sweeps' innermost update, so rowVel
// and applyPair are written out (they are too large to be inlined, and the
// calls cost about as much as their arithmetic).
func solveNormal(vel []sbody, r *crow) float64 {
	if r.mass == 0 {
		return 0
	}
	A, B := &vel[r.a], &vel[r.b]
	onA, onB := r.a != fixedSlot, r.b != fixedSlot
	cdot := 0.0
	if onA {
		cdot = -dot3(&r.d, &A.v) - dot3(&r.cA, &A.w)
	}
	if onB {
		cdot += dot3(&r.d, &B.v)
		cdot += dot3(&r.cB, &B.w)
	}
	old := r.lambda
	nl := max(old+r.mass*(r.target-cdot), 0)
	x := nl - old
	if x == 0 {
		return 0
	}
	r.lambda = nl
	if onA {
		addM(&A.v, &r.d, r.mA, -x)
		addScaled(&A.w, &r.wA, -x)
	}
	if onB {
		addM(&B.v, &r.d, r.mB, x)
		addScaled(&B.w, &r.wB, x)
	}
	return math.Abs(x) * r.k
}

// jrow is an extra row (Row) in solver form: the general Jacobian, its
// products with the inverse masses and inertias, bounds.
type jrow struct {
	a, b                   int32
	linA, angA, linB, angB vec
	dvA, dwA, dvB, dwB     vec
	k, mass                float64
	target                 float64
	lo, hi                 float64
	lambda                 float64
}

// setup fills r from Row q between slots a and b of bodies A and B.
func (r *jrow) setup(A, B *Body, a, b int32, q *Row) {
	r.a, r.b = a, b
	r.linA, r.angA, r.linB, r.angB = q.LinA, q.AngA, q.LinB, q.AngB
	r.dvA = vec{r.linA[0] * A.InvMass, r.linA[1] * A.InvMass, r.linA[2] * A.InvMass}
	r.dvB = vec{r.linB[0] * B.InvMass, r.linB[1] * B.InvMass, r.linB[2] * B.InvMass}
	r.dwA, r.dwB = mulMat(&A.InvInertia, &r.angA), mulMat(&B.InvInertia, &r.angB)
	r.k = dot3(&r.linA, &r.dvA) + dot3(&r.angA, &r.dwA) + dot3(&r.linB, &r.dvB) + dot3(&r.angB, &r.dwB)
	r.mass = 0
	if r.k > 0 && !math.IsInf(r.k, 1) {
		r.mass = 1 / r.k
	}
	r.target, r.lo, r.hi = q.Target, q.Lo, q.Hi
	r.lambda = 0
}

func (r *jrow) cdot(vel []sbody) float64 {
	A, B := &vel[r.a], &vel[r.b]
	return dot3(&r.linA, &A.v) + dot3(&r.angA, &A.w) + dot3(&r.linB, &B.v) + dot3(&r.angB, &B.w)
}

func (r *jrow) apply(vel []sbody, x float64) {
	A, B := &vel[r.a], &vel[r.b]
	addScaled(&A.v, &r.dvA, x)
	addScaled(&A.w, &r.dwA, x)
	addScaled(&B.v, &r.dvB, x)
	addScaled(&B.w, &r.dwB, x)
}

// solve is solveScalar for an extra row: one projected Gauss-Seidel update
// toward target with accumulator lambda clamped to [lo, hi].
func (r *jrow) solve(vel []sbody, target, lo, hi float64, lambda *float64) float64 {
	if r.mass == 0 {
		return 0
	}
	old := *lambda
	nl := min(max(old+r.mass*(target-r.cdot(vel)), lo), hi)
	x := nl - old
	if x == 0 {
		return 0
	}
	*lambda = nl
	r.apply(vel, x)
	return math.Abs(x) * r.k
}

// kWith is r's velocity change per unit impulse of q, a row on the same
// two bodies (an entry of the block J M^-1 J^T).
func (r *crow) kWith(q *crow) float64 {
	return dotM(&r.d, &q.d, q.mA) + dot3(&r.cA, &q.wA) + dotM(&r.d, &q.d, q.mB) + dot3(&r.cB, &q.wB)
}
