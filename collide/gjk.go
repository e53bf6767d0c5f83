package collide

import "math"

// GJK: E. G. Gilbert, D. W. Johnson and S. S. Keerthi, "A fast procedure for
// computing the distance between complex objects in three-dimensional space",
// IEEE J. Robotics and Automation 4(2), 1988. The closest point of the
// Minkowski difference D = A - B to the origin is found by iterating support
// points of D; each iteration reduces the simplex to the smallest sub-simplex
// supporting its closest point.
//
// The sub-simplex step is the signed-volumes method of M. Montanari,
// N. Petrinic and E. Barbieri, "Improving the GJK algorithm for faster and
// more reliable distance queries between convex objects", ACM TOG 36(3),
// 2017: barycentric coordinates come from signed volumes (determinants) of
// the simplex and its faces projected onto the coordinate plane of largest
// area, and a face is examined only where the sign of its coordinate tells
// that the origin lies beyond it. This avoids the precision loss of Johnson's
// distance sub-algorithm on nearly degenerate simplices.

const (
	// gjkMaxIter bounds the iterations; polytopes converge in far fewer (the
	// support points are vertices of D), curved shapes stop on gjkRelTol.
	gjkMaxIter = 64
	// gjkRelTol stops when the lower bound v.w/|v| on the distance is within
	// this fraction of the upper bound |v| (relative gap squared scale).
	gjkRelTol = 1e-13
	// gjkTouchTol: |v| below this fraction of the simplex size counts as zero
	// distance (the origin lies on D within rounding).
	gjkTouchTol = 1e-13
	// gjkStopBand: gjkUntil stops only when its lower bound exceeds the stop
	// by this fraction, far above the rounding of the bound (a few ulps), so
	// that a full run would find the distance above the stop too.
	gjkStopBand = 1e-9
)

// simplex holds up to four support points of D with the points of A and B
// that made them, and the barycentric coordinates of the closest point.
type simplex struct {
	n      int
	w      [4]vec3
	a      [4]vec3
	b      [4]vec3
	la, lb [4]vec3 // a and b in their shapes' own frames (gjkwarm.go)
	lam    [4]float64
}

// gjkResult is the outcome of one GJK query on the cores of two views.
type gjkResult struct {
	dist    float64
	pa, pb  vec3 // closest points on A and B
	v       vec3 // pa - pb, the closest point of D to the origin
	overlap bool // the origin is inside D (or on it, within gjkTouchTol)
	iters   int
	capped  bool // stopped on gjkMaxIter, result is the best found
	apart   bool // gjkUntil proved the distance above its stop (dist is a lower bound)
	refined bool // cylRefine found the nearest points (cylrefine.go)
}

func sameSign(a, b float64) bool { return (a > 0 && b > 0) || (a < 0 && b < 0) }

// sd1 finds the closest point to the origin on segment s[i]-s[j].
// Montanari et al. 2017, S1D: barycentric coordinates along the axis of
// largest extent.
func sd1(s *[4]vec3, i, j int, lam *[4]float64) uint8 {
	a, b := s[i], s[j]
	t := b.Sub(a)
	tt := t.Dot(t)
	if tt == 0 {
		lam[i] = 1
		return 1 << i
	}
	p := a.Sub(t.Mul(a.Dot(t) / tt))
	k := argmaxAbs(t)
	mu := a[k] - b[k]
	c1 := p[k] - b[k] // mu times the coordinate of a
	c2 := a[k] - p[k] // mu times the coordinate of b
	switch {
	case sameSign(mu, c1) && sameSign(mu, c2):
		lam[i], lam[j] = c1/mu, c2/mu
		return 1<<i | 1<<j
	case sameSign(mu, c1):
		lam[i] = 1 // the coordinate of b is not positive: vertex a
		return 1 << i
	default:
		lam[j] = 1
		return 1 << j
	}
}

func cross2(ax, ay, bx, by float64) float64 { return ax*by - ay*bx }

// sd2 finds the closest point to the origin on triangle s[i] s[j] s[k].
// Montanari et al. 2017, S2D.
func sd2(s *[4]vec3, i, j, k int, lam *[4]float64) uint8 {
	a, b, c := s[i], s[j], s[k]
	n := b.Sub(a).Cross(c.Sub(a))
	nn := n.Dot(n)
	var mu float64
	var cs [3]float64
	ax := 0
	if nn > 0 {
		p := n.Mul(a.Dot(n) / nn) // projection of the origin onto the plane
		ax = argmaxAbs(n)
		x, y := (ax+1)%3, (ax+2)%3
		mu = n[ax]
		// Signed areas in the projection with each corner replaced by p.
		cs[0] = cross2(b[x]-p[x], b[y]-p[y], c[x]-p[x], c[y]-p[y])
		cs[1] = cross2(p[x]-a[x], p[y]-a[y], c[x]-a[x], c[y]-a[y])
		cs[2] = cross2(b[x]-a[x], b[y]-a[y], p[x]-a[x], p[y]-a[y])
		if sameSign(mu, cs[0]) && sameSign(mu, cs[1]) && sameSign(mu, cs[2]) {
			lam[i], lam[j], lam[k] = cs[0]/mu, cs[1]/mu, cs[2]/mu
			return 1<<i | 1<<j | 1<<k
		}
	}
	// The origin projects outside (or the triangle is degenerate): the
	// closest point is on an edge opposite a corner whose coordinate is not
	// positive.
	idx := [3]int{i, j, k}
	best := math.Inf(1)
	var bestMask uint8
	var bestLam [4]float64
	for m := 0; m < 3; m++ {
		if mu != 0 && sameSign(mu, cs[m]) {
			continue
		}
		var l [4]float64
		mask := sd1(s, idx[(m+1)%3], idx[(m+2)%3], &l)
		d := closestOf(s, mask, &l)
		if dd := d.Dot(d); dd < best {
			best, bestMask, bestLam = dd, mask, l
		}
	}
	*lam = bestLam
	return bestMask
}

