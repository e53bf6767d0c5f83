package collide

import "math"

// The general convex path: GJK on the cores for the distance and normal of
// shapes apart, EPA for the depth and normal of shapes that overlap, then a
// manifold from the features of both shapes along the normal.

const (
	// coreTouch: core distances below this fraction of the shapes' size are
	// treated as overlap and go to EPA, whose normal is well defined where
	// the GJK direction (from two nearly equal points) is not.
	coreTouch = 1e-9
	// satMaxEdgePairs: pairs of hulls with more edge pairs than this take
	// the general path instead of the separating-axis test, whose edge loop
	// is quadratic in the hull size (a box against a hull has its own,
	// linear test: boxhull.go): measured in bench/collide.go, two
	// 40-vertex hulls (about 13,000 edge pairs) take several times longer by
	// the test than by GJK, EPA and face clipping, while for boxes and
	// small prisms (up to about 40 edges each) the test is as fast and gives
	// its face contacts without iteration.
	satMaxEdgePairs = 1600
)

// nearest is the normal and the closest (or deepest) surface points of two
// convex views, from A toward B.
type nearest struct {
	n      vec3
	sep    float64
	pa, pb vec3 // surface points of A and B
	failed bool // EPA measured no depth; n is the line of centres
}

// distance finds the normal and separation of views a and b by GJK, EPA when
// the cores overlap. It reports false when the separation exceeds margin.
func (d *Detector) distance(a, b *view, margin float64) (nearest, bool) {
	var r nearest
	if a.rounded() && b.rounded() {
		return roundNearest(a, b, margin)
	}
	// Shapes farther apart than the margin need no exact distance (nor
	// than coreTouch, below which cores count as overlapping).
	scale := a.size + b.size
	stop := math.Max(margin+a.rad+b.rad, coreTouch*scale)
	// From the pair's last simplex when CollidePair has one (gjkwarm.go).
	g := d.gjkFrom(a, b, false, stop, refinable(a, b), d.warm.take(a, b)) // (cylrefine.go)
	if g.apart {
		r.sep = g.dist - a.rad - b.rad
		r.n = g.v.Mul(-1 / math.Sqrt(g.v.Dot(g.v)))
		return r, false
	}
	if !g.overlap && g.dist > coreTouch*scale {
		r.sep = g.dist - a.rad - b.rad
		r.n = g.v.Mul(-1 / g.dist) // v = pa - pb
		if r.sep > margin {
			return r, false
		}
		r.pa = g.pa.Add(r.n.Mul(a.rad))
		r.pb = g.pb.Sub(r.n.Mul(b.rad))
		return r, true
	}
	e := d.epa(a, b, false)
	if !e.ok && (a.rad > 0 || b.rad > 0) {
		// Flat cores (a segment on a triangle): EPA on the whole shapes.
		d.gjk(a, b, true)
		e = d.epa(a, b, true)
		if e.ok {
			e.depth -= a.rad + b.rad
		}
	}
	if !e.ok {
		// No depth could be measured (D is flat): fall back to the line of
		// centres, or the last GJK direction.
		n, l := unit(b.center().Sub(a.center()))
		if l == 0 {
			n, l = unit(g.v.Mul(-1))
		}
		if l == 0 {
			n = vec3{0, 0, 1}
		}
		e = epaResult{normal: n, pa: g.pa, pb: g.pb}
		r.failed = true
	}
	r.n = e.normal
	r.sep = -e.depth - a.rad - b.rad
	r.pa = e.pa.Add(r.n.Mul(a.rad))
	r.pb = e.pb.Sub(r.n.Mul(b.rad))
	return r, r.sep <= margin
}

func (v *view) rounded() bool { return v.kind == kSphere || v.kind == kCapsule }

// segment returns the core segment of a sphere (both ends equal) or capsule.
func (v *view) segment() (vec3, vec3) {
	if v.kind == kSphere {
		return v.pos, v.pos
	}
	ax := v.axis().Mul(v.half[2])
	return v.pos.Sub(ax), v.pos.Add(ax)
}

