package engine

import (
	"math"

	"clatter/contact"
	"clatter/shapes"
)

// Work of drives. The divergence guard compares the energy after a step
// with the energy before it plus the work that something outside the
// dynamic bodies may have done on them in the step: driven (kinematic)
// bodies and conveyor surfaces through contacts, motors and driven bodies
// through joint rows. The power of an impulse P delivered at a point that
// moves at u is P.u; summed over the step, with the constant velocities the
// drives have within it, that is the input. The guard takes magnitudes, an
// upper bound on what the drives can have put in, so that it never stops
// a run that is right; a part launched by a jam gains far more than that.

// drivenWork is the bound on the work done on the dynamic bodies by drives
// in the step just solved, J.
func (w *World) drivenWork() float64 {
	c := &w.collision
	work := 0.0
	for i := range c.points {
		p := &c.points[i]
		a, b := BodyID(p.A), BodyID(p.B)
		da, db := w.drives(a), w.drives(b)
		if !da && !db && p.SurfaceVelocity == (shapes.Vec3{}) {
			continue
		}
		imp := p.Normal.Mul(p.NormalImpulse + p.ImpactImpulse).Add(p.FrictionImpulse).Add(p.ImpactFriction)
		if da {
			work += math.Abs(imp.Dot(w.pointVelocity(a, p.Position)))
		}
		if db {
			work += math.Abs(imp.Dot(w.pointVelocity(b, p.Position)))
		}
		work += math.Abs(imp.Dot(p.SurfaceVelocity))
	}
	for j := range w.mech.rows {
		r := &w.mech.rows[j]
		if r.Impulse == 0 {
			continue
		}
		// A passive row holds its velocity at zero and does no work; a
		// motor drives it to Target, a servo or a force row moves at
		// whatever speed its fixed impulse gives.
		work += math.Abs(r.Impulse) * (math.Abs(r.Target) + math.Abs(w.rowVelocity(r)) + math.Abs(w.rowDrive(r)))
	}
	return work
}

// drives reports whether body id moves without being pushed: a kinematic
// body in motion.
func (w *World) drives(id BodyID) bool {
	return w.b.kind[id] == Kinematic && (w.b.vel[id] != (shapes.Vec3{}) || w.b.spin[id] != (shapes.Vec3{}))
}

// pointVelocity is the velocity of body id's material at world point x.
func (w *World) pointVelocity(id BodyID, x shapes.Vec3) shapes.Vec3 {
	return w.b.vel[id].Add(w.b.spin[id].Cross(x.Sub(w.b.pos[id])))
}

// rowVelocity is a row's velocity with the bodies' velocities now.
func (w *World) rowVelocity(r *contact.Row) float64 {
	v := 0.0
	if int(r.A) < len(w.b.kind) {
		v += r.LinA.Dot(w.b.vel[r.A]) + r.AngA.Dot(w.b.spin[r.A])
	}
	if int(r.B) < len(w.b.kind) {
		v += r.LinB.Dot(w.b.vel[r.B]) + r.AngB.Dot(w.b.spin[r.B])
	}
	return v
}

// rowDrive is the part of a row's velocity that comes from driven bodies.
func (w *World) rowDrive(r *contact.Row) float64 {
	v := 0.0
	if int(r.A) < len(w.b.kind) && w.drives(BodyID(r.A)) {
		v += r.LinA.Dot(w.b.vel[r.A]) + r.AngA.Dot(w.b.spin[r.A])
	}
	if int(r.B) < len(w.b.kind) && w.drives(BodyID(r.B)) {
		v += r.LinB.Dot(w.b.vel[r.B]) + r.AngB.Dot(w.b.spin[r.B])
	}
	return v
}
