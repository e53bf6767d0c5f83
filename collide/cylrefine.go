package collide

import "math"

// The distance from a cylinder to a polytope (a box, a hull or a mesh
// triangle) near a rim or the side, and between two cylinders at a rim
// (rimRefine).
//
// There the Minkowski difference is curved, and GJK converges only
// linearly: each support point adds a point of the rim, the simplex's face
// approximates the curve by a chord, and the gap between GJK's bounds falls
// by about four per iteration, so the 1e-13 of gjkRelTol takes 20 to 35
// iterations where a polytope pair takes 5 to 8. The polytope's side of
// the simplex, though, settles on its closest feature (one vertex, or the
// two ends of an edge, or a face) within a few iterations.
//
// So once GJK's bounds are within the loose tolerance cylLooseTol, the
// nearest points of that feature and the cylinder are found directly: the
// nearest point of the cylinder to a point is in closed form; the distance
// from the cylinder to a point moving along an edge is a convex function
// of the edge parameter (the distance from a convex set is a convex
// function, Boyd and Vandenberghe, "Convex Optimization", 2004, section
// 3.2.5, composed with an affine map), whose slope has one root, found by
// regula falsi (cylEdgeNearest); and the cylinder's point nearest a face's
// plane is its support point toward the face.
//
// The pair of points so found is accepted only when GJK's own stopping
// test holds for it: the support points of both shapes along the
// direction between them give the lower bound v.w/|v| on the distance
// (Gilbert, Johnson and Keerthi 1988), and it must lie within gjkRelTol of
// the pair's distance |v|, the upper bound (a pair of points of the two
// shapes), as when GJK stops, or within rounding (cylRound). Otherwise (a
// feature GJK had not yet found, a face's foot outside the face) GJK
// carries on to gjkRelTol. Where both finish, the pair found here is at
// least as close as GJK's (GJK near touch stops on rounding, with bounds
// up to 1e-4 apart relative to the distance, where these agree to 1e-8).

// cylLooseTol is the relative gap between GJK's bounds at which the
// polytope's closest feature is taken from the simplex: measured on
// random cylinder-hull and cylinder-box pairs 0.1 um to 1 mm apart, the
// feature is then found in 96 percent of queries (as at 1e-5; 1e-2 loses
// a few more), and a wrong one only costs carrying on.
const cylLooseTol = 1e-3

// cylRootMax caps the steps of the root search along an edge (a
// bisection every eighth step alone brings the bracket below rounding).
const cylRootMax = 100

// refinable reports whether the pair a, b is a cylinder and a polytope
// whose distance cylRefine may finish.
func refinable(a, b *view) bool {
	other := func(v *view) bool {
		return v.kind == kBox || v.kind == kHull || v.kind == kTriangle || v.kind == kCylinder
	}
	return a.kind == kCylinder && other(b) || b.kind == kCylinder && other(a)
}

