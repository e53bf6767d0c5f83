package collide

import (
	"cmp"
	"math"
	"runtime"
	"slices"
	"sync"
	"weak"

	"clatter/shapes"
)

// A large hull's faces, and its edges, grouped by the direction of their
// normals, so that a query can bound the gaps of a whole group at once and
// skip the groups that cannot hold its answer (branch and bound over a
// bounding hierarchy: Ericson, "Real-Time Collision Detection", 2005,
// chapter 6; the groups are cones of normals on the Gauss map, as the normal
// cones of D. Johnson and E. Cohen, "Spatialized normal cone hierarchies",
// ACM Symposium on Interactive 3D Graphics, 2001).
//
// A node of a tree holds a range of faces (or edges) and a cone that
// contains their normals: an axis a and a chord eps, |n - a| <= eps for
// every face normal n of the range, or for every normal on an edge's arc
// (between its two faces' normals). A spherical cap narrower than a half
// sphere contains the great-circle arc between any two of its points, so
// the cone of an edge node only has to contain its edges' face normals. The
// node keeps beside the cone what the bounds of boxhulltree.go need: a
// centre o of its features and the largest value of an expression over
// them.

// hullIndexFaces is the face count from which a hull gets an index: below
// it the plain loops over all faces and edges cost less than the trees
// (measured for part-sized boxes on random hulls: the trees cost 1.5 times
// the loops at 76 faces, 1.15 times at 196, half at 396).
const hullIndexFaces = 256

// hullLeaf is the most faces or edges of a leaf.
const hullLeaf = 6

// hullIndexCap bounds the number of hulls a Detector keeps indexes of;
// beyond it the cache starts again (indexes are rebuilt when needed).
const hullIndexCap = 256

// coneNode is a node of a cone tree.
type coneNode struct {
	a, o vec3    // the cone's axis (unit) and a centre of the node's features
	eps  float64 // the cone's chord (see edgeWidth for an edge node's)
	// top is the largest n.o - offset over a face node's faces, and the
	// largest a.(o - q0) + eps |o - q0| over an edge node's edges' first
	// vertices q0.
	top float64
	// w is the largest edgeWidth of an edge node's edges.
	w      float64
	kid    [2]int32 // children, or -1 in a leaf
	i0, i1 int32    // the node's features: items[i0:i1]
}

// coneTree is a tree over the faces or the edges of a hull.
type coneTree struct {
	nodes []coneNode
	items []int32 // face or edge indices in tree order
}

// hullIndex is a hull's two trees and its face planes in its own frame. It
// holds no pointer to the hull, so that the shared cache does not keep
// hulls alive; nv, nf and ne are the hull's counts when it was built.
type hullIndex struct {
	nv, nf, ne   int
	faces, edges coneTree
	planes       []plane   // the hull's faces as planes, in its own frame
	reach        float64   // the largest |v| of the vertices
	centre       vec3      // the mean of the vertices, a point inside the hull
	slack        hullSlack // the hull's tolerances in the test's gaps (boxhullrest.go)
}

// hullIndexes is a Detector's cache of hull indexes, in front of the
// shared one.
type hullIndexes struct {
	m map[*shapes.Hull]*hullIndex
}

// sharedIndexes holds the index of every hull alive that was queried, for
// all Detectors: a study builds a world (and a Detector) per trial, and the
// index of its part is built once. An index is read-only once built. The
// keys are weak, and a hull's entry goes when the hull is collected.
var sharedIndexes struct {
	sync.Mutex
	m map[weak.Pointer[shapes.Hull]]*hullIndex
}

// fits reports whether x was built for a hull of h's size (a hull is not
// meant to change once built; this catches a hull rebuilt in place).
func (x *hullIndex) fits(h *shapes.Hull) bool {
	return x != nil && x.nv == len(h.Vertices) && x.nf == len(h.Faces) && x.ne == len(h.Edges)
}

// hullIndexFor returns the index of hull h, built on first use, or nil when
// h is small enough for the plain loops.
func (d *Detector) hullIndexFor(h *shapes.Hull) *hullIndex {
	if h == nil || len(h.Faces) < hullIndexFaces {
		return nil
	}
	return d.cachedIndex(h)
}

// cachedIndex returns the index of hull h from the detector's memo,
// building or fetching the shared one on first use.
func (d *Detector) cachedIndex(h *shapes.Hull) *hullIndex {
	c := &d.hullIdx
	if x := c.m[h]; x.fits(h) {
		return x
	}
	if c.m == nil || len(c.m) >= hullIndexCap {
		c.m = make(map[*shapes.Hull]*hullIndex)
	}
	x := sharedIndex(h)
	c.m[h] = x
	return x
}

