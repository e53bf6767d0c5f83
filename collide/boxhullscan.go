package collide

import "math"

// The gaps of a small hull beyond the six faces of a box in one pass over
// its vertices. A box face's gap is the hull's least extent along the
// face's normal, found for each face by a climb over the hull's vertex
// graph (hullMin). The six normals are the box's three axes and their
// negatives, so one pass that keeps each axis's least and greatest dot
// product gives all six extremes; on a hull of a few dozen vertices the
// pass costs less than six climbs, whose hops from vertex to vertex
// branch unpredictably (measured on 40-vertex hulls: see boxScanVerts).
// The values are the climbs' to the rounding of a dot product (the
// negated normals' dot products are the axes' negated exactly), and where
// several vertices tie the first is taken, as a scan of the hull does
// (shapes.Hull.SupportFrom).

// boxScanVerts is the largest hull, in vertices, whose box-face gaps are
// found by the pass instead of six climbs.
const boxScanVerts = 64

// boxFacesScan sets g[i] to the gap of the hull beyond the box's face i
// and v[i] to the hull vertex that gives it, as boxFaceAt does.
func (bh *boxHullAxes) boxFacesScan(v *[6]int, g *[6]float64) {
	lo := [3]float64{math.Inf(1), math.Inf(1), math.Inf(1)}
	hi := [3]float64{math.Inf(-1), math.Inf(-1), math.Inf(-1)}
	var li, hiI [3]int
	u0, u1, u2 := bh.u[0], bh.u[1], bh.u[2]
	vs := bh.h.Vertices
	for i := range vs {
		x := &vs[i] // by index (geom.go)
		p0, p1, p2 := u0.Dot(*x), u1.Dot(*x), u2.Dot(*x)
		if p0 < lo[0] {
			lo[0], li[0] = p0, i
		}
		if p0 > hi[0] {
			hi[0], hiI[0] = p0, i
		}
		if p1 < lo[1] {
			lo[1], li[1] = p1, i
		}
		if p1 > hi[1] {
			hi[1], hiI[1] = p1, i
		}
		if p2 < lo[2] {
			lo[2], li[2] = p2, i
		}
		if p2 > hi[2] {
			hi[2], hiI[2] = p2, i
		}
	}
	pl := bh.p.planes
	for k := 0; k < 3; k++ {
		// Face 2k has normal u_k, face 2k+1 its negative (polytope.set).
		v[2*k], g[2*k] = li[k], lo[k]-pl[2*k].d
		v[2*k+1], g[2*k+1] = hiI[k], -hi[k]-pl[2*k+1].d
	}
}

// The edge loop of the box-hull test (satBoxHull) pairs a hull edge with
// box axis i only where the cosines of the edge's two face normals with
// axis i have opposite signs (crossedBoxEdge: their product is negative).
// Most edges cross none of the three planes x_i = 0, so the signs of each
// face's cosines are kept as bits and an edge's candidate axes are read
// off its two faces' bits before any arithmetic. The bits only filter:
// crossedBoxEdge still decides each candidate on the product, so the pairs
// tried, their order and the result are those of the loop over all three
// axes.

// cosSigns is the signs of the cosines cs: bit i set when cs[i] < 0, bit
// 3+i when cs[i] > 0.
func cosSigns(cs *vec3) uint8 {
	var s uint8
	for i := 0; i < 3; i++ {
		if cs[i] < 0 {
			s |= 1 << i
		}
		if cs[i] > 0 {
			s |= 8 << i
		}
	}
	return s
}

// crossingAxes is the set of axes i (bit i) on which two faces' cosines,
// with signs a and b (cosSigns), are of opposite signs: every axis whose
// product of cosines is negative is in it.
func crossingAxes(a, b uint8) uint8 {
	return (a&(b>>3) | (a>>3)&b) & 7
}
