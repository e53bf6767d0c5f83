package collide

import (
	"cmp"
	"math"
	"slices"

	"clatter/shapes"
)

// Temporal coherence between steps: most candidate pairs of a resting pile
// are apart, and the axis that separated a pair last step almost always
// separates it again. CollidePair remembers that axis per pair and tests it
// first. The memory only ever ends a query early when the axis proves what
// the full query would also find (no contact within the margin), so the
// results are the same as those of Collide, query by query:
//
//   - a direction of the general path gives a lower bound on the distance,
//     which GJK's distance (an upper bound) cannot undercut;
//   - an axis of the separating-axis test is one that the test itself
//     tries: a face normal of one of the shapes at its current pose, or the
//     cross product of two box axes. Where the Gauss map decides whether an
//     edge pair is tried (hulls), the test's own loop checks the
//     remembered pair first, on its own arithmetic.
//
// A pair the axis proved apart keeps the gap it measured, and later steps
// prove it apart again by how far that gap can have closed since, without
// measuring the axis (apartbound.go).
//
// The quick test outside the query's frames works in world coordinates, so
// it asks for a gap beyond the margin by memBand, far above the rounding of
// either computation and above GJK's touching tolerance.

// hint kinds: what a pair's memory holds.
const (
	hintNone  uint8 = iota
	hintDir         // a world direction from A to B (general path)
	hintFaceP       // face i of P (separating-axis test; P and Q as polytopes orders them)
	hintFaceQ       // face i of Q
	hintEdge        // edge i of P against edge j of Q (boxes: axis i of P, axis j of Q)
)

// memBand, relative to the shapes' sizes plus their distances from the
// origin: how far beyond the margin the quick test wants the gap. Rounding
// of either computation is about 1e-15 of those lengths; GJK treats cores
// closer than coreTouch (1e-9) of the sizes as overlapping.
const memBand = 1e-8

// pairHint is the memory of one pair.
type pairHint struct {
	key  uint64
	kind uint8
	// swap: the separating-axis test's P is the query's B (the test orders
	// a box before a hull).
	swap bool
	i, j int32
	// dir is the world direction of hintDir; for face hints the face's
	// outward normal in its own shape's frame, with off its plane offset.
	dir vec3
	off float64
	// va, vb: the hull vertices of A and B that were last extreme along
	// the direction, where the next search starts.
	va, vb int32
	// ref: the gap the axis last measured and the pose then (apartbound.go).
	ref apartRef
	// seq orders the hints kept this step: a hint of last step's list is
	// kept for the next when seq is past the step's start (pairCache.from).
	seq uint64
}

// pairCache holds last step's hints sorted by key and the new ones this
// step makes. A hint of last step that serves again stays where it is,
// marked (keepHint), rather than being copied.
type pairCache struct {
	prev, cur []pairHint
	cursor    int    // where the next lookup in prev starts (queries come in key order)
	seq, from uint64 // counts the hints kept; its value when the step began
	on        bool
	swapped   bool     // the current query's pair handler sees B before A
	in, out   pairHint // the current query's hint from last step, and for the next
}

// lookup returns the pair's hint from last step, in place, or nil.
func (c *pairCache) lookup(key uint64) *pairHint {
	p, i := c.prev, c.cursor
	// Queries come in key order: the key is at the cursor, or between it
	// and the hint before (a pair new this step has none), as in
	// persistMem.lookup.
	if (i == 0 || p[i-1].key < key) && (i == len(p) || p[i].key >= key) {
		if i < len(p) && p[i].key == key {
			c.cursor++
			return &p[i]
		}
		return nil
	}
	i, ok := slices.BinarySearchFunc(p, key, func(h pairHint, k uint64) int { return cmp.Compare(h.key, k) })
	if !ok {
		c.cursor = i
		return nil
	}
	c.cursor = i + 1
	return &p[i]
}

