package collide

import (
	"cmp"
	"math"
	"slices"
)

// The contact patch of a manifold: the region where the shapes touch, which
// the solver needs for friction against twisting (package contact, twist.go).
// It is the convex hull of the candidate points that touch, before the
// reduction to four points, so that a hull face gives its whole polygon: the
// points that penetrate, and those within patchDepthTol of the patch's
// extent of the deepest (a patch of points all still apart, as a part lands). A cylinder cap
// lying flat is a disc, not the polygon of its rim points.
//
// Its effective friction radius is the mean distance from the centroid over
// the patch (uniform pressure): the moment of uniform Coulomb friction
// against spinning about the centroid is mu N times it (Goyal, Ruina and
// Papadopoulos, "Planar sliding with dry friction, Part 1", Wear 143, 1991).
// A disc of radius R gives 2R/3, a segment of length L gives L/4, and a
// polygon the sum over its edges of the integral of |x| over the triangle
// the edge makes with the centroid, in polar coordinates about the centroid:
// with h the edge's distance from the centroid and s the position along the
// edge from the foot of the perpendicular,
//
//	integral over the triangle of |x| dA = [h s sqrt(h^2+s^2) + h^3 asinh(s/h)] / 6
//
// between the edge's ends (from the integral of sec^3, any table of
// integrals). A square of side a gives a (sqrt 2 + ln(1 + sqrt 2)) / 6.

// patchDepthTol: candidates less than this fraction of the patch's extent
// above the deepest count as touching even if they are apart. A face tilted
// by less than a milliradian lands on all of it; a part tipping onto an
// edge tilts by more within a step or two.
const patchDepthTol = 1e-3

// discHint marks that the candidates may be the rim points of a cylinder
// cap of radius r, n of them, set by the code that made them.
type discHint struct {
	r float64
	n int
}

// pt2 is a point in the contact plane.
type pt2 struct{ x, y float64 }

// patch returns the centre (frame) and the effective friction radius of the
// patch of d.cand under normal n; the radius is 0 for a point contact.
func (d *Detector) patch(n vec3) (vec3, float64) {
	hint := d.disc
	d.disc = discHint{}
	switch len(d.cand) {
	case 0:
		return vec3{}, 0
	case 1:
		return d.cand[0].p, 0
	}
	u, v := d.tangents.basis(n)
	minSep := math.Inf(1)
	x0, x1, y0, y1 := math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)
	for i := range d.cand {
		c := &d.cand[i]
		x, y := c.p.Dot(u), c.p.Dot(v)
		minSep = min(minSep, c.sep)
		x0, x1, y0, y1 = min(x0, x), max(x1, x), min(y0, y), max(y1, y)
	}
	lim := max(minSep+patchDepthTol*max(x1-x0, y1-y0), 0)
	pts := d.patchPts[:0]
	var cx, cy, cz float64
	for i := range d.cand {
		c := &d.cand[i]
		if c.sep > lim {
			continue
		}
		p := pt2{c.p.Dot(u), c.p.Dot(v)}
		pts = append(pts, p)
		cx, cy, cz = cx+p.x, cy+p.y, cz+c.p.Dot(n)
	}
	k := float64(len(pts))
	cx, cy, cz = cx/k, cy/k, cz/k
	d.patchPts = pts
	at := func(x, y float64) vec3 { return u.Mul(x).Add(v.Mul(y)).Add(n.Mul(cz)) }
	if len(pts) == 1 {
		return at(cx, cy), 0
	}
	if hint.n == len(pts) && onCircle(pts, cx, cy, hint.r) {
		return at(cx, cy), 2 * hint.r / 3
	}
	hull := convexHull2(pts, d.patchHull[:0])
	d.patchHull = hull
	switch len(hull) {
	case 1:
		return at(hull[0].x, hull[0].y), 0
	case 2:
		a, b := hull[0], hull[1]
		return at(0.5*(a.x+b.x), 0.5*(a.y+b.y)), 0.25 * math.Sqrt((b.x-a.x)*(b.x-a.x)+(b.y-a.y)*(b.y-a.y))
	}
	gx, gy, r := polygonPatch(hull)
	return at(gx, gy), r
}

// onCircle reports whether every point lies on the circle of radius r about
// (cx, cy), to rounding.
func onCircle(pts []pt2, cx, cy, r float64) bool {
	for _, p := range pts {
		if d2 := (p.x-cx)*(p.x-cx) + (p.y-cy)*(p.y-cy); math.Abs(d2-r*r) > 2e-6*r*r {
			return false
		}
	}
	return r > 0
}

