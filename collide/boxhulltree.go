package collide

import "math"

// The box-hull test against a large hull by branch and bound over the
// hull's cone tree (hullindex.go): the same axes, gaps and choice as the
// plain loops of satBoxHull, found without measuring the faces and edges
// that provably cannot be the answer.
//
// The bound. Every gap the test measures is min over the box of m.x
// minus the hull feature's extent along m, for a unit vector m: a hull
// face's normal (the gap n.c - r(n) - f, with r(n) = sum_k h_k |n.u_k| the
// box's extent along n for half sizes h_k and axes u_k, f the offset), or
// for an edge pair the negated axis (ax.(q0 - p0) with p0 on the box edge
// extreme along ax = -m, q0 on the hull edge). So a gap is at most m.(p -
// q) for any point p of the box and q of the feature: for m within eps of
// a node's axis a and o the node's centre, at most a.(p - o) + eps |p - o|
// + top, where top bounds m.(o - q) over the node (see coneNode). The
// search tries two points p (nodeBound). Edge pairs have their axis square
// to a box axis, which lets a node miss the box's great circles entirely
// and narrows the cone on each (edgeNodeBound); the axis the test computes
// lies within edgeWidth of the edge's arc, and edgeWidth also bounds how
// far the box edge chosen from the crossing can fall short of the box's
// extreme along it. The bounds hold for the numbers the plain loops
// compute, up to rounding (treeRound), without assuming the hull convex.
//
// The answer of the plain loops is the largest gap of each kind with ties
// to the first in their order; the search keeps the same tie rule, so the
// order in which it visits the tree does not matter. A node is skipped
// when its bound can neither separate the pair (beat the margin) nor
// change the choice (outrank the incumbent or reach the best so far).

// treeRound is the slack added to every bound, as a fraction of the
// lengths in the query (shapes' sizes, the box centre's and the hull's
// vertices' distances from the hull's origin): far above the rounding of
// the gaps and bounds (a few units of 1e-16 of those lengths), far below
// any gap difference that matters.
const treeRound = 1e-9

// treeStack is the depth-first stack of a search: nodes with the bound
// computed when they were pushed.
type treeStack struct {
	n  [64]int32
	ub [64]float64
	k  int
}

func (t *treeStack) push(n int32, ub float64) {
	t.n[t.k], t.ub[t.k] = n, ub
	t.k++
}

func (t *treeStack) pop() (int32, float64) {
	t.k--
	return t.n[t.k], t.ub[t.k]
}

// pushPair pushes nodes a and b (bounds ua, ub) so that the one with the
// larger bound comes off the stack first; larger bounds are likelier to
// hold the answer and so to raise the threshold early.
func (t *treeStack) pushPair(a, b int32, ua, ub float64) {
	if ua > ub {
		t.push(b, ub)
		t.push(a, ua)
		return
	}
	t.push(a, ua)
	t.push(b, ub)
}

// walkTree runs a search's depth-first walk over tree t: a node's bound
// (bound) is worked out when it is pushed, and the node is skipped when
// that bound can neither separate the pair (beat margin) nor change the
// choice (reach keep or *best, the best gap leaf has found so far). leaf
// visits a leaf's items and returns false when one separates the pair,
// which ends the walk with false.
func walkTree(t *coneTree, margin, keep float64, best *float64, bound func(*coneNode) float64, leaf func([]int32) bool) bool {
	var st treeStack
	st.push(0, math.Inf(1))
	for st.k > 0 {
		k, ub := st.pop()
		if ub <= margin && (ub <= keep || ub < *best) {
			continue
		}
		n := &t.nodes[k]
		if a, b := n.kid[0], n.kid[1]; a >= 0 {
			st.pushPair(a, b, bound(&t.nodes[a]), bound(&t.nodes[b]))
			continue
		}
		if !leaf(t.items[n.i0:n.i1]) {
			return false
		}
	}
	return true
}

// nodeBound bounds the gaps of face node n, including the rounding slack
// (see the top of the file): a gap is at most m.(p - q) for any point p of
// the box, with m the face's normal (within eps of a) and q a point of the
// face, so at most a.(p - o) + eps |p - o| + top. Two points p are tried:
// the box's point nearest o, and that point moved to the box's far side
// along each axis k on which every m of the cone has the sign of a (|a.u_k|
// > eps), where the move lowers m.p for all of them.
func (bh *boxHullAxes) nodeBound(n *coneNode, slack float64) float64 {
	oc := n.o.Sub(bh.c)
	var au, l [3]float64
	for k := 0; k < 3; k++ {
		au[k], l[k] = n.a.Dot(bh.u[k]), oc.Dot(bh.u[k])
	}
	return bh.pointBound(&au, &l, -1, n.eps) + n.top + slack
}