func det3(a, b, c vec3) float64 { return a.Dot(b.Cross(c)) }

// sd3 finds the closest point to the origin in tetrahedron s[0..3].
// Montanari et al. 2017, S3D: the cofactors of [s1 s2 s3 s4; 1 1 1 1] give
// the barycentric coordinates of the origin.
func sd3(s *[4]vec3, lam *[4]float64) uint8 {
	var cs [4]float64
	cs[0] = -det3(s[1], s[2], s[3])
	cs[1] = det3(s[0], s[2], s[3])
	cs[2] = -det3(s[0], s[1], s[3])
	cs[3] = det3(s[0], s[1], s[2])
	m := cs[0] + cs[1] + cs[2] + cs[3]
	if sameSign(m, cs[0]) && sameSign(m, cs[1]) && sameSign(m, cs[2]) && sameSign(m, cs[3]) {
		for i := range cs {
			lam[i] = cs[i] / m
		}
		return 15
	}
	best := math.Inf(1)
	var bestMask uint8
	var bestLam [4]float64
	for f := 0; f < 4; f++ {
		if m != 0 && sameSign(m, cs[f]) {
			continue
		}
		var l [4]float64
		i, j, k := (f+1)%4, (f+2)%4, (f+3)%4
		mask := sd2(s, i, j, k, &l)
		d := closestOf(s, mask, &l)
		if dd := d.Dot(d); dd < best {
			best, bestMask, bestLam = dd, mask, l
		}
	}
	*lam = bestLam
	return bestMask
}

func closestOf(s *[4]vec3, mask uint8, lam *[4]float64) vec3 {
	var v vec3
	for i := 0; i < 4; i++ {
		if mask&(1<<i) != 0 {
			v = v.Add(s[i].Mul(lam[i]))
		}
	}
	return v
}

// reduceInto runs the signed-volumes step on the simplex, writes the
// supporting sub-simplex into out (which may be s, or another simplex so
// that s survives) and returns the closest point to the origin.
func (s *simplex) reduceInto(out *simplex) vec3 {
	var lam [4]float64
	var mask uint8
	switch s.n {
	case 1:
		out.n, out.w[0], out.a[0], out.b[0], out.lam[0] = 1, s.w[0], s.a[0], s.b[0], 1
		out.la[0], out.lb[0] = s.la[0], s.lb[0]
		return s.w[0]
	case 2:
		mask = sd1(&s.w, 0, 1, &lam)
	case 3:
		mask = sd2(&s.w, 0, 1, 2, &lam)
	case 4:
		mask = sd3(&s.w, &lam)
	}
	n := 0
	var v vec3
	for i := 0; i < s.n; i++ {
		if mask&(1<<i) == 0 {
			continue
		}
		out.w[n], out.a[n], out.b[n], out.lam[n] = s.w[i], s.a[i], s.b[i], lam[i]
		out.la[n], out.lb[n] = s.la[i], s.lb[i]
		v = v.Add(out.w[n].Mul(lam[i]))
		n++
	}
	out.n = n
	return v
}

// points returns the closest points on A and B from the barycentric coordinates.
func (s *simplex) points() (pa, pb vec3) {
	for i := 0; i < s.n; i++ {
		pa = pa.Add(s.a[i].Mul(s.lam[i]))
		pb = pb.Add(s.b[i].Mul(s.lam[i]))
	}
	return pa, pb
}

// gjk computes the distance between the cores of a and b (full adds the
// rounding radii, for EPA on the whole shapes). The final simplex stays in
// d.smp for EPA.
func (d *Detector) gjk(a, b *view, full bool) gjkResult {
	return d.gjkUntil(a, b, full, posInf)
}

// gjkUntil is gjk that may stop as soon as the distance is proved to
// exceed stop: the lower bound v.w/|v| that each iteration finds (the
// support plane of D normal to v separates D from the origin by that much:
// Gilbert, Johnson and Keerthi 1988; the same bound ends van den Bergen's
// separating-axis variant of GJK, "Collision Detection in Interactive 3D
// Environments", 2003, chapter 4, cited from memory) is above it. The result then has apart set, dist is that lower bound and v the
// direction that proved it; the closest points are not found.
func (d *Detector) gjkUntil(a, b *view, full bool, stop float64) gjkResult {
	return d.gjkRefined(a, b, full, stop, false)
}