// cylRefine finds the nearest points of the cylinder and the polytope
// feature that GJK's simplex s holds, and accepts them when they
// pass GJK's stopping test.
func (d *Detector) cylRefine(a, b *view, s *simplex) (gjkResult, bool) {
	if a.kind == kCylinder && b.kind == kCylinder {
		return rimRefine(a, b, s)
	}
	c := a
	pts := &s.b
	if b.kind == kCylinder {
		c, pts = b, &s.a
	}
	// The distinct polytope points of the simplex: its feature.
	var f [3]vec3
	nf := 0
next:
	for i := 0; i < s.n; i++ {
		for k := 0; k < nf; k++ {
			if pts[i] == f[k] {
				continue next
			}
		}
		if nf == len(f) {
			return gjkResult{}, false
		}
		f[nf] = pts[i]
		nf++
	}
	var x, q vec3
	var dist float64
	switch nf {
	case 1:
		x = f[0]
		q, dist = cylNearest(c, x)
	case 2:
		x, q, dist = cylEdgeNearest(c, f[0], f[1])
	case 3:
		// A face: the cylinder's point deepest toward its plane, and that
		// point's foot on the plane.
		n, l := unit(f[1].Sub(f[0]).Cross(f[2].Sub(f[0])))
		if l == 0 {
			return gjkResult{}, false
		}
		if n.Dot(c.pos.Sub(f[0])) < 0 {
			n = n.Mul(-1) // from the face toward the cylinder
		}
		q = c.support(n.Mul(-1))
		dist = q.Sub(f[0]).Dot(n)
		x = q.Sub(n.Mul(dist))
		// The foot must lie in the triangle, so that x is a point of the
		// polytope and |x - q| an upper bound on the distance (the stopping
		// test's lower bound along a face normal holds anywhere).
		for k := 0; k < 3; k++ {
			if f[(k+1)%3].Sub(f[k]).Cross(x.Sub(f[k])).Dot(n) < 0 {
				return gjkResult{}, false
			}
		}
	}
	r := gjkResult{pa: q, pb: x}
	if c == b {
		r.pa, r.pb = x, q
	}
	// The distance is that of the two points as the caller sees them, so
	// that v/dist is a unit vector (dist itself is rounded in the
	// cylinder's frame).
	r.v = r.pa.Sub(r.pb)
	r.dist = math.Sqrt(r.v.Dot(r.v))
	if !(dist > coreTouch*(a.size+b.size)) || !(r.dist > coreTouch*(a.size+b.size)) {
		return gjkResult{}, false
	}
	if !certified(a, b, r.v) {
		return gjkResult{}, false
	}
	return r, true
}

// certified reports whether v (a point of the Minkowski difference a - b)
// passes GJK's stopping test: the lower bound v.w/|v| from the support
// points along -v and v is within gjkRelTol of |v|, or within the
// rounding of the coordinates (cylRound of their scale), where GJK itself
// stops when rounding takes over.
func certified(a, b *view, v vec3) bool {
	w := a.support(v.Mul(-1)).Sub(b.support(v))
	vv := v.Dot(v)
	scale := a.size + b.size + a.pos.Len() + b.pos.Len()
	return vv > 0 && vv-v.Dot(w) <= gjkRelTol*vv+cylRound*scale*math.Sqrt(vv)
}

// cylRound, relative to the coordinates' scale (the shapes' sizes and
// distances from the query frame's origin): the slack of the stopping test
// for rounding. The direction between two points d apart carries their
// rounding, divided by d, into the lower bound over the shapes' extent:
// pairs 0.1 um apart among parts of 1 to 3 cm miss the bare test by up to
// 2e-13 of the scale; this is five times that, and still a hundred times
// below where GJK near touch leaves its own bounds.
const cylRound = 1e-12

// cylNearest returns the point of cylinder c nearest to x and its distance
// (0 when x is inside).
func cylNearest(c *view, x vec3) (vec3, float64) {
	l := mulT(c.rot, x.Sub(c.pos))
	rad, h := c.cylR, c.half[2]
	rho := math.Hypot(l[0], l[1])
	ux, uy := 1.0, 0.0
	if rho > 0 {
		ux, uy = l[0]/rho, l[1]/rho
	}
	qr := math.Min(rho, rad)
	ql := vec3{ux * qr, uy * qr, math.Max(-h, math.Min(h, l[2]))}
	return c.pos.Add(mul(c.rot, ql)), l.Sub(ql).Len()
}

// cylEdgeNearest returns the point of edge x0 x1 nearest to cylinder c,
// the cylinder's point nearest to it, and their distance. The distance
// is convex along the edge, so its slope, whose sign is that of
// (x - q).e, changes sign once, at the nearest point. The root is
// bracketed and found by the Illinois variant of regula falsi (Dowell and
// Jarratt, "A modified regula falsi method for computing the root of an
// equation", BIT 11, 1971), with a bisection step whenever it would stall,
// down to rounding (a search on the distance's values would stop where
// they differ by rounding, about sqrt(rounding x radius) from it, too far
// for the stopping test).
func cylEdgeNearest(c *view, x0, x1 vec3) (x, q vec3, dist float64) {
	e := x1.Sub(x0)
	slope := func(t float64) float64 {
		x := x0.Add(e.Mul(t))
		q, _ := cylNearest(c, x)
		return x.Sub(q).Dot(e)
	}
	t := 0.0
	glo, ghi := slope(0), slope(1)
	switch {
	case glo >= 0:
		t = 0
	case ghi <= 0:
		t = 1
	default:
		t = falsi(slope, 0, 1, glo, ghi)
	}
	x = x0.Add(e.Mul(t))
	q, dist = cylNearest(c, x)
	return x, q, dist
}

