package collide

import (
	"math"

	"clatter/shapes"
)

// Separating-axis test for convex polyhedra (boxes, hulls, triangles): two
// convex polyhedra are disjoint exactly when their projections are disjoint
// on some face normal of either or on the cross product of an edge of each.
// The axis of largest separation (least penetration) names the contact: a
// face (then the manifold comes from clipping, see clip.go) or a pair of
// edges (one point).
//
// Edge pairs are pruned on the Gauss map: the cross product of two edges is a
// face normal of the Minkowski difference A - B only when the arc of normals
// of A's edge (between its two face normals) crosses the arc of B's edge
// negated. Other pairs cannot give the largest separation and are skipped,
// which also makes the separation of a kept pair simply the distance between
// the two edge lines along the axis.

type plane struct {
	n vec3
	d float64 // points x of the plane have n.x == d
}

// polytope is a box, hull or triangle in the computation frame.
type polytope struct {
	verts  []vec3
	planes []plane
	faces  []shapes.Face // topology only (Verts); normals are in planes
	edges  []shapes.Edge
	flat   bool // a triangle: one face axis, edges with two quarter arcs
	hull   *shapes.Hull
	rot    mat3
	pos    vec3
	size   float64

	vbuf []vec3
	pbuf []plane
	arcs []edgeArc
	// sideCos holds, while sat runs, the cosines of this polytope's face
	// normals with the plane normal of one arc of the other.
	sideCos []float64
	// arcsFor records which side arcs holds (0 none, 1 as P, 2 as Q), so
	// that a polytope tested against many triangles prepares them once.
	arcsFor int8
}

// edgeArc is an edge's arc on the Gauss map (from normal a to normal b)
// with the normal u = a x b of its plane, and the edge itself.
type edgeArc struct {
	a, b, u vec3
	p0, dp  vec3
	edge    int32
	side    int8 // for a flat polytope: 0 the front quarter arc, 1 the back
}

func (p *polytope) init() {
	p.vbuf = make([]vec3, 0, 32)
	p.pbuf = make([]plane, 0, 32)
	p.arcs = make([]edgeArc, 0, 32)
}

// prepareArcs fills p.arcs; neg negates the normals (B's side of A - B).
func (p *polytope) prepareArcs(neg bool) {
	want := int8(1)
	if neg {
		want = 2
	}
	if p.arcsFor == want {
		return
	}
	p.arcsFor = want
	p.arcs = p.arcs[:0]
	sg := 1.0
	if neg {
		sg = -1
	}
	for i, e := range p.edges {
		p0 := p.verts[e.V[0]]
		dp := p.verts[e.V[1]].Sub(p0)
		if p.flat {
			// A flat polytope's edge has the half circle of normals from n
			// through the outward side normal m to -n.
			n := p.planes[0].n.Mul(sg)
			m, _ := unit(dp.Cross(p.planes[0].n))
			m = m.Mul(sg)
			p.arcs = append(p.arcs,
				edgeArc{a: n, b: m, u: n.Cross(m), p0: p0, dp: dp, edge: int32(i)},
				edgeArc{a: m, b: n.Mul(-1), u: m.Cross(n.Mul(-1)), p0: p0, dp: dp, edge: int32(i), side: 1})
			continue
		}
		a, b := p.planes[e.F[0]].n.Mul(sg), p.planes[e.F[1]].n.Mul(sg)
		p.arcs = append(p.arcs, edgeArc{a: a, b: b, u: a.Cross(b), p0: p0, dp: dp, edge: int32(i)})
	}
}

