package contact

import "clatter/shapes"

// The solver's compact body arrays.
//
// A Body is 248 bytes, of which a sweep reads and writes the 48 of V and W.
// Solve therefore gathers the velocities of the bodies that its points and
// rows join into a slice of their own, in the order the points first name
// them (slots), works on it, and scatters the result back. A world of
// thousands of bodies with a few in contact (the rest asleep, or apart)
// costs the solver only those few.
//
// Bodies that cannot move and do not move (static bodies: no inverse mass or
// inertia, no velocity) all share slot 0, the fixed slot, whose velocities
// stay zero: the rows skip its side, half the work of a part on a floor.

// sbody is one body's velocities in the solver: real, pseudo or force.
type sbody struct{ v, w vec }

// fixedSlot is the slot of every body that cannot move and does not.
const fixedSlot = 0

// slots is the mapping between the caller's body indices and the solver's.
type slots struct {
	of    []int32   // slot of each body index, -1 if none; all -1 between Solves
	gid   []int32   // body index of each slot, -1 for the fixed slot
	fixed []int32   // the bodies in the fixed slot
	vel   []sbody   // V, W of each slot: what the sweeps work on
	ps    []sbody   // Vp, Wp: the position pass's pseudo-velocities
	fv    []sbody   // DV, DW: this step's force velocities
	fs    []sbody   // fv without what supports take up (supported.go)
	im    []float64 // InvMass
	cap   []float64 // turnCap of Size: the rows' bound on stopping errors (turn.go)
}

// slotOf gives body i a slot if it has none.
func (s *slots) slotOf(bodies []Body, i int32) {
	if s.of[i] >= 0 {
		return
	}
	if isFixed(&bodies[i]) {
		s.of[i] = fixedSlot
		s.fixed = append(s.fixed, i)
		return
	}
	s.of[i] = int32(len(s.gid))
	s.gid = append(s.gid, i)
}

// isFixed reports whether b neither moves nor can be moved.
func isFixed(b *Body) bool {
	return b.InvMass == 0 && b.InvInertia == (shapes.Mat3{}) &&
		b.V == (vec{}) && b.W == (vec{}) && b.DV == (vec{}) && b.DW == (vec{})
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
	s.gid, s.fixed = append(s.gid[:0], -1), s.fixed[:0]
	for i := range points {
		s.slotOf(bodies, points[i].A)
		s.slotOf(bodies, points[i].B)
	}
	for j := range rows {
		s.slotOf(bodies, rows[j].A)
		s.slotOf(bodies, rows[j].B)
	}
	n := len(s.gid)
	s.vel, s.ps, s.fv, s.im, s.cap = grow(s.vel, n), grow(s.ps, n), grow(s.fv, n), grow(s.im, n), grow(s.cap, n)
	s.vel[fixedSlot], s.fv[fixedSlot], s.im[fixedSlot], s.cap[fixedSlot] = sbody{}, sbody{}, 0, turnCap(0)
	for k := 1; k < n; k++ {
		b := &bodies[s.gid[k]]
		s.vel[k] = sbody{b.V, b.W}
		s.fv[k] = sbody{b.DV, b.DW}
		s.im[k] = b.InvMass
		s.cap[k] = turnCap(b.Size)
	}
}

// scatter writes the slots' velocities and pseudo-velocities back to their
// bodies, zeroes the pseudo-velocities of the others and frees the slots.
// The velocities of bodies without a slot of their own are left as they
// came.
func (s *slots) scatter(bodies []Body) {
	for i := range bodies {
		bodies[i].Vp, bodies[i].Wp = vec{}, vec{}
	}
	for k := 1; k < len(s.gid); k++ {
		i := s.gid[k]
		b := &bodies[i]
		b.V, b.W = s.vel[k].v, s.vel[k].w
		b.Vp, b.Wp = s.ps[k].v, s.ps[k].w
		s.of[i] = -1
	}
	for _, i := range s.fixed {
		s.of[i] = -1
	}
}

// addForces adds sign times this step's force velocities to the slots'
// velocities.
func (s *slots) addForces(sign float64) {
	for k := 1; k < len(s.vel); k++ {
		f := &s.fv[k]
		if f.v != (vec{}) || f.w != (vec{}) {
			addScaled(&s.vel[k].v, &f.v, sign)
			addScaled(&s.vel[k].w, &f.w, sign)
		}
	}
}
