package engine

import (
	"fmt"
	"math"

	"clatter/shapes"
)

// applySoft applies this step's compliant contact forces as impulses,
// follows each contact's impact and records the peaks (compliant.go).
func (w *World) applySoft(dt float64) error {
	s := &w.soft
	defer func() { s.lastH = dt }()
	n := len(w.b.kind)
	for len(s.force) < n {
		s.force = append(s.force, shapes.Vec3{})
		s.peak = append(s.peak, 0)
	}
	clear(s.force)
	for i := range s.contacts {
		s.contacts[i].seen = false
	}
	for i := 0; i < len(s.pts); {
		j := i + 1
		for j < len(s.pts) && s.pts[j].a == s.pts[i].a && s.pts[j].b == s.pts[i].b {
			j++
		}
		if err := w.springPair(s.pts[i:j], dt); err != nil {
			return err
		}
		i = j
	}
	// Contacts no longer indented have ended.
	kept := s.contacts[:0]
	for _, c := range s.contacts {
		if c.seen {
			kept = append(kept, c)
		} else if !c.done {
			// It ended when the indentation reached zero, found likewise.
			end := w.time
			if c.lastRate < 0 {
				end = math.Min(w.time, c.lastT-c.lastD/c.lastRate)
			}
			w.reportSoft(&c, end)
		}
	}
	s.contacts = kept
	for i, f := range s.force {
		if w.b.kind[i] == Dynamic && f != (shapes.Vec3{}) {
			s.peak[i] = math.Max(s.peak[i], f.Len()/(w.b.mass[i]*StandardGravity))
		}
	}
	return nil
}

// softActive reports whether a compliant contact is indented now: the
// spring then holds energy that the energy guard cannot see.
func (w *World) softActive() bool { return len(w.soft.contacts) > 0 }

// PeakAcceleration is the largest net compliant contact force on a body
// over its weight, in units of standard gravity: what an accelerometer on
// the body reads. It is 0 for a body that met only rigid contacts.
func (w *World) PeakAcceleration(id BodyID) float64 {
	if int(id) >= len(w.soft.peak) {
		return 0
	}
	return w.soft.peak[id]
}

// springPair applies the spring of one compliant pair of bodies.
func (w *World) springPair(pts []softPoint, dt float64) error {
	a, b := pts[0].a, pts[0].b
	law := w.soft.laws[pts[0].law]
	deep, sumD := -1, 0.0
	for i := range pts {
		if d := -pts[i].sep; d > 0 {
			sumD += d
			if deep < 0 || d > -pts[deep].sep {
				deep = i
			}
		}
	}
	if deep < 0 {
		return nil // speculative points only: not touching
	}
	if law.err != "" {
		return w.softLawError(&pts[0], law)
	}
	c, fresh := w.softContactOf(a, b, &pts[deep])
	// The indentation rate, weighted as the force is shared, before any
	// point's impulse changes it: it says whether the impact is over.
	rate := 0.0
	for i := range pts {
		if d := -pts[i].sep; d > 0 {
			rate += d / sumD * w.approach(&pts[i])
		}
	}
	// A linear cushion is one spring between the two bodies: its force
	// k d_max (the deepest indentation) is shared over the indented points
	// in proportion to their indentation, so a face landing flat on four
	// points and a corner on one both meet stiffness k, and a point that
	// starts to touch takes its share smoothly from zero. Its dashpot is
	// shared alike but acts at each point on that point's own rate, so that
	// it damps rocking as well as bouncing. The impulses are all found from
	// the velocities before any is applied. Hertz points are each their own
	// contact.
	var total shapes.Vec3 // force on B, N
	if cap(w.soft.jn) < len(pts) {
		w.soft.jn = make([]float64, len(pts))
	}
	w.soft.jn = w.soft.jn[:len(pts)]
	clear(w.soft.jn)
	invPair := w.b.invMOrZero(a) + w.b.invMOrZero(b)
	// A contact that began slower than the bounce threshold gets no
	// restitution, as a rigid one does not: its dashpot is critical (a
	// part set down on a cushion settles instead of ringing for ever).
	gentle := c.v0 <= w.softBounceThreshold()
	if fresh && law.k > 0 && invPair > 0 {
		// A Kelvin-Voigt contact's force jumps to c v0 the instant it
		// begins (k d is still 0), and where the damping is heavy (zeta >
		// 1/2: c^2 / m > k, e below about 0.16) that is its peak: the force
		// falls from there. A sub-step only sees the force averaged over
		// its window, from an onset anywhere within it, which read the
		// peak up to 2 percent low, differently at each step. The onset is
		// therefore a peak of its own (Thomson, "Theory of vibration with
		// applications", ch. 2: the damped oscillator with d(0) = 0,
		// d'(0) = v0).
		//
		// The approach c.v0 already has this sub-step's gravity: a body
		// in free flight until now carries the velocity of the sub-step's
		// end (flight.go). At the onset, c.start, gravity had added that
		// much less (a body pushed meanwhile by something else carries the
		// middle's, and is then over-read by half a sub-step of gravity).
		gn := 0.0
		if w.b.kind[b] == Dynamic {
			gn -= w.cfg.Gravity.Dot(pts[deep].n)
		}
		if w.b.kind[a] == Dynamic {
			gn += w.cfg.Gravity.Dot(pts[deep].n)
		}
		v := c.v0 - gn*(w.time+dt-c.start)
		onset := 2 * dampingRatio(restitutionOf(&pts[deep], gentle)) * math.Sqrt(law.k/invPair) * max(v, 0)
		w.notePeak(c, onset)
		for _, id := range [2]BodyID{a, b} {
			if w.b.kind[id] == Dynamic {
				w.soft.peak[id] = math.Max(w.soft.peak[id], onset/(w.b.mass[id]*StandardGravity))
			}
		}
	}
	for i := range pts {
		p := &pts[i]
		d := -p.sep
		if d <= 0 {
			continue
		}
		if law.k > 0 {
			w.soft.jn[i] = linearImpulse(law.k, -pts[deep].sep, d, w.approach(p), d/sumD, restitutionOf(p, gentle), invPair, dt)
			continue
		}
		kh, err := w.hertzConstant(p, law)
		if err != nil {
			return err
		}
		inv := w.invMassAt(a, p.pos, p.n) + w.invMassAt(b, p.pos, p.n)
		w.soft.jn[i] = hertzImpulse(kh, d, w.approach(p), math.Max(c.v0, w.softBounceThreshold()), restitutionOf(p, gentle), inv, dt)
	}
	for i := range pts {
		if jn := w.soft.jn[i]; jn != 0 {
			w.push(a, b, pts[i].pos, pts[i].n.Mul(jn))
			total = total.Add(pts[i].n.Mul(jn / dt))
			c.impulse += jn
		}
	}
	// Friction once every normal impulse is in, so that the turn one
	// point's impulse gives for a moment is not taken for slip.
	for i := range pts {
		if jn := w.soft.jn[i]; jn > 0 {
			total = total.Add(w.softFriction(&pts[i], jn).Mul(1 / dt))
		}
	}
	w.soft.force[b] = w.soft.force[b].Add(total)
	w.soft.force[a] = w.soft.force[a].Sub(total)
	w.notePeak(c, total.Len())
	c.lastT, c.lastD, c.lastRate = w.time, -pts[deep].sep, rate
	// The impact is over when the indentation, having passed its deepest,
	// stops shrinking: the bodies part, or (a landing that stays) the first
	// rebound swing ends.
	if rate < 0 {
		c.restoring = true
	} else if c.restoring && !c.done {
		w.reportSoft(c, w.time)
		c.done = true
	}
	return nil
}

