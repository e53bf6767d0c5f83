package engine

import (
	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// predictAll notes where every jointed body would be at the end of the
// step if it kept moving at constant velocity: at the velocities before the
// solve, with a constant spin, or (solved) at those the solve left in the
// solver's bodies, turned the way the step will turn them (the torque-free
// precession of a body turning off its principal axes is of the same
// second order as the curvature of the joints, and a thin link's is not
// small: leaving it out leaves a thousand times the drift of a spatial
// chain of bars). Before the solve a dynamic body turns the same way, at
// the spin it has, unless it would cone more than maxPredictedConing in the
// step (coning.go); then it keeps a constant spin, and what its velocity
// targets miss the position pass takes.
func (w *World) predictAll(dt float64, solved bool) {
	m := &w.mech
	n := len(w.b.kind)
	m.predP = growFill(m.predP, n, shapes.Vec3{})
	m.predQ = growFill(m.predQ, n, shapes.Quat{})
	if solved && len(m.turn) < n {
		m.turn = append(m.turn, make([]turnMemo, n-len(m.turn))...)
	}
	bodies := w.collision.bodies
	for _, id := range m.jbodies {
		p, q := w.b.pos[id], w.b.rot[id]
		v, s := w.b.vel[id], w.b.spin[id]
		if solved && w.jointFree(id) {
			v, s = bodies[id].V, bodies[id].W
		}
		switch {
		case solved && w.jointFree(id):
			// As the step will integrate it, precession included; the
			// integration reuses it (turnMemo).
			qp, sp := freeRotation(qmul(&q, &w.b.axes[id]), w.b.moments[id], s, dt)
			m.turn[id] = turnMemo{step: w.steps, q: q, spin: s, dt: dt, qp: qp, sp: sp}
			p, q = p.Add(v.Mul(dt)), qmulConj(&qp, &w.b.axes[id]).Normalize()
		case w.jointFree(id) && w.coning(id, s, dt) <= maxPredictedConing:
			qp, _ := freeRotation(qmul(&q, &w.b.axes[id]), w.b.moments[id], s, dt)
			p, q = p.Add(v.Mul(dt)), qmulConj(&qp, &w.b.axes[id]).Normalize()
		case w.b.kind[id] != Static:
			p, q = p.Add(v.Mul(dt)), integrateQuat(q, s, dt)
		}
		m.predP[id], m.predQ[id] = p, q
	}
}

// turnMemo is a free rotation worked out by predictAll for the step
// numbered step: freeRotation of the body's orientation q (times its
// principal axes) at spin over dt gave qp and the new spin sp.
type turnMemo struct {
	step     int
	q        shapes.Quat
	spin, sp shapes.Vec3
	dt       float64
	qp       shapes.Quat
}

// freeTurn is freeRotation of a dynamic body over the step, taken from
// predictAll's memo when it was worked out for the same step and state.
func (w *World) freeTurn(id BodyID, dt float64) (shapes.Quat, shapes.Vec3) {
	if t := w.mech.turn; int(id) < len(t) {
		if m := &t[id]; m.step == w.steps && m.dt == dt && m.q == w.b.rot[id] && m.spin == w.b.spin[id] {
			return m.qp, m.sp
		}
	}
	return freeRotation(qmul(&w.b.rot[id], &w.b.axes[id]), w.b.moments[id], w.b.spin[id], dt)
}

// predicted returns a jointed body's pose from the last predictAll.
func (w *World) predicted(id BodyID) (shapes.Vec3, shapes.Quat) {
	if id == Ground {
		return shapes.Vec3{}, mgl64.QuatIdent()
	}
	return w.mech.predP[id], w.mech.predQ[id]
}
