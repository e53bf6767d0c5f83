package contact

import (
	"cmp"
	"slices"
)

// pairIndex is one body pair's run of points in a step: bodies a, b and
// the entries lo..hi of the step's warm points (Solver.prevPts).
type pairIndex struct {
	a, b   int32
	lo, hi int32
}

func pairOrder(x, y pairIndex) int {
	if c := cmp.Compare(x.a, y.a); c != 0 {
		return c
	}
	return cmp.Compare(x.b, y.b)
}

// matchPoints finds each point's entry in last step's memory: by Key
// (sortKeys), or else by position, and copies what the solver keeps of it
// into the point's state.
//
// A feature id can change while nothing moves: corners of an upper box that
// lie exactly on the side planes of an equal lower box are clipped as
// vertices one step and as edge crossings the next when the stack sways by
// a fraction of a micrometre, and a near tie between the two faces can swap
// the reference face. The point is the same point carrying the same load;
// losing its warm start would make it look like a new contact hit by a
// step of gravity. So a point whose key is new takes over the nearest
// unclaimed point of the same body pair within its slop of where it is
// (slop.go: at most a hundredth of a small part's radius): a distance the
// contact's features cannot cross without the contact itself changing
// (points of one manifold lie much farther apart). A fixed Slop of 0.2 mm
// would reach across the corners of a 0.2 mm part.
func (s *Solver) matchPoints(points []Point) {
	s.sortKeys(points)
	prev := s.prevPts
	s.claimed = grow(s.claimed, len(prev))
	clear(s.claimed)
	missing := false
	for i := range points {
		if k := s.match[i]; k >= 0 {
			s.claimed[k] = true
		} else {
			missing = true
		}
	}
	if missing && len(prev) > 0 {
		s.matchByPosition(points)
	}
	for i := range points {
		k := s.match[i]
		if k < 0 {
			continue
		}
		w := &prev[k]
		ps := &s.pts[i]
		ps.found, ps.prevSliding, ps.prevSlips, ps.pending, ps.held, ps.stop = true, w.sliding, w.slips, w.pending, w.held, w.stop
		ps.prevN = w.normal
	}
}

// matchByPosition matches the points left without a key match to unclaimed
// points of last step of the same pair within the point's slop, nearest
// first in the points' order.
func (s *Solver) matchByPosition(points []Point) {
	cur := 0 // a cursor over prevPair (sorted by bodies)
	for g := 0; g+1 < len(s.groups); g++ {
		lo, hi := int(s.groups[g]), int(s.groups[g+1])
		var pr *pairIndex
		for i := lo; i < hi; i++ {
			if s.match[i] >= 0 {
				continue
			}
			if pr == nil {
				k, ok := s.findPair(pairIndex{a: points[i].A, b: points[i].B}, &cur)
				if !ok {
					break
				}
				pr = &s.prevPair[k]
			}
			r := s.pts[i].slop
			best, bestD := int32(-1), r*r
			for k := pr.lo; k < pr.hi; k++ {
				if s.claimed[k] {
					continue
				}
				p, q := &points[i].Position, &s.prevPts[k].pos
				d := vec{p[0] - q[0], p[1] - q[1], p[2] - q[2]}
				if d2 := dot3(&d, &d); d2 <= bestD {
					best, bestD = k, d2
				}
			}
			if best >= 0 {
				s.match[i] = best
				s.claimed[best] = true
			}
		}
	}
}

// findPair finds pair p in prevPair from the cursor cur, which moves
// forward while the pairs asked for come in order (the broad phase's pairs
// mostly do); one asked for out of order puts it back by binary search.
func (s *Solver) findPair(p pairIndex, cur *int) (int, bool) {
	prev := s.prevPair
	k := *cur
	if k > 0 && pairOrder(prev[k-1], p) >= 0 {
		k, _ = slices.BinarySearchFunc(prev, p, pairOrder)
	}
	for k < len(prev) && pairOrder(prev[k], p) < 0 {
		k++
	}
	*cur = k
	return k, k < len(prev) && pairOrder(prev[k], p) == 0
}

// storePairs remembers this step's points by body pair for the next step's
// matchByPosition: one entry per run of points of a pair, sorted by bodies.
func (s *Solver) storePairs(points []Point) {
	s.curPair = s.curPair[:0]
	for g := 0; g+1 < len(s.groups); g++ {
		lo, hi := s.groups[g], s.groups[g+1]
		s.curPair = append(s.curPair, pairIndex{a: points[lo].A, b: points[lo].B, lo: lo, hi: hi})
	}
	if !slices.IsSortedFunc(s.curPair, pairOrder) {
		slices.SortStableFunc(s.curPair, pairOrder)
	}
	s.prevPair, s.curPair = s.curPair, s.prevPair
}
