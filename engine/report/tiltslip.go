package report

import (
	"clatter/engine"
	"clatter/shapes"
)

// slipped adds the last step's slip of a body's foot over its support to
// the sum kept in the support's frame, and returns that sum.
//
// The slip of a step is the velocity of the foot relative to the point of
// the support under it, at the poses the step started from (where the
// contact solve holds the two together), times the step: what friction
// failed to hold. It is not the change of the foot's place in the
// support's frame: a support that turns carries the point under the foot
// on an arc, while the step moves the body along that arc's chord, so a
// foot held fast drifts off it by r (omega dt)^2 / 2 a step (r the
// distance from the support's centre, omega its spin), an error of the
// first-order position update (Hairer, Lubich and Wanner, "Geometric
// Numerical Integration", 2006, ch. I.1) that halves with the step. On a
// 4 m lever tilting at 2 degrees per second that came to 0.04 mm/s at a
// step of 1/60 s, and a 2 m block that stood fast was reported to slide.
func (b *tiltState) slipped(w *engine.World, dt float64) shapes.Vec3 {
	body, sup := b.was[0], b.was[1]
	p := body.Apply(b.foot)
	v := w.Velocity(b.id).Add(w.Spin(b.id).Cross(p.Sub(body.Position)))
	u := w.Velocity(b.on).Add(w.Spin(b.on).Cross(p.Sub(sup.Position)))
	rel := sup.Orientation.Conjugate().Rotate(v.Sub(u))
	rel = rel.Sub(b.up.Mul(rel.Dot(b.up)))
	b.slip = b.slip.Add(rel.Mul(dt))
	b.hold(w)
	return b.slip
}

// hold keeps the poses a step starts from.
func (b *tiltState) hold(w *engine.World) {
	b.was, b.then = [2]shapes.Pose{bodyPose(w, b.id), supportPose(w, b.on)}, w.Time()
}
