package collide

import (
	"sort"

	"clatter/shapes"
)

// Warm-started GJK: frame coherence for pairs that touch or nearly touch
// step after step while they move. GJK converges from any starting simplex
// whose points belong to the Minkowski difference D = A - B: its
// convergence proof asks only that each new point be a support point of D
// and that the simplex be reduced to the smallest one supporting its
// closest point (Gilbert, Johnson and Keerthi 1988). So a pair's query may
// start from the simplex its last query ended with, each point re-placed as
// the same point of each shape (a hull's vertex, a box's corner, a point
// of a cylinder's rim) at the shapes' current poses: after a small motion
// that simplex already lies on or next to the closest feature of D, and
// GJK needs one or two support points where from scratch it needs five to
// ten; for shapes that overlap, last step's tetrahedron usually still holds
// the origin and GJK ends at once. This is the caching of the previous
// simplex that van den Bergen describes ("Collision Detection in
// Interactive 3D Environments", 2003, section 4.3.7, from memory; also
// Ericson, "Real-Time Collision Detection", 2005, section 9.5.4). The hull's
// support climbs start at the vertices the last query ended on.
//
// The answer is GJK's, to its tolerances: the same distance to gjkRelTol
// (it is the distance between two convex sets, whatever the start), the
// same closest points where they are unique, and for shapes that overlap a
// tetrahedron around the origin from which EPA grows the same depth to its
// tolerance. TestWarmGJKMatchesCold compares it with the cold start over
// many random poses.

// warmKeep is how many steps a pair's simplex is kept while the pair is
// not queried (its persistent points answer meanwhile, persist.go, or it
// is proved apart by its axis): any old simplex is a valid start, and one
// a few steps old is still a good one.
const warmKeep = 32

// warmSimplex is the simplex a GJK query ended with, as points of each
// shape in its own frame, and the hull vertices its support climbs ended
// on; ka and kb are the kinds of the views, in the order GJK saw them.
type warmSimplex struct {
	n      int
	ka, kb kind
	la, lb [4]vec3
	ia, ib int32
}

// warmEntry is the memory of one pair.
type warmEntry struct {
	key  uint64
	seen uint32 // the step of its last query
	a, b shapes.Shape
	s    warmSimplex
}

// warmMem holds the entries sorted by key, those first made this step
// until nextStep merges them in, and the current query's simplex.
type warmMem struct {
	step   uint32
	mem    []warmEntry
	add    []warmEntry
	cursor int

	// The current query: its key and shapes, the entry found (an index
	// into mem, or -1), its simplex (copied in, and written back once a
	// GJK query has taken it and left its own there).
	on, taken bool
	// off turns the warm start off: the tests of the apart memory compare
	// CollidePair with Collide bit for bit.
	off  bool
	key  uint64
	a, b shapes.Shape
	at   int
	s    warmSimplex
}

// begin starts the query of pair key (shapes a, b in CollidePair's order).
func (w *warmMem) begin(key uint64, a, b shapes.Shape) {
	w.on, w.taken = true, false
	w.key, w.a, w.b = key, a, b
	w.at = w.lookup(key)
}

// take hands the current query's simplex to the first GJK query of views
// a and b that can use it, or returns nil. The simplex is last step's if
// the pair was queried with the same shapes, in the same handler order.
func (w *warmMem) take(a, b *view) *warmSimplex {
	if !w.on || w.off || w.taken || !warmable(a) || !warmable(b) {
		return nil
	}
	w.taken = true
	w.s = warmSimplex{}
	if w.at >= 0 {
		if e := &w.mem[w.at]; e.a == w.a && e.b == w.b && e.s.ka == a.kind && e.s.kb == b.kind {
			w.s = e.s
		}
	}
	return &w.s
}

// end keeps what the current query's GJK ended with.
func (w *warmMem) end() {
	if w.on && w.taken {
		e := warmEntry{key: w.key, seen: w.step, a: w.a, b: w.b, s: w.s}
		if w.at >= 0 {
			w.mem[w.at] = e
		} else {
			w.add = append(w.add, e)
		}
	}
	w.on, w.a, w.b = false, nil, nil
}

