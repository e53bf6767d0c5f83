package collide

import "math"

// The steps every separating-axis test takes, whatever the two shapes
// (S. Gottschalk, "Collision Queries using Oriented Bounding Boxes", PhD
// thesis, University of North Carolina at Chapel Hill, 2000; C. Ericson,
// "Real-Time Collision Detection", Morgan Kaufmann 2005, section 5.2.1):
//
//  1. the axis that separated the pair last step (CollidePair's memory) is
//     tried first, and ends the test when it separates them again;
//  2. the face axes of P, then of Q: any gap beyond the margin ends the test
//     (the pair is apart), else the largest gap of each side is kept;
//  3. one of the two best faces is chosen by the tie-break rule below;
//  4. the edge pairs: again any gap beyond the margin ends the test, and an
//     edge pair whose gap beats the chosen face by the rule becomes the
//     contact axis.
//
// Each test (sat, satBoxes, satBoxTriangle, satBoxHull) only enumerates the
// axes of its shapes, measures the gaps in its own cheap way, and reports
// each one to a satSearch, which does the steps. The search is a concrete
// type whose methods inline, so a test pays nothing for sharing them.

// satSearch is one run of the separating-axis steps, writing into r.
type satSearch struct {
	r               *satResult
	margin, scale   float64
	best            [2]float64 // the largest face gaps of P and Q so far
	bestI           [2]int     // and their faces
	bestFace, bestE float64    // the chosen face's gap; the largest edge gap so far
}

func newSatSearch(r *satResult, margin, scale float64) satSearch {
	return satSearch{r: r, margin: margin, scale: scale,
		best: [2]float64{math.Inf(-1), math.Inf(-1)}, bestE: math.Inf(-1)}
}

// outranks is the one tie-break rule of axis selection: a candidate axis
// with gap s replaces the incumbent with gap best only when it beats it by
// bias (satFaceBias or satEdgeBias) of the shapes' size. Near ties (a box
// resting flat) therefore resolve the same way every step, toward the
// incumbent: P's face over Q's, a triangle's own face over the solid's
// (mesh contacts keep the surface normal), any face over an edge pair
// (faces give manifolds of several points).
func (s *satSearch) outranks(gap, best, bias float64) bool {
	return gap > best+bias*s.scale
}

// hinted reports whether the remembered axis h, with gap gap, separates
// the pair again; then it is the test's answer.
func (s *satSearch) hinted(h pairHint, gap float64) bool {
	if gap > s.margin {
		s.r.fail, s.r.hinted = h, true
		return true
	}
	return false
}

// face takes the gap on face i of P (side hintFaceP) or Q (hintFaceQ);
// false when that face separates the pair.
func (s *satSearch) face(side uint8, gap float64, i int) bool {
	if gap > s.margin {
		s.r.fail = pairHint{kind: side, i: int32(i)}
		return false
	}
	k := side - hintFaceP
	if gap > s.best[k] {
		s.best[k], s.bestI[k] = gap, i
	}
	return true
}

// pickFace chooses the face axis once both sides' faces are in: P's best,
// unless Q's outranks it; with preferQ (Q is a mesh triangle) the other
// way round.
func (s *satSearch) pickFace(preferQ bool) {
	p, q := s.best[0], s.best[1]
	k := b2i(s.outranks(q, p, satFaceBias)) // 1: Q's face
	if preferQ {
		k = 1 - b2i(s.outranks(p, q, satFaceBias))
	}
	s.r.kind, s.r.sep, s.r.face = satFaceP+k, s.best[k], s.bestI[k]
	s.bestFace = s.best[k]
}

// edge takes the gap on edge pair (i, j), named as a hint by those
// indices. sep reports that it separates the pair (the test ends); better
// that its axis is now the contact axis, and the caller must fill r's edge
// fields (satResult.setEdge).
func (s *satSearch) edge(gap float64, i, j int) (sep, better bool) {
	if gap > s.margin {
		s.r.fail = pairHint{kind: hintEdge, i: int32(i), j: int32(j)}
		return true, false
	}
	if !(gap > s.bestE) {
		return false, false
	}
	s.bestE = gap
	return false, s.outranks(gap, s.bestFace, satEdgeBias)
}

// setEdge makes edge p0-p1 of P (feature ep) against q0-q1 of Q (eq) the
// result, with separation sep along axis ax (from P toward Q).
func (r *satResult) setEdge(sep float64, ax vec3, ep, eq int, p0, p1, q0, q1 vec3) {
	r.kind, r.sep, r.axis = satEdge, sep, ax
	r.ep, r.eq = ep, eq
	r.p0, r.p1, r.q0, r.q1 = p0, p1, q0, q1
}
