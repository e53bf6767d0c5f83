package collide

import "math"

// Witnesses from the polytope's edges for the separating axes of a
// cylinder and a polytope (cylpoly.go). The axes bound the distance from
// below (the largest gap over any set of axes is at most the distance) and
// a pair of points, one of each shape, bounds it from above; where the two
// meet within cylCertTol the axes' answer is proved. A point of both shapes
// proves an overlap. The witnesses of cylPoly come from support points and
// from the edge-rim search; an edge lying across the cylinder's side (the
// axis u x e of the side's lines against the edge) has neither: its nearest
// point to the side is in the middle of the edge, and no rim is near. There
// the common perpendicular of the edge and the cylinder's axis gives the
// pair: the edge's point x closest to the axis segment, and the point of
// the cylinder nearest x (closest points of two segments: Ericson,
// "Real-Time Collision Detection", 2005, section 5.1.9). Before, such pairs
// went on to GJK and EPA; in a pour of boxes and cylinders they were a
// third of the box-cylinder queries.

// edgeWitness looks at each edge of the polytope for its point x closest
// to the cylinder's axis segment. It returns, over the edges, the pair of
// such an x and the cylinder's point q nearest it that are closest
// together, and their distance; or inside true (with x) as soon as one x
// lies in the cylinder, a point of both shapes.
func (a *cylAxes) edgeWitness() (x, q vec3, dist float64, inside bool) {
	cp := a.cp
	k0, k1 := a.c0.Sub(a.u.Mul(a.h)), a.c0.Add(a.u.Mul(a.h))
	dist = math.Inf(1)
	for _, e := range cp.edges {
		_, _, xe, _ := closestSegmentSegment(cp.verts[e[0]], cp.verts[e[1]], k0, k1)
		qe, de, in := a.nearestTo(xe)
		if in {
			return xe, qe, 0, true
		}
		if de < dist {
			x, q, dist = xe, qe, de
		}
	}
	return x, q, dist, false
}

// nearestTo is the point of the cylinder nearest x and its distance; in
// reports that x lies in the cylinder (then q is x).
func (a *cylAxes) nearestTo(x vec3) (q vec3, dist float64, in bool) {
	w := x.Sub(a.c0)
	z := w.Dot(a.u)
	rad := w.Sub(a.u.Mul(z))
	rl := rad.Len()
	if math.Abs(z) <= a.h && rl <= a.r {
		return x, 0, true
	}
	q = a.c0.Add(a.u.Mul(math.Max(-a.h, math.Min(a.h, z))))
	if rl > a.r {
		q = q.Add(rad.Mul(a.r / rl))
	} else {
		q = q.Add(rad)
	}
	return q, x.Sub(q).Len(), false
}

// rimApart is cylPoly's answer when the edge-rim axes, searched because the
// closed-form ones left the shapes overlapping, show them apart instead:
// apart beyond the margin by an axis, or within it when the nearest pair of
// an edge point and a rim point met in the search (or in a search for the
// nearest such pair, rimWitness), or the edges' pairs (edgeWitness), come
// within tol of the gap; otherwise left to GJK.
func (a *cylAxes) rimApart(r nearest, tol float64) (nearest, bool, bool) {
	if res, in, ok := a.provedApart(r, tol); ok {
		return res, in, true
	}
	// The search looked only where the edges come within the overlap's
	// depth of a rim; the pair that proves the gap is farther apart.
	a.rimWitness(tol)
	if res, in, ok := a.provedApart(r, tol); ok {
		return res, in, true
	}
	r.n, r.sep = a.n, a.best
	if x, q, dist, in := a.edgeWitness(); !in && dist <= a.best+tol {
		r.pa, r.pb = q, x
		return r, true, true
	}
	return nearest{}, false, false
}

// provedApart is rimApart's answer from the axes and the nearest edge-rim
// pair found so far: ok when an axis shows the shapes apart beyond the
// margin (in false) or the pair comes within tol of the gap (in true).
func (a *cylAxes) provedApart(r nearest, tol float64) (res nearest, in, ok bool) {
	r.n, r.sep = a.n, a.best
	switch {
	case a.apart:
		return r, false, true
	case a.wit <= a.best+tol:
		r.pa, r.pb = a.witQ, a.witX
		return r, true, true
	}
	return r, false, false
}
