package collide

import "math"

// satBoxes is the separating-axis test of two boxes by their 15 axes (three
// face normals of each and the nine cross products of their edge
// directions), with projection radii from the axes' cosines (as in
// S. Gottschalk, M. C. Lin and D. Manocha, "OBBTree", SIGGRAPH 1996; Ericson
// 2005, section 4.4.1). It returns the same result as sat on the boxes'
// polytopes, at a fraction of the cost.
func satBoxes(a, b *view, margin float64) (satResult, bool) {
	var r satResult
	ok := satBoxesHint(a, b, margin, pairHint{}, &r)
	return r, ok
}

// satBoxesHint is satBoxes writing into r, trying the remembered axis h
// first; on a separation beyond margin r.fail names the separating axis.
func satBoxesHint(a, b *view, margin float64, h pairHint, r *satResult) bool {
	var bp boxPair
	bp.init(a, b)
	s := newSatSearch(r, margin, a.size+b.size)
	if g, ok := bp.hintGap(h); ok && s.hinted(h, g) {
		return false
	}
	for i := 0; i < 3; i++ {
		g, dist := bp.faceP(i)
		if !s.face(hintFaceP, g, 2*i+b2i(dist < 0)) {
			return false
		}
	}
	for j := 0; j < 3; j++ {
		// B's face toward A: -ub_j when B lies on the +ub_j side.
		g, dist := bp.faceQ(j)
		if !s.face(hintFaceQ, g, 2*j+b2i(dist > 0)) {
			return false
		}
	}
	s.pickFace(false)
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			g, ax, pa, pb, ok := bp.edge(i, j)
			if !ok {
				continue
			}
			sep, better := s.edge(g, i, j)
			if sep {
				return false
			}
			if better {
				bp.setEdge(r, a.pos, b.pos, i, j, g, ax, &pa, &pb)
			}
		}
	}
	return true
}

// boxPair holds what the 15 axes of two boxes share: the offset of the
// centres, both sets of axes and their cosines.
type boxPair struct {
	t      vec3
	ua, ub [3]vec3
	ar     [3][3]float64 // |ua_i . ub_j|
	ha, hb vec3
}

func (bp *boxPair) init(a, b *view) {
	bp.t = b.pos.Sub(a.pos)
	for i := 0; i < 3; i++ {
		bp.ua[i], bp.ub[i] = col(a.rot, i), col(b.rot, i)
	}
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			bp.ar[i][j] = math.Abs(bp.ua[i].Dot(bp.ub[j]))
		}
	}
	bp.ha, bp.hb = a.half, b.half
}

// hintGap is the gap on the remembered axis h (face hints name a face,
// 0..5, on axis i/2; edge hints two axes); ok is false when h names no
// axis of two boxes.
func (bp *boxPair) hintGap(h pairHint) (g float64, ok bool) {
	if h.i < 0 || h.i > 5 || h.j < 0 || h.j > 2 || (h.kind == hintEdge && h.i > 2) {
		return 0, false
	}
	switch h.kind {
	case hintFaceP:
		g, _ = bp.faceP(int(h.i / 2))
		return g, true
	case hintFaceQ:
		g, _ = bp.faceQ(int(h.i / 2))
		return g, true
	case hintEdge:
		g, _, _, _, ok = bp.edge(int(h.i), int(h.j))
		return g, ok
	}
	return 0, false
}

// faceP is the gap on A's axis i and the distance of the centres along it.
func (bp *boxPair) faceP(i int) (s, dist float64) {
	dist = bp.t.Dot(bp.ua[i])
	hb, ar := bp.hb, &bp.ar
	return math.Abs(dist) - bp.ha[i] - (hb[0]*ar[i][0] + hb[1]*ar[i][1] + hb[2]*ar[i][2]), dist
}

// faceQ is the gap on B's axis j.
func (bp *boxPair) faceQ(j int) (s, dist float64) {
	dist = bp.t.Dot(bp.ub[j])
	ha, ar := bp.ha, &bp.ar
	return math.Abs(dist) - bp.hb[j] - (ha[0]*ar[0][j] + ha[1]*ar[1][j] + ha[2]*ar[2][j]), dist
}

// edge is the gap on ua_i x ub_j (oriented from A toward B), with the
// axis and its cosines with each box's axes; ok is false for parallel axes.
func (bp *boxPair) edge(i, j int) (s float64, ax vec3, pa, pb [3]float64, ok bool) {
	ax = bp.ua[i].Cross(bp.ub[j])
	l := ax.Len()
	if l <= satParallel {
		return 0, ax, pa, pb, false
	}
	ax = ax.Mul(1 / l)
	dist := bp.t.Dot(ax)
	if dist < 0 {
		ax, dist = ax.Mul(-1), -dist
	}
	ra, rb := 0.0, 0.0
	for k := 0; k < 3; k++ {
		pa[k], pb[k] = ax.Dot(bp.ua[k]), ax.Dot(bp.ub[k])
		ra += bp.ha[k] * math.Abs(pa[k])
		rb += bp.hb[k] * math.Abs(pb[k])
	}
	return dist - ra - rb, ax, pa, pb, true
}

