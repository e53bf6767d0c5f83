package collide

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"clatter/shapes"
)

// The separation of a cylinder and a box by cylPoly (whose edge-rim axes
// come from rimroots.go) against a brute-force reference: the largest
// separation over all directions, min over the box minus max over the
// cylinder of n.x, which is the distance of two convex sets apart and
// minus their penetration depth when they overlap (Ericson, "Real-Time
// Collision Detection", 2005, sections 5.2.1 and 9.1). The reference
// evaluates it on a dense set of directions (a Fibonacci lattice on the
// sphere) and climbs from the best ones by a random pattern search with
// shrinking steps; the box's extreme point is the best of its eight
// corners, the cylinder's that of its support function (the point of the
// rim, or of a cap or the side, farthest along n: a disc's farthest point
// is its centre plus r times the unit direction of n's component in its
// plane).
// Every direction it evaluates is a real one, so its maximum is a lower
// bound on the true one: cylPoly must reach it, and the separation along
// cylPoly's own normal, measured the same way, must be cylPoly's.

// sepAlong is the separation of box b (view) beyond cylinder c along unit
// n, from the eight corners and the support point of each rim disc.
func sepAlong(c, b *view, n vec3) float64 {
	lo := math.Inf(1)
	for i := 0; i < 8; i++ {
		l := vec3{b.half[0], b.half[1], b.half[2]}
		for k := 0; k < 3; k++ {
			if i&(1<<k) == 0 {
				l[k] = -l[k]
			}
		}
		lo = math.Min(lo, n.Dot(b.pos.Add(mul(b.rot, l))))
	}
	u := c.axis()
	hi := math.Inf(-1)
	// The rim point r w (w the unit direction of n's part across the
	// axis) adds r (n.w), which is r times the length of that part.
	across := n.Sub(u.Mul(n.Dot(u))).Len()
	for _, sg := range [2]float64{1, -1} {
		p := c.pos.Add(u.Mul(sg * c.half[2]))
		hi = math.Max(hi, n.Dot(p)+c.cylR*across)
	}
	return lo - hi
}