// notePeak records the contact force f (N) in the contact's peaks.
func (w *World) notePeak(c *softContact, f float64) {
	c.peakF = math.Max(c.peakF, f)
	for k, id := range [2]BodyID{c.a, c.b} {
		if w.b.kind[id] == Dynamic {
			c.peakG[k] = math.Max(c.peakG[k], f/(w.b.mass[id]*StandardGravity))
		}
	}
}

// linearImpulse is the normal impulse over one sub-step at a point of a
// linear cushion of stiffness k that takes the share s of the contact:
// s (k d_max + c d_dot), with c = 2 zeta sqrt(k m), m = 1/inv the pair's
// mass 1/(1/m_A + 1/m_B), and zeta = -ln e / sqrt(pi^2 + ln^2 e), which
// makes a mass-spring-dashpot impact lose exactly what the restitution e
// says (the Kelvin-Voigt contact; e.g. Schwager and Poschel, Phys. Rev. E
// 57, 1998). As in that model the dashpot may pull briefly at the end of a
// contact.
//
// The dashpot's impulse over the sub-step's window [t - dt/2, t + dt/2]
// is exactly c times the change of the indentation over it, counted only
// while indented: c (d+(t + dt/2) - d+(t - dt/2)). Its ends come from the
// rates before and after the impulse (the trapezoidal rule: second order,
// stable however heavy the damping), and clipping them at zero takes the
// jump of the dashpot force at the start and the end of a contact inside a
// sub-step without a first-order error.
func linearImpulse(k, dMax, d, rate, share, e, inv, dt float64) float64 {
	if inv == 0 {
		return 0
	}
	c := 2 * dampingRatio(e) * math.Sqrt(k/inv)
	before := math.Max(0, d-rate*dt/2)
	j := (k*dMax*dt + c*(d+rate*dt/2-before)) / (1 + c*dt*inv/2)
	if d+(rate-j*inv)*dt/2 < 0 { // the contact ends within the window
		j = k*dMax*dt - c*before
	}
	return share * j
}

// dampingRatio is zeta = -ln e / sqrt(pi^2 + ln^2 e) of a linear
// spring-dashpot whose coefficient of restitution is e (critical, 1, at
// e = 0).
func dampingRatio(e float64) float64 {
	if e <= 0 {
		return 1
	}
	l := math.Log(math.Min(e, 1))
	return -l / math.Sqrt(math.Pi*math.Pi+l*l)
}