// The box topology: vertex i has x, y, z signs from bits 0, 1, 2 (set =
// positive); faces in the order +x, -x, +y, -y, +z, -z, counter-clockwise
// seen from outside.
var (
	boxFaces = []shapes.Face{
		{Normal: vec3{1, 0, 0}, Verts: []int32{1, 3, 7, 5}},
		{Normal: vec3{-1, 0, 0}, Verts: []int32{0, 4, 6, 2}},
		{Normal: vec3{0, 1, 0}, Verts: []int32{2, 6, 7, 3}},
		{Normal: vec3{0, -1, 0}, Verts: []int32{0, 1, 5, 4}},
		{Normal: vec3{0, 0, 1}, Verts: []int32{4, 5, 7, 6}},
		{Normal: vec3{0, 0, -1}, Verts: []int32{0, 2, 3, 1}},
	}
	boxEdges = edgesOf(boxFaces)
	// Each box vertex's three neighbours (differing in one sign bit).
	triFaces     = []shapes.Face{{Verts: []int32{0, 1, 2}}, {Verts: []int32{0, 2, 1}}}
	triTopoEdges = []shapes.Edge{{V: [2]int32{0, 1}, F: [2]int32{0, 1}}, {V: [2]int32{1, 2}, F: [2]int32{0, 1}}, {V: [2]int32{2, 0}, F: [2]int32{0, 1}}}
)

// edgesOf derives the unique edges of a closed polygon mesh: F[0] runs
// V[0] -> V[1] in its counter-clockwise order, F[1] the other way.
func edgesOf(faces []shapes.Face) []shapes.Edge {
	var out []shapes.Edge
	for fi, f := range faces {
		for k := range f.Verts {
			a, b := f.Verts[k], f.Verts[(k+1)%len(f.Verts)]
			found := false
			for i := range out {
				if out[i].V[0] == b && out[i].V[1] == a {
					out[i].F[1] = int32(fi)
					found = true
				}
			}
			if !found {
				out = append(out, shapes.Edge{V: [2]int32{a, b}, F: [2]int32{int32(fi), -1}})
			}
		}
	}
	return out
}

func boxVertex(h vec3, i int) vec3 {
	v := h.Mul(-1)
	if i&1 != 0 {
		v[0] = h[0]
	}
	if i&2 != 0 {
		v[1] = h[1]
	}
	if i&4 != 0 {
		v[2] = h[2]
	}
	return v
}

// set fills p from view v (a box, hull or triangle).
func (p *polytope) set(v *view) {
	p.flat, p.hull, p.rot, p.pos, p.size = false, nil, v.rot, v.pos, v.size
	p.arcsFor = 0
	switch v.kind {
	case kBox:
		p.vbuf = p.vbuf[:0]
		for i := 0; i < 8; i++ {
			p.vbuf = append(p.vbuf, v.pos.Add(mul(v.rot, boxVertex(v.half, i))))
		}
		p.pbuf = p.pbuf[:0]
		for i := 0; i < 6; i++ {
			n := col(v.rot, i/2)
			if i%2 == 1 {
				n = n.Mul(-1)
			}
			p.pbuf = append(p.pbuf, plane{n, n.Dot(v.pos) + v.half[i/2]})
		}
		p.verts, p.planes, p.faces, p.edges = p.vbuf, p.pbuf, boxFaces, boxEdges
	case kHull:
		h := v.hull
		p.hull = h
		if v.rot == identity3 && v.pos == (vec3{}) {
			p.verts = h.Vertices
		} else {
			p.vbuf = p.vbuf[:0]
			for _, x := range h.Vertices {
				p.vbuf = append(p.vbuf, v.pos.Add(mul(v.rot, x)))
			}
			p.verts = p.vbuf
		}
		p.pbuf = p.pbuf[:0]
		if v.rot == identity3 && v.pos == (vec3{}) {
			for _, f := range h.Faces {
				p.pbuf = append(p.pbuf, plane{f.Normal, f.Offset})
			}
		} else {
			for _, f := range h.Faces {
				n := mul(v.rot, f.Normal)
				p.pbuf = append(p.pbuf, plane{n, f.Offset + n.Dot(v.pos)})
			}
		}
		p.planes, p.faces, p.edges = p.pbuf, h.Faces, h.Edges
	case kTriangle:
		p.vbuf = append(p.vbuf[:0], v.tri[0], v.tri[1], v.tri[2])
		d := v.triN.Dot(v.tri[0])
		p.pbuf = append(p.pbuf[:0], plane{v.triN, d}, plane{v.triN.Mul(-1), -d})
		p.verts, p.planes, p.faces, p.edges, p.flat = p.vbuf, p.pbuf, triFaces, triTopoEdges, true
	}
}