// bruteSeparation is the reference's largest separation of box b beyond
// cylinder c and its direction. The separation is the least of eight
// smooth functions (one a corner) less the cylinder's support, smooth but
// on the great circle across its axis (the side) and at the axis (the
// caps). Its maximum is where one corner is least and the function is
// smooth, or on a great circle where two corners tie (normal to the line
// between them) or across the axis, or where two such circles cross. So
// the reference takes the best of: the crossings; each of those great
// circles sampled densely, refined about its best samples by
// golden-section search; and a dense lattice on the sphere, climbed from
// its best directions by random steps (the smooth maxima).
func bruteSeparation(c, b *view, rng *rand.Rand) (float64, vec3) {
	const (
		lattice  = 3000  // directions of the lattice
		starts   = 4     // best lattice directions climbed from
		tries    = 32    // random steps tried at each step size
		minStep  = 1e-13 // radians: below rounding of the directions
		maxSteps = 3000  // steps of a climb
		ring     = 720   // samples of a great circle
		rounds   = 80    // golden-section steps (0.618^80: below rounding)
	)
	bestS, bestN := math.Inf(-1), vec3{}
	consider := func(n vec3) float64 {
		s := sepAlong(c, b, n)
		if s > bestS {
			bestS, bestN = s, n
		}
		return s
	}
	var corners [8]vec3
	for i := range corners {
		l := vec3{b.half[0], b.half[1], b.half[2]}
		for k := 0; k < 3; k++ {
			if i&(1<<k) == 0 {
				l[k] = -l[k]
			}
		}
		corners[i] = b.pos.Add(mul(b.rot, l))
	}
	u := c.axis()
	consider(u)
	consider(u.Mul(-1))
	// The great circles: normal to each line between two corners, and to
	// the axis.
	normals := []vec3{u}
	for i := range corners {
		for j := i + 1; j < 8; j++ {
			if e, l := unit(corners[j].Sub(corners[i])); l > 0 {
				normals = append(normals, e)
			}
		}
	}
	for i, m := range normals {
		for _, k := range normals[i+1:] {
			if x, l := unit(m.Cross(k)); l > 1e-9 {
				consider(x)
				consider(x.Mul(-1))
			}
		}
		p := perpendicular(m)
		q := m.Cross(p)
		at := func(phi float64) vec3 { return p.Mul(math.Cos(phi)).Add(q.Mul(math.Sin(phi))) }
		var f [ring]float64
		for k := range f {
			f[k] = consider(at(2 * math.Pi * float64(k) / ring))
		}
		for k := range f {
			if f[k] < f[(k+ring-1)%ring] || f[k] < f[(k+1)%ring] {
				continue // not a sampled maximum
			}
			lo, hi := 2*math.Pi*float64(k-1)/ring, 2*math.Pi*float64(k+1)/ring
			const g = 0.6180339887498949
			x1, x2 := hi-g*(hi-lo), lo+g*(hi-lo)
			f1, f2 := consider(at(x1)), consider(at(x2))
			for it := 0; it < rounds; it++ {
				if f1 >= f2 {
					hi, x2, f2 = x2, x1, f1
					x1 = hi - g*(hi-lo)
					f1 = consider(at(x1))
				} else {
					lo, x1, f1 = x1, x2, f2
					x2 = lo + g*(hi-lo)
					f2 = consider(at(x2))
				}
			}
		}
	}
	type cand struct {
		s float64
		n vec3
	}
	cs := make([]cand, 0, lattice)
	golden := math.Pi * (3 - math.Sqrt(5))
	for i := 0; i < lattice; i++ {
		z := 1 - (2*float64(i)+1)/lattice
		rho := math.Sqrt(1 - z*z)
		th := golden * float64(i)
		n := vec3{rho * math.Cos(th), rho * math.Sin(th), z}
		cs = append(cs, cand{consider(n), n})
	}
	sort.Slice(cs, func(i, j int) bool { return cs[i].s > cs[j].s })
	for _, x := range cs[:starts] {
		for step, it := 0.02, 0; step > minStep && it < maxSteps; it++ {
			moved := false
			for k := 0; k < tries && !moved; k++ {
				d := vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
				d = d.Sub(x.n.Mul(d.Dot(x.n))).Normalize()
				n := x.n.Add(d.Mul(step)).Normalize()
				if s := consider(n); s > x.s {
					x, moved = cand{s, n}, true
				}
			}
			if moved {
				step *= 2 // a step that gains is tried longer
			} else {
				step /= 4
			}
		}
	}
	return bestS, bestN
}