// lookup returns the index of the pair's entry in mem, or -1. Queries come
// in key order, so the key is at the cursor or not there at all, most of
// the time (as in persistMem.lookup).
func (w *warmMem) lookup(key uint64) int {
	m, i := w.mem, w.cursor
	if (i == 0 || m[i-1].key < key) && (i == len(m) || m[i].key >= key) {
		if i < len(m) && m[i].key == key {
			w.cursor++
			return i
		}
		return -1
	}
	// The first entry whose key is not below key, by its index: a search
	// handed the entries by value (slices.BinarySearchFunc) copies one, a
	// simplex and all, at every probe.
	i = sort.Search(len(m), func(j int) bool { return m[j].key >= key })
	w.cursor = i
	if i == len(m) || m[i].key != key {
		return -1
	}
	w.cursor++
	return i
}

// nextStep forgets the entries not queried for warmKeep steps and merges
// in the new ones.
func (w *warmMem) nextStep() {
	n := 0
	for i := range w.mem {
		if w.step-w.mem[i].seen < warmKeep {
			if n != i {
				w.mem[n] = w.mem[i]
			}
			n++
		}
	}
	mem := mergeKeyed(w.mem, n, w.add, func(e *warmEntry) uint64 { return e.key }) // keymerge.go
	if old := len(w.mem); len(mem) < old {
		clear(w.mem[len(mem):old]) // the shapes of forgotten entries
	}
	w.mem, w.add = mem, w.add[:0]
	w.cursor = 0
	w.step++
}

// warmable reports the views whose support points can be re-placed: a
// box's corner, a hull's vertex, a cylinder's rim point, in the shape's
// own frame.
func warmable(v *view) bool {
	return v.kind == kBox || v.kind == kHull || v.kind == kCylinder
}

// gjkSupport is GJK's support point along d with the point in the
// shape's own frame (supportLocal), or of the whole shape when full.
func (v *view) gjkSupport(d vec3, full bool, start *int32) (p, l vec3) {
	if full {
		p = v.supportFull(d)
		return p, p
	}
	return v.supportLocal(d, start)
}

// supportLocal is support for a box, cylinder or hull view, with the
// point in the shape's own frame too; a hull's climb starts at vertex
// *start and leaves the vertex found there. Other views give the support
// point for both.
func (v *view) supportLocal(d vec3, start *int32) (p, l vec3) {
	switch v.kind {
	case kBox:
		m := mulT(v.rot, d)
		l = vec3{sgn(m[0]) * v.half[0], sgn(m[1]) * v.half[1], sgn(m[2]) * v.half[2]}
	case kCylinder:
		l = shapes.Cylinder{Radius: v.cylR, HalfLength: v.half[2]}.Support(mulT(v.rot, d))
	case kHull:
		i := v.hull.SupportFrom(mulT(v.rot, d), int(*start))
		*start = int32(i)
		l = v.hull.Vertices[i]
	default:
		p = v.support(d)
		return p, p
	}
	return v.pos.Add(mul(v.rot, l)), l
}

// gjkWarm re-places the simplex w at the views' poses and reduces it into
// d.smp; it returns the closest point v of the reduced simplex, v.v, and
// the largest squared length of its points (GJK's scale of rounding).
func (d *Detector) gjkWarm(a, b *view, w *warmSimplex) (v vec3, vv, maxww float64) {
	t := &d.smp2
	t.n = w.n
	for i := 0; i < w.n; i++ {
		t.la[i], t.lb[i] = w.la[i], w.lb[i]
		t.a[i], t.b[i] = a.place(w.la[i]), b.place(w.lb[i])
		t.w[i] = t.a[i].Sub(t.b[i])
		maxww = max(maxww, t.w[i].Dot(t.w[i]))
	}
	v = t.reduceInto(&d.smp)
	return v, v.Dot(v), maxww
}

// keep leaves in w (if not nil) the simplex s that a query of views a and
// b ended with, and the vertices ia and ib its hull climbs ended on.
func (w *warmSimplex) keep(a, b *view, s *simplex, ia, ib int32) {
	if w == nil {
		return
	}
	w.n, w.ka, w.kb, w.ia, w.ib = s.n, a.kind, b.kind, ia, ib
	copy(w.la[:s.n], s.la[:s.n])
	copy(w.lb[:s.n], s.lb[:s.n])
}

// place returns the frame point of local point l of the view.
func (v *view) place(l vec3) vec3 { return v.pos.Add(mul(v.rot, l)) }