// gjkRefined is gjkUntil that, when refine is set, hands the simplex to
// cylRefine once its bounds are within cylLooseTol, and returns what that
// finds if it passes the stopping test (cylrefine.go).
func (d *Detector) gjkRefined(a, b *view, full bool, stop float64, refine bool) gjkResult {
	return d.gjkFrom(a, b, full, stop, refine, nil)
}

// gjkFrom is gjkRefined started from the simplex warm holds, when it is
// not nil and holds one (gjkwarm.go), and leaves in warm the simplex this
// query ends with. The full shapes (full set) never start warm.
func (d *Detector) gjkFrom(a, b *view, full bool, stop float64, refine bool, warm *warmSimplex) gjkResult {
	d.stats.GJKCalls++
	var ia, ib int32 // where hull support climbs start
	sup := func(v *view, dir vec3, start *int32) (vec3, vec3) { return v.gjkSupport(dir, full, start) }
	s, next := &d.smp, &d.smp2
	var res gjkResult
	var v vec3
	var vv, maxww float64
	if full {
		warm = nil // its points are not the shapes' own
	}
	if warm != nil && warm.n > 0 {
		ia, ib = warm.ia, warm.ib
		v, vv, maxww = d.gjkWarm(a, b, warm) // into d.smp
		if d.smp.n == 4 || vv <= gjkTouchTol*gjkTouchTol*maxww {
			res.overlap = true
		} else if refine {
			// The polytope's feature is most often last step's: its
			// nearest points to the cylinder pass GJK's own stopping test
			// at once, where GJK would close in on the curved rim for a
			// few iterations before trying them (cylrefine.go).
			if r, ok := d.cylRefine(a, b, s); ok {
				r.refined = true
				warm.keep(a, b, s, ia, ib)
				return r
			}
		}
	} else {
		dir := b.center().Sub(a.center())
		if dir.Dot(dir) == 0 {
			dir = vec3{1, 0, 0}
		}
		s.n = 1
		s.a[0], s.la[0] = sup(a, dir, &ia)
		s.b[0], s.lb[0] = sup(b, dir.Mul(-1), &ib)
		s.w[0] = s.a[0].Sub(s.b[0])
		s.lam[0] = 1
		v = s.w[0]
		vv = v.Dot(v)
		maxww = vv
	}
	for it := 0; !res.overlap; it++ {
		if it == gjkMaxIter {
			res.capped = true
			d.stats.GJKCapped++
			break
		}
		res.iters = it + 1
		if vv == 0 {
			res.overlap = true
			break
		}
		pa, la := sup(a, v.Mul(-1), &ia)
		pb, lb := sup(b, v, &ib)
		w := pa.Sub(pb)
		vw := v.Dot(w)
		// Apart beyond the stop: the lower bound v.w/|v| exceeds it.
		if lim := stop * (1 + gjkStopBand); vw > 0 && vw*vw > lim*lim*vv {
			res.apart, res.dist, res.v = true, vw/math.Sqrt(vv), v
			warm.keep(a, b, s, ia, ib)
			return res
		}
		if refine && vv-vw <= cylLooseTol*vv {
			refine = false // once
			if r, ok := d.cylRefine(a, b, s); ok {
				r.iters, r.refined = it+1, true
				warm.keep(a, b, s, ia, ib)
				return r
			}
		}
		// Converged: the lower bound v.w/|v| is within the relative tolerance
		// of |v| (this also catches a repeated support point).
		if vv-vw <= gjkRelTol*vv {
			break
		}
		dup := false
		for i := 0; i < s.n; i++ {
			if s.w[i] == w {
				dup = true
			}
		}
		if dup {
			break
		}
		// The reduced simplex goes to the other buffer, so that s stays
		// as it was should the step make no progress.
		s.w[s.n], s.a[s.n], s.b[s.n] = w, pa, pb
		s.la[s.n], s.lb[s.n] = la, lb
		s.n++
		maxww = math.Max(maxww, w.Dot(w))
		nv := s.reduceInto(next)
		if next.n == 4 {
			res.overlap = true
			v = nv
			s, next = next, s
			break
		}
		nvv := nv.Dot(nv)
		if nvv <= gjkTouchTol*gjkTouchTol*maxww {
			res.overlap = true
			v = nv
			s, next = next, s
			break
		}
		if nvv >= vv {
			// No progress: rounding has taken over; keep the better simplex.
			s.n--
			break
		}
		v, vv = nv, nvv
		s, next = next, s
	}
	if s != &d.smp {
		d.smp = *s // EPA starts from d.smp
		s = &d.smp
	}
	warm.keep(a, b, s, ia, ib)
	res.v = v
	res.pa, res.pb = s.points()
	if res.overlap {
		res.dist = 0
	} else {
		res.dist = math.Sqrt(vv)
	}
	return res
}
