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
	for i := range p.edges {
		e := &p.edges[i]
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
			for i := range h.Vertices {
				p.vbuf = append(p.vbuf, v.pos.Add(mul(v.rot, h.Vertices[i])))
			}
			p.verts = p.vbuf
		}
		p.pbuf = p.pbuf[:0]
		if v.rot == identity3 && v.pos == (vec3{}) {
			for i := range h.Faces {
				f := &h.Faces[i]
				p.pbuf = append(p.pbuf, plane{f.Normal, f.Offset})
			}
		} else {
			for i := range h.Faces {
				f := &h.Faces[i]
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
	for i := range p.verts {
		if d := n.Dot(p.verts[i]); d < best { // by index (geom.go)
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
	s := newSatSearch(r, margin, p.size+q.size)
	if g, ok := polyHintGap(p, q, h); ok && s.hinted(h, g) {
		return false
	}
	for i := range p.planes {
		if !s.face(hintFaceP, satFaceGap(p.planes[i], q), i) {
			return false
		}
	}
	for i := 0; i < q.faceAxes(); i++ {
		if !s.face(hintFaceQ, satFaceGap(q.planes[i], p), i) {
			return false
		}
	}
	s.pickFace(q.flat) // a triangle's own face is preferred
	return polyEdgePairs(p, q, &s)
}

// faceAxes is the number of face axes of p: a flat polytope (a triangle)
// has only its front face.
func (p *polytope) faceAxes() int {
	if p.flat {
		return 1
	}
	return len(p.planes)
}

// polyHintGap is the gap on the remembered axis h of P and Q; ok is false
// when h names no axis that the test would try.
func polyHintGap(p, q *polytope, h pairHint) (g float64, ok bool) {
	switch h.kind {
	case hintFaceP:
		if int(h.i) < len(p.planes) {
			return satFaceGap(p.planes[h.i], q), true
		}
	case hintFaceQ:
		if int(h.i) < q.faceAxes() {
			return satFaceGap(q.planes[h.i], p), true
		}
	case hintEdge:
		p.prepareArcs(false)
		q.prepareArcs(true)
		if int(h.i) < len(p.arcs) && int(h.j) < len(q.arcs) {
			g, _, ok = satEdgeGap(&p.arcs[h.i], &q.arcs[h.j])
			return g, ok
		}
	}
	return 0, false
}

// polyEdgePairs runs the edge pairs of P and Q whose arcs cross on the
// Gauss map through search s; false when one separates them.
func polyEdgePairs(p, q *polytope, s *satSearch) bool {
	p.prepareArcs(false)
	q.prepareArcs(true)
	// For a solid Q, the first test of arcsCross (Q's arc crosses the plane
	// of P's arc) takes the cosines of Q's face normals with that plane's
	// normal, computed once per arc of P rather than twice per pair; a Q
	// arc runs between the negated normals of its edge's faces, so these
	// are the same numbers up to sign.
	pre := !q.flat
	if pre {
		q.sideCos = growF(q.sideCos, len(q.planes))
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
			if pre && q.arcMisses(y) {
				continue
			}
			g, ax, ok := satEdgeGap(x, y)
			if !ok {
				continue
			}
			sep, better := s.edge(g, i, j)
			if sep {
				return false
			}
			if better {
				s.r.setEdge(g, ax, int(x.edge), int(y.edge), x.p0, x.p0.Add(x.dp), y.p0, y.p0.Add(y.dp))
			}
		}
	}
	return true
}

// arcMisses reports, from the cosines in q.sideCos, that Q's (negated) arc
// y does not cross the plane of the arc of P they were taken with.
func (q *polytope) arcMisses(y *edgeArc) bool {
	e := &q.edges[y.edge]
	return q.sideCos[e.F[0]]*q.sideCos[e.F[1]] >= 0
}

// incidentFace returns the face of q most anti-parallel to n.
func incidentFace(q *polytope, n vec3) int {
	best, bi := math.Inf(1), 0
	for i := range q.planes {
		if d := q.planes[i].n.Dot(n); d < best { // by index (geom.go)
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
