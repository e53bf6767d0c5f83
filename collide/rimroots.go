package collide

import "math"

// The edge-rim search of cylPoly (cylpoly.go) by the roots of the slope of
// the squared distance f(t) from the edge's point t to the rim circle,
//
//	f(t) = (rho(t) - r)^2 + z(t)^2,  f'(t)/2 = (rho - r) rho' + z z',
//
// rho the point's distance from the axis (rho' = (rb + rc t)/rho, the
// derivative of the square root of a quadratic) and z its height over the
// cap's plane (linear). The common normals of the edge and the circle are
// the critical points of f (Eberly, "3D Game Engine Design", 2nd ed.,
// 2006, from memory; Ericson, "Real-Time Collision Detection", 2005,
// section 5.1, for closest points as roots of a derivative).
//
// Only the part of the edge that can hold a pair closer than lim is
// searched, lim being the depth of the overlap the closed-form axes left
// or the nearest pair met so far: a pair |x - q| < lim has |z| < lim and
// rho < r + lim, which bound t to an interval (z is linear in t, rho^2
// quadratic). Where the edge runs outside the rim's cylinder (rho > r) the
// distance to the circle is convex along it (the norm of (rho - r, z), of
// a convex and an affine function: Boyd and Vandenberghe, "Convex
// Optimization", 2004, section 3.2.4), so its one minimum is the root of
// the slope between the ends, bracketed by their signs. Inside (rho < r)
// minima and maxima alternate: the slope is sampled cylSamples times and
// each change of sign refined. Roots are found to rounding by regula falsi
// (Illinois, falsi in cylrefine.go) where golden-section search on the
// distance's values took 24 steps to 1e-5 of the bracket: a root of the
// slope is as exact as its rounding allows, about 3e-8 of the edge
// parameter where a search on values stops (the square root of rounding).

// slope is f'(t)/2 at edge point t for the rim of radius r; on the axis
// (rho = 0) rho' is taken as 0: every rim point is as near there.
func (l *edgeLine) slope(t, r float64) float64 {
	z := l.z0 + t*l.z1
	g := z * l.z1
	if rho := math.Sqrt(math.Max(0, l.ra+t*(2*l.rb+t*l.rc))); rho > 0 {
		g += (rho - r) * (l.rb + t*l.rc) / rho
	}
	return g
}

// window is the interval of the edge parameter in [0, 1] where the edge
// can come closer than lim to the rim of radius r: |z| <= lim and
// rho <= r + lim. ok is false when there is none.
func (l *edgeLine) window(r, lim float64) (lo, hi float64, ok bool) {
	lo, hi = 0, 1
	if math.IsInf(lim, 1) {
		return lo, hi, true
	}
	if !(lim >= 0) {
		return 0, 0, false
	}
	if l.z1 != 0 {
		t0, t1 := (-lim-l.z0)/l.z1, (lim-l.z0)/l.z1
		lo, hi = max(lo, min(t0, t1)), min(hi, max(t0, t1))
	} else if math.Abs(l.z0) > lim {
		return 0, 0, false
	}
	// rc t^2 + 2 rb t + ra <= (r + lim)^2.
	c := l.ra - (r+lim)*(r+lim)
	if l.rc > 0 {
		disc := l.rb*l.rb - l.rc*c
		if disc < 0 {
			return 0, 0, false
		}
		sq := math.Sqrt(disc)
		lo, hi = max(lo, (-l.rb-sq)/l.rc), min(hi, (-l.rb+sq)/l.rc)
	} else if c > 0 {
		return 0, 0, false
	}
	return lo, hi, lo <= hi
}

// edgeRim tries the common normals of edge p0 p1 and the rim circle on
// side sg where the edge comes within lim of the circle (the maxima of the
// distance only for shapes that overlap, a.mins false); each extremum's
// axes are tried by rimAxes.
func (a *cylAxes) edgeRim(i0, i1 int32, sg, bias, lim float64) {
	l := a.line(i0, i1, sg)
	p0 := a.cp.verts[i0]
	lo, hi, ok := l.window(a.r, lim)
	if !ok {
		return
	}
	// Crossings of rho = r: |rv0 + t rv1|^2 = r^2.
	cuts := [4]float64{lo}
	nc := 1
	qa, qb, qc := l.rc, 2*l.rb, l.ra-a.r*a.r
	if disc := qb*qb - 4*qa*qc; qa > 0 && disc > 0 {
		sq := math.Sqrt(disc)
		for _, t := range [2]float64{(-qb - sq) / (2 * qa), (-qb + sq) / (2 * qa)} {
			if t > lo && t < hi {
				cuts[nc] = t
				nc++
			}
		}
	}
	cuts[nc] = hi
	for i := 0; i < nc; i++ {
		t0, t1 := cuts[i], cuts[i+1]
		if m := 0.5 * (t0 + t1); l.ra+m*(2*l.rb+m*l.rc) > a.r*a.r {
			a.rimConvex(&l, p0, t0, t1, bias)
		} else {
			a.rimInside(&l, p0, t0, t1, bias)
		}
	}
}

// rimConvex tries the one minimum of the distance on [t0, t1], where the
// edge runs outside the rim's cylinder: an end where the slope points
// inward, else the root between.
func (a *cylAxes) rimConvex(l *edgeLine, p0 vec3, t0, t1, bias float64) {
	slope := func(t float64) float64 { return l.slope(t, a.r) }
	g0, g1 := slope(t0), slope(t1)
	t := t0
	switch {
	case g0 >= 0:
	case g1 <= 0:
		t = t1
	default:
		t = falsi(slope, t0, t1, g0, g1)
	}
	a.rimAxes(l, p0, t, bias)
}

// rimInside tries the extrema of the distance on [t0, t1], inside the
// rim's cylinder: the slope is sampled, a change of sign from - to + is a
// minimum, from + to - a maximum (tried when the shapes overlap), and an
// end where the slope points inward a minimum.
func (a *cylAxes) rimInside(l *edgeLine, p0 vec3, t0, t1, bias float64) {
	slope := func(t float64) float64 { return l.slope(t, a.r) }
	down := func(t float64) float64 { return -l.slope(t, a.r) }
	dt := (t1 - t0) / cylSamples
	var g [cylSamples + 1]float64
	for k := range g {
		g[k] = slope(t0 + float64(k)*dt)
	}
	if g[0] > 0 {
		a.rimAxes(l, p0, t0, bias)
	}
	for k := 0; k < cylSamples; k++ {
		lo, hi := t0+float64(k)*dt, t0+float64(k+1)*dt
		switch {
		case g[k] == 0:
			a.rimAxes(l, p0, lo, bias)
		case g[k] < 0 && g[k+1] > 0:
			a.rimAxes(l, p0, falsi(slope, lo, hi, g[k], g[k+1]), bias)
		case g[k] > 0 && g[k+1] < 0 && !a.mins:
			a.rimAxes(l, p0, falsi(down, lo, hi, -g[k], -g[k+1]), bias)
		}
	}
	if g[cylSamples] <= 0 {
		a.rimAxes(l, p0, t1, bias)
	}
}

// rimWitness searches the edges that come closer to a rim than the
// nearest pair met so far (a.wit) for their nearest approaches: the
// minima of the distance only, each a pair of points of the shapes and an
// axis.
func (a *cylAxes) rimWitness(tol float64) {
	a.mins = true
	for _, e := range a.cp.edges {
		for _, sg := range [2]float64{1, -1} {
			if a.rimBound(e[0], e[1], sg, a.wit) < a.wit {
				a.edgeRim(e[0], e[1], sg, tol, a.wit)
			}
		}
	}
}