func TestCylinderBoxSeparationMatchesBruteForce(t *testing.T) {
	const (
		// shortTol, relative to the shapes' sizes: cylPoly answers for
		// shapes apart once a pair of points of the two is within
		// cylCertTol of the sizes of its separation (an upper bound
		// within that of its lower bound), so it may fall that much short
		// of the distance; plus rounding (lengths of a few centimetres
		// carry about 1e-17 m). Measured worst 5.2e-10 (touching rims,
		// certified by a witness); 3.4e-16 elsewhere.
		shortTol = cylCertTol + 1e-12
		// roundTol, relative to the sizes: the separation along cylPoly's
		// own normal, measured on the corners and the rims, against its
		// separation: rounding only.
		roundTol = 1e-12
		// refTol, relative to the sizes: how far the reference may stop
		// short of cylPoly's answer. A maximum where one corner is least
		// is climbed by random steps, which slow down where the
		// separation is flat; measured worst 1.7e-10 (two shapes 46 nm
		// apart), so 1e-9 still fails an answer off by 30 pm.
		refTol = 1e-9
		// poseCount random poses per case: a few seconds of reference on
		// a loaded machine.
		poseCount = 24
	)
	type pose struct {
		cylRot, boxRot mat3
		boxPos         vec3
	}
	rng := rand.New(rand.NewPCG(7, 0x51d))
	cyl := shapes.Cylinder{Radius: 0.01, HalfLength: 0.012}
	box := shapes.Box{Half: vec3{0.015, 0.01, 0.008}}
	var cv, bv view
	d := NewDetector()
	// touching places the box along a random direction, then moves it
	// along the reference normal to the separation sep.
	touching := func(cr, br mat3, dir vec3, sep float64) pose {
		cv.setConvex(cyl, cr, vec3{})
		bv.setConvex(box, br, dir.Mul(0.05))
		s, n := bruteSeparation(&cv, &bv, rng)
		return pose{cr, br, bv.pos.Add(n.Mul(sep - s))}
	}
	turn := func(axis vec3, ang float64) mat3 {
		return shapes.RotationMatrix(shapes.Quat{W: math.Cos(ang / 2), V: axis.Normalize().Mul(math.Sin(ang / 2))})
	}
	cases := []struct {
		name  string
		poses func() pose
	}{
		// A landing part: random poses, from 3 mm deep to 1 mm apart.
		{"random", func() pose {
			dir := vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
			return touching(shapes.RotationMatrix(randomTurn(rng)), shapes.RotationMatrix(randomTurn(rng)), dir, -0.003+0.004*rng.Float64())
		}},
		// The cylinder's axis parallel to a box edge (x), side against
		// the box's edges: the side-edge axes are degenerate.
		{"parallel axes", func() pose {
			cr := turn(vec3{0, 1, 0}, math.Pi/2) // axis along x
			br := turn(vec3{1, 0, 0}, rng.Float64()*math.Pi)
			dir := vec3{0, rng.NormFloat64(), rng.NormFloat64()}.Normalize()
			return touching(cr, br, dir, -0.002+0.003*rng.Float64())
		}},
		// A box edge across a rim, near touching: the edge-rim axes
		// decide (the edge's nearest rim point is on the circle).
		{"touching rims", func() pose {
			cr := shapes.RotationMatrix(randomTurn(rng))
			u := col(cr, 2)
			side, _ := unit(perpendicular(u).Mul(math.Cos(rng.Float64() * 6.3)).Add(u.Cross(perpendicular(u)).Mul(math.Sin(rng.Float64() * 6.3))))
			dir := side.Add(u).Normalize()
			return touching(cr, shapes.RotationMatrix(randomTurn(rng)), dir, -1e-6+2e-6*rng.Float64())
		}},
		// Deep: sunk by up to 40 percent of the radius (cylPoly takes
		// depths below cylDeep, half the radius).
		{"deep", func() pose {
			dir := vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
			return touching(shapes.RotationMatrix(randomTurn(rng)), shapes.RotationMatrix(randomTurn(rng)), dir, -0.004*rng.Float64())
		}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			checked, worstShort, worstRef := 0, 0.0, 0.0
			for i := 0; i < poseCount; i++ {
				p := tc.poses()
				cv.setConvex(cyl, p.cylRot, vec3{})
				bv.setConvex(box, p.boxRot, p.boxPos)
				scale := cv.size + bv.size
				got, ok, done := d.cylPoly(&cv, &bv, math.Inf(1))
				if !done || !ok {
					continue // left to GJK and EPA
				}
				checked++
				ref, refN := bruteSeparation(&cv, &bv, rng)
				if s := sepAlong(&cv, &bv, got.n); math.Abs(s-got.sep) > roundTol*scale {
					t.Errorf("pose %d: separation %.15g, but %.15g along its normal %v", i, got.sep, s, got.n)
				}
				short := (ref - got.sep) / scale
				worstShort = math.Max(worstShort, short)
				worstRef = math.Max(worstRef, -short)
				if short > shortTol {
					t.Errorf("pose %d: separation %.15g, the reference finds %.15g along %v (normal %v)", i, got.sep, ref, refN, got.n)
				}
				if -short > refTol {
					t.Errorf("pose %d: the reference %.15g stops %.3g of the size short of %.15g", i, ref, -short, got.sep)
				}
			}
			if checked < poseCount/2 {
				t.Errorf("only %d of %d poses answered by the axes", checked, poseCount)
			}
			t.Logf("%d poses: cylPoly short of the reference by at most %.2g, the reference short of cylPoly by at most %.2g (of the size)", checked, worstShort, worstRef)
		})
	}
}

