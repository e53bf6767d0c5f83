package collide

import (
	"math"

	"clatter/shapes"
)

// The separating-axis test of a box (P) against a hull (Q), run in the
// hull's own frame so that its vertices and face planes are used as stored.
// It finds the axis that sat would find on the same two polytopes, at a
// fraction of the cost:
//
//   - a hull face's gap uses the box's extent along the normal, from the
//     cosines of the normal with the box's three axes;
//   - the edge pairs to test are those whose arcs cross on the Gauss map
//     (see sat.go). The box's arcs are the quarter circles of the
//     coordinate planes of its frame, so a hull edge's (negated) arc crosses
//     the arc of box axis i exactly where it passes through the plane x_i = 0
//     of the box frame, and the signs of the crossing point's other two
//     coordinates name the box edge. The same cosines give that point, so
//     each hull edge costs a few comparisons instead of a test against all
//     twelve box edges.

// boxEdgeAt[i][bits] is the index in boxEdges of the box edge along axis i
// whose vertices have the sign bits bits on the other two axes (bit i clear).
var boxEdgeAt = func() (t [3][8]int8) {
	for i := range t {
		for k := range t[i] {
			t[i][k] = -1
		}
	}
	for e, ed := range boxEdges {
		v0, v1 := int(ed.V[0]), int(ed.V[1])
		x := v0 ^ v1
		i := 0
		for x != 1<<i {
			i++
		}
		t[i][v0&^(1<<i)] = int8(e)
	}
	return t
}()

// boxHull collides box a with hull b (views in the query frame); the
// contact points are left in d.cand, in the query frame.
func (d *Detector) boxHull(a, b *view, margin float64, h pairHint) (vec3, bool) {
	bv := *a
	bv.rot = mulTM(b.rot, a.rot)
	bv.pos = mulT(b.rot, a.pos.Sub(b.pos))
	p := &d.polyP
	p.set(&bv)
	x := d.hullIndexFor(b.hull) // nil for a small hull
	sx := d.hullSlack(b.hull)   // the same index, for any size; nil without edges
	var r satResult
	if !d.satBoxHull(p, b.hull, &bv, a.size+b.size, margin, h, &r, x, sx) {
		d.remember(r)
		return vec3{}, false
	}
	// Touching: the hull's polytope, in its own frame, for the clipping;
	// its planes are the index's (the faces as set makes them).
	hv := *b
	hv.rot, hv.pos = identity3, vec3{}
	q := &d.polyQ
	var n vec3
	switch {
	case x != nil:
		q.setIndexed(&hv, x)
		n = d.indexedContact(p, q, r, margin, x)
	case sx != nil && r.kind == satFaceP && len(d.faceCos) == len(b.hull.Faces):
		q.setIndexed(&hv, sx)
		n = d.boxFaceContact(p, q, r, margin)
	default:
		if sx != nil {
			q.setIndexed(&hv, sx)
		} else {
			q.set(&hv)
		}
		n = d.polyContact(p, q, r, margin)
	}
	if b.rot != identity3 || b.pos != (vec3{}) {
		for i := range d.cand {
			d.cand[i].p = b.pos.Add(mul(b.rot, d.cand[i].p))
		}
		n = mul(b.rot, n)
	}
	if r.kind == satFaceP {
		// The box face's normal as the query frame has it: exact when the
		// box is the frame, so that a resting contact's normal carries no
		// rounding from the change of frame (the reduction's tie-breaks
		// look at the normal's components).
		n = col(a.rot, r.face/2)
		if r.face%2 == 1 {
			n = n.Mul(-1)
		}
	}
	return n, len(d.cand) > 0
}

// hullMin is the vertex of h with the least n.x and that value (the same
// vertex and value as polytope.minAlong on the hull in its own frame).
func hullMin(h *shapes.Hull, n vec3) (int, float64) {
	i := h.SupportIndex(n.Mul(-1))
	return i, n.Dot(h.Vertices[i])
}