// minAlong returns the index and value of the vertex with the least n.x.
func (p *polytope) minAlong(n vec3) (int, float64) {
	if p.hull != nil && len(p.verts) > 32 {
		i := p.hull.SupportIndex(mulT(p.rot, n.Mul(-1)))
		return i, n.Dot(p.verts[i])
	}
	best, bi := math.Inf(1), 0
	for i, x := range p.verts {
		if d := n.Dot(x); d < best {
			best, bi = d, i
		}
	}
	return bi, best
}

// satKind names the axis of least penetration.
const (
	satFaceP = iota
	satFaceQ
	satEdge
)

type satResult struct {
	kind   int
	sep    float64
	face   int // reference face (on P for satFaceP, on Q for satFaceQ)
	ep, eq int // edges for satEdge, with their end points
	p0, p1 vec3
	q0, q1 vec3
	axis   vec3
	fail   pairHint // the axis that separated the pair, when the test fails
	hinted bool     // the remembered axis was that axis
}

// arcsCross reports whether the great-circle arc x.a-x.b crosses arc
// y.a-y.b (unit vectors, each arc shorter than a half circle). The arcs'
// planes must separate each other's end points, and the two crossing points
// (each written with positive weights of its arc's ends) must be the same
// point of the sphere, not antipodes.
func arcsCross(x, y *edgeArc) bool {
	cu, du := y.a.Dot(x.u), y.b.Dot(x.u)
	if cu*du >= 0 {
		return false
	}
	av, bv := x.a.Dot(y.u), x.b.Dot(y.u)
	if av*bv >= 0 {
		return false
	}
	x1 := x.a.Mul(math.Abs(bv)).Add(x.b.Mul(math.Abs(av)))
	x2 := y.a.Mul(math.Abs(du)).Add(y.b.Mul(math.Abs(cu)))
	return x1.Dot(x2) > 0
}

// Tolerances of axis selection, as fractions of the shapes' size. A face of
// Q must beat a face of P, and an edge pair the best face, by this much to
// be chosen, so that near ties (a box resting flat) resolve the same way
// every step and prefer faces, whose manifolds have several points.
const (
	satFaceBias = 1e-7
	satEdgeBias = 1e-4
	// satParallel skips edge pairs whose cross product is this small a
	// fraction of the edge lengths' product (parallel edges: their contact is
	// found on a face axis).
	satParallel = 1e-6
)

// sat runs the separating-axis test of P against Q. It reports false as soon
// as an axis separates them by more than margin. For a flat Q (a triangle)
// only its front face is a face axis.
func sat(p, q *polytope, margin float64) (satResult, bool) {
	var r satResult
	ok := satHint(p, q, margin, pairHint{}, &r)
	return r, ok
}

// satFaceGap is the gap of Q beyond plane pl of P (or of P beyond Q's).
func satFaceGap(pl plane, other *polytope) float64 {
	_, m := other.minAlong(pl.n)
	return m - pl.d
}

// satEdgeGap is the gap on the cross product of edge arcs x (of P) and y
// (of Q, negated), oriented outward from P; ok is false when the arcs do
// not cross on the Gauss map or the edges are parallel.
func satEdgeGap(x, y *edgeArc) (s float64, ax vec3, ok bool) {
	if !arcsCross(x, y) {
		return 0, ax, false
	}
	ax = x.dp.Cross(y.dp)
	l := ax.Len()
	if l <= satParallel*x.dp.Len()*y.dp.Len() {
		return 0, ax, false
	}
	ax = ax.Mul(1 / l)
	if ax.Dot(x.a.Add(x.b)) < 0 {
		ax = ax.Mul(-1)
	}
	return ax.Dot(y.p0.Sub(x.p0)), ax, true
}

