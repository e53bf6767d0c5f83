package engine

import (
	"math"

	"clatter/contact"
	"clatter/shapes"
)

// jointRows appends the rows of every joint with a body free to move this
// step. It runs inside the solve, once the solver's bodies are filled; the
// ground is an extra body with zero inverse mass after the world's bodies.
func (w *World) jointRows(dt float64, rows []contact.Row) []contact.Row {
	m := &w.mech
	if len(m.joints) == 0 {
		return rows
	}
	c := &w.collision
	n := len(w.b.kind)
	c.bodies = append(c.bodies[:n], contact.Body{})
	m.dt = dt
	w.predictAll(dt, false)
	w.groupJoints()
	// The position pass removes Settings.Correction of each row's predicted
	// error per step; scaling the drift gives joints their own fraction.
	scale := w.jointScale()
	// The rows for the sweeps first, then those the exact solve does alone
	// (jointtree.go); the solver is given the first part.
	m.rows = m.rows[:0]
	swept := 0
	for pass := 0; pass < 2; pass++ {
		for j := range m.joints {
			jt := &m.joints[j]
			free := w.jointFree(jt.a) || w.jointFree(jt.b)
			if pass == 0 {
				jt.first, jt.count, jt.motorRow = 0, 0, -1
				jt.eqFirst, jt.eqCount = 0, 0
			}
			if !free || w.swept(jt) != (pass == 0) {
				continue
			}
			jt.first = int32(len(m.rows))
			m.rows = w.appendJointRows(jt, uint64(j)<<8, dt, scale, pass == 0, m.rows)
			jt.count = int32(len(m.rows)) - jt.first
		}
		if pass == 0 {
			swept = len(m.rows)
		}
	}
	return m.rows[:swept]
}

// jointFree reports whether a joint body moves under forces this step.
func (w *World) jointFree(id BodyID) bool {
	return id != Ground && w.b.kind[id] == Dynamic && w.b.awake[id]
}

// Row key offsets within a joint's block of 256 keys.
const (
	keyLower = 1 + iota
	keyUpper
	keyMotor
	keyFriction
	keyEq = 8 // up to 6 rows
)

// appendJointRows appends a joint's rows; swept says whether they go to the
// sweeps (decoupled for them) or only to the exact solve (scaled to unit
// coupling, which is all it needs). One-sided and bounded rows come first
// and the equality block last, so each sweep ends with the joint itself
// solved.
func (w *World) appendJointRows(jt *joint, key uint64, dt, scale float64, swept bool, rows []contact.Row) []contact.Row {
	ia, ib := int32(jt.a), int32(jt.b)
	if jt.b == Ground {
		ib = int32(len(w.b.kind))
	}
	g := w.jointGeom(jt)
	jt.lever = g.rA
	q, axisRow := jt.freeCoordinate(&g, ia, ib)
	rows = appendLimitRows(rows, jt, axisRow, q, dt, scale, key)
	rows = appendMotorRow(rows, jt, axisRow, dt, key)
	rows = appendFrictionRow(rows, jt, axisRow, dt, key)
	eq := len(rows)
	rows, oneSided := w.appendEqRows(rows, jt, &g, ia, ib, dt, scale, key)
	if oneSided {
		eq = len(rows) // not part of the block
	}
	jt.eqFirst, jt.eqCount = int32(eq), int32(len(rows)-eq)
	bodies := w.collision.bodies
	decoupled := false
	if swept {
		decoupled = decouple(rows[eq:], bodies, &jt.chol)
	} else {
		normalise(rows[eq:], bodies, &jt.chol)
	}
	if jt.def.Motor.Mode == MotorServo {
		rows[int(jt.first)+int(jt.motorRow)] = w.servoRow(jt, axisRow, q, dt, rows[eq:], decoupled, key|keyMotor)
	}
	return rows
}