// crossedBoxEdge is the box edge along axis i whose arc the negated arc of
// a hull edge crosses on the Gauss map, given the cosines ca and cb of the
// hull edge's two face normals with the box axes, or -1. The negated arc
// meets the plane x_i = 0 of the box frame where the normals' cosines with
// axis i change sign, at the point -(ca |cb_i| + cb |ca_i|) (positive
// weights of its ends), and the signs of that point's other coordinates
// name the quadrant, so the edge.
func crossedBoxEdge(ca, cb *vec3, i int) int {
	if !(ca[i]*cb[i] < 0) {
		return -1
	}
	wa, wb := math.Abs(cb[i]), math.Abs(ca[i])
	j, k := (i+1)%3, (i+2)%3
	pj := -(ca[j]*wa + cb[j]*wb)
	pk := -(ca[k]*wa + cb[k]*wb)
	if pj == 0 || pk == 0 {
		return -1 // through a box face normal: a tie, no crossing inside the arc
	}
	bits := 0
	if pj > 0 {
		bits |= 1 << j
	}
	if pk > 0 {
		bits |= 1 << k
	}
	return int(boxEdgeAt[i][bits])
}

// edgePair is the gap and axis of the hull's edge e (faces with box-axis
// cosines ca and cb) against the box edge that crossedBoxEdge pairs with
// box axis i; ok is false when there is no such box edge or no axis.
func (bh *boxHullAxes) edgePair(e *shapes.Edge, ca, cb *vec3, i int) (g float64, ax vec3, bi int, ok bool) {
	if bi = crossedBoxEdge(ca, cb, i); bi < 0 {
		return 0, vec3{}, bi, false
	}
	q0 := bh.h.Vertices[e.V[0]]
	dq := bh.h.Vertices[e.V[1]].Sub(q0)
	g, ax, ok = bh.edge(bi).edgeGap(&q0, &dq)
	return g, ax, bi, ok
}

// boxEdgeFrame is a box edge in the computation frame: its start, its
// direction (and that squared), and the sum of its two faces' normals,
// which points out of the box across the edge.
type boxEdgeFrame struct {
	p0, dp, out vec3
	dd          float64
}

// edgeGap is the gap on the cross product of box edge x and the edge from
// q0 along dq, oriented outward from the box; ok is false for parallel
// edges (as in sat, the cross product below satParallel of the lengths'
// product).
//
// It is written out on scalars: the vector methods (Cross, Dot, Mul, Sub),
// whose results are arrays, keep them in memory, and this form measured
// about half their time; it does the same operations in the same order, so
// its results are theirs bit for bit (TestEdgeGapScalars).
func (x *boxEdgeFrame) edgeGap(q0, dq *vec3) (s float64, ax vec3, ok bool) {
	a0, a1, a2 := x.dp[0], x.dp[1], x.dp[2]
	b0, b1, b2 := dq[0], dq[1], dq[2]
	c0, c1, c2 := a1*b2-a2*b1, a2*b0-a0*b2, a0*b1-a1*b0 // dp x dq
	l2 := c0*c0 + c1*c1 + c2*c2
	if l2 <= satParallel*satParallel*x.dd*(b0*b0+b1*b1+b2*b2) || l2 == 0 {
		return 0, vec3{c0, c1, c2}, false
	}
	k := 1 / math.Sqrt(l2)
	c0, c1, c2 = c0*k, c1*k, c2*k
	if c0*x.out[0]+c1*x.out[1]+c2*x.out[2] < 0 {
		c0, c1, c2 = c0*-1, c1*-1, c2*-1
	}
	return c0*(q0[0]-x.p0[0]) + c1*(q0[1]-x.p0[1]) + c2*(q0[2]-x.p0[2]), vec3{c0, c1, c2}, true
}