// roundNearest is the exact nearest pair of two spheres or capsules: the
// closest points of the core segments. Coincident cores take the normal
// across both axes, across the one axis, or along z for two spheres,
// pointing from A's centre toward B's.
func roundNearest(a, b *view, margin float64) (nearest, bool) {
	a0, a1 := a.segment()
	b0, b1 := b.segment()
	_, _, ca, cb := closestSegmentSegment(a0, a1, b0, b1)
	dv := cb.Sub(ca)
	dist := dv.Len()
	r := nearest{sep: dist - a.rad - b.rad}
	if r.sep > margin {
		return r, false
	}
	if dist > coreTouch*(a.size+b.size) {
		r.n = dv.Mul(1 / dist)
	} else {
		da, db := a1.Sub(a0), b1.Sub(b0)
		n, l := unit(da.Cross(db))
		if l <= satParallel*da.Len()*db.Len() || l == 0 {
			switch {
			case da != (vec3{}):
				n = perpendicular(da.Normalize())
			case db != (vec3{}):
				n = perpendicular(db.Normalize())
			default:
				n = vec3{0, 0, 1}
			}
		}
		if n.Dot(b.pos.Sub(a.pos)) < 0 {
			n = n.Mul(-1)
		}
		r.n = n
	}
	r.pa = ca.Add(r.n.Mul(a.rad))
	r.pb = cb.Sub(r.n.Mul(b.rad))
	return r, true
}

// general is the whole general path: it leaves the points in d.cand and
// returns the normal from a to b.
func (d *Detector) general(a, b *view, margin float64) (vec3, bool) {
	c := &d.cache
	r, ok := d.distance(a, b, margin)
	if !ok {
		if c.on && r.n != (vec3{}) {
			c.out.kind, c.out.dir = hintDir, r.n
		}
		return vec3{}, false
	}
	return d.featureContact(a, b, r, margin), true
}

// featureContact builds the manifold of a and b from their features along
// r.n and returns its normal. When a face is involved its normal becomes the
// manifold's, and the other shape's feature is taken again along that exact
// normal (a curved shape's support point moves with the direction).
//
// When both offer faces, the better aligned one is the reference, A's on a
// tie, except that a mesh triangle (b) is the reference whenever it is one
// of the two: its normal is the surface's.
func (d *Detector) featureContact(a, b *view, r nearest, margin float64) vec3 {
	fa, fb := &d.featA, &d.featB
	a.extreme(r.n, fa)
	b.extreme(r.n.Mul(-1), fb)
	d.cand = d.cand[:0]
	scale := a.size + b.size
	na, nb := len(fa.pts), len(fb.pts)
	alignA, alignB := fa.normal.Dot(r.n), -fb.normal.Dot(r.n)
	polyA := fa.polygon() && alignA >= featCos
	polyB := fb.polygon() && alignB >= featCos
	refA := polyA && (!polyB || (b.kind != kTriangle && alignA >= alignB))
	refB := !refA && polyB
	n := r.n
	switch {
	case refA:
		n = fa.normal
		if a.kind == kCylinder {
			a.cylinderExtreme(n, fa, true) // a cap reference is drawn finer
		}
		b.extreme(n.Mul(-1), fb)
		d.faceFeature(fa, fb, false, margin, scale)
	case refB:
		n = fb.normal.Mul(-1)
		if b.kind == kCylinder {
			b.cylinderExtreme(fb.normal, fb, true)
		}
		a.extreme(n, fa)
		d.faceFeature(fb, fa, true, margin, scale)
	case na == 2 && nb == 2 && !fa.set && !fb.set:
		// Two round sides (cylinders, capsules): the exact normal is the
		// common perpendicular of the axes, where EPA on curved sides is
		// only as good as its tolerance allows.
		if ns, ok := sideNormal(a, b); ok && ns.Dot(r.n) >= featCos {
			n, r.n = ns, ns
			a.extreme(n, fa)
			b.extreme(n.Mul(-1), fb)
			r.pa, r.pb, r.sep = nearestOnFeatures(fa, fb, n)
		}
		if len(fa.pts) == 2 && len(fb.pts) == 2 {
			d.parallelSegments(fa, fb, n, margin)
		}
	}
	switch { // a cylinder cap lying on a face is a disc (patch.go)
	case a.kind == kCylinder && fa.polygon():
		d.disc = discHint{r: a.cylR, n: len(fa.pts)}
	case b.kind == kCylinder && fb.polygon():
		d.disc = discHint{r: b.cylR, n: len(fb.pts)}
	}
	if len(d.cand) == 0 {
		n = r.n
		if !fa.set && !fb.set && len(fa.pts) <= 2 && len(fb.pts) <= 2 && !refA && !refB {
			// Point and segment features: their exact nearest points along
			// the normal (EPA's barycentric points are only as good as its
			// tolerance on curved shapes).
			r.pa, r.pb, r.sep = nearestOnFeatures(fa, fb, n)
		}
		if r.sep <= margin {
			d.cand = append(d.cand, candPoint{p: r.pa.Add(r.pb).Mul(0.5), sep: r.sep, id: faceID(false, fa.base, fb.base, 0xFE, 0)})
		}
	}
	return n
}