// freeCoordinate returns a revolute or prismatic joint's free coordinate q
// (angle or travel) and the row of its rate (the Jacobian of q); it
// advances a revolute joint's unwrapped angle. Other kinds get q = 0 and a
// row without directions.
func (jt *joint) freeCoordinate(g *jgeom, ia, ib int32) (float64, contact.Row) {
	var q float64
	var r contact.Row
	r.A, r.B = ia, ib
	switch jt.def.Kind {
	case Revolute:
		jt.angle += wrapAngle(g.raw - jt.raw)
		jt.raw = g.raw
		q = jt.angle
		r.AngA, r.AngB = g.axis, g.axis.Mul(-1)
	case Prismatic:
		q = g.axis.Dot(g.d)
		r.LinA, r.AngA = g.axis, g.rA.Cross(g.axis)
		r.LinB, r.AngB = g.axis.Mul(-1), g.rB.Add(g.d).Cross(g.axis).Mul(-1)
	}
	return q, r
}

// appendLimitRows appends the rows of a joint's limits at free coordinate
// q. They are speculative: a row may let the joint close its gap to the
// limit within the step (target -gap/dt) but not pass it; a joint already
// past is stopped and pushed back by the position pass.
func appendLimitRows(rows []contact.Row, jt *joint, axisRow contact.Row, q, dt, scale float64, key uint64) []contact.Row {
	def := &jt.def
	if !def.Limited {
		return rows
	}
	for side, gap := range [2]float64{q - def.Lower, def.Upper - q} {
		r := axisRow
		if side == 1 {
			r = negRow(r)
		}
		r.Target = -max(gap, 0) / dt
		r.Lo, r.Hi = 0, math.Inf(1)
		r.Correct, r.Drift = true, gap*scale
		r.Key = key | uint64(keyLower+side)
		rows = append(rows, r)
	}
	return rows
}

// appendMotorRow appends a joint's motor row and notes where it is: a
// speed motor's capped row, or a servo's place, which appendJointRows
// fills in once the equality block gives the effective mass.
func appendMotorRow(rows []contact.Row, jt *joint, axisRow contact.Row, dt float64, key uint64) []contact.Row {
	m := &jt.def.Motor
	switch m.Mode {
	case MotorSpeed:
		r := axisRow
		r.Target = m.Speed
		cap := m.MaxForce * dt
		r.Lo, r.Hi = -cap, cap
		r.Key = key | keyMotor
		jt.motorRow = int32(len(rows)) - jt.first
		rows = append(rows, r)
	case MotorServo:
		jt.motorRow = int32(len(rows)) - jt.first
		rows = append(rows, axisRow)
	}
	return rows
}

// appendFrictionRow appends the row of a joint's Coulomb friction: an
// impulse bounded by the friction torque or force over the step.
func appendFrictionRow(rows []contact.Row, jt *joint, axisRow contact.Row, dt float64, key uint64) []contact.Row {
	if !(jt.def.Friction > 0) {
		return rows
	}
	r := axisRow
	f := jt.def.Friction * dt
	r.Lo, r.Hi = -f, f
	r.Key = key | keyFriction
	return append(rows, r)
}

// appendEqRows appends a joint's equality rows and reports whether they are
// one-sided (a distance joint with a range). Each holds a value C (a
// component of the anchors' offset, of the misalignment of the axes, ...)
// at zero. Its Jacobian is C's rate now, but C is curved: moving with the
// velocity v for the step changes it by J v dt plus a remainder rho of
// second order (the centripetal term of a swinging link). The velocity
// target -rho/dt asks for the velocity that ends the step on the
// constraint; a target of 0 would leave the link a little off it at the end
// of every step, and projecting that off next step would take (omega dt)^2
// of the kinetic energy per step (3 percent per swing of a 1 m pendulum at
// 1 ms). The remainder is taken from the velocities before the solve,
// predicting the poses the way the step integrates them. The position pass
// then removes C itself.
func (w *World) appendEqRows(rows []contact.Row, jt *joint, g *jgeom, ia, ib int32, dt, scale float64, key uint64) ([]contact.Row, bool) {
	_, qb := w.frame(jt.b)
	bs := &jt.basis
	bs.p1, bs.p2 = perpendiculars(g.axis)
	if jt.def.Kind == Prismatic { // its off-axis rows turn with B (eqValues)
		bs.p1B, bs.p2B = rotate(qb.Conjugate(), bs.p1), rotate(qb.Conjugate(), bs.p2)
	}
	e := eqBuilder{rows: rows, first: len(rows), a: ia, b: ib, key: key}
	n := eqValues(jt, g, qb, bs, &e.c)
	var cEnd [6]float64
	pa1, qa1 := w.predicted(jt.a)
	pb1, qb1 := w.predicted(jt.b)
	ge := jointGeomAt(jt, pa1, qa1, pb1, qb1, false)
	eqValues(jt, &ge, qb1, bs, &cEnd)
	oneSided := e.kindRows(jt.def.Kind, g, bs, n)
	w.setEqTargets(e.rows[e.first:], &cEnd, dt, scale, key, oneSided)
	return e.rows, oneSided
}