// collideHinted is CollidePair's query (persist.go) for a pair with no
// persistent points: it returns the same manifolds as Collide, and uses
// the axis that separated the pair last step to prove it apart sooner
// (and, on the general path, GJK starts from the pair's last simplex:
// the same manifolds to GJK's and EPA's tolerances, gjkwarm.go).
func (d *Detector) collideHinted(dst []Manifold, key uint64, a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose, margin float64) []Manifold {
	c := &d.cache
	if !(margin >= 0) || math.IsInf(margin, 0) {
		margin = 0
	}
	// The hint is read and updated in place: last step's list is not read
	// again once this step's is made.
	h := c.lookup(key)
	// The bound first: a pose that is not finite makes it NaN or infinite,
	// and it proves nothing (apartbound.go). It holds only for the shapes
	// it was made with, which were plain convex ones, so the most common
	// pair, apart and resting, skips the tests of the shapes' kinds.
	if h != nil && h.kind != hintNone && d.boundedApart(h, a, pa, b, pb, margin) {
		c.keepHint(h)
		d.stats.Remembered++
		return dst
	}
	if !plainConvex(a) || !plainConvex(b) {
		return d.Collide(dst, a, pa, b, pb, margin)
	}
	if h != nil && h.kind != hintNone && finitePose(pa) && finitePose(pb) && d.measuredApart(h, a, pa, b, pb, margin) {
		c.keepHint(h)
		d.stats.Remembered++
		return dst
	}
	if !finitePose(pa) || !finitePose(pb) {
		return dst
	}
	c.in = pairHint{}
	if h != nil {
		c.in = *h
	}
	c.out = pairHint{key: key}
	c.on, c.swapped = true, false
	d.warm.begin(key, a, b)
	dst = d.Collide(dst, a, pa, b, pb, margin)
	d.warm.end()
	c.on = false
	if o := &c.out; o.kind != hintNone {
		o.swap = c.swapped
		switch o.kind {
		case hintDir:
			// Found in A's frame, from the handler's first shape to its second.
			o.dir = pa.Orientation.Rotate(o.dir)
			if c.swapped {
				o.dir = o.dir.Mul(-1)
			}
		case hintFaceP, hintFaceQ:
			owner := a
			if (o.kind == hintFaceQ) != o.swap {
				owner = b
			}
			o.dir, o.off = faceOf(owner, int(o.i))
		}
		c.seq++
		c.out.seq = c.seq
		c.cur = append(c.cur, c.out)
	}
	return dst
}

// keepHint keeps last step's hint h, as it is now, for the next step.
func (c *pairCache) keepHint(h *pairHint) {
	c.seq++
	h.seq = c.seq
}

// NextStep ends a step of CollidePair queries: what they found becomes the
// memory for the next step, and pairs not queried this step are forgotten.
func (d *Detector) NextStep() {
	d.persist.nextStep() // persistent manifolds (persist.go)
	d.warm.nextStep()    // GJK simplices (gjkwarm.go)
	d.cache.nextStep()
}

// nextStep makes the hints kept and made this step the list the next step
// looks up, sorted by key; a key queried twice in one step keeps its last
// hint (the larger seq).
func (c *pairCache) nextStep() {
	n := 0
	for i := range c.prev {
		if c.prev[i].seq > c.from {
			if n != i { // hints stay put until one is forgotten
				c.prev[n] = c.prev[i]
			}
			n++
		}
	}
	add := c.cur
	if !slices.IsSortedFunc(add, cmpHint) {
		slices.SortStableFunc(add, cmpHint)
	}
	k := 0
	for i := range add {
		if k > 0 && add[k-1].key == add[i].key {
			add[k-1] = add[i]
			continue
		}
		if k != i {
			add[k] = add[i]
		}
		k++
	}
	// Merge from the back, in place; of two hints of one key the later.
	prev := slices.Grow(c.prev[:n], k)[:n+k]
	i, j, w := n-1, k-1, n+k-1
	for ; j >= 0; w-- {
		switch {
		case i >= 0 && prev[i].key > add[j].key:
			prev[w] = prev[i]
			i--
		case i >= 0 && prev[i].key == add[j].key:
			if prev[i].seq > add[j].seq {
				prev[w] = prev[i]
			} else {
				prev[w] = add[j]
			}
			i--
			j--
		default:
			prev[w] = add[j]
			j--
		}
	}
	// The merge fills prev[w+1:], and prev[:i+1] is still in place in
	// front of it; a key in both lists left a slot free between them.
	if start := w - i; start > 0 {
		if i >= 0 {
			copy(prev[start:], prev[:i+1])
		}
		prev = prev[:copy(prev, prev[start:])]
	}
	c.prev, c.cur = prev, add[:0]
	c.cursor = 0
	c.from = c.seq
}

func cmpHint(a, b pairHint) int { return cmp.Compare(a.key, b.key) }

// remember keeps the axis that separated the current query for the next step.
func (d *Detector) remember(r satResult) {
	c := &d.cache
	if !c.on || r.fail.kind == hintNone {
		return
	}
	c.out.kind, c.out.i, c.out.j = r.fail.kind, r.fail.i, r.fail.j
	if r.hinted {
		d.stats.Remembered++
	}
}