// satBoxHull is satHint for box polytope p (view bv, in the hull's frame)
// against hull h in its own frame; scale is the sum of the shapes' sizes.
// With x, h's index, the hull's faces and edges are searched through its
// tree (boxhulltree.go), with the same result as the loops below.
//
// sx is h's index for its slack (hullSlack). d.faceCos holds the cosines
// of all of h's faces when the test has measured them all (boxFaceContact
// reads them), and is empty otherwise.
func (d *Detector) satBoxHull(p *polytope, h *shapes.Hull, bv *view, scale, margin float64, hint pairHint, r *satResult, x, sx *hullIndex) bool {
	d.faceCos, d.faceSgn = d.faceCos[:0], d.faceSgn[:0]
	var bh boxHullAxes
	bh.init(p, h, bv)
	s := newSatSearch(r, margin, scale)
	if g, ok := bh.hintGap(hint); ok && s.hinted(hint, g) {
		return false
	}
	if x != nil {
		if !bh.boxFacesBounded(x, &s) {
			return false
		}
		// A part over a larger box: the searches cannot change the
		// answer (boxhullrest.go).
		faces, edges := bh.restBound(x, bh.deep, s.scale)
		if d.allAxes {
			faces, edges = math.Inf(1), math.Inf(1)
		}
		if !(faces <= s.margin && faces <= s.best[0]+satFaceBias*s.scale) && !bh.treeFaces(x, &s) {
			return false
		}
		s.pickFace(false)
		if edges <= s.margin && edges <= s.bestFace+satEdgeBias*s.scale {
			return true
		}
		return bh.treeEdges(x, &s, r)
	}
	var fv [6]int
	var fg [6]float64
	scan := len(h.Vertices) <= boxScanVerts // boxhullscan.go
	if scan {
		bh.boxFacesScan(&fv, &fg)
	}
	for i := range p.planes {
		v, g := fv[i], fg[i]
		if !scan {
			v, g = bh.boxFaceAt(i)
		}
		if g > s.best[0] && g <= s.margin {
			bh.deep = v
		}
		if !s.face(hintFaceP, g, i) {
			return false
		}
	}
	if !d.allAxes && bh.restSkips(sx, &s) { // boxhullrest.go
		s.pickFace(false)
		return true
	}
	for j := range h.Faces {
		g, cs := bh.hullFace(j)
		if !s.face(hintFaceQ, g, j) {
			return false
		}
		d.faceCos, d.faceSgn = append(d.faceCos, cs), append(d.faceSgn, cosSigns(&cs))
	}
	s.pickFace(false)
	cos, sgn := d.faceCos, d.faceSgn
	for he := range h.Edges {
		e := &h.Edges[he]
		axes := crossingAxes(sgn[e.F[0]], sgn[e.F[1]]) // boxhullscan.go
		if axes == 0 {
			continue
		}
		ca, cb := &cos[e.F[0]], &cos[e.F[1]]
		for i := 0; i < 3; i++ {
			if axes&(1<<i) == 0 {
				continue
			}
			g, ax, bi, ok := bh.edgePair(e, ca, cb, i)
			if !ok {
				continue
			}
			sep, better := s.edge(g, bi, he)
			if sep {
				return false
			}
			if better {
				bed := boxEdges[bi]
				r.setEdge(g, ax, bi, he, p.verts[bed.V[0]], p.verts[bed.V[1]], h.Vertices[e.V[0]], h.Vertices[e.V[1]])
			}
		}
	}
	return true
}

// boxHullAxes is what the axes of a box polytope p (view bv) and a hull h
// share, in the hull's frame: the box's axes, centre and half sizes, and
// its twelve edges.
type boxHullAxes struct {
	p     *polytope
	h     *shapes.Hull
	u     [3]vec3
	c, hb vec3
	be    [12]boxEdgeFrame // filled by edge on first use (the early-out of boxhullrest.go needs none)
	beSet bool
	deep  int // the hull's vertex deepest beyond the box face of largest gap (boxFacesBounded)
}

func (bh *boxHullAxes) init(p *polytope, h *shapes.Hull, bv *view) {
	bh.p, bh.h = p, h
	bh.u = [3]vec3{col(bv.rot, 0), col(bv.rot, 1), col(bv.rot, 2)}
	bh.c, bh.hb = bv.pos, bv.half
	bh.beSet = false
}

// edge is the box's edge k in the computation frame.
func (bh *boxHullAxes) edge(k int) *boxEdgeFrame {
	if !bh.beSet {
		p := bh.p
		for k, e := range boxEdges {
			x := &bh.be[k]
			x.p0 = p.verts[e.V[0]]
			x.dp = p.verts[e.V[1]].Sub(x.p0)
			x.dd = x.dp.Dot(x.dp)
			x.out = p.planes[e.F[0]].n.Add(p.planes[e.F[1]].n)
		}
		bh.beSet = true
	}
	return &bh.be[k]
}

