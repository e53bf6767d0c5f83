package broad

import (
	"math"
	"slices"
)

// Still bodies. Static and sleeping bodies do not move, so their proxies
// are kept apart from the awake ones, sorted once when they change rather
// than refreshed and re-sorted every call, and only the awake proxies are
// swept: against each other as before, and each against the still list by
// a binary search for the still boxes that can reach it along the sweep
// axis. A world at rest then costs the broad phase what its awake bodies
// cost (the still boxes are never tested against each other, as no pair of
// them is ever reported).

// bigReach is the length along the sweep axis, in multiples of the still
// boxes' mean, beyond which a still box is tested against every awake box
// instead of being found by the search: the search looks back from each
// awake box by the longest of the others, so one long fixture would
// otherwise make every search walk over all the boxes before it.
const bigReach = 4

// stillSet holds the proxies of the still bodies, sorted by lo.
type stillSet struct {
	p       []proxy
	big     []int32 // indices into p of the boxes longer than bigReach means, ascending
	reach   float64 // longest of the other boxes along the sweep axis
	dirty   bool    // p must be refreshed from the slots and sorted again
	reclass bool    // some listed body fell asleep or woke
	// Spread sums of p's box centres taken relative to ref (see gather).
	sums spreadSums
	ref  [3]float64
}

// addStill lists a new static or sleeping body.
func (s *SAP) addStill(id int32) {
	s.slots[id].flags |= fStill
	s.still.p = append(s.still.p, proxy{id: id})
	s.still.dirty = true
}

// reclassify moves the proxies whose bodies fell asleep to the still list
// and those that woke to s.fresh, to be merged into the awake list.
func (s *SAP) reclassify() {
	st := &s.still
	n := len(st.p)
	w := 0
	for _, q := range s.p {
		if s.slots[q.id].awake() {
			s.p[w] = q
			w++
		} else {
			s.slots[q.id].flags |= fStill
			st.p = append(st.p, q)
			st.dirty = true
		}
	}
	s.p = s.p[:w]
	w = 0
	for k, q := range st.p {
		if k < n && s.slots[q.id].awake() {
			s.slots[q.id].flags &^= fStill
			s.fresh = append(s.fresh, q)
			st.dirty = true
			continue
		}
		st.p[w] = q
		w++
	}
	st.p = st.p[:w]
	st.reclass = false
}

// stillSpread adds the still boxes' spread to st, refreshing the still
// proxies first if they changed.
func (s *SAP) stillSpread(st *spreadSums) {
	ss := &s.still
	if ss.dirty {
		ss.sums, ss.ref = spreadSums{}, s.ref
		s.gather(ss.p, &ss.sums)
	}
	// The sums were taken about ss.ref; shift them to s.ref:
	// with d' = d - delta, sum d' = s1 - n delta and
	// sum d'^2 = s2 - 2 delta s1 + n delta^2.
	for ax := 0; ax < 3; ax++ {
		n, s1, s2 := ss.sums.n[ax], ss.sums.s1[ax], ss.sums.s2[ax]
		delta := s.ref[ax] - ss.ref[ax]
		st.n[ax] += n
		st.s1[ax] += s1 - n*delta
		st.s2[ax] += s2 - 2*delta*s1 + n*delta*delta
	}
}

// arrangeStill puts the still proxies in the current axis order (they were
// gathered in order old) and sorts them, if they changed or the axes did.
func (s *SAP) arrangeStill(old [3]int) {
	ss := &s.still
	if s.axes != old {
		s.remap(ss.p, old)
	}
	if !ss.dirty && s.axes[0] == old[0] {
		return
	}
	ss.dirty = false
	if !insertionSort(ss.p, len(ss.p)) {
		slices.SortFunc(ss.p, cmpProxy)
	}
	// Split off the long boxes.
	sum, n := 0.0, 0
	for k := range ss.p {
		if l := ss.p[k].hi - ss.p[k].lo; l <= math.MaxFloat64 {
			sum += l
			n++
		}
	}
	limit := math.Inf(1)
	if n > 0 {
		limit = bigReach * sum / float64(n)
	}
	ss.big, ss.reach = ss.big[:0], 0
	for k := range ss.p {
		if l := ss.p[k].hi - ss.p[k].lo; l <= limit {
			ss.reach = math.Max(ss.reach, l)
		} else {
			ss.big = append(ss.big, int32(k))
		}
	}
}

// sweepStill appends the pairs of each awake box with the still boxes.
func (s *SAP) sweepStill(dst [][2]int32) [][2]int32 {
	st := s.still.p
	if len(st) == 0 {
		return dst
	}
	reach, big := s.still.reach, s.still.big
	for i := range s.p {
		q := &s.p[i]
		// The first still box starting at or after q.lo - reach: none
		// before it, save the long ones, reaches q.
		from := q.lo - reach
		lo, hi := 0, len(st)
		for lo < hi {
			m := int(uint(lo+hi) >> 1)
			if st[m].lo < from {
				lo = m + 1
			} else {
				hi = m
			}
		}
		for _, k := range big {
			if int(k) >= lo {
				break
			}
			if r := &st[k]; r.hi >= q.lo && overlapRest(q, r) {
				dst = s.report(dst, q.id, r.id)
			}
		}
		for k := lo; k < len(st) && st[k].lo <= q.hi; k++ {
			if r := &st[k]; r.hi >= q.lo && overlapRest(q, r) {
				dst = s.report(dst, q.id, r.id)
			}
		}
	}
	return dst
}

// overlapRest reports whether two boxes overlap on the two axes after the sweep axis.
func overlapRest(q, r *proxy) bool {
	return !(r.lo1 > q.hi1 || r.hi1 < q.lo1 || r.lo2 > q.hi2 || r.hi2 < q.lo2)
}