// satHint is sat writing into r, trying the remembered axis h first; on a
// separation beyond margin r.fail names the separating axis (edge pairs by
// their arc indices).
func satHint(p, q *polytope, margin float64, h pairHint, r *satResult) bool {
	nq := len(q.planes)
	if q.flat {
		nq = 1
	}
	switch h.kind {
	case hintFaceP:
		if int(h.i) < len(p.planes) && satFaceGap(p.planes[h.i], q) > margin {
			r.fail, r.hinted = h, true
			return false
		}
	case hintFaceQ:
		if int(h.i) < nq && satFaceGap(q.planes[h.i], p) > margin {
			r.fail, r.hinted = h, true
			return false
		}
	case hintEdge:
		p.prepareArcs(false)
		q.prepareArcs(true)
		if int(h.i) < len(p.arcs) && int(h.j) < len(q.arcs) {
			if s, _, ok := satEdgeGap(&p.arcs[h.i], &q.arcs[h.j]); ok && s > margin {
				r.fail, r.hinted = h, true
				return false
			}
		}
	}
	bestP, bestPi := math.Inf(-1), -1
	for i, pl := range p.planes {
		s := satFaceGap(pl, q)
		if s > margin {
			r.fail = pairHint{kind: hintFaceP, i: int32(i)}
			return false
		}
		if s > bestP {
			bestP, bestPi = s, i
		}
	}
	bestQ, bestQi := math.Inf(-1), -1
	for i := 0; i < nq; i++ {
		s := satFaceGap(q.planes[i], p)
		if s > margin {
			r.fail = pairHint{kind: hintFaceQ, i: int32(i)}
			return false
		}
		if s > bestQ {
			bestQ, bestQi = s, i
		}
	}
	scale := p.size + q.size
	r.kind, r.sep, r.face = satFaceP, bestP, bestPi
	if q.flat {
		// The triangle's own face is preferred (mesh contacts keep its normal).
		if bestQ >= bestP-satFaceBias*scale {
			r.kind, r.sep, r.face = satFaceQ, bestQ, bestQi
		}
	} else if bestQ > bestP+satFaceBias*scale {
		r.kind, r.sep, r.face = satFaceQ, bestQ, bestQi
	}
	bestFace := r.sep
	bestE := math.Inf(-1)
	p.prepareArcs(false)
	q.prepareArcs(true)
	// For a solid Q, the first test of arcsCross (Q's arc crosses the plane
	// of P's arc) takes the cosines of Q's face normals with that plane's
	// normal, computed once per arc of P rather than twice per pair; a Q
	// arc runs between the negated normals of its edge's faces, so these
	// are the same numbers up to sign.
	pre := !q.flat
	if pre {
		d := &q.sideCos
		*d = growF(*d, len(q.planes))
	}
	for i := range p.arcs {
		x := &p.arcs[i]
		if pre {
			for f := range q.planes {
				q.sideCos[f] = q.planes[f].n.Dot(x.u)
			}
		}
		for j := range q.arcs {
			y := &q.arcs[j]
			if pre {
				e := &q.edges[y.edge]
				if cu, du := -q.sideCos[e.F[0]], -q.sideCos[e.F[1]]; cu*du >= 0 {
					continue
				}
			}
			s, ax, ok := satEdgeGap(x, y)
			if !ok {
				continue
			}
			if s > margin {
				r.fail = pairHint{kind: hintEdge, i: int32(i), j: int32(j)}
				return false
			}
			if s > bestE {
				bestE = s
				if bestE > bestFace+satEdgeBias*scale {
					r.kind, r.sep, r.axis = satEdge, s, ax
					r.ep, r.eq = int(x.edge), int(y.edge)
					r.p0, r.p1 = x.p0, x.p0.Add(x.dp)
					r.q0, r.q1 = y.p0, y.p0.Add(y.dp)
				}
			}
		}
	}
	return true
}

// incidentFace returns the face of q most anti-parallel to n.
func incidentFace(q *polytope, n vec3) int {
	best, bi := math.Inf(1), 0
	for i, pl := range q.planes {
		if d := pl.n.Dot(n); d < best {
			best, bi = d, i
		}
	}
	return bi
}