// nearestOnFeatures returns the nearest surface points of two point or
// segment features and their separation along n.
func nearestOnFeatures(fa, fb *feature, n vec3) (pa, pb vec3, sep float64) {
	a0, a1 := fa.pts[0], fa.pts[len(fa.pts)-1]
	b0, b1 := fb.pts[0], fb.pts[len(fb.pts)-1]
	_, _, ca, cb := closestSegmentSegment(a0, a1, b0, b1)
	pa = ca.Add(n.Mul(fa.rad))
	pb = cb.Sub(n.Mul(fb.rad))
	return pa, pb, pb.Sub(pa).Dot(n)
}

// sideNormal is the common perpendicular of the axes of two cylinders or
// capsules, from a toward b, when it meets both axis segments (or the axes
// are parallel): then the sides touch along it.
func sideNormal(a, b *view) (vec3, bool) {
	round := func(v *view) bool { return v.kind == kCylinder || v.kind == kCapsule }
	if !round(a) || !round(b) {
		return vec3{}, false
	}
	axA, axB := a.axis(), b.axis()
	ea, eb := axA.Mul(a.half[2]), axB.Mul(b.half[2])
	_, _, ca, cb := closestSegmentSegment(a.pos.Sub(ea), a.pos.Add(ea), b.pos.Sub(eb), b.pos.Add(eb))
	n, l := unit(cb.Sub(ca))
	if l == 0 || math.Abs(n.Dot(axA)) > 1e-9 || math.Abs(n.Dot(axB)) > 1e-9 {
		return vec3{}, false
	}
	return n, true
}

// faceFeature clips incident feature inc against reference polygon ref (of
// B when flip). A single incident point counts only inside the reference
// face's prism; elsewhere the contact is not on the face.
func (d *Detector) faceFeature(ref, inc *feature, flip bool, margin, scale float64) {
	if len(inc.pts) >= 2 && !inc.set {
		d.clipToPolygon(ref.pts, ref.normal, inc.pts, inc.rad, flip, ref.base, inc.base, margin, scale)
		return
	}
	tol := clipTolerance * scale
	rd := ref.normal.Dot(ref.pts[0])
next:
	for i := range inc.pts {
		p := &inc.pts[i]
		for k := range ref.pts {
			a, b := ref.pts[k], ref.pts[(k+1)%len(ref.pts)]
			sn, l := unit(b.Sub(a).Cross(ref.normal))
			if l > 0 && sn.Dot(p.Sub(a)) > tol {
				continue next
			}
		}
		d.addRefPoint(*p, ref.normal, rd, inc.rad, flip, ref.base, inc.base, codeV(i), 0, margin)
	}
}

// parallelSegments gives two points for two segment features that are
// parallel (capsules or cylinders lying side by side): B's segment clipped to
// the extent of A's.
func (d *Detector) parallelSegments(fa, fb *feature, n vec3, margin float64) {
	a0, a1 := fa.pts[0], fa.pts[1]
	b0, b1 := fb.pts[0], fb.pts[1]
	da, db := a1.Sub(a0), b1.Sub(b0)
	la, lb := da.Len(), db.Len()
	if la == 0 || lb == 0 || math.Abs(da.Dot(db)) < featCos*la*lb {
		return
	}
	aa := da.Dot(da)
	t0 := b0.Sub(a0).Dot(da) / aa
	t1 := b1.Sub(a0).Dot(da) / aa
	lo, hi := math.Max(0, math.Min(t0, t1)), math.Min(1, math.Max(t0, t1))
	if lo > hi {
		return
	}
	for k, t := range [2]float64{lo, hi} {
		qa := a0.Add(da.Mul(t))
		// The point of B's segment over qa.
		s := (t - t0) / (t1 - t0)
		if t1 == t0 {
			s = 0
		}
		qb := b0.Add(db.Mul(clamp01(s)))
		pa := qa.Add(n.Mul(fa.rad))
		pb := qb.Sub(n.Mul(fb.rad))
		sep := pb.Sub(pa).Dot(n)
		if sep <= margin {
			d.cand = append(d.cand, candPoint{p: pa.Add(pb).Mul(0.5), sep: sep, id: faceID(false, fa.base, fb.base, codeV(k), 0)})
		}
		if hi == lo {
			break
		}
	}
}
