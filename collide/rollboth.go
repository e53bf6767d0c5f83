package collide

import (
	"math"

	"clatter/shapes"
)

// Two curved shapes touching (a cylinder lying across another, a rim on a
// side, balls and capsules) have no frame in which the contact stays put:
// each rolls on the other. Their refresh (rollBoth) finds the contact
// again from the two touching features, each a core with a radius: a
// ball's centre, a capsule's segment, a cylinder's axis when its side
// touches (each with its radius), or a cylinder's rim, a circle of no
// radius. Between two such cores the contact is where they come nearest:
//
//   - two points or segments: their closest points (Ericson, "Real-Time
//     Collision Detection", 2005, sec. 5.1.9), the normal along the line
//     between them and the separation their distance less both radii;
//   - a rim and a point or segment: the rim point nearest that core, found
//     by Newton's method on the angle along the rim from the angle of the
//     last full query; the normal runs from the core to that point;
//   - two rims: the pair of rim points where the line between them is
//     square to both rims, found by Newton's method on both angles; the
//     normal is square to both rims' tangents there, as between two edges
//     of polytopes (Ericson, sec. 5.2.5, from memory).
//
// This is the exact contact of those features, whether the shapes are
// apart or overlap: for overlapping shapes the separation is the largest
// over directions of the gap between their extents along the direction
// (the penetration depth; e.g. van den Bergen, "Collision Detection in
// Interactive 3D Environments", 2003, sec. 4.3.4), which for a rim across
// a side is reached along the side's normals, where it is the rim's
// nearest approach to the side's axis less the side's radius. A full
// query finds the same contact (to EPA's tolerance where the shapes
// overlap and the normal is not found in closed form). The features stay
// those of the full query only while the feet stay on them: a cylinder's
// side touches only while the foot on its axis lies between the caps, a
// rim only while the normal lies between its cap's normal and its radius
// there; otherwise, and for contacts of two points (parallel sides), the
// full query runs.

// core kinds.
const (
	coreSeg = iota + 1 // a point or a segment along the shape's z axis, with a radius
	coreRim            // the rim of a cylinder's cap
)

// rollCore is the touching feature of a curved shape, in its frame.
type rollCore struct {
	kind uint8
	side bool    // a cylinder's side: the foot must lie inside the segment
	half float64 // coreSeg: the segment runs from -half to half along z
	rad  float64 // coreSeg: the radius about it; coreRim: the rim's radius
	z    float64 // coreRim: the height of the cap
	phi  float64 // coreRim: the angle of the full query's point on the rim
}

// rimNewtonMax caps Newton's steps along a rim: from the full query's
// angle, after relative motion below the persistence limit, the step
// halves its digits' error each time (quadratic convergence) and reaches
// rimNewtonTol in three or four.
const rimNewtonMax = 8

// rimNewtonTol (radians) is the step below which the rim angle counts as
// found: the point is then off by less than the rim's radius times it,
// 1e-12 of the radius, far below the 1e-10 m to which a refresh matches a
// fresh query.
const rimNewtonTol = 1e-12

// sideNormalTol is how far from square to a cylinder's axis (the sine)
// the local contact normal of a full query may be for its side to count
// as touching: the extreme-feature tolerance of features.go.
const sideNormalTol = featSin

// touchCore returns the core of rollable shape s touching with outward
// normal nl at point pl (both in s's frame), and false for a shape that is
// not rollable.
func touchCore(s shapes.Shape, nl, pl vec3) (rollCore, bool) {
	switch c := s.(type) {
	case shapes.Sphere:
		return rollCore{kind: coreSeg, rad: c.Radius}, true
	case shapes.Capsule:
		return rollCore{kind: coreSeg, half: c.HalfLength, rad: c.Radius}, true
	case shapes.Cylinder:
		if math.Abs(nl[2]) <= sideNormalTol*nl.Len() {
			return rollCore{kind: coreSeg, side: true, half: c.HalfLength, rad: c.Radius}, true
		}
		return rollCore{kind: coreRim, rad: c.Radius, z: math.Copysign(c.HalfLength, nl[2]), phi: math.Atan2(pl[1], pl[0])}, true
	}
	return rollCore{}, false
}

// bothCores returns the cores of a and b touching in manifold m (world),
// and false when rollBoth does not refresh the pair: m has other than one
// point or a shape is not rollable.
func bothCores(a, b shapes.Shape, pa, pb *shapes.Pose, m *Manifold) (ca, cb rollCore, ok bool) {
	if m.Count != 1 {
		return ca, cb, false
	}
	pt := &m.Points[0]
	h := m.Normal.Mul(0.5 * pt.Separation)
	qa, qb := pa.Orientation.Conjugate(), pb.Orientation.Conjugate()
	ca, oka := touchCore(a, qa.Rotate(m.Normal), qa.Rotate(pt.Position.Sub(h).Sub(pa.Position)))
	cb, okb := touchCore(b, qb.Rotate(m.Normal.Mul(-1)), qb.Rotate(pt.Position.Add(h).Sub(pb.Position)))
	return ca, cb, oka && okb
}