// sharedIndex returns h's index from the shared cache, building it there
// when it is missing.
func sharedIndex(h *shapes.Hull) *hullIndex {
	key := weak.Make(h)
	s := &sharedIndexes
	s.Lock()
	x := s.m[key]
	s.Unlock()
	if x.fits(h) {
		return x
	}
	x = newHullIndex(h)
	s.Lock()
	if s.m == nil {
		s.m = make(map[weak.Pointer[shapes.Hull]]*hullIndex)
	}
	s.m[key] = x
	s.Unlock()
	runtime.AddCleanup(h, func(k weak.Pointer[shapes.Hull]) {
		s.Lock()
		delete(s.m, k)
		s.Unlock()
	}, key)
	return x
}

// newHullIndex builds the trees of hull h.
func newHullIndex(h *shapes.Hull) *hullIndex {
	x := &hullIndex{nv: len(h.Vertices), nf: len(h.Faces), ne: len(h.Edges)}
	for _, v := range h.Vertices {
		x.reach = math.Max(x.reach, v.Len())
		x.centre = x.centre.Add(v)
	}
	x.centre = x.centre.Mul(1 / float64(len(h.Vertices)))
	x.planes = make([]plane, len(h.Faces))
	for i, f := range h.Faces {
		x.planes[i] = plane{f.Normal, f.Offset}
	}
	dir := make([]vec3, max(len(h.Faces), len(h.Edges)))
	for i, f := range h.Faces {
		dir[i] = f.Normal
	}
	x.faces.build(dir[:len(h.Faces)], nil)
	for i, e := range h.Edges {
		dir[i] = h.Faces[e.F[0]].Normal.Add(h.Faces[e.F[1]].Normal)
	}
	x.edges.build(dir[:len(h.Edges)], func(i int32) bool {
		e := &h.Edges[i]
		return h.Faces[e.F[0]].Normal.Sub(h.Faces[e.F[1]].Normal).Len() > hullWideArc
	})
	for k := range x.faces.nodes {
		x.measureFaces(h, &x.faces.nodes[k])
	}
	width := make([]float64, len(h.Edges))
	for i := range h.Edges {
		width[i] = edgeWidth(h, &h.Edges[i])
	}
	for k := range x.edges.nodes {
		x.measureEdges(h, width, &x.edges.nodes[k])
	}
	x.measureSlack(h, width)
	return x
}

// build makes the tree of the items with directions dir. Items for which
// apart is true (edges of wide arcs) get a subtree of their own under the
// root, so that their wide cones do not widen the cones of the others.
func (t *coneTree) build(dir []vec3, apart func(int32) bool) {
	n := len(dir)
	t.items = make([]int32, n)
	for i := range t.items {
		t.items[i] = int32(i)
	}
	t.nodes = make([]coneNode, 0, 2*(n/hullLeaf+2))
	if apart != nil {
		slices.SortStableFunc(t.items, func(p, q int32) int { return cmp.Compare(b2i(apart(p)), b2i(apart(q))) })
		m := int32(0)
		for m < int32(n) && !apart(t.items[m]) {
			m++
		}
		if m > 0 && m < int32(n) {
			t.nodes = append(t.nodes, coneNode{i0: 0, i1: int32(n)})
			a := t.split(0, m, dir)
			b := t.split(m, int32(n), dir)
			t.nodes[0].kid = [2]int32{a, b}
			return
		}
	}
	t.split(0, int32(n), dir)
}

// hullWideArc is the chord between an edge's face normals (about 30
// degrees) beyond which the edge goes to the tree's subtree of wide arcs.
const hullWideArc = 0.5

// split makes the node of items[i0:i1] and its subtree, halving the items
// at the median of their directions' component of widest spread.
func (t *coneTree) split(i0, i1 int32, dir []vec3) int32 {
	k := int32(len(t.nodes))
	t.nodes = append(t.nodes, coneNode{i0: i0, i1: i1, kid: [2]int32{-1, -1}})
	if i1-i0 <= hullLeaf {
		return k
	}
	its := t.items[i0:i1]
	lo, hi := vec3{math.Inf(1), math.Inf(1), math.Inf(1)}, vec3{math.Inf(-1), math.Inf(-1), math.Inf(-1)}
	for _, i := range its {
		n := dir[i]
		for j := 0; j < 3; j++ {
			lo[j], hi[j] = math.Min(lo[j], n[j]), math.Max(hi[j], n[j])
		}
	}
	ax := argmaxAbs(hi.Sub(lo))
	mid := i0 + (i1-i0)/2
	selectNth(its, int(mid-i0), func(p, q int32) bool {
		return dir[p][ax] < dir[q][ax] || (dir[p][ax] == dir[q][ax] && p < q)
	})
	a := t.split(i0, mid, dir)
	b := t.split(mid, i1, dir)
	t.nodes[k].kid = [2]int32{a, b}
	return k
}

