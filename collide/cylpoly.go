package collide

import "math"

// A cylinder against a box or a mesh triangle by separating axes, in place
// of GJK and EPA. For two convex sets the largest separation
// over all directions is their distance when apart and minus their
// penetration depth when they overlap, and it is reached on a normal of
// the boundary of their Minkowski difference (Ericson, "Real-Time Collision
// Detection", 2005, sections 5.2.1 and 9.1). For a cylinder C (centre c,
// unit axis u, radius r, half length h) and a polytope P these normals are
//
//   - the face normals of P (a face of P against any feature of C);
//   - the axis u (a cap against a vertex or an edge of P);
//   - u x e for each edge e of P (the side's lines against the edge);
//   - for each vertex v of P, the side's radial direction through v and the
//     direction from the nearest point of each rim circle to v;
//   - for each edge e of P and each rim, e x t, t the rim's tangent at the
//     point where the edge and the circle have a common normal, and the
//     direction between those two points.
//
// The last family has no closed form: its points are the local minima of
// the distance from the edge to the circle, found by a one-dimensional
// search along the edge, in the manner of Eberly's separation tests of
// cylinders against other solids ("3D Game Engine Design", 2nd ed., 2006,
// from memory). The tests measure the difference from GJK and EPA.
// The support function of the cylinder along a unit d is
// d.c + h |d.u| + r sqrt(1 - (d.u)^2).

// cylPolytope gathers the polytope's vertices, face normals and edges in
// the frame into the Detector's scratch slices.
type cylPolytope struct {
	verts []vec3
	norms []vec3
	edges [][2]int32
	dirs  []vec3 // edge directions (a box's three)
	// Per vertex, relative to the cylinder: the axial coordinate, the
	// radial offset and the distance from the surface.
	vz []float64
	vr []vec3
	vd []float64
}

var boxEdgeList = [12][2]int32{
	{0, 1}, {2, 3}, {4, 5}, {6, 7}, // along x (vertex bit 0)
	{0, 2}, {1, 3}, {4, 6}, {5, 7}, // along y
	{0, 4}, {1, 5}, {2, 6}, {3, 7}, // along z
}

// gather fills cp from p (a box or a triangle); false for other views. A
// hull takes the general path: the axes here are linear in its numbers of
// faces, edges and vertices with a constant far above a support climb's,
// and measured on 12- and 40-vertex hulls they cost 2.5 and 10 times GJK
// and EPA.
func (cp *cylPolytope) gather(p *view) bool {
	cp.verts, cp.norms, cp.edges, cp.dirs = cp.verts[:0], cp.norms[:0], cp.edges[:0], cp.dirs[:0]
	switch p.kind {
	case kBox:
		for i := 0; i < 8; i++ {
			l := vec3{p.half[0], p.half[1], p.half[2]}
			for k := 0; k < 3; k++ {
				if i&(1<<k) == 0 {
					l[k] = -l[k]
				}
			}
			cp.verts = append(cp.verts, p.pos.Add(mul(p.rot, l)))
		}
		for k := 0; k < 3; k++ {
			cp.norms = append(cp.norms, col(p.rot, k))
		}
		cp.edges = append(cp.edges, boxEdgeList[:]...)
		cp.dirs = append(cp.dirs, cp.norms...)
		return true
	case kTriangle:
		cp.verts = append(cp.verts, p.tri[0], p.tri[1], p.tri[2])
		cp.norms = append(cp.norms, p.triN)
		cp.edges = append(cp.edges, [2]int32{0, 1}, [2]int32{1, 2}, [2]int32{2, 0})
	default:
		return false
	}
	for _, e := range cp.edges {
		cp.dirs = append(cp.dirs, cp.verts[e[1]].Sub(cp.verts[e[0]]))
	}
	return true
}

// cylAxes tracks the best axis of a cylinder-polytope test.
type cylAxes struct {
	c0, u  vec3
	r, h   float64
	p      *view
	cp     *cylPolytope
	best   float64 // the largest separation found
	n      vec3    // its unit axis, from the cylinder toward the polytope
	margin float64
	apart  bool // an axis separates by more than the margin
	// The nearest pair of an edge point and a rim point that edgeRim met
	// (a bound on the distance from above), and its length.
	witX, witQ vec3
	wit        float64
	mins       bool // edgeRim looks for nearest approaches only (shapes apart)
}