// TestEdgeRimNearestClosedForm: the nearest approach of an edge to the top
// rim circle (radius r at height h on the z axis) that edgeRim finds,
// against plane geometry: a line in the cap's plane at distance d from the
// axis is d - r from the circle (0 when tangent); a line parallel to the
// axis at distance rho from it is |rho - r| from the circle (at the cap's
// plane); a line at height z over or under the plane comes nearest where
// it crosses the circle's cylinder, z away, or, passing outside at
// distance d, sqrt((d - r)^2 + z^2) away.
func TestEdgeRimNearestClosedForm(t *testing.T) {
	const (
		r, h = 0.01, 0.012
		// tol (m): rounding of centimetre lengths (about 2e-18 m an
		// operation) over a few dozen operations; the root's own error
		// enters the distance at second order only.
		tol = 1e-15
	)
	cases := []struct {
		name   string
		p0, p1 vec3
		want   float64
	}{
		{"in the plane, outside", vec3{-0.03, 0.02, h}, vec3{0.03, 0.02, h}, 0.02 - r},
		{"in the plane, tangent", vec3{-0.03, r, h}, vec3{0.03, r, h}, 0},
		{"parallel to the axis, outside", vec3{0.015, 0, h - 0.005}, vec3{0.015, 0, h + 0.005}, 0.005},
		{"parallel to the axis, inside", vec3{0, 0.004, h - 0.005}, vec3{0, 0.004, h + 0.005}, 0.006},
		{"through the axis, above", vec3{-0.03, 0, h + 0.002}, vec3{0.03, 0, h + 0.002}, 0.002},
		{"outside, above", vec3{-0.03, 0.02, h + 0.003}, vec3{0.03, 0.02, h + 0.003}, math.Hypot(0.02-r, 0.003)},
		{"through the rim", vec3{0, 0, h - 0.001}, vec3{0.02, 0, h + 0.001}, 0},
		{"sunk across the rim", vec3{-0.03, 0.005, h - 0.002}, vec3{0.03, 0.005, h - 0.002}, 0.002},
	}
	var cv, tv view
	cv.setConvex(shapes.Cylinder{Radius: r, HalfLength: h}, identity3, vec3{})
	for _, tc := range cases {
		// A triangle of the edge and a point far below the cylinder.
		far := vec3{0, -0.5, -1}
		n, _ := unit(tc.p1.Sub(tc.p0).Cross(far.Sub(tc.p0)))
		tv.setTriangle(tc.p0, tc.p1, far, n)
		var cp cylPolytope
		cp.gather(&tv)
		a := cylAxes{c0: cv.pos, u: cv.axis(), r: r, h: h, p: &tv, cp: &cp, best: math.Inf(-1), margin: math.Inf(1)}
		a.closedForm(0) // the vertices' axial and radial coordinates
		a.wit, a.mins = math.Inf(1), true
		a.edgeRim(0, 1, 1, 0, math.Inf(1))
		if math.Abs(a.wit-tc.want) > tol {
			t.Errorf("%s: nearest approach %.17g, want %.17g", tc.name, a.wit, tc.want)
		}
		if got := a.witX.Sub(a.witQ).Len(); math.Abs(got-a.wit) > tol || math.Abs(math.Hypot(a.witQ[0], a.witQ[1])-r) > tol || math.Abs(a.witQ[2]-h) > tol {
			t.Errorf("%s: witness %v - %v is not a rim point %g away", tc.name, a.witX, a.witQ, a.wit)
		}
	}
}