// plainConvex reports shapes whose pairs the memory serves: convex shapes
// other than planes (compounds and meshes have several pieces per pair).
func plainConvex(s shapes.Shape) bool {
	switch s.(type) {
	case shapes.Box, shapes.Cylinder, *shapes.Hull, shapes.Sphere, shapes.Capsule:
		return true
	}
	return false
}

// faceOf returns face i's outward normal and plane offset in the frame of
// box or hull s (box faces in the order +x, -x, +y, -y, +z, -z).
func faceOf(s shapes.Shape, i int) (vec3, float64) {
	switch c := s.(type) {
	case shapes.Box:
		if i >= 0 && i < 6 {
			var n vec3
			n[i/2] = 1 - 2*float64(i%2)
			return n, c.Half[i/2]
		}
	case *shapes.Hull:
		if c != nil && i >= 0 && i < len(c.Faces) {
			return c.Faces[i].Normal, c.Faces[i].Offset
		}
	}
	return vec3{}, 0
}

// extent returns the largest value of n.x over shape s at pose p (n a
// world unit vector), starting a hull's search at vertex *start and leaving
// the extreme vertex there.
func extent(s shapes.Shape, p shapes.Pose, n vec3, start *int32) float64 {
	l := p.Orientation.Conjugate().Rotate(n)
	e := n.Dot(p.Position)
	switch c := s.(type) {
	case shapes.Box:
		return e + c.Half[0]*math.Abs(l[0]) + c.Half[1]*math.Abs(l[1]) + c.Half[2]*math.Abs(l[2])
	case shapes.Sphere:
		return e + c.Radius
	case shapes.Capsule:
		return e + c.HalfLength*math.Abs(l[2]) + c.Radius
	case shapes.Cylinder:
		return e + c.HalfLength*math.Abs(l[2]) + c.Radius*math.Hypot(l[0], l[1])
	case *shapes.Hull:
		i := c.SupportFrom(l, int(*start))
		*start = int32(i)
		return e + c.Vertices[i].Dot(l)
	}
	return math.Inf(1)
}

// radius is a bound on the distance of s's points from its frame's origin
// (zero for shapes the memory does not serve).
func radius(s shapes.Shape) float64 {
	switch c := s.(type) {
	case shapes.Box:
		return c.Half.Len()
	case shapes.Sphere:
		return c.Radius
	case shapes.Capsule:
		return c.Radius + c.HalfLength
	case shapes.Cylinder:
		return math.Hypot(c.Radius, c.HalfLength)
	case *shapes.Hull:
		b := c.Bounds()
		return 0.5*b.Size().Len() + b.Center().Len()
	}
	return 0
}

// hintGap returns the gap between shape a at pa and b at pb along the
// remembered axis h at the current poses, or reports that h cannot measure
// it (an edge pair of hulls, a degenerate axis).
func hintGap(h *pairHint, a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose) (float64, bool) {
	var gap float64
	switch h.kind {
	case hintDir:
		n := h.dir
		gap = -extent(b, pb, n.Mul(-1), &h.vb) - extent(a, pa, n, &h.va)
	case hintFaceP, hintFaceQ:
		// The face's owner and the other shape.
		po, sx, px, vx := pa, b, pb, &h.vb
		if (h.kind == hintFaceQ) != h.swap {
			po, sx, px, vx = pb, a, pa, &h.va
		}
		n := po.Orientation.Rotate(h.dir)
		if n == (vec3{}) {
			return 0, false
		}
		gap = -extent(sx, px, n.Mul(-1), vx) - (n.Dot(po.Position) + h.off)
	case hintEdge:
		ba, okA := a.(shapes.Box)
		bb, okB := b.(shapes.Box)
		if okA != okB {
			return boxHullEdgeGap(h, a, pa, b, pb) // apartedge.go
		}
		if !okA || !okB || h.i < 0 || h.i > 2 || h.j < 0 || h.j > 2 {
			return 0, false // edges of two hulls: the test's own loop checks them
		}
		ra, rb := shapes.RotationMatrix(pa.Orientation), shapes.RotationMatrix(pb.Orientation)
		pi, qj := int(h.i), int(h.j)
		if h.swap {
			pi, qj = qj, pi
		}
		ax := col(ra, pi).Cross(col(rb, qj))
		l := ax.Len()
		if l <= 2*satParallel {
			return 0, false
		}
		ax = ax.Mul(1 / l)
		gap = math.Abs(ax.Dot(pb.Position.Sub(pa.Position)))
		for k := 0; k < 3; k++ {
			gap -= ba.Half[k]*math.Abs(ax.Dot(col(ra, k))) + bb.Half[k]*math.Abs(ax.Dot(col(rb, k)))
		}
	default:
		return 0, false
	}
	return gap, true
}