// setEqTargets sets the velocity targets and drifts of a joint's equality
// rows from their values cEnd at the predicted end of the step (the drift
// holds the value now, as eqBuilder.add left it).
func (w *World) setEqTargets(eq []contact.Row, cEnd *[6]float64, dt, scale float64, key uint64, oneSided bool) {
	bodies := w.collision.bodies
	for i := range eq {
		r := &eq[i]
		gap := r.Drift
		rho := cEnd[i] - gap - rowSpeed(r, bodies)*dt
		r.Target = -rho / dt
		r.Drift = gap*scale + rho
		if oneSided {
			// Speculative, like a limit: it may close the gap within the
			// step but not pass it.
			r.Target = -(max(gap, 0) + rho) / dt
			r.Lo, r.Hi = 0, math.Inf(1)
			r.Key = key | uint64(keyLower+i)
		}
	}
}

// eqBuilder appends a joint's equality rows in order, each with its value
// now as its drift.
type eqBuilder struct {
	rows  []contact.Row
	first int // index of the first equality row
	a, b  int32
	key   uint64
	c     [6]float64 // the rows' values now (eqValues)
}

func (e *eqBuilder) add(linA, angA, linB, angB shapes.Vec3) {
	k := len(e.rows) - e.first
	e.rows = append(e.rows, eqRow(e.a, e.b, linA, angA, linB, angB, e.c[k], e.key|uint64(keyEq+k)))
}

// point holds A's anchor to B's; rA and rB are the lever arms.
func (e *eqBuilder) point(rA, rB shapes.Vec3) {
	for k := 0; k < 3; k++ {
		var u shapes.Vec3
		u[k] = 1
		e.add(u, rA.Cross(u), u.Mul(-1), rB.Cross(u).Mul(-1))
	}
}

// lock forbids A to turn relative to B.
func (e *eqBuilder) lock() {
	for k := 0; k < 3; k++ {
		var u shapes.Vec3
		u[k] = 1
		e.add(shapes.Vec3{}, u, shapes.Vec3{}, u.Mul(-1))
	}
}

// kindRows appends the equality rows of a joint of the given kind, n of
// them by eqValues, and reports whether they are one-sided (a distance
// joint with a range: a rope or a stop).
func (e *eqBuilder) kindRows(kind JointKind, g *jgeom, bs *eqBasis, n int) bool {
	switch kind {
	case Revolute:
		e.point(g.rA, g.rB)
		// A's axis kept along B's: p . (axis_B x axis_A) = 0 for the two
		// normals p; its rate is p . (w_A - w_B) at the joint.
		for _, p := range [2]shapes.Vec3{bs.p1, bs.p2} {
			e.add(shapes.Vec3{}, p, shapes.Vec3{}, p.Mul(-1))
		}
	case Spherical:
		e.point(g.rA, g.rB)
	case Fixed:
		e.point(g.rA, g.rB)
		e.lock()
	case Prismatic:
		e.lock()
		// Off-axis travel p . d = 0, with p turning with B.
		lb := g.rB.Add(g.d)
		for _, p := range [2]shapes.Vec3{bs.p1, bs.p2} {
			e.add(p, g.rA.Cross(p), p.Mul(-1), lb.Cross(p).Mul(-1))
		}
	case Distance:
		if n == 0 {
			return false // anchors together: the direction is undefined for this step
		}
		nr := g.d.Normalize()
		linA, angA, linB, angB := nr, g.rA.Cross(nr), nr.Mul(-1), g.rB.Cross(nr).Mul(-1)
		e.add(linA, angA, linB, angB)
		if n == 2 { // a rope or a stop: one-sided rows at either end of the range
			e.add(linA.Mul(-1), angA.Mul(-1), linB.Mul(-1), angB.Mul(-1))
			return true
		}
	}
	return false
}

