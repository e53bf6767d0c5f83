package engine

import "clatter/shapes"

// Free flight under constant gravity is integrated exactly. Semi-implicit
// Euler moves a body by v(t+dt) dt, half a step of gravity, g dt^2 / 2,
// further than the parabola; its measured energy then sags in flight and a
// bounce that restores the drop height lifts it above the start, by
// g T dt / (2 h) of a fall of height h and time T: 3.7 percent of a 1 m
// drop at 1/60 s (Hairer, Lubich and Wanner, "Geometric Numerical
// Integration", 2nd ed. 2006, ch. I.1). The trapezoidal position update
// x += (v(t) + v(t+dt)) dt / 2 is exact for a constant acceleration, so
// kinetic plus potential energy stays constant in flight at any step.
//
// A body that a contact, joint or compliant force pushed this step keeps
// the semi-implicit update: a resting body (v = 0) then moves by nothing,
// which is what the contact solver's rows assume. An impact alone (a
// bounce, solved on the arrival velocity before this step's gravity) does
// not count as a push: the body leaves the surface in free flight.

// noteFlight starts a step's record of pushed bodies, once kicks and
// gravity are in the velocities and before anything else acts on them.
func (w *World) noteFlight() {
	if n := len(w.b.kind); cap(w.pushed) < n {
		w.pushed = make([]bool, n, n+n/4)
	} else {
		w.pushed = w.pushed[:n]
		clear(w.pushed)
	}
	if w.soft.on { // only compliant forces act before the solve (markForced)
		w.flight = append(w.flight[:0], w.b.vel...)
	}
}

// markForced marks the bodies whose velocity a force changed since
// noteFlight (compliant contacts act before the solve).
func (w *World) markForced() {
	for i := range w.flight {
		if w.b.vel[i] != w.flight[i] {
			w.pushed[i] = true
		}
	}
}

// markPushed marks the bodies that the velocity solve's contact or joint
// impulses acted on (impacts excepted, see above).
func (w *World) markPushed() {
	c := &w.collision
	for i := range c.points {
		p := &c.points[i]
		if p.NormalImpulse != 0 || p.FrictionImpulse != (shapes.Vec3{}) {
			w.mark(BodyID(p.A))
			w.mark(BodyID(p.B))
		}
	}
	for i := range w.mech.joints {
		// A joint holds its bodies, by rows or by its exact projection
		// (joint.go), even in a step where its rows carry no impulse.
		w.mark(w.mech.joints[i].a)
		w.mark(w.mech.joints[i].b)
	}
	for i := range c.rows {
		w.mark(BodyID(c.rows[i].A))
		w.mark(BodyID(c.rows[i].B))
	}
}

// flightDrift is the position change to add to v(t+dt) dt for body i:
// -g dt^2 / 2 when gravity alone moved it this step, and zero otherwise.
func (w *World) flightDrift(i int, dt float64) shapes.Vec3 {
	if w.b.kind[i] != Dynamic || i >= len(w.pushed) || w.pushed[i] {
		return shapes.Vec3{}
	}
	return w.cfg.Gravity.Mul(-0.5 * dt * dt)
}

// inFlight reports whether body i moved in free flight last step, so that
// its velocity is that of the step's end rather than half a step behind
// its position (compliant.go's step changes).
func (w *World) inFlight(i int) bool { return i >= len(w.pushed) || !w.pushed[i] }

// mark marks a body as pushed. Rows may reach the solver's own anchor body
// past the world's, and a joint to the world has no second body
// (joint.go): only the world's bodies are marked.
func (w *World) mark(id BodyID) {
	if id >= 0 && int(id) < len(w.pushed) {
		w.pushed[id] = true
	}
}