// rollBoth writes the refreshed contact of e's two curved shapes at pa and
// pb into out (the file comment) and reports whether it stands for a fresh
// query: the features still touch as they did and the contact is within
// margin.
func (e *persistEntry) rollBoth(pa, pb *shapes.Pose, margin float64, out *Manifold) bool {
	ra, rb := shapes.RotationMatrix(pa.Orientation), shapes.RotationMatrix(pb.Orientation)
	ca, cb := &e.cores[0], &e.cores[1]
	var n, xa, xb vec3
	var sep float64
	switch {
	case ca.kind == coreRim && cb.kind == coreRim:
		var ok bool
		if n, xa, xb, ok = rimRim(ca, &ra, &pa.Position, cb, &rb, &pb.Position); !ok {
			return false
		}
		sep = xb.Sub(xa).Dot(n)
	case ca.kind == coreSeg && cb.kind == coreSeg:
		a0, a1 := segEnds(ca, &ra, &pa.Position)
		b0, b1 := segEnds(cb, &rb, &pb.Position)
		s, t, qa, qb := closestSegmentSegment(a0, a1, b0, b1)
		if ca.side && !(s > 0 && s < 1) || cb.side && !(t > 0 && t < 1) {
			return false // a cylinder's foot at its cap: its rim touches
		}
		d, l := unit(qb.Sub(qa))
		if !(l > coreTouch*(ca.rad+cb.rad)) {
			return false // cores crossing: no direction between them
		}
		n, sep = d, l-ca.rad-cb.rad
		xa, xb = qa.Add(n.Mul(ca.rad)), qb.Sub(n.Mul(cb.rad))
	case ca.kind == coreRim:
		b0, b1 := segEnds(cb, &rb, &pb.Position)
		p, q, ok := rimNearest(ca, &ra, &pa.Position, b0, b1, cb.side)
		if !ok {
			return false
		}
		d, l := unit(q.Sub(p))
		if !(l > 0) || !inRimCone(ca, &ra, &pa.Position, p, d) {
			return false
		}
		n, sep = d, l-cb.rad
		xa, xb = p, q.Sub(n.Mul(cb.rad))
	default:
		a0, a1 := segEnds(ca, &ra, &pa.Position)
		p, q, ok := rimNearest(cb, &rb, &pb.Position, a0, a1, ca.side)
		if !ok {
			return false
		}
		d, l := unit(p.Sub(q))
		if !(l > 0) || !inRimCone(cb, &rb, &pb.Position, p, d.Mul(-1)) {
			return false
		}
		n, sep = d, l-ca.rad
		xa, xb = q.Add(n.Mul(ca.rad)), p
	}
	if !(sep <= margin) {
		return false
	}
	k := &e.m
	mid := xa.Add(xb).Mul(0.5)
	*out = Manifold{Normal: n, Count: 1, SubA: k.subA, SubB: k.subB, PatchCenter: mid, PatchRadius: k.radius}
	out.Points[0] = Point{Position: mid, Separation: sep, ID: k.id[0]}
	return true
}

// segEnds returns the ends of segment core c of a shape at rotation r and
// position o (both the centre for a ball).
func segEnds(c *rollCore, r *mat3, o *vec3) (vec3, vec3) {
	ax := col(*r, 2).Mul(c.half)
	return o.Sub(ax), o.Add(ax)
}

// rimNearest returns the point p of rim c (of a cylinder at rotation r and
// position o) nearest the segment b0 b1 and the segment's point q nearest
// p. It is Newton's method on the slope g(phi) = (p - q).dp of half the
// squared distance along the rim, from the full query's angle, with dp and
// ddp = -(p - centre) the first and second derivatives of p in phi; the
// slope's derivative is |dp|^2 - (e.dp)^2/|e|^2 + (p - q).ddp with e the
// segment (its middle term absent where q stays at an end).
// It reports false when the search does not settle within cylRimArc of
// the start, or, for a cylinder's side (side), when q reaches an end.
func rimNearest(c *rollCore, r *mat3, o *vec3, b0, b1 vec3, side bool) (p, q vec3, ok bool) {
	e := b1.Sub(b0)
	ee := e.Dot(e)
	phi := c.phi
	for it := 0; it < rimNewtonMax; it++ {
		var dp, rv vec3
		p, dp, rv = rimPoint(c, r, o, phi)
		t := 0.0
		if ee > 0 {
			t = p.Sub(b0).Dot(e) / ee
		}
		inside := t > 0 && t < 1
		if side && !inside {
			return p, q, false
		}
		q = b0.Add(e.Mul(clamp01(t)))
		pq := p.Sub(q)
		g := pq.Dot(dp)
		h := dp.Dot(dp) - pq.Dot(rv)
		if inside {
			ed := e.Dot(dp)
			h -= ed * ed / ee
		}
		if !(h > 0) {
			return p, q, false // not a minimum along the rim
		}
		step := g / h
		if math.Abs(step) <= rimNewtonTol {
			return p, q, true
		}
		if phi -= step; math.Abs(phi-c.phi) > cylRimArc {
			return p, q, false
		}
	}
	return p, q, false
}

