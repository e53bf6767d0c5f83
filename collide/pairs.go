package collide

import (
	"math"

	"clatter/shapes"
)

// convexConvex collides two convex shapes in the local frame of A.
func (d *Detector) convexConvex(dst []Manifold, a shapes.Shape, fa frame, subA int32, b shapes.Shape, fb frame, subB int32, margin float64) []Manifold {
	var va, vb view
	rot, pos := fa.relative(fb)
	if !va.setConvex(a, identity3, vec3{}) || !vb.setConvex(b, rot, pos) {
		return dst
	}
	n, ok := d.pair(&va, &vb, margin)
	if !ok {
		return dst
	}
	return d.emit(dst, fa, n, subA, subB)
}

// rank orders the kinds so that each pair handler sees its shapes in one order.
func rank(k kind) int { return int(k) }

// pair leaves the contact points of a and b in d.cand and returns the
// normal from a toward b; false when they are farther apart than margin.
func (d *Detector) pair(a, b *view, margin float64) (vec3, bool) {
	if rank(a.kind) > rank(b.kind) {
		d.cache.swapped = true
		n, ok := d.pairOrdered(b, a, margin)
		return n.Mul(-1), ok
	}
	return d.pairOrdered(a, b, margin)
}

func (d *Detector) pairOrdered(a, b *view, margin float64) (vec3, bool) {
	d.cand = d.cand[:0]
	d.disc = discHint{}
	switch a.kind {
	case kSphere:
		switch b.kind {
		case kSphere, kCapsule:
			return d.rounded(a, b, margin)
		case kBox, kCylinder, kHull:
			n, ok := d.solidSphere(b, a.pos, a.rad, margin)
			return n.Mul(-1), ok
		}
	case kCapsule:
		if b.kind == kCapsule {
			return d.rounded(a, b, margin)
		}
	case kBox, kHull:
		if b.kind == kBox || b.kind == kHull {
			return d.polytopes(a, b, margin)
		}
	}
	if n, ok, done := d.cylinderPair(a, b, margin); done { // cylpoly.go
		return n, ok
	}
	return d.general(a, b, margin)
}

// rounded handles sphere-sphere, sphere-capsule and capsule-capsule
// exactly through their core segments; parallel capsules get two points.
func (d *Detector) rounded(a, b *view, margin float64) (vec3, bool) {
	r, ok := roundNearest(a, b, margin)
	if !ok {
		return vec3{}, false
	}
	if a.kind == kSphere || b.kind == kSphere {
		d.cand = append(d.cand, candPoint{p: r.pa.Add(r.pb).Mul(0.5), sep: r.sep})
		return r.n, true
	}
	return d.featureContact(a, b, r, margin), true
}

