package contact

import "math"

// Forces that supports take up.
//
// Whether a speculative point's gap closes within the step, and the speed
// at which it arrives (arrivalSpeed), follow from the bodies' approach and
// what this step's forces add to it. A body that rests on a support gains
// none of the velocity its weight would give it: the support takes it up.
// Counted as if free, the weight of a box resting on the floor cancelled
// that of a box falling onto it, and the falling box's gap was judged by
// its speed before the step alone: at 1/120 s a box dropped 8.6 mm onto a
// resting one was found to stay apart in the step it landed, was stopped
// at the gap by the velocity solve as a resting contact and never bounced
// (e = 0.93; measured); at 1 ms its deferred impact arrived without the
// last step's fall and it rebounded to 0.955 of e^2 h.
//
// supportedForces writes the force velocities with what supports take up
// removed into s.sl.fs. For every point that carried load last step (its
// normal impulse, prevN, above zero), each of its bodies that is at rest
// (resting) and whose force velocity presses into the contact keeps none
// of the pressing part, and of the part along the surface loses what
// friction can hold, up to mu times the pressing part (Coulomb; the static
// coefficient unless the point slid last step). A resting pile's bodies so
// keep none of their weight, and the gaps between them keep still; bodies
// falling free, sliding or turning keep all of it, as before.
func (s *Solver) supportedForces(bodies []Body) {
	sl := &s.sl
	sl.fs = grow(sl.fs, len(sl.fv))
	copy(sl.fs, sl.fv)
	for i := range s.pts {
		ps := &s.pts[i]
		if !ps.found || !(ps.prevN > 0) {
			continue
		}
		mu := ps.muS
		if ps.prevSliding {
			mu = ps.mu
		}
		// The row's direction d separates B from A: B presses along -d,
		// A along +d.
		// A body whose weight an earlier point took up is passed over
		// at once: a resting pile asks resting once or twice a body.
		rn := &s.nrows[i]
		if f := &sl.fs[rn.b].v; rn.b != fixedSlot && *f != (vec{}) && s.resting(bodies, rn.b) {
			takeUp(f, &rn.d, -1, mu)
		}
		if f := &sl.fs[rn.a].v; rn.a != fixedSlot && *f != (vec{}) && s.resting(bodies, rn.a) {
			takeUp(f, &rn.d, 1, mu)
		}
	}
}

// resting reports whether the body in slot k moves slower, at its centre
// and at its bounding radius, than one step of its own forces would move
// it: at rest on its supports, which then take up its weight. A body
// turning about a support (tipping, rocking onto a face) is accelerated by
// its weight's torque about it, which the force velocities do not show;
// it keeps them as they are, the approach of its other points then
// counted with its whole weight as before (a cube tipping about an edge
// brings its far edge down at 3/4 g as it lands flat: counted as g, not 0).
func (s *Solver) resting(bodies []Body, k int32) bool {
	v, f := &s.sl.vel[k], &s.sl.fv[k]
	step := math.Sqrt(dot3(&f.v, &f.v))
	size := bodies[s.sl.gid[k]].Size
	return math.Sqrt(dot3(&v.v, &v.v))+size*math.Sqrt(dot3(&v.w, &v.w)) <= step
}

// takeUp removes from force velocity f what a support of normal sign*d
// (unit d; sign*d points into the support) and friction coefficient mu
// takes up: the part pressing into it, and of the part along it up to mu
// times that.
func takeUp(f, d *vec, sign, mu float64) {
	p := sign * dot3(f, d) // how fast f presses into the support
	if !(p > 0) {
		return
	}
	addScaled(f, d, -sign*p)
	t := math.Sqrt(dot3(f, f)) // what is left lies along the surface
	if t <= mu*p {
		*f = vec{}
		return
	}
	scale := 1 - mu*p/t
	*f = vec{f[0] * scale, f[1] * scale, f[2] * scale}
}