// boxFace is the gap of the hull beyond the box's face i.
func (bh *boxHullAxes) boxFace(i int) float64 {
	_, g := bh.boxFaceAt(i)
	return g
}

// boxFaceAt is boxFace and the hull's vertex that gives the gap.
func (bh *boxHullAxes) boxFaceAt(i int) (int, float64) {
	pl := &bh.p.planes[i]
	v, m := hullMin(bh.h, pl.n)
	return v, m - pl.d
}

// hullFace is the gap of the box beyond the hull's face j, from the box's
// extent along its normal, and the normal's cosines with the box's axes.
func (bh *boxHullAxes) hullFace(j int) (float64, vec3) {
	f := &bh.h.Faces[j]
	n := f.Normal
	cs := vec3{n.Dot(bh.u[0]), n.Dot(bh.u[1]), n.Dot(bh.u[2])} // as cosines(j)
	hb := bh.hb
	return n.Dot(bh.c) - (hb[0]*math.Abs(cs[0]) + hb[1]*math.Abs(cs[1]) + hb[2]*math.Abs(cs[2])) - f.Offset, cs
}

// cosines is the cosines of the hull's face j's normal with the box's axes.
func (bh *boxHullAxes) cosines(j int) vec3 {
	n := bh.h.Faces[j].Normal
	return vec3{n.Dot(bh.u[0]), n.Dot(bh.u[1]), n.Dot(bh.u[2])}
}

// hintGap is the gap on the remembered axis; ok is false when it names no
// axis that the test would try (an edge pair whose arcs do not cross).
func (bh *boxHullAxes) hintGap(hint pairHint) (float64, bool) {
	h := bh.h
	switch hint.kind {
	case hintFaceP:
		if int(hint.i) < len(bh.p.planes) {
			return bh.boxFace(int(hint.i)), true
		}
	case hintFaceQ:
		if int(hint.i) < len(h.Faces) {
			g, _ := bh.hullFace(int(hint.i))
			return g, true
		}
	case hintEdge:
		if int(hint.i) >= len(boxEdges) || int(hint.j) >= len(h.Edges) {
			break
		}
		e := h.Edges[hint.j]
		_, ca := bh.hullFace(int(e.F[0]))
		_, cb := bh.hullFace(int(e.F[1]))
		if crossedBoxEdge(&ca, &cb, int(boxEdgeAxis[hint.i])) == int(hint.i) {
			q0 := h.Vertices[e.V[0]]
			dq := h.Vertices[e.V[1]].Sub(q0)
			g, _, ok := bh.edge(int(hint.i)).edgeGap(&q0, &dq)
			return g, ok
		}
	}
	return 0, false
}

// boxEdgeAxis is the axis along which each box edge runs.
var boxEdgeAxis = func() (t [12]int8) {
	for e, ed := range boxEdges {
		x := ed.V[0] ^ ed.V[1]
		for x != 1<<t[e] {
			t[e]++
		}
	}
	return t
}()

func growF(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n, n+n/4)
	}
	return s[:n]
}

// boxFaceContact is polyContact for a test that chose box face r.face of p
// against small hull q (in its own frame), with the cosines of q's face
// normals with the box's axes in d.faceCos (satBoxHull). The face normal of
// box face r.face is box axis k = r.face/2 or its negative, so its dot
// product with a hull face's normal is that face's cosine with axis k, or
// the cosine negated, bit for bit (negation is exact): the incident face
// is incidentFace's without another pass of dot products.
func (d *Detector) boxFaceContact(p, q *polytope, r satResult, margin float64) vec3 {
	d.cand = d.cand[:0]
	k, neg := r.face/2, r.face%2 == 1
	best, fi := math.Inf(1), 0
	for j := range d.faceCos {
		c := d.faceCos[j][k]
		if neg {
			c = -c
		}
		if c < best {
			best, fi = c, j
		}
	}
	d.clipFaces(p, r.face, q, fi, false, margin)
	return p.planes[r.face].n
}