// edgeNodeBound bounds the gaps of edge node n's pairs with the box's
// edges as nodeBound does, on each of the three great circles where the
// pairs' axes lie: a pair with a box edge along axis i has its axis m
// square to u_i, so m.(p - o) = m.w with w the part of p - o square to u_i,
// and m - a' (with a' the part of a square to u_i) has length at most e =
// sqrt(eps^2 - (a.u_i)^2). A circle the cone misses (|a.u_i| > eps) holds
// no pair: the signs of the cosines of the edges' face normals with u_i
// agree; a node whose cone misses all three gets -Inf. The edges' widths
// add the slack of the box's support along m (edgeWidth).
func (bh *boxHullAxes) edgeNodeBound(n *coneNode, slack float64) float64 {
	oc := n.o.Sub(bh.c)
	var au, l [3]float64
	for k := 0; k < 3; k++ {
		au[k], l[k] = n.a.Dot(bh.u[k]), oc.Dot(bh.u[k])
	}
	best := math.Inf(-1)
	for i := 0; i < 3; i++ {
		if math.Abs(au[i]) > n.eps+coneRound {
			continue
		}
		e := math.Sqrt(math.Max(0, n.eps*n.eps-au[i]*au[i])) + coneRound
		best = math.Max(best, bh.pointBound(&au, &l, i, e))
	}
	if math.IsInf(best, -1) {
		return best
	}
	return best + n.top + slack + 2*n.w*(bh.hb[0]+bh.hb[1]+bh.hb[2])
}

// pointBound is the smaller of a.(p - o) + e |p - o| over the two points p
// of nodeBound, leaving out axis skip (-1: none); au and l are a's and o -
// c's coordinates in the box's axes.
func (bh *boxHullAxes) pointBound(au, l *[3]float64, skip int, e float64) float64 {
	var near, far, dn, df float64 // a.(p - o) and |p - o|^2 of the two points
	for k := 0; k < 3; k++ {
		if k == skip {
			continue
		}
		hb := bh.hb[k]
		d := 0.0 // the nearest point's offset from o along axis k
		if l[k] > hb {
			d = hb - l[k]
		} else if l[k] < -hb {
			d = -hb - l[k]
		}
		near += d * au[k]
		dn += d * d
		if math.Abs(au[k])-e > coneRound {
			d = -hb - l[k]
			if au[k] < 0 {
				d = hb - l[k]
			}
		}
		far += d * au[k]
		df += d * d
	}
	return math.Min(near+e*math.Sqrt(dn), far+e*math.Sqrt(df))
}

// coneRound is the rounding of the cosines that decide whether a cone meets
// a plane: dot products of unit vectors.
const coneRound = 1e-12

// treeSlack is treeRound of the query's lengths.
func (bh *boxHullAxes) treeSlack(x *hullIndex, scale float64) float64 {
	return treeRound * (scale + bh.c.Len() + x.reach + bh.hb[0] + bh.hb[1] + bh.hb[2])
}

// boxFacesBounded takes the box's faces for search s, skipping those whose
// gap is bounded below the best so far: the hull's gap beyond a box face's
// plane is at most that of the index's centre, a point inside the hull. The
// face of largest bound goes first, and the best is kept with the first
// face on a tie, as the loop over the faces in order keeps it.
func (bh *boxHullAxes) boxFacesBounded(x *hullIndex, s *satSearch) bool {
	slack := bh.treeSlack(x, s.scale)
	var ub [6]float64
	first := 0
	for i := range ub {
		pl := &bh.p.planes[i]
		ub[i] = pl.n.Dot(x.centre) - pl.d + slack
		if ub[i] > ub[first] {
			first = i
		}
	}
	best, bi := math.Inf(-1), -1
	for k := -1; k < len(ub); k++ {
		i := k
		if k < 0 {
			i = first
		} else if k == first {
			continue
		}
		if ub[i] <= s.margin && ub[i] < best {
			continue
		}
		v, g := bh.boxFaceAt(i)
		if g > s.margin {
			s.r.fail = pairHint{kind: hintFaceP, i: int32(i)}
			return false
		}
		if g > best || (g == best && i < bi) {
			best, bi, bh.deep = g, i, v
		}
	}
	s.best[0], s.bestI[0] = best, bi
	return true
}

// treeFaces finds the hull's face of largest gap for search s, whose box
// faces are in; false when a face separates the pair.
func (bh *boxHullAxes) treeFaces(x *hullIndex, s *satSearch) bool {
	slack := bh.treeSlack(x, s.scale)
	keep := s.best[0] + satFaceBias*s.scale // Q's face must beat this
	best, bj := math.Inf(-1), -1
	bound := func(n *coneNode) float64 { return bh.nodeBound(n, slack) }
	leaf := func(items []int32) bool {
		for _, j := range items {
			g, _ := bh.hullFace(int(j))
			if g > s.margin {
				s.r.fail = pairHint{kind: hintFaceQ, i: j}
				return false
			}
			if g > best || (g == best && int(j) < bj) {
				best, bj = g, int(j)
			}
		}
		return true
	}
	if !walkTree(&x.faces, s.margin, keep, &best, bound, leaf) {
		return false
	}
	if bj >= 0 {
		s.best[1], s.bestI[1] = best, bj
	}
	return true
}