// inRimCone reports whether n, pointing out of the cylinder at rim point p
// of its rim c, lies between the cap's normal and the radius at p: the
// rim, not the cap or the side, is then the cylinder's support along n.
func inRimCone(c *rollCore, r *mat3, o *vec3, p, n vec3) bool {
	ax := col(*r, 2)
	if c.z < 0 {
		ax = ax.Mul(-1)
	}
	radial := p.Sub(o.Add(col(*r, 2).Mul(c.z)))
	return n.Dot(ax) >= 0 && n.Dot(radial) >= 0
}

// rimPoint returns the point of rim c (of a cylinder at rotation r and
// position o) at angle phi, its first derivative in phi and its offset
// from the rim's centre (the negated second derivative).
func rimPoint(c *rollCore, r *mat3, o *vec3, phi float64) (p, dp, rv vec3) {
	u, w := col(*r, 0), col(*r, 1)
	sn, cs := math.Sincos(phi)
	rv = u.Mul(c.rad * cs).Add(w.Mul(c.rad * sn))
	dp = w.Mul(c.rad * cs).Sub(u.Mul(c.rad * sn))
	return o.Add(col(*r, 2).Mul(c.z)).Add(rv), dp, rv
}

// rimRim returns the normal n (out of A, square to both rims' tangents)
// and the points xa, xb of rims ca and cb (of cylinders at ra, oa and rb,
// ob) where the line between them is square to both rims: Newton's method
// on the slopes g = ((xb - xa).dxa, (xb - xa).dxb) of half the squared
// distance in the two angles, from the full query's, with the Jacobian
// [-|dxa|^2 - d.rva, dxa.dxb; -dxa.dxb, |dxb|^2 - d.rvb] (d = xb - xa,
// rv the offsets from the rims' centres). It reports false when the
// search does not settle within cylRimArc of the start, the tangents are
// nearly parallel, or n leaves either rim's cone (inRimCone).
func rimRim(ca *rollCore, ra *mat3, oa *vec3, cb *rollCore, rb *mat3, ob *vec3) (n, xa, xb vec3, ok bool) {
	fa, fb := ca.phi, cb.phi
	for it := 0; it < rimNewtonMax; it++ {
		pa, da, rva := rimPoint(ca, ra, oa, fa)
		pb, db, rvb := rimPoint(cb, rb, ob, fb)
		d := pb.Sub(pa)
		g1, g2 := d.Dot(da), d.Dot(db)
		j11, j12 := -da.Dot(da)-d.Dot(rva), db.Dot(da)
		j21, j22 := -j12, db.Dot(db)-d.Dot(rvb)
		det := j11*j22 - j12*j21
		if !(math.Abs(det) > rimParallel*da.Dot(da)*db.Dot(db)) {
			return n, xa, xb, false // tangents nearly parallel
		}
		sa, sb := (g1*j22-g2*j12)/det, (j11*g2-j21*g1)/det
		if math.Abs(sa) <= rimNewtonTol && math.Abs(sb) <= rimNewtonTol {
			n, _ = unit(da.Cross(db))
			if !inRimCone(ca, ra, oa, pa, n) {
				n = n.Mul(-1)
			}
			ok = inRimCone(ca, ra, oa, pa, n) && inRimCone(cb, rb, ob, pb, n.Mul(-1))
			return n, pa, pb, ok
		}
		fa, fb = fa-sa, fb-sb
		if math.Abs(fa-ca.phi) > cylRimArc || math.Abs(fb-cb.phi) > cylRimArc {
			return n, xa, xb, false
		}
	}
	return n, xa, xb, false
}

// rimParallel is the square of the sine below which two rims' tangents
// count as parallel, where the normal square to both is not defined by
// them: 1e-6, tangents within a milliradian, at which the normal from
// their cross product is still good to rounding over a milliradian (1e-13).
const rimParallel = 1e-6