// hertzImpulse is the normal impulse at one Hertz point: F = K d^(3/2)
// (Hertz 1882; K = 4/3 E* sqrt(R*), Johnson, "Contact Mechanics", 1985,
// eq. 4.23) with the damping of Hunt and Crossley (ASME J. Appl. Mech. 42,
// 1975), lambda d^(3/2) d_dot, and lambda = 3 K (1 - e^2) / (4 v0) from
// Lankarani and Nikravesh (ASME J. Mech. Design 112, 1990), v0 the
// approach speed when the contact began. The rate is taken as in
// linearImpulse (trapezoidal); it never pulls.
func hertzImpulse(kh, d, rate, v0, e, inv, dt float64) float64 {
	f := kh * d * math.Sqrt(d)
	lambda := f * 3 * (1 - e*e) / (4 * v0)
	return math.Max(0, (f+lambda*rate)*dt/(1+lambda*dt*inv/2))
}

// hertzConstant is K = 4/3 E* sqrt(R*) for a point, with R* = 1/(1/R_A +
// 1/R_B) from the round bodies' radii (a flat body counts as R infinite).
func (w *World) hertzConstant(p *softPoint, law springLaw) (float64, error) {
	ca, cb := curvature(w.b.shape[p.a]), curvature(w.b.shape[p.b])
	if ca+cb == 0 {
		return 0, fmt.Errorf("bodies %q and %q: Hertz contact (a stiffness given as modulus and poisson) needs a round body, a sphere or a capsule; give a flat body a linear stiffness instead",
			w.b.name[p.a], w.b.name[p.b])
	}
	return 4.0 / 3 * law.eStar * math.Sqrt(1/(ca+cb)), nil
}

// curvature is 1/R of a round shape's surface, 0 for a flat one.
func curvature(s shapes.Shape) float64 {
	switch c := s.(type) {
	case shapes.Sphere:
		return 1 / c.Radius
	case *shapes.Sphere:
		return 1 / c.Radius
	case shapes.Capsule:
		return 1 / c.Radius
	case *shapes.Capsule:
		return 1 / c.Radius
	}
	return 0
}

// softFriction applies Coulomb friction at a compliant point and returns
// its impulse on B: the impulse that stops the slip if the static bound
// mu_s j_n allows it, else mu_k j_n against the slip.
func (w *World) softFriction(p *softPoint, jn float64) shapes.Vec3 {
	v := w.relVelocity(p.a, p.b, p.pos)
	vt := v.Sub(p.n.Mul(v.Dot(p.n)))
	s := vt.Len()
	if s == 0 || jn <= 0 {
		return shapes.Vec3{}
	}
	t := vt.Mul(1 / s)
	inv := w.invMassAt(p.a, p.pos, t) + w.invMassAt(p.b, p.pos, t)
	if inv == 0 {
		return shapes.Vec3{}
	}
	stop := s / inv
	mag := stop
	if stop > math.Max(p.staticFric, p.friction)*jn {
		mag = p.friction * jn
	}
	j := t.Mul(-mag)
	w.push(p.a, p.b, p.pos, j)
	return j
}

// softContactOf finds or starts the record of the pair's compliant
// contact; fresh says it starts now.
func (w *World) softContactOf(a, b BodyID, deep *softPoint) (c *softContact, fresh bool) {
	s := &w.soft
	for i := range s.contacts {
		if c := &s.contacts[i]; c.a == a && c.b == b {
			c.seen = true
			return c, false
		}
	}
	// It began when the indentation was zero, found from the speed; a
	// sub-step of error would be 2 percent of the duration.
	v0, start := w.approach(deep), w.time
	if v0 > 0 {
		start = math.Max(w.time-w.soft.lastH, w.time+deep.sep/v0)
	}
	s.contacts = append(s.contacts, softContact{a: a, b: b, start: start, v0: v0,
		point: deep.pos, normal: deep.n, poses: [2]shapes.Pose{w.ShapePose(a), w.ShapePose(b)}, seen: true})
	return &s.contacts[len(s.contacts)-1], true
}

// reportSoft emits the impact event of a compliant contact.
func (w *World) reportSoft(c *softContact, end float64) {
	if c.v0 <= w.softBounceThreshold() {
		return // a gentle touch, not an impact (as for rigid contacts)
	}
	w.b.maxHit[c.a] = math.Max(w.b.maxHit[c.a], c.v0)
	w.b.maxHit[c.b] = math.Max(w.b.maxHit[c.b], c.v0)
	w.emit(Event{Kind: Impact, Time: c.start, A: c.a, B: c.b, Point: c.point, Normal: c.normal, Speed: c.v0, Impulse: c.impulse,
		Compliant: true, PeakForce: c.peakF, Duration: end - c.start, PeakAcceleration: c.peakG, Poses: c.poses})
}

// invMOrZero is a body's inverse mass, 0 unless it is dynamic.
func (b *bodyData) invMOrZero(id BodyID) float64 {
	if b.kind[id] != Dynamic {
		return 0
	}
	return b.invM[id]
}

// restitutionOf is a point's restitution, 0 for a gentle contact.
func restitutionOf(p *softPoint, gentle bool) float64 {
	if gentle {
		return 0
	}
	return p.restitution
}