func eqRow(a, b int32, linA, angA, linB, angB shapes.Vec3, drift float64, key uint64) contact.Row {
	inf := math.Inf(1)
	return contact.Row{A: a, B: b, LinA: linA, AngA: angA, LinB: linB, AngB: angB,
		Lo: -inf, Hi: inf, Correct: true, Drift: drift, Key: key}
}

func negRow(r contact.Row) contact.Row {
	r.LinA, r.AngA, r.LinB, r.AngB = r.LinA.Mul(-1), r.AngA.Mul(-1), r.LinB.Mul(-1), r.AngB.Mul(-1)
	return r
}

// rowSpeed is a row's Cdot with the solver bodies' velocities.
func rowSpeed(r *contact.Row, bodies []contact.Body) float64 {
	A, B := &bodies[r.A], &bodies[r.B]
	return r.LinA.Dot(A.V) + r.AngA.Dot(A.W) + r.LinB.Dot(B.V) + r.AngB.Dot(B.W)
}

// servoRow returns the row of a servo: a spring-damper toward the target,
// integrated implicitly over the step (backward Euler, so that a stiff
// servo stays stable): with effective mass m along the joint's free
// coordinate q, speed v0 at the start of the step and v1 = v0 + lambda/m
// at its end, the impulse is
//
//	lambda = h (k (q* - q - h v1) - c v1),
//
// solved for lambda and capped at MaxForce h. It is applied as a fixed
// impulse (Lo = Hi = lambda). The effective mass is that of the free
// coordinate with the joint's other rows holding (a Schur complement; the
// decoupled rows make it 1/(k_aa - sum_i (J'_i M^-1 J_a^T)^2)), so a hinged
// arm responds with its inertia about the pivot.
func (w *World) servoRow(jt *joint, r contact.Row, q, h float64, eq []contact.Row, decoupled bool, key uint64) contact.Row {
	bodies := w.collision.bodies
	resp := responseOf(&r, bodies)
	kinv := coupling(&r, resp)
	if decoupled {
		for i := range eq {
			y := coupling(&eq[i], resp)
			kinv -= y * y
		}
	}
	m := &jt.def.Motor
	lambda := 0.0
	if kinv > 0 {
		A, B := &bodies[r.A], &bodies[r.B]
		v0 := r.LinA.Dot(A.V) + r.AngA.Dot(A.W) + r.LinB.Dot(B.V) + r.AngB.Dot(B.W)
		kc := h * (h*m.Stiffness + m.Damping)
		lambda = (h*m.Stiffness*(m.Target-q) - kc*v0) / (1 + kc*kinv)
		lim := m.MaxForce * h
		lambda = min(max(lambda, -lim), lim)
	}
	r.Lo, r.Hi, r.Key = lambda, lambda, key
	return r
}

// jointScale is the factor on a row's drift that makes the position pass
// remove jointCorrection of it per step (see jointRows).
func (w *World) jointScale() float64 {
	if corr := w.collision.solver.Settings.Correction; corr > 0 {
		return jointCorrection / corr
	}
	return 1
}

// afterJointSolve runs after the contact solve: the exact projection of
// the velocities and pseudo-velocities onto the joints that form a forest
// (jointtree.go). The joints' reactions are read from the rows when asked
// (JointReaction).
func (w *World) afterJointSolve(dt float64) {
	if len(w.mech.joints) == 0 {
		return
	}
	if w.buildTree() {
		w.projectJoints(false)
		if w.collision.solver.Settings.PositionIterations > 0 {
			w.predictAll(dt, true)
			w.projectJoints(true)
		}
	}
}