// measureFaces fills face node n's cone, centre and top.
func (x *hullIndex) measureFaces(h *shapes.Hull, n *coneNode) {
	var sum, cen vec3
	cnt := 0
	for _, f := range x.faces.items[n.i0:n.i1] {
		sum = sum.Add(h.Faces[f].Normal)
		for _, v := range h.Faces[f].Verts {
			cen = cen.Add(h.Vertices[v])
			cnt++
		}
	}
	n.a, _ = unit(sum)
	n.o = cen.Mul(1 / float64(max(cnt, 1)))
	n.top = math.Inf(-1)
	for _, f := range x.faces.items[n.i0:n.i1] {
		fc := &h.Faces[f]
		n.eps = math.Max(n.eps, fc.Normal.Sub(n.a).Len())
		n.top = math.Max(n.top, fc.Normal.Dot(n.o)-fc.Offset)
	}
	if n.a == (vec3{}) || n.eps > 2 {
		n.eps = 2 // the chord of two unit vectors is at most 2
	}
}

// measureEdges fills edge node n's cone, centre, top and width (from the
// edges' widths).
func (x *hullIndex) measureEdges(h *shapes.Hull, width []float64, n *coneNode) {
	var sum, cen vec3
	for _, e := range x.edges.items[n.i0:n.i1] {
		ed := &h.Edges[e]
		sum = sum.Add(h.Faces[ed.F[0]].Normal).Add(h.Faces[ed.F[1]].Normal)
		cen = cen.Add(h.Vertices[ed.V[0]])
	}
	n.a, _ = unit(sum)
	n.o = cen.Mul(1 / float64(max(n.i1-n.i0, 1)))
	arc := 0.0
	for _, e := range x.edges.items[n.i0:n.i1] {
		ed := &h.Edges[e]
		arc = math.Max(arc, h.Faces[ed.F[0]].Normal.Sub(n.a).Len())
		arc = math.Max(arc, h.Faces[ed.F[1]].Normal.Sub(n.a).Len())
		n.w = math.Max(n.w, width[e])
	}
	n.eps = arc + n.w
	if n.a == (vec3{}) || arc >= math.Sqrt2 || n.eps > 2 {
		// A cone as wide as a half sphere does not contain its arcs; the
		// chord of two unit vectors is at most 2 in any case.
		n.eps = 2
	}
	n.top = math.Inf(-1)
	for _, e := range x.edges.items[n.i0:n.i1] {
		d := n.o.Sub(h.Vertices[h.Edges[e].V[0]])
		n.top = math.Max(n.top, n.a.Dot(d)+n.eps*d.Len())
	}
}

// edgeWidth bounds how far (as a chord) the axis on which the box-hull test
// measures an edge pair with edge e can lie from the arc of e's normals.
// The test takes the axis as the cross product of the box edge and e's
// direction dq, which is square to both face normals only for an exactly
// flat hull; merged faces are flat to within the hull's tolerances. With
// t the unit vector square to both normals, the axes u x dq and u x t of a
// unit box axis u differ by at most |dq - t|, and the test skips pairs
// whose cross product is below satParallel, so the unit axes differ by at
// most 2 |dq - t| / satParallel. edgeRound adds the rounding of that cross
// product at the cut-off.
func edgeWidth(h *shapes.Hull, e *shapes.Edge) float64 {
	dq, l := unit(h.Vertices[e.V[1]].Sub(h.Vertices[e.V[0]]))
	t, lt := unit(h.Faces[e.F[0]].Normal.Cross(h.Faces[e.F[1]].Normal))
	if l == 0 || lt == 0 {
		return 2
	}
	if t.Dot(dq) < 0 {
		t = t.Mul(-1)
	}
	return 2*dq.Sub(t).Len()/satParallel + edgeRound
}

// edgeRound is the rounding of a unit axis taken from a cross product as
// small as satParallel of its factors' lengths: about 1e-16 / 1e-6, with a
// wide margin.
const edgeRound = 1e-8

// selectNth reorders s so that s[k] is the element a sort by less would put
// there, with none after it less and none before it greater (C. A. R.
// Hoare, "Algorithm 65: FIND", CACM 4(7), 1961), in linear time on
// average: the tree's median splits need no full sort. The pivot is the
// median of the first, middle and last elements, so the result is a pure
// function of the input.
func selectNth(s []int32, k int, less func(p, q int32) bool) {
	lo, hi := 0, len(s)-1
	for lo < hi {
		m := lo + (hi-lo)/2
		if less(s[m], s[lo]) {
			s[m], s[lo] = s[lo], s[m]
		}
		if less(s[hi], s[lo]) {
			s[hi], s[lo] = s[lo], s[hi]
		}
		if less(s[hi], s[m]) {
			s[hi], s[m] = s[m], s[hi]
		}
		p := s[m]
		i, j := lo, hi
		for i <= j {
			for less(s[i], p) {
				i++
			}
			for less(p, s[j]) {
				j--
			}
			if i <= j {
				s[i], s[j] = s[j], s[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return
		}
	}
}