// solidSphere collides a box, cylinder or hull s with a sphere (centre c in
// the frame, radius r) exactly, and returns the normal from s to the sphere.
func (d *Detector) solidSphere(s *view, c vec3, r float64, margin float64) (vec3, bool) {
	l := mulT(s.rot, c.Sub(s.pos)) // the centre in the solid's frame
	var q, nl vec3                 // closest surface point and outward normal, local
	var gap float64                // signed distance of the centre from the surface
	var id uint32
	switch s.kind {
	case kBox:
		h := s.half
		inside := true
		code := 0
		for i := 0; i < 3; i++ {
			q[i] = math.Max(-h[i], math.Min(h[i], l[i]))
			if q[i] != l[i] {
				inside = false
				code += (1 + b2i(l[i] < 0)) * [3]int{1, 3, 9}[i]
			}
		}
		if !inside {
			dv := l.Sub(q)
			gap = dv.Len()
			nl = dv.Mul(1 / gap)
			id = uint32(code)
			break
		}
		// Inside: leave through the nearest face (ties: the first axis).
		k, pen := 0, math.Inf(1)
		for i := 0; i < 3; i++ {
			if p := h[i] - math.Abs(l[i]); p < pen {
				k, pen = i, p
			}
		}
		nl[k] = sgn(l[k])
		q = l
		q[k] = nl[k] * h[k]
		gap = -pen
		id = uint32(32 + 2*k + b2i(l[k] < 0))
	case kCylinder:
		rad, h := s.cylR, s.half[2]
		rho := math.Hypot(l[0], l[1])
		ux, uy := 1.0, 0.0
		if rho > 0 {
			ux, uy = l[0]/rho, l[1]/rho
		}
		qz := math.Max(-h, math.Min(h, l[2]))
		qr := math.Min(rho, rad)
		if rho > rad || math.Abs(l[2]) > h {
			q = vec3{ux * qr, uy * qr, qz}
			dv := l.Sub(q)
			gap = dv.Len()
			nl = dv.Mul(1 / gap)
			id = uint32(1 + b2i(rho > rad) + 2*b2i(math.Abs(l[2]) > h) + 4*b2i(l[2] < 0))
			break
		}
		side, capPen := rad-rho, h-math.Abs(l[2])
		if side < capPen {
			nl = vec3{ux, uy, 0}
			q = vec3{ux * rad, uy * rad, l[2]}
			gap = -side
			id = 16
		} else {
			nl = vec3{0, 0, sgn(l[2])}
			q = vec3{l[0], l[1], nl[2] * h}
			gap = -capPen
			id = uint32(17 + b2i(l[2] < 0))
		}
	case kHull:
		g := d.gjk(s, &view{kind: kSphere, rot: identity3, pos: c}, false)
		if !g.overlap && g.dist > coreTouch*(s.size+r) {
			gap = g.dist
			n := g.v.Mul(-1 / g.dist) // v = hull point - centre: n points out of the hull
			nl = mulT(s.rot, n)
			q = mulT(s.rot, g.pa.Sub(s.pos))
			id = 64
			break
		}
		// Inside: the face plane nearest the centre (exact for a polytope).
		best, bi := math.Inf(-1), 0
		for i, f := range s.hull.Faces {
			if e := f.Normal.Dot(l) - f.Offset; e > best {
				best, bi = e, i
			}
		}
		f := s.hull.Faces[bi]
		nl = f.Normal
		q = l.Sub(nl.Mul(best))
		gap = best
		id = uint32(128 + bi%128)
	}
	sep := gap - r
	if sep > margin {
		return vec3{}, false
	}
	n := mul(s.rot, nl)
	ps := s.pos.Add(mul(s.rot, q)) // the solid's surface point
	pr := c.Sub(n.Mul(r))          // the sphere's surface point
	d.cand = append(d.cand, candPoint{p: ps.Add(pr).Mul(0.5), sep: sep, id: id})
	return n, true
}

// polytopes runs the separating-axis test for boxes and hulls, or the
// general path when the edge loop would be too long. The remembered axis
// of a CollidePair query is tried first.
func (d *Detector) polytopes(a, b *view, margin float64) (vec3, bool) {
	p, q := &d.polyP, &d.polyQ
	var h pairHint
	if d.cache.on {
		h = d.cache.in
	}
	var r satResult
	switch {
	case a.kind == kBox && b.kind == kBox:
		if !satBoxesHint(a, b, margin, h, &r) {
			d.remember(r)
			return vec3{}, false
		}
		p.set(a)
		q.set(b)
	case a.kind == kBox && b.kind == kHull:
		// Linear in the hull's size (boxhull.go), so for hulls of any size.
		return d.boxHull(a, b, margin, h)
	default:
		if polyEdges(a)*polyEdges(b) > satMaxEdgePairs {
			return d.general(a, b, margin)
		}
		p.set(a)
		q.set(b)
		if !satHint(p, q, margin, h, &r) {
			d.remember(r)
			return vec3{}, false
		}
	}
	n := d.polyContact(p, q, r, margin)
	return n, len(d.cand) > 0
}

// polyEdges is the number of edges of a box or hull view.
func polyEdges(v *view) int {
	if v.kind == kHull {
		return len(v.hull.Edges)
	}
	return len(boxEdges)
}