// falsi returns the root of slope in [lo, hi], where it rises through
// zero from glo < 0 to ghi > 0.
func falsi(slope func(float64) float64, lo, hi, glo, ghi float64) float64 {
	t := lo
	side := 0
	for it := 0; it < cylRootMax && lo < hi; it++ {
		t = (lo*ghi - hi*glo) / (ghi - glo)
		if !(t > lo && t < hi) || it%8 == 7 {
			t = 0.5 * (lo + hi) // stalled, or a bisection now and then
			if t <= lo || t >= hi {
				break // no float between them
			}
		}
		g := slope(t)
		switch {
		case g > 0:
			hi, ghi = t, g
			if side == 1 {
				glo *= 0.5
			}
			side = 1
		case g < 0:
			lo, glo = t, g
			if side == -1 {
				ghi *= 0.5
			}
			side = -1
		default:
			lo, hi = t, t
		}
		if (hi-lo)*(1+math.Abs(t)) <= 0x1p-52 {
			break
		}
	}
	return t
}

// rimRefine is cylRefine for two cylinders, where GJK is slowest (30
// iterations and more): when the simplex's point on one of them lies at a
// rim, the rim's point nearest the other cylinder is found by regula falsi
// on the slope of its distance along the rim (the distance from a point to
// a cylinder is in closed form), within cylRimArc of the simplex's point,
// and the pair is accepted if it passes the stopping test. This covers a
// rim against the other's rim, side or cap; sides and caps facing each
// other are left to GJK.
func rimRefine(a, b *view, s *simplex) (gjkResult, bool) {
	pa, pb := s.points()
	for k, o := range [2]*view{a, b} {
		c, p := b, pa
		if k == 1 {
			c, p = a, pb
		}
		l := mulT(o.rot, p.Sub(o.pos))
		if math.Abs(l[2]) < 0.5*o.half[2] || math.Hypot(l[0], l[1]) < 0.5*o.cylR {
			continue // not near a rim of o
		}
		zr := math.Copysign(o.half[2], l[2])
		at := func(phi float64) (x, dx vec3) {
			sn, cs := math.Sincos(phi)
			x = o.pos.Add(mul(o.rot, vec3{o.cylR * cs, o.cylR * sn, zr}))
			dx = mul(o.rot, vec3{-o.cylR * sn, o.cylR * cs, 0})
			return x, dx
		}
		slope := func(phi float64) float64 {
			x, dx := at(phi)
			q, _ := cylNearest(c, x)
			return x.Sub(q).Dot(dx)
		}
		phi0 := math.Atan2(l[1], l[0])
		lo, hi := phi0-cylRimArc, phi0+cylRimArc
		glo, ghi := slope(lo), slope(hi)
		if !(glo < 0 && ghi > 0) {
			continue // no minimum bracketed
		}
		x, _ := at(falsi(slope, lo, hi, glo, ghi))
		q, _ := cylNearest(c, x)
		r := gjkResult{pa: x, pb: q}
		if k == 1 {
			r.pa, r.pb = q, x
		}
		r.v = r.pa.Sub(r.pb)
		r.dist = math.Sqrt(r.v.Dot(r.v))
		if r.dist > coreTouch*(a.size+b.size) && certified(a, b, r.v) {
			return r, true
		}
	}
	return gjkResult{}, false
}

// cylRimArc (radians) is half the arc of the rim searched about the
// simplex's point: by cylLooseTol that point is within a few hundredths of
// a radian of the nearest one in the measured pairs.
const cylRimArc = 0.25