// setEdge makes the edge pair on ua_i x ub_j (gap s, axis ax, cosines pa
// and pb) r's contact: A's edge along ua_i extreme toward +ax against B's
// along ub_j extreme toward -ax, with the boxes' centres ca and cb.
func (bp *boxPair) setEdge(r *satResult, ca, cb vec3, i, j int, s float64, ax vec3, pa, pb *[3]float64) {
	oa, va := boxEdgeOffset(&bp.ua, bp.ha, pa, i, 1)
	ob, vb := boxEdgeOffset(&bp.ub, bp.hb, pb, j, -1)
	ea, eb := bp.ua[i].Mul(bp.ha[i]), bp.ub[j].Mul(bp.hb[j])
	r.setEdge(s, ax, 8*i+va, 8*j+vb, ca.Add(oa).Sub(ea), ca.Add(oa).Add(ea), cb.Add(ob).Sub(eb), cb.Add(ob).Add(eb))
}

// boxEdgeOffset is the offset from a box's centre of the middle of its
// edge along axis i extreme toward sg times the direction whose cosines
// with the axes u are c, and the sign bits of that edge's vertices.
func boxEdgeOffset(u *[3]vec3, h vec3, c *[3]float64, i int, sg float64) (o vec3, bits int) {
	for k := 0; k < 3; k++ {
		if k == i {
			continue
		}
		s := sg * sgn(c[k])
		o = o.Add(u[k].Mul(s * h[k]))
		if s > 0 {
			bits |= 1 << k
		}
	}
	return o, bits
}

// satBoxTriangle is the separating-axis test of a box (P) against a mesh
// triangle (Q, front face only) on their 13 axes: the box's three face
// normals (both senses), the triangle's normal and the nine cross products
// of box axes and triangle edges (both senses), each measured by projection
// (T. Akenine-Moller, "Fast 3D triangle-box overlap testing", J. Graphics
// Tools 6(1), 2001). Projection gaps on axes that are not face normals of
// the Minkowski difference never exceed the true one, so the largest gap is
// the same as the pruned test's.
func satBoxTriangle(a, tv *view, margin float64) (satResult, bool) {
	var r satResult
	bt := boxTri{c: a.pos, h: a.half, tri: &tv.tri}
	for i := 0; i < 3; i++ {
		bt.ua[i] = col(a.rot, i)
	}
	s := newSatSearch(&r, margin, a.size+tv.size)
	// The triangle's face: the box's lowest point against its plane.
	n := tv.triN
	if !s.face(hintFaceQ, n.Dot(bt.c)-bt.radius(n)-n.Dot(bt.tri[0]), 0) {
		return r, false
	}
	for i := 0; i < 3; i++ {
		g, f := bt.face(i)
		if !s.face(hintFaceP, g, f) {
			return r, false
		}
	}
	s.pickFace(true)
	for k := 0; k < 3; k++ {
		t0, t1 := bt.tri[k], bt.tri[(k+1)%3]
		e := t1.Sub(t0)
		el := e.Len()
		for i := 0; i < 3; i++ {
			g, ax, ok := bt.edge(i, e, el)
			if !ok {
				continue
			}
			sep, better := s.edge(g, i, k)
			if sep {
				return r, false
			}
			if better {
				// The box edge along ua_i extreme toward +ax.
				c := [3]float64{ax.Dot(bt.ua[0]), ax.Dot(bt.ua[1]), ax.Dot(bt.ua[2])}
				o, vi := boxEdgeOffset(&bt.ua, bt.h, &c, i, 1)
				eb := bt.ua[i].Mul(bt.h[i])
				r.setEdge(g, ax, 8*i+vi, k, bt.c.Add(o).Sub(eb), bt.c.Add(o).Add(eb), t0, t1)
			}
		}
	}
	return r, true
}

// boxTri is a box (axes ua, centre c, half sizes h) and a triangle, in the
// same frame, measured by projection.
type boxTri struct {
	ua   [3]vec3
	c, h vec3
	tri  *[3]vec3
}

// radius is the box's extent along l from its centre.
func (bt *boxTri) radius(l vec3) float64 {
	h, ua := bt.h, &bt.ua
	return h[0]*math.Abs(l.Dot(ua[0])) + h[1]*math.Abs(l.Dot(ua[1])) + h[2]*math.Abs(l.Dot(ua[2]))
}

// span is the triangle's extent along l.
func (bt *boxTri) span(l vec3) (lo, hi float64) {
	tri := bt.tri
	lo, hi = tri[0].Dot(l), tri[0].Dot(l)
	for k := 1; k < 3; k++ {
		v := tri[k].Dot(l)
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	return
}

// face is the gap of the triangle beyond the box's faces on axis i, the
// larger of the two senses, and that face.
func (bt *boxTri) face(i int) (float64, int) {
	lo, hi := bt.span(bt.ua[i])
	m := bt.ua[i].Dot(bt.c)
	sPlus := lo - (m + bt.h[i])  // the triangle beyond the +ua_i face
	sMinus := (m - bt.h[i]) - hi // beyond the -ua_i face
	if sMinus > sPlus {
		return sMinus, 2*i + 1
	}
	return sPlus, 2 * i
}

// edge is the gap on the cross product of box axis i and triangle edge e
// (length el), in the sense of the larger gap, oriented from the box
// toward the triangle; ok is false when they are parallel.
func (bt *boxTri) edge(i int, e vec3, el float64) (s float64, ax vec3, ok bool) {
	ax = bt.ua[i].Cross(e)
	l := ax.Len()
	if l <= satParallel*el {
		return 0, ax, false
	}
	ax = ax.Mul(1 / l)
	lo, hi := bt.span(ax)
	m, rb := ax.Dot(bt.c), bt.radius(ax)
	s = lo - (m + rb)
	if sm := (m - rb) - hi; sm > s {
		s, ax = sm, ax.Mul(-1)
	}
	return s, ax, true
}
