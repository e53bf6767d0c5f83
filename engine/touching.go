package engine

// Touching pairs at rest. The narrow phase examines only pairs with an
// awake body, so the pairs of two sleeping (or sleeping and static) bodies
// are not found again while they sleep. They are kept aside, unsorted, in
// restState, rather than carried in the step's list: the step's events,
// islands and Touching queries then cost what the awake pairs cost. A pair
// returns to the step's comparison when one of its bodies wakes.

// restState holds the touching pairs of still bodies.
type restState struct {
	pairs  []touchPair
	count  []int32 // by body: how many of pairs hold it
	woke   bool    // a body woke since the last contactEvents
	out    []touchPair
	merged []touchPair
	// mark[id] == stamp: body id is in the step's touching list.
	mark  []uint32
	stamp uint32
}

// keepResting sets aside a touching pair whose bodies are both still.
func (w *World) keepResting(p touchPair) {
	r := &w.collision.rest
	for len(r.count) < len(w.b.kind) {
		r.count = append(r.count, 0)
	}
	r.pairs = append(r.pairs, p)
	r.count[p.a]++
	r.count[p.b]++
}

// wokenPairs takes back the pairs set aside of which a body has woken and
// returns prev with them merged in, in order.
func (w *World) wokenPairs(prev []touchPair) []touchPair {
	r := &w.collision.rest
	r.woke = false
	r.out = r.out[:0]
	k := 0
	for _, p := range r.pairs {
		if w.b.awake[p.a] || w.b.awake[p.b] {
			r.out = append(r.out, p)
			r.count[p.a]--
			r.count[p.b]--
		} else {
			r.pairs[k] = p
			k++
		}
	}
	r.pairs = r.pairs[:k]
	if len(r.out) == 0 {
		return prev
	}
	sortTouching(r.out)
	r.merged = r.merged[:0]
	i, j := 0, 0
	for i < len(prev) && j < len(r.out) {
		if touchLess(prev[i], r.out[j]) {
			r.merged = append(r.merged, prev[i])
			i++
		} else {
			r.merged = append(r.merged, r.out[j])
			j++
		}
	}
	r.merged = append(r.merged, prev[i:]...)
	r.merged = append(r.merged, r.out[j:]...)
	return r.merged
}

// markTouching records the bodies of the step's touching pairs for Touching.
func (w *World) markTouching() {
	r := &w.collision.rest
	for len(r.mark) < len(w.b.kind) {
		r.mark = append(r.mark, 0)
	}
	if r.stamp++; r.stamp == 0 {
		clear(r.mark)
		r.stamp = 1
	}
	for _, p := range w.collision.touching {
		r.mark[p.a], r.mark[p.b] = r.stamp, r.stamp
	}
}

func touchLess(x, y touchPair) bool {
	return x.a < y.a || x.a == y.a && x.b < y.b
}