// convexHull2 appends to dst the convex hull of pts, counter-clockwise,
// without collinear points, by the monotone chain of A. M. Andrew, "Another
// efficient algorithm for convex hulls in two dimensions", IPL 9(5), 1979.
// It sorts pts in place.
func convexHull2(pts []pt2, dst []pt2) []pt2 {
	if len(pts) == 3 { // a triangle needs only its orientation
		a, b, c := pts[0], pts[1], pts[2]
		switch t := cross2(b.x-a.x, b.y-a.y, c.x-a.x, c.y-a.y); {
		case t > 0:
			return append(dst, a, b, c)
		case t < 0:
			return append(dst, a, c, b)
		}
	}
	slices.SortFunc(pts, func(a, b pt2) int {
		if c := cmp.Compare(a.x, b.x); c != 0 {
			return c
		}
		return cmp.Compare(a.y, b.y)
	})
	turn := func(o, a, b pt2) float64 { return cross2(a.x-o.x, a.y-o.y, b.x-o.x, b.y-o.y) }
	base := len(dst)
	for _, p := range pts { // lower chain
		for len(dst) >= base+2 && turn(dst[len(dst)-2], dst[len(dst)-1], p) <= 0 {
			dst = dst[:len(dst)-1]
		}
		dst = append(dst, p)
	}
	low := len(dst) + 1
	for i := len(pts) - 2; i >= 0; i-- { // upper chain
		p := pts[i]
		for len(dst) >= low && turn(dst[len(dst)-2], dst[len(dst)-1], p) <= 0 {
			dst = dst[:len(dst)-1]
		}
		dst = append(dst, p)
	}
	dst = dst[:len(dst)-1] // the first point again
	if len(dst)-base == 2 && dst[base] == dst[base+1] {
		dst = dst[:base+1]
	}
	return dst
}

// polygonPatch returns the area centroid of the convex counter-clockwise
// polygon h and the mean distance from it over the polygon (see the file
// comment). A polygon of no area counts as the segment between its ends.
func polygonPatch(h []pt2) (gx, gy, r float64) {
	var area float64
	o := h[0] // about a vertex, for rounding
	for i := 1; i+1 < len(h); i++ {
		a := cross2(h[i].x-o.x, h[i].y-o.y, h[i+1].x-o.x, h[i+1].y-o.y)
		area += a
		gx += a * (h[i].x + h[i+1].x - 2*o.x)
		gy += a * (h[i].y + h[i+1].y - 2*o.y)
	}
	if !(area > 0) {
		return o.x, o.y, 0
	}
	gx, gy = o.x+gx/(3*area), o.y+gy/(3*area)
	area *= 0.5
	sum := 0.0
	for i := range h {
		p, q := h[i], h[(i+1)%len(h)]
		ex, ey := q.x-p.x, q.y-p.y
		l := math.Sqrt(ex*ex + ey*ey)
		if l == 0 {
			continue
		}
		ex, ey = ex/l, ey/l
		px, py := p.x-gx, p.y-gy
		hh := math.Abs(cross2(ex, ey, px, py)) // distance of the edge's line
		if hh == 0 {
			continue
		}
		s0 := px*ex + py*ey // along the edge from the foot of the perpendicular
		sum += edgeMoment(hh, s0, s0+l) / 6
	}
	return gx, gy, sum / area
}

// edgeMoment is F(s1) - F(s0) for F(s) = h s R + h^3 asinh(s/h), R =
// sqrt(h^2+s^2), with the two asinh in one logarithm: asinh(s/h) = ln((s +
// R)/h), and ln(h/(R - s)) for s < 0 where s + R would cancel.
func edgeMoment(h, s0, s1 float64) float64 {
	r0, r1 := math.Sqrt(h*h+s0*s0), math.Sqrt(h*h+s1*s1)
	var as float64
	switch {
	case s0 >= 0: // both ends past the foot (s1 > s0)
		as = math.Log((s1 + r1) / (s0 + r0))
	case s1 <= 0: // both ends before it
		as = math.Log((r0 - s0) / (r1 - s1))
	default:
		as = math.Log((s1 + r1) * (r0 - s0) / (h * h))
	}
	return h*(s1*r1-s0*r0) + h*h*h*as
}