// polyContact turns a SAT result of P against Q into candidate points in
// d.cand and returns the normal from P to Q. baseP and baseQ tag features of
// each side in the ids.
func (d *Detector) polyContact(p, q *polytope, r satResult, margin float64) vec3 {
	d.cand = d.cand[:0]
	switch r.kind {
	case satEdge:
		_, _, cp, cq := closestSegmentSegment(r.p0, r.p1, r.q0, r.q1)
		sep := r.axis.Dot(cq.Sub(cp))
		if sep <= margin {
			d.cand = append(d.cand, candPoint{p: cp.Add(cq).Mul(0.5), sep: sep, id: edgeID(r.ep, r.eq)})
		}
		return r.axis
	case satFaceP:
		fi := incidentFace(q, p.planes[r.face].n)
		d.clipFaces(p, r.face, q, fi, false, margin)
		return p.planes[r.face].n
	default:
		fi := incidentFace(p, q.planes[r.face].n)
		d.clipFaces(q, r.face, p, fi, true, margin)
		return q.planes[r.face].n.Mul(-1)
	}
}

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

// satBoxesHint is satBoxes writing into r, trying the remembered axis h
// first; on a separation beyond margin r.fail names the separating axis.
func satBoxesHint(a, b *view, margin float64, h pairHint, r *satResult) bool {
	var bp boxPair
	bp.init(a, b)
	// Face hints name a face (0..5: axis i/2), edge hints two axes.
	if h.i < 0 || h.i > 5 || h.j < 0 || h.j > 2 || (h.kind == hintEdge && h.i > 2) {
		h.kind = hintNone // not an axis of two boxes
	}
	switch h.kind {
	case hintFaceP:
		if s, _ := bp.faceP(int(h.i / 2)); s > margin {
			r.fail, r.hinted = h, true
			return false
		}
	case hintFaceQ:
		if s, _ := bp.faceQ(int(h.i / 2)); s > margin {
			r.fail, r.hinted = h, true
			return false
		}
	case hintEdge:
		if s, _, _, _, ok := bp.edge(int(h.i), int(h.j)); ok && s > margin {
			r.fail, r.hinted = h, true
			return false
		}
	}
	ha, hb := a.half, b.half
	ua, ub := &bp.ua, &bp.ub
	scale := a.size + b.size
	bestP, bestPi := math.Inf(-1), 0
	for i := 0; i < 3; i++ {
		s, dist := bp.faceP(i)
		if s > margin {
			r.fail = pairHint{kind: hintFaceP, i: int32(2*i + b2i(dist < 0))}
			return false
		}
		if s > bestP {
			bestP, bestPi = s, 2*i+b2i(dist < 0)
		}
	}
	bestQ, bestQi := math.Inf(-1), 0
	for j := 0; j < 3; j++ {
		s, dist := bp.faceQ(j)
		if s > margin {
			r.fail = pairHint{kind: hintFaceQ, i: int32(2*j + b2i(dist > 0))}
			return false
		}
		// B's face toward A: -ub_j when B lies on the +ub_j side.
		if s > bestQ {
			bestQ, bestQi = s, 2*j+b2i(dist > 0)
		}
	}
	r.kind, r.sep, r.face = satFaceP, bestP, bestPi
	if bestQ > bestP+satFaceBias*scale {
		r.kind, r.sep, r.face = satFaceQ, bestQ, bestQi
	}
	bestFace := r.sep
	bestE := math.Inf(-1)
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			s, ax, pa, pb, ok := bp.edge(i, j)
			if !ok {
				continue
			}
			if s > margin {
				r.fail = pairHint{kind: hintEdge, i: int32(i), j: int32(j)}
				return false
			}
			if s > bestE {
				bestE = s
				if bestE > bestFace+satEdgeBias*scale {
					// A's edge along ua_i extreme toward +ax, B's along ub_j
					// extreme toward -ax.
					var ca, cb vec3
					va, vb := 0, 0
					for k := 0; k < 3; k++ {
						if k != i {
							sa := sgn(pa[k])
							ca = ca.Add(ua[k].Mul(sa * ha[k]))
							if sa > 0 {
								va |= 1 << k
							}
						}
						if k != j {
							sb := -sgn(pb[k])
							cb = cb.Add(ub[k].Mul(sb * hb[k]))
							if sb > 0 {
								vb |= 1 << k
							}
						}
					}
					ea, eb := ua[i].Mul(ha[i]), ub[j].Mul(hb[j])
					r.kind, r.sep, r.axis = satEdge, s, ax
					r.ep, r.eq = 8*i+va, 8*j+vb
					r.p0, r.p1 = a.pos.Add(ca).Sub(ea), a.pos.Add(ca).Add(ea)
					r.q0, r.q1 = b.pos.Add(cb).Sub(eb), b.pos.Add(cb).Add(eb)
				}
			}
		}
	}
	return true
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
	var ua [3]vec3
	for i := 0; i < 3; i++ {
		ua[i] = col(a.rot, i)
	}
	c, h := a.pos, a.half
	tri := &tv.tri
	radius := func(l vec3) float64 {
		return h[0]*math.Abs(l.Dot(ua[0])) + h[1]*math.Abs(l.Dot(ua[1])) + h[2]*math.Abs(l.Dot(ua[2]))
	}
	span := func(l vec3) (lo, hi float64) {
		lo, hi = tri[0].Dot(l), tri[0].Dot(l)
		for k := 1; k < 3; k++ {
			v := tri[k].Dot(l)
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		return
	}
	scale := a.size + tv.size
	// The triangle's face: the box's lowest point against its plane.
	n := tv.triN
	bestQ := n.Dot(c) - radius(n) - n.Dot(tri[0])
	if bestQ > margin {
		return r, false
	}
	bestP, bestPi := math.Inf(-1), 0
	for i := 0; i < 3; i++ {
		lo, hi := span(ua[i])
		m := ua[i].Dot(c)
		sPlus := lo - (m + h[i])  // the triangle beyond the +ua_i face
		sMinus := (m - h[i]) - hi // beyond the -ua_i face
		s, fi := sPlus, 2*i
		if sMinus > sPlus {
			s, fi = sMinus, 2*i+1
		}
		if s > margin {
			return r, false
		}
		if s > bestP {
			bestP, bestPi = s, fi
		}
	}
	r.kind, r.sep, r.face = satFaceQ, bestQ, 0
	if bestP > bestQ+satFaceBias*scale {
		r.kind, r.sep, r.face = satFaceP, bestP, bestPi
	}
	bestFace := r.sep
	bestE := math.Inf(-1)
	for k := 0; k < 3; k++ {
		t0, t1 := tri[k], tri[(k+1)%3]
		e := t1.Sub(t0)
		el := e.Len()
		for i := 0; i < 3; i++ {
			ax := ua[i].Cross(e)
			l := ax.Len()
			if l <= satParallel*el {
				continue
			}
			ax = ax.Mul(1 / l)
			lo, hi := span(ax)
			m, rb := ax.Dot(c), radius(ax)
			s := lo - (m + rb)
			if sm := (m - rb) - hi; sm > s {
				s, ax = sm, ax.Mul(-1)
			}
			if s > margin {
				return r, false
			}
			if s > bestE {
				bestE = s
				if bestE > bestFace+satEdgeBias*scale {
					// The box edge along ua_i extreme toward +ax.
					var cb vec3
					vi := 0
					for j := 0; j < 3; j++ {
						if j != i {
							sj := sgn(ax.Dot(ua[j]))
							cb = cb.Add(ua[j].Mul(sj * h[j]))
							if sj > 0 {
								vi |= 1 << j
							}
						}
					}
					eb := ua[i].Mul(h[i])
					r.kind, r.sep, r.axis = satEdge, s, ax
					r.ep, r.eq = 8*i+vi, k
					r.p0, r.p1 = c.Add(cb).Sub(eb), c.Add(cb).Add(eb)
					r.q0, r.q1 = t0, t1
				}
			}
		}
	}
	return r, true
}
