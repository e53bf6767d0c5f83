package collide

import (
	"math"

	"clatter/shapes"
)

// An exact early-out of the box-hull test against a large hull, for the
// common case of a part lying on (or just above) a larger box: the hull's
// vertex deepest beyond the box face of largest gap lies over that face,
// so no other axis can hold a larger gap, and the searches of the hull's
// faces and edges (boxhulltree.go) cannot change the answer.
//
// The argument. For convex sets P (the box) and Q (the hull's vertices'
// convex hull) and a unit vector m, let sg(m) = min over P of m.p - max
// over Q of m.q, the gap between them along m. Its largest value over all
// m is the signed distance s of the two sets: their distance when apart
// (the separating hyperplane theorem), minus the penetration depth when
// they overlap (the depth is the least overlap over all directions). Any
// point q of Q bounds s from above by its signed distance d(q) from P:
// apart, s <= |q - P|; with q inside P at depth t from P's boundary, the
// overlap along any m is at least t (q - t m lies in P), so s <= -t. So
// every sg(m) <= d(q) (Ericson, "Real-Time Collision Detection", 2005,
// chapter 5, for the separating-axis test and these support gaps; van den
// Bergen, "Collision Detection in Interactive 3D Environments", 2003, for
// the penetration depth as the least overlap).
//
// The gaps the test computes differ from sg on their axes by what the
// hull's tolerances allow: a hull face's gap n.c - r(n) - f exceeds sg(n)
// by how far a vertex lies beyond the face's plane (faceOut); an edge
// pair's gap exceeds sg(-axis) by how far the hull edge falls short of the
// hull's extreme along the axis and the box edge short of the box's
// (edgeOut and the box's share, from the edges' widths: edgeWidth). With q
// the vertex that gave the chosen box face its gap g, d(q) equals g when q
// lies over the face, and the searches are skipped when d(q) plus those
// allowances cannot reach the margin nor outrank the chosen face by the
// biases of satSearch. The answer is then the one the searches give, bit
// for bit.

// hullSlack is what a hull's tolerances add to the gaps the box-hull test
// computes over the support gaps of its vertices' convex hull.
type hullSlack struct {
	faceOut float64 // the farthest a vertex lies beyond a face's plane
	// edgeOut bounds how far beyond the hull's extreme along an edge pair's
	// axis the pair's hull edge may lie.
	edgeOut float64
}

// measureSlack fills x.slack for hull h, with width the edges' widths.
//
// A face's excess is max over the vertices of n.v - f, found by the
// support climb (exact to the rounding of a dot product). An edge e with
// face normals n0, n1 and first vertex q0 is measured on an axis m within
// its width w of a point a0 n0 + a1 n1 (a0, a1 >= 0) of its arc, so for q
// in Q, m.(q - q0) <= a0 n0.(q - q0) + a1 n1.(q - q0) + w |q - q0|, and
// n_f.(q - q0) <= faceOut_f + (f - n_f.q0); on a unit arc of angle theta,
// a0 + a1 <= 1 / cos(theta/2).
func (x *hullIndex) measureSlack(h *shapes.Hull, width []float64) {
	round := 8 * 0x1p-53 * x.reach // a dot product's rounding, several times over
	out := make([]float64, len(h.Faces))
	for i := range h.Faces {
		f := &h.Faces[i]
		out[i] = math.Max(0, h.Vertices[h.SupportIndex(f.Normal)].Dot(f.Normal)-f.Offset) + round
		x.slack.faceOut = math.Max(x.slack.faceOut, out[i])
	}
	for i := range h.Edges {
		e := &h.Edges[i]
		f0, f1 := &h.Faces[e.F[0]], &h.Faces[e.F[1]]
		q0 := h.Vertices[e.V[0]]
		tau := math.Max(out[e.F[0]]+f0.Offset-f0.Normal.Dot(q0), out[e.F[1]]+f1.Offset-f1.Normal.Dot(q0))
		c := f0.Normal.Sub(f1.Normal).Len() // 2 sin(theta/2)
		cos := math.Sqrt(math.Max(0, 1-0.25*c*c))
		s := math.Max(0, tau+round)/cos + width[i]*2*x.reach
		if !(s < math.Inf(1)) {
			s = math.Inf(1) // an edge as sharp as a blade: no early-out
		}
		x.slack.edgeOut = math.Max(x.slack.edgeOut, s)
	}
}

// signedDistance is q's signed distance from the box: negative inside, the
// depth below its nearest face.
func (bh *boxHullAxes) signedDistance(q vec3) float64 {
	d := q.Sub(bh.c)
	in, out := math.Inf(-1), 0.0
	for k := 0; k < 3; k++ {
		e := math.Abs(d.Dot(bh.u[k])) - bh.hb[k]
		in = math.Max(in, e)
		if e > 0 {
			out += e * e
		}
	}
	if in <= 0 {
		return in
	}
	return math.Sqrt(out)
}

// restBound is the bound, from the box face chosen so far and its deepest
// hull vertex v, above every hull face's gap (faces) and every edge pair's
// (edges) that the test computes: see the top of the file.
func (bh *boxHullAxes) restBound(x *hullIndex, v int, scale float64) (faces, edges float64) {
	d := bh.signedDistance(bh.h.Vertices[v]) + bh.treeSlack(x, scale)
	box := 2 * x.edges.nodes[0].w * (bh.hb[0] + bh.hb[1] + bh.hb[2]) // the box edge's share (edgeNodeBound)
	return d + x.slack.faceOut, d + x.slack.edgeOut + box
}

// restSkips reports whether the early-out decides a test whose box faces
// are in (s.best[0], with its deepest vertex bh.deep): no hull face nor
// edge pair can separate the pair or outrank the box's face. x holds the
// hull's slack; nil decides nothing.
func (bh *boxHullAxes) restSkips(x *hullIndex, s *satSearch) bool {
	if x == nil {
		return false
	}
	faces, edges := bh.restBound(x, bh.deep, s.scale)
	return faces <= s.margin && faces <= s.best[0]+satFaceBias*s.scale &&
		edges <= s.margin && edges <= s.best[0]+satEdgeBias*s.scale
}

// hullSlack returns the index of hull h, of any size, for its slack (the
// plain loops of a small hull use nothing else of it); nil for a hull
// without edges.
func (d *Detector) hullSlack(h *shapes.Hull) *hullIndex {
	if h == nil || len(h.Edges) == 0 || len(h.Faces) == 0 {
		return nil
	}
	return d.cachedIndex(h) // hullindex.go
}
