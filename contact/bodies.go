package contact

// The solver's compact body arrays.
//
// A Body is 248 bytes, of which a sweep reads and writes the 48 of V and W.
// Solve therefore gathers the velocities of the bodies that its points and
// rows join into a slice of their own, in the order the points first name
// them (slots), works on it, and scatters the result back. A world of
// thousands of bodies with a few in contact (the rest asleep, or apart)
// costs the solver only those few.

// sbody is one body's velocities in the solver: real, pseudo or force.
type sbody struct{ v, w vec }

// slots is the mapping between the caller's body indices and the solver's.
type slots struct {
	of  []int32   // slot of each body index, -1 if none; all -1 between Solves
	gid []int32   // body index of each slot
	vel []sbody   // V, W of each slot: what the sweeps work on
	ps  []sbody   // Vp, Wp: the position pass's pseudo-velocities
	fv  []sbody   // DV, DW: this step's force velocities
	im  []float64 // InvMass
}

// slotOf returns the slot of body i, giving it the next one if it has none.
func (s *slots) slotOf(i int32) int32 {
	if k := s.of[i]; k >= 0 {
		return k
	}
	k := int32(len(s.gid))
	s.of[i] = k
	s.gid = append(s.gid, i)
	return k
}

// gather assigns slots to the bodies of points and rows, in the order they
// are named, and copies their velocities.
func (s *slots) gather(bodies []Body, points []Point, rows []Row) {
	if len(s.of) < len(bodies) {
		n := len(s.of)
		s.of = append(s.of, make([]int32, len(bodies)-n)...)
		for i := n; i < len(s.of); i++ {
			s.of[i] = -1
		}
	}
	s.gid = s.gid[:0]
	for i := range points {
		s.slotOf(points[i].A)
		s.slotOf(points[i].B)
	}
	for j := range rows {
		s.slotOf(rows[j].A)
		s.slotOf(rows[j].B)
	}
	n := len(s.gid)
	s.vel, s.ps, s.fv, s.im = grow(s.vel, n), grow(s.ps, n), grow(s.fv, n), grow(s.im, n)
	for k, i := range s.gid {
		b := &bodies[i]
		s.vel[k] = sbody{b.V, b.W}
		s.fv[k] = sbody{b.DV, b.DW}
		s.im[k] = b.InvMass
	}
}

// scatter writes the slots' velocities and pseudo-velocities back to their
// bodies, zeroes the pseudo-velocities of the others and frees the slots.
// The velocities of bodies without a slot are left as they came.
func (s *slots) scatter(bodies []Body) {
	for i := range bodies {
		bodies[i].Vp, bodies[i].Wp = vec{}, vec{}
	}
	for k, i := range s.gid {
		b := &bodies[i]
		b.V, b.W = s.vel[k].v, s.vel[k].w
		b.Vp, b.Wp = s.ps[k].v, s.ps[k].w
		s.of[i] = -1
	}
}

// addForces adds sign times this step's force velocities to the slots'
// velocities.
func (s *slots) addForces(sign float64) {
	for k := range s.vel {
		f := &s.fv[k]
		if f.v != (vec{}) || f.w != (vec{}) {
			addScaled(&s.vel[k].v, &f.v, sign)
			addScaled(&s.vel[k].w, &f.w, sign)
		}
	}
}