// try tests axis ax (any length) in both orientations; bias favours the
// axes tried first (faces) on ties. It reports false once an axis
// separates by more than the margin. The cylinder's extent about its
// centre along a unit n is h |n.u| + r sqrt(1 - (n.u)^2), the same both
// ways, so both orientations cost one pass.
//
// It is written out on scalars: the vector methods return arrays, which
// the compiler keeps in memory. The operations and their order are those
// of the vector form (unit, Dot, Sub, Mul, Len), so the results are the
// same bit for bit (TestCylTryScalars).
func (a *cylAxes) try(ax vec3, bias float64) bool {
	l := math.Sqrt(ax[0]*ax[0] + ax[1]*ax[1] + ax[2]*ax[2])
	if !(l > 1e-12) {
		return true
	}
	k := 1 / l
	n0, n1, n2 := ax[0]*k, ax[1]*k, ax[2]*k // unit(ax)
	u := &a.u
	un := n0*u[0] + n1*u[1] + n2*u[2]
	// The part of n across the axis by its length, not sqrt(1 - un^2),
	// which loses half the digits near the axis (a cap's normal): 1e-8
	// of the radius where un is 1 to rounding.
	w0, w1, w2 := n0-u[0]*un, n1-u[1]*un, n2-u[2]*un
	ec := a.h*math.Abs(un) + a.r*math.Sqrt(w0*w0+w1*w1+w2*w2)
	cn := n0*a.c0[0] + n1*a.c0[1] + n2*a.c0[2]
	var lo, hi float64 // the polytope's extent along n
	if p := a.p; p.kind == kBox {
		m := n0*p.pos[0] + n1*p.pos[1] + n2*p.pos[2]
		e := 0.0
		for k := 0; k < 3; k++ {
			r := p.rot[3*k : 3*k+3]
			e += p.half[k] * math.Abs(n0*r[0]+n1*r[1]+n2*r[2])
		}
		lo, hi = m-e, m+e
	} else {
		lo, hi = math.Inf(1), math.Inf(-1)
		for i := range a.cp.verts {
			v := &a.cp.verts[i]
			x := n0*v[0] + n1*v[1] + n2*v[2]
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
	}
	s, neg := lo-cn-ec, false // the polytope beyond the cylinder along n
	if s2 := cn - ec - hi; s2 > s {
		s, neg = s2, true
	}
	if s > a.best+bias {
		if neg {
			n0, n1, n2 = n0*-1, n1*-1, n2*-1
		}
		a.best, a.n = s, vec3{n0, n1, n2}
		if s > a.margin {
			a.apart = true
			return false
		}
	}
	return true
}

// cylPoly finds the separation and normal (from cylinder c toward polytope
// p) of the two by separating axes when it can prove them; handled is
// false for the pairs it leaves to GJK and EPA: polytopes it does not take
// (see gather), and distances and overlaps it cannot certify. ok is false when
// they are farther apart than margin.
//
// The closed-form families (all but the edge-rim one) are tried first.
// When they leave the shapes overlapping by depth D, an edge-rim axis can
// do better only through a pair of an edge point x and a rim point q with
// |x - q| < D (the Minkowski difference's boundary point nearest the origin
// is x - q), so only edges that come that close to a rim are searched for
// their common normals, and a point found in both shapes confirms that
// they overlap at all. Deep overlaps go to EPA (see cylDeep).
func (d *Detector) cylPoly(c, p *view, margin float64) (r nearest, ok, handled bool) {
	cp := &d.cylP
	if c.kind != kCylinder || !cp.gather(p) {
		return r, false, false
	}
	a := cylAxes{c0: c.pos, u: c.axis(), r: c.cylR, h: c.half[2], p: p, cp: cp, best: math.Inf(-1), margin: margin}
	if !a.closedForm(satFaceBias * (c.size + p.size)) {
		r.n, r.sep = a.n, a.best
		return r, false, true // proved apart beyond the margin
	}
	tol := cylCertTol * (c.size + p.size)
	if !(a.best <= 0) {
		// Apart within the margin: the axes bound the distance from
		// below, and a pair of points that far apart bounds it from above.
		if pc, pp, ok := a.apartWitness(c, tol); ok {
			r.n, r.sep, r.pa, r.pb = a.n, a.best, pc, pp
			return r, true, true
		}
		// An edge across the side (cylwitness.go).
		if x, q, dist, in := a.edgeWitness(); !in && dist <= a.best+tol {
			r.n, r.sep, r.pa, r.pb = a.n, a.best, q, x
			return r, true, true
		}
		// An edge facing a rim: the nearest points of the two are a pair
		// of points of the shapes, and the direction between them an axis.
		a.wit = math.Inf(1)
		a.rimWitness(tol)
		switch {
		case a.apart:
			r.n, r.sep = a.n, a.best
			return r, false, true
		case a.wit <= a.best+tol:
			r.n, r.sep, r.pa, r.pb = a.n, a.best, a.witQ, a.witX
			return r, true, true
		}
		return r, false, false
	}
	depth := -a.best
	if depth >= cylDeep*c.cylR {
		return r, false, false
	}
	a.wit = math.Inf(1)
	for _, e := range cp.edges {
		for _, sg := range [2]float64{1, -1} {
			if a.rimBound(e[0], e[1], sg, depth-tol) < depth-tol {
				a.edgeRim(e[0], e[1], sg, tol, depth)
			}
		}
	}
	if a.best <= 0 && !a.overlapWitness() {
		if _, _, _, in := a.edgeWitness(); !in {
			// No point of both: a pair that proves a gap, farther apart
			// than the depth, lies outside the windows searched.
			a.rimWitness(tol)
			if a.best <= 0 {
				return r, false, false
			}
		}
	}
	if !(a.best <= 0) {
		return a.rimApart(r, tol)
	}
	r.n, r.sep = a.n, a.best
	// The cylinder's deepest point and its image on the polytope's side
	// (exact for a face of the polytope; the manifold takes the exact
	// points of edges and vertices from the features).
	r.pa = c.support(r.n)
	r.pb = r.pa.Add(r.n.Mul(r.sep))
	return r, true, true
}

// cylDeep: overlaps deeper than this fraction of the radius go to EPA.
// Points of the rim or side farther than the nearest one from a feature of
// the polytope are critical only at depths of r and more (|x - q| >= r for
// them), and an edge that passes within r - D of the axis, where the
// nearest rim point swings round faster than the samples of edgeRim
// resolve, can beat depth D only if D > r/2.
const cylDeep = 0.5

// cylCertTol, relative to the shapes' sizes: how much closer than the
// depth an edge must come to a rim before its common normals are searched
// (an edge-rim axis that beats the depth by less than this changes the
// depth by rounding only).
const cylCertTol = 1e-9

// closedForm tries the face normals, the axis, the side-edge axes and the
// vertex axes; false once one separates beyond the margin. A vertex's axes
// (the side's radial direction through it, the directions from its
// nearest rim points) end at the boundary point of the cylinder nearest to
// it, so they can beat an overlap of depth D only for a vertex within D of
// the cylinder's surface; when the other axes already show the shapes
// apart, only at the vertices nearest the cylinder (the distance is the
// least over all points of the polytope).
func (a *cylAxes) closedForm(bias float64) bool {
	cp := a.cp
	for i := range cp.norms {
		if !a.try(cp.norms[i], 0) {
			return false
		}
	}
	if !a.try(a.u, bias) {
		return false
	}
	for i := range cp.dirs {
		if !a.try(a.u.Cross(cp.dirs[i]), bias) {
			return false
		}
	}
	cp.vz, cp.vr, cp.vd = cp.vz[:0], cp.vr[:0], cp.vd[:0]
	near := math.Inf(1)
	for i := range cp.verts {
		w := cp.verts[i].Sub(a.c0)
		z := w.Dot(a.u)
		rad := w.Sub(a.u.Mul(z))
		dz, dr := math.Abs(z)-a.h, rad.Len()-a.r
		var db float64 // distance from the cylinder's surface
		if dz <= 0 && dr <= 0 {
			db = -math.Max(dz, dr)
		} else {
			db = math.Hypot(math.Max(dz, 0), math.Max(dr, 0))
		}
		cp.vz, cp.vr, cp.vd = append(cp.vz, z), append(cp.vr, rad), append(cp.vd, db)
		near = math.Min(near, db)
	}
	for i, v := range cp.verts {
		if a.best > 0 && cp.vd[i] > near*(1+1e-9)+1e-300 || a.best <= 0 && cp.vd[i] >= -a.best {
			continue
		}
		rad := cp.vr[i]
		if !a.try(rad, bias) {
			return false
		}
		rl := rad.Len()
		for _, sg := range [2]float64{1, -1} {
			q := a.c0.Add(a.u.Mul(sg * a.h))
			if rl > 0 {
				q = q.Add(rad.Mul(a.r / rl))
			}
			if !a.try(v.Sub(q), bias) {
				return false
			}
		}
	}
	return true
}

// edgeLine is edge p0 + t e (t in [0, 1]) seen from the rim on side sg:
// its height z0 + t z1 over the cap's plane and its radial offset
// rv0 + t rv1 from the axis.
type edgeLine struct {
	k        vec3 // the cap's centre
	e        vec3
	z0, z1   float64
	rv0, rv1 vec3
	// rho^2 = ra + 2 rb t + rc t^2
	ra, rb, rc float64
}

func (a *cylAxes) line(i0, i1 int32, sg float64) edgeLine {
	cp := a.cp
	l := edgeLine{k: a.c0.Add(a.u.Mul(sg * a.h)), e: cp.verts[i1].Sub(cp.verts[i0])}
	l.z0, l.z1 = cp.vz[i0]-sg*a.h, cp.vz[i1]-cp.vz[i0]
	l.rv0, l.rv1 = cp.vr[i0], cp.vr[i1].Sub(cp.vr[i0])
	l.ra, l.rb, l.rc = l.rv0.Dot(l.rv0), l.rv0.Dot(l.rv1), l.rv1.Dot(l.rv1)
	return l
}

// rimBound is a lower bound on the distance between edge p0 p1 and the rim
// on side sg: at every point of the edge the distance from the circle is at
// least the height over its plane and at least the radial gap |rho - r|;
// the height is linear along the edge and rho (a distance from a line) is
// convex, so the least of each is found in closed form. Once the height
// alone reaches limit the bound is returned without the radial part.
func (a *cylAxes) rimBound(i0, i1 int32, sg, limit float64) float64 {
	cp := a.cp
	z0, z1 := cp.vz[i0]-sg*a.h, cp.vz[i1]-sg*a.h
	z := 0.0
	if (z0 <= 0) == (z1 <= 0) {
		z = math.Min(math.Abs(z0), math.Abs(z1))
	}
	if z >= limit {
		return z // far from the cap's plane: the radial gap is not needed
	}
	rv0, rv1 := cp.vr[i0], cp.vr[i1].Sub(cp.vr[i0])
	r0, r1 := rv0.Len(), cp.vr[i1].Len()
	lo, hi := math.Min(r0, r1), math.Max(r0, r1)
	if lo > a.r {
		if vv := rv1.Dot(rv1); vv > 0 {
			if t := -rv0.Dot(rv1) / vv; t > 0 && t < 1 {
				lo = rv0.Add(rv1.Mul(t)).Len()
			}
		}
	}
	var g float64
	switch {
	case hi < a.r:
		g = a.r - hi
	case lo > a.r:
		g = lo - a.r
	}
	return math.Max(z, g)
}

// cylSamples is the number of samples of the slope of an edge-rim
// distance inside the rim's cylinder, where its extrema alternate
// (rimroots.go).
const cylSamples = 16

// rimAxes tries the axes of the edge's point t and its nearest rim point.
func (a *cylAxes) rimAxes(l *edgeLine, p0 vec3, t, bias float64) {
	rv := l.rv0.Add(l.rv1.Mul(t))
	rl := rv.Len()
	if rl == 0 {
		return // on the axis: every rim point is as near
	}
	x := p0.Add(l.e.Mul(t))
	q := l.k.Add(rv.Mul(a.r / rl))
	a.try(l.e.Cross(a.u.Cross(rv)), bias)
	a.try(x.Sub(q), bias)
	if dq := x.Sub(q).Len(); dq < a.wit {
		a.wit, a.witX, a.witQ = dq, x, q
	}
}

// overlapWitness looks for a point in both shapes: the centre of the
// cylinder's cap facing the best axis or its deepest rim point there (for
// a triangle, where the segment to either from the cylinder's centre
// crosses the triangle), or the polytope's deepest point inside the
// cylinder.
func (a *cylAxes) overlapWitness() bool {
	n, p := a.n, a.p
	ud := n.Dot(a.u)
	cands := [2]vec3{a.c0.Add(a.u.Mul(a.h * sgn(ud))), {}}
	cands[1] = cands[0]
	if rad, rl := unit(n.Sub(a.u.Mul(ud))); rl > 1e-12 {
		cands[1] = cands[1].Add(rad.Mul(a.r))
	}
	for _, x := range cands {
		if p.kind != kTriangle {
			if a.insideP(x) {
				return true
			}
			continue
		}
		tn := p.triN
		d0, d1 := tn.Dot(a.c0.Sub(p.tri[0])), tn.Dot(x.Sub(p.tri[0]))
		if (d0 < 0) == (d1 < 0) {
			continue
		}
		if overTriangle(a.c0.Add(x.Sub(a.c0).Mul(d0/(d0-d1))), p, 0) {
			return true
		}
	}
	// The polytope's deepest point toward the cylinder, inside it.
	w := p.support(n.Mul(-1)).Sub(a.c0)
	z := w.Dot(a.u)
	return math.Abs(z) <= a.h && w.Sub(a.u.Mul(z)).Len() <= a.r
}

// apartWitness looks, for shapes apart by a.best along a.n, for a point of
// each that far apart: the cylinder's support point moved across the gap
// onto the polytope (a rim or side point facing a face), or the
// polytope's support point moved back onto the cylinder (a vertex or edge
// facing the cap or side). tol is the slack of the inside tests.
func (a *cylAxes) apartWitness(c *view, tol float64) (pc, pp vec3, ok bool) {
	n, s, p := a.n, a.best, a.p
	pc = c.support(n)
	pp = pc.Add(n.Mul(s))
	if p.kind == kTriangle {
		if math.Abs(p.triN.Dot(pp.Sub(p.tri[0]))) <= tol && overTriangle(pp, p, tol) {
			return pc, pp, true
		}
	} else if a.insideP(pp.Add(n.Mul(tol))) {
		return pc, pp, true
	}
	pp = p.support(n.Mul(-1))
	pc = pp.Sub(n.Mul(s))
	w := pc.Sub(n.Mul(tol)).Sub(a.c0)
	z := w.Dot(a.u)
	if math.Abs(z) <= a.h && w.Sub(a.u.Mul(z)).Len() <= a.r {
		return pc, pp, true
	}
	return pc, pp, false
}

// insideP reports whether x lies in the box.
func (a *cylAxes) insideP(x vec3) bool {
	p := a.p
	l := mulT(p.rot, x.Sub(p.pos))
	return math.Abs(l[0]) <= p.half[0] && math.Abs(l[1]) <= p.half[1] && math.Abs(l[2]) <= p.half[2]
}

// cylinderPair is the dispatch of pairOrdered for a cylinder against a
// box (either order): the separating axes above,
// then the manifold from the features along the normal as on the general
// path. handled is false for other pairs.
func (d *Detector) cylinderPair(a, b *view, margin float64) (n vec3, ok, handled bool) {
	var r nearest
	switch {
	case a.kind == kCylinder:
		r, ok, handled = d.cylPoly(a, b, margin)
	case b.kind == kCylinder:
		r, ok, handled = d.cylPoly(b, a, margin)
		r.n, r.pa, r.pb = r.n.Mul(-1), r.pb, r.pa
	}
	if !handled {
		return vec3{}, false, false
	}
	if !ok {
		if c := &d.cache; c.on && r.n != (vec3{}) {
			c.out.kind, c.out.dir = hintDir, r.n
		}
		return vec3{}, false, true
	}
	return d.featureContact(a, b, r, margin), true, true
}

// triNearest is distance for a convex view against a mesh triangle, by
// the separating axes for a cylinder.
func (d *Detector) triNearest(v, tv *view, margin float64) (nearest, bool) {
	if r, ok, done := d.cylPoly(v, tv, margin); done {
		return r, ok
	}
	return d.distance(v, tv, margin)
}