// treeEdges finds the edge pair of largest gap for search s, whose face is
// chosen, and makes it r's answer when it outranks the face; false when an
// edge pair separates the pair.
func (bh *boxHullAxes) treeEdges(x *hullIndex, s *satSearch, r *satResult) bool {
	h := bh.h
	slack := bh.treeSlack(x, s.scale)
	keep := s.bestFace + satEdgeBias*s.scale // an edge pair must beat this
	best, key := math.Inf(-1), -1
	var bax vec3
	var bbi, bhe int
	bound := func(n *coneNode) float64 { return bh.edgeNodeBound(n, slack) }
	leaf := func(items []int32) bool {
		for _, he := range items {
			e := &h.Edges[he]
			ca, cb := bh.cosines(int(e.F[0])), bh.cosines(int(e.F[1]))
			for i := 0; i < 3; i++ {
				g, ax, bi, ok := bh.edgePair(e, &ca, &cb, i)
				if !ok {
					continue
				}
				if g > s.margin {
					s.r.fail = pairHint{kind: hintEdge, i: int32(bi), j: he}
					return false
				}
				if kk := 3*int(he) + i; g > best || (g == best && kk < key) {
					best, key, bax, bbi, bhe = g, kk, ax, bi, int(he)
				}
			}
		}
		return true
	}
	if !walkTree(&x.edges, s.margin, keep, &best, bound, leaf) {
		return false
	}
	if key >= 0 && s.outranks(best, s.bestFace, satEdgeBias) {
		e := &h.Edges[bhe]
		bed := boxEdges[bbi]
		r.setEdge(best, bax, bbi, bhe, bh.p.verts[bed.V[0]], bh.p.verts[bed.V[1]], h.Vertices[e.V[0]], h.Vertices[e.V[1]])
	}
	return true
}

// incident is the face of the hull most anti-parallel to the unit vector
// n, the first in index order on a tie: incidentFace on the hull's planes.
// A node's normals have n_j.n >= a.n - epsF. The search starts with face
// from as the best so far (a resting pair's last incident face prunes
// most of the tree at once); the answer does not depend on it.
func (x *hullIndex) incident(n vec3, from int) int {
	const slack = 1e-12 // rounding of the dot products of unit vectors
	if from < 0 || from >= len(x.planes) {
		from = 0
	}
	best, bj := x.planes[from].n.Dot(n), from
	t := &x.faces
	var st treeStack
	st.push(0, math.Inf(-1))
	for st.k > 0 {
		k, lb := st.pop()
		if lb > best {
			continue
		}
		nd := &t.nodes[k]
		if a, b := nd.kid[0], nd.kid[1]; a >= 0 {
			la := capLow(&t.nodes[a], n, best+slack) - slack
			lb := capLow(&t.nodes[b], n, best+slack) - slack
			// The smaller bound comes off first: negate for pushPair.
			st.pushPair(a, b, -la, -lb)
			st.ub[st.k-1], st.ub[st.k-2] = -st.ub[st.k-1], -st.ub[st.k-2]
			continue
		}
		for _, j := range t.items[nd.i0:nd.i1] {
			if d := x.planes[j].n.Dot(n); d < best || (d == best && int(j) < bj) {
				best, bj = d, int(j)
			}
		}
	}
	return bj
}

// capLow is the least m.n over the unit vectors m of node c's cone (|m -
// a| <= eps) for a unit n: cos(theta + alpha) for theta the angle between a
// and n and alpha the cone's half angle (cos alpha = 1 - eps^2/2), or -1
// when the cone reaches -n. It is never below a.n - eps, the bound
// |m.n - a.n| <= |m - a|, which it returns when that is above limit (the
// node is skipped either way).
func capLow(c *coneNode, n vec3, limit float64) float64 {
	cn, e := c.a.Dot(n), c.eps
	if cn-e > limit {
		return cn - e
	}
	ca := 1 - 0.5*e*e
	if ca <= -cn { // theta + alpha >= pi
		return -1
	}
	sa := e * math.Sqrt(math.Max(0, 1-0.25*e*e))
	return cn*ca - math.Sqrt(math.Max(0, 1-cn*cn))*sa
}

// setIndexed fills p with hull v.hull in its own frame, taking the planes
// from its index x instead of copying them.
func (p *polytope) setIndexed(v *view, x *hullIndex) {
	h := v.hull
	p.flat, p.hull, p.rot, p.pos, p.size = false, h, identity3, vec3{}, v.size
	p.arcsFor = 0
	p.verts, p.planes, p.faces, p.edges = h.Vertices, x.planes, h.Faces, h.Edges
}

// indexedContact is polyContact for box p against indexed hull q (in its
// own frame), with the hull's incident face found through the tree.
func (d *Detector) indexedContact(p, q *polytope, r satResult, margin float64, x *hullIndex) vec3 {
	if r.kind != satFaceP {
		return d.polyContact(p, q, r, margin)
	}
	d.cand = d.cand[:0]
	n := p.planes[r.face].n
	from := 0
	if d.lastIncident.x == x {
		from = d.lastIncident.face
	}
	f := x.incident(n, from)
	d.lastIncident.x, d.lastIncident.face = x, f
	d.clipFaces(p, r.face, q, f, false, margin)
	return n
}
