package collide

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// randomTurn is uniform on SO(3) (Shoemake, "Uniform random rotations",
// Graphics Gems III, 1992).
func randomTurn(rng *rand.Rand) shapes.Quat {
	u1, u2, u3 := rng.Float64(), rng.Float64(), rng.Float64()
	a, c := math.Sqrt(1-u1), math.Sqrt(u1)
	return shapes.Quat{W: c * math.Cos(2*math.Pi*u3), V: vec3{a * math.Sin(2*math.Pi*u2), a * math.Cos(2*math.Pi*u2), c * math.Sin(2*math.Pi*u3)}}
}

// TestCylinderAxesMatchGJKEPA compares the separating axes of a cylinder
// against a box and a triangle with the general path (GJK
// distance for shapes apart, EPA depth for shapes that overlap) at random
// poses: separation and normal.
func TestCylinderAxesMatchGJKEPA(t *testing.T) {
	const (
		// sepTol, relative to the shapes' size: EPA stops when its bound
		// and its best face agree to epaCurvedTol (1e-7) of the size on
		// curved shapes (epa.go); GJK on a cylinder stops at a similar
		// fraction. Twice that, 2e-7, bounds the reference's own error
		// (measured worst: 1.4e-7).
		sepTol = 2e-7
		// normTol (radians) applies where the depth is unique enough to fix
		// the normal: both normals must give the same depth within sepTol,
		// and where they differ more the test compares the depth along each.
		normTol = 1e-2
	)
	rng := rand.New(rand.NewPCG(13, 0xc71))
	others := []struct {
		name string
		set  func(v *view, rot mat3, pos vec3)
	}{
		{"box", func(v *view, rot mat3, pos vec3) { v.setConvex(shapes.Box{Half: vec3{0.08, 0.05, 0.03}}, rot, pos) }},
		{"triangle", func(v *view, rot mat3, pos vec3) {
			a, b, c := pos.Add(mul(rot, vec3{-0.1, -0.06, 0})), pos.Add(mul(rot, vec3{0.09, -0.05, 0})), pos.Add(mul(rot, vec3{0.01, 0.1, 0}))
			n, _ := unit(b.Sub(a).Cross(c.Sub(a)))
			v.setTriangle(a, b, c, n)
		}},
	}
	cyls := []shapes.Cylinder{{Radius: 0.04, HalfLength: 0.06}, {Radius: 0.07, HalfLength: 0.015}}
	d := NewDetector()
	for _, o := range others {
		for _, touching := range []bool{false, true} {
			var worstSep, worstN float64
			overlaps, apart, left := 0, 0, 0
			for _, cy := range cyls {
				for i := 0; i < 2000; i++ {
					var cv, ov view
					cv.setConvex(cy, shapes.RotationMatrix(randomTurn(rng)), vec3{})
					dir := vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
					rot := shapes.RotationMatrix(randomTurn(rng))
					o.set(&ov, rot, dir.Mul(0.02+0.12*rng.Float64()))
					if touching {
						// Moved along the normal to a separation between -4 mm
						// and +2 mm: the contacts of a resting or landing part.
						ref, _ := d.distance(&cv, &ov, math.Inf(1))
						o.set(&ov, rot, ov.pos.Add(ref.n.Mul(-ref.sep-0.004+0.006*rng.Float64())))
					}
					scale := cv.size + ov.size
					ref, okRef := d.distance(&cv, &ov, math.Inf(1))
					got, ok, done := d.cylPoly(&cv, &ov, math.Inf(1))
					if !done {
						left++
						continue
					}
					if !ok || !okRef || ref.failed {
						continue
					}
					if ref.sep < 0 {
						overlaps++
					} else {
						apart++
					}
					e := math.Abs(got.sep-ref.sep) / scale
					worstSep = math.Max(worstSep, e)
					if e > sepTol {
						m := ref.n
						pc := cv.supportFull(m)
						py := ov.supportFull(m.Mul(-1))
						w := pc.Sub(cv.pos)
						t.Errorf("%s %v pose %d: separation %.9g by axes, %.9g by GJK/EPA; along EPA's normal %.9g; n.u %.4f; C point axial %.4f radial %.4f; P point %v", o.name, cy, i, got.sep, ref.sep,
							py.Dot(m)-pc.Dot(m), m.Dot(cv.axis()), w.Dot(cv.axis()), w.Sub(cv.axis().Mul(w.Dot(cv.axis()))).Len(), mulT(ov.rot, py.Sub(ov.pos)))
						continue
					}
					// The depth along each normal, measured on the shapes.
					along := func(n vec3) float64 {
						return ov.supportFull(n.Mul(-1)).Dot(n) - cv.supportFull(n).Dot(n)
					}
					if math.Abs(along(ref.n)-along(got.n)) <= sepTol*scale*0.1 {
						continue // two directions equally good
					}
					ang := math.Acos(math.Min(1, got.n.Dot(ref.n)))
					worstN = math.Max(worstN, ang)
					if ang > normTol {
						t.Errorf("%s pose %d: normal %v by axes, %v by GJK/EPA (%.3g rad)", o.name, i, got.n, ref.n, ang)
					}
				}
			}
			t.Logf("%s (touching %v): %d overlapping, %d apart, %d left to GJK/EPA; worst separation error %.2g of the size, worst normal angle %.2g rad", o.name, touching, overlaps, apart, left, worstSep, worstN)
		}
	}
}

// TestCylinderOnBoxClosedForm: a cylinder of radius r and half length h
// lying on a box's top face, sunk by depth, touches along a line: the
// points lie at the ends of the side (x = +-h about its centre), at
// separation -depth, normal the face's; standing on its cap it touches on
// the rim circle of radius r. (Geometry of the cylinder; the expected
// values follow from the pose.)
func TestCylinderOnBoxClosedForm(t *testing.T) {
	const (
		r, h, depth = 0.03, 0.05, 1e-3
		// tol: rounding of lengths of about 0.1 m.
		tol = 1e-12
	)
	box := shapes.Box{Half: vec3{0.5, 0.5, 0.1}}
	base := shapes.Pose{Position: vec3{0, 0, -0.1}, Orientation: mgl64.QuatIdent()}
	cyl := shapes.Cylinder{Radius: r, HalfLength: h}
	d := NewDetector()
	t.Run("lying", func(t *testing.T) {
		// Axis along x: rotate z onto x.
		q := mgl64.QuatRotate(math.Pi/2, vec3{0, 1, 0})
		c := vec3{0.1, -0.2, r - depth}
		ms := d.Collide(nil, box, base, cyl, shapes.Pose{Position: c, Orientation: q}, 0.005)
		if len(ms) != 1 || ms[0].Count != 2 {
			t.Fatalf("manifolds %+v, want one of two points", ms)
		}
		m := ms[0]
		if m.Normal.Sub(vec3{0, 0, 1}).Len() > tol {
			t.Errorf("normal %v, want +z", m.Normal)
		}
		xs := []float64{}
		for _, p := range m.Points[:m.Count] {
			if math.Abs(p.Separation+depth) > tol {
				t.Errorf("separation %g, want %g", p.Separation, -depth)
			}
			// Midway between the surfaces: z = -depth/2, y on the line.
			if math.Abs(p.Position[2]+depth/2) > tol || math.Abs(p.Position[1]-c[1]) > tol {
				t.Errorf("point %v not on the contact line y=%g z=%g", p.Position, c[1], -depth/2)
			}
			xs = append(xs, p.Position[0]-c[0])
		}
		if math.Abs(math.Abs(xs[0])-h) > tol || math.Abs(xs[0]+xs[1]) > tol {
			t.Errorf("points at x offsets %v, want +-%g", xs, h)
		}
	})
	t.Run("standing", func(t *testing.T) {
		c := vec3{-0.1, 0.05, h - depth}
		ms := d.Collide(nil, box, base, cyl, shapes.Pose{Position: c, Orientation: mgl64.QuatRotate(0.3, vec3{0, 0, 1})}, 0.005)
		if len(ms) != 1 || ms[0].Count < 3 {
			t.Fatalf("manifolds %+v, want one of at least three points", ms)
		}
		m := ms[0]
		if m.Normal.Sub(vec3{0, 0, 1}).Len() > tol {
			t.Errorf("normal %v, want +z", m.Normal)
		}
		for _, p := range m.Points[:m.Count] {
			if math.Abs(p.Separation+depth) > tol {
				t.Errorf("separation %g, want %g", p.Separation, -depth)
			}
			rho := math.Hypot(p.Position[0]-c[0], p.Position[1]-c[1])
			if math.Abs(rho-r) > tol || math.Abs(p.Position[2]+depth/2) > tol {
				t.Errorf("point %v: %g from the axis, want the rim at %g", p.Position, rho, r)
			}
		}
	})
}

// tryVectors is cylAxes.try written with the vector methods, as it was
// before it was written out on scalars: the reference of
// TestCylTryScalars.
func (a *cylAxes) tryVectors(ax vec3, bias float64) bool {
	n, l := unit(ax)
	if !(l > 1e-12) {
		return true
	}
	un := n.Dot(a.u)
	ec := a.h*math.Abs(un) + a.r*n.Sub(a.u.Mul(un)).Len()
	cn := n.Dot(a.c0)
	var lo, hi float64
	if p := a.p; p.kind == kBox {
		m := n.Dot(p.pos)
		e := 0.0
		for k := 0; k < 3; k++ {
			e += p.half[k] * math.Abs(n.Dot(col(p.rot, k)))
		}
		lo, hi = m-e, m+e
	} else {
		lo, hi = math.Inf(1), math.Inf(-1)
		for _, v := range a.cp.verts {
			x := n.Dot(v)
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
	}
	s, neg := lo-cn-ec, false
	if s2 := cn - ec - hi; s2 > s {
		s, neg = s2, true
	}
	if s > a.best+bias {
		if neg {
			n = n.Mul(-1)
		}
		a.best, a.n = s, n
		if s > a.margin {
			a.apart = true
			return false
		}
	}
	return true
}

// TestCylTryScalars checks that cylAxes.try on scalars keeps the vector
// form's verdict, best separation and axis bit for bit, trying runs of
// random axes (of random, tiny and zero length, and the cylinder's own
// axis) at random poses of a cylinder against a box and a triangle.
func TestCylTryScalars(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 0x7e5))
	rv := func(s float64) vec3 { return vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(s) }
	bits := func(v vec3) [3]uint64 {
		return [3]uint64{math.Float64bits(v[0]), math.Float64bits(v[1]), math.Float64bits(v[2])}
	}
	var cp cylPolytope
	for i := 0; i < 4000; i++ {
		var cv, pv view
		cv.setConvex(shapes.Cylinder{Radius: 0.01, HalfLength: 0.012}, shapes.RotationMatrix(randomTurn(rng)), rv(0.01))
		if i%2 == 0 {
			pv.setConvex(shapes.Box{Half: vec3{0.015, 0.01, 0.008}}, shapes.RotationMatrix(randomTurn(rng)), rv(0.01))
		} else {
			a, b, c := rv(0.02), rv(0.02), rv(0.02)
			n, _ := unit(b.Sub(a).Cross(c.Sub(a)))
			pv.setTriangle(a, b, c, n)
		}
		if !cp.gather(&pv) {
			t.Fatal("gather refused a box or a triangle")
		}
		margin := 0.004 * rng.Float64()
		x := cylAxes{c0: cv.pos, u: cv.axis(), r: cv.cylR, h: cv.half[2], p: &pv, cp: &cp, best: math.Inf(-1), margin: margin}
		y := x
		for k := 0; k < 12; k++ {
			ax := rv(math.Pow(10, -14*rng.Float64()))
			switch k % 6 {
			case 1:
				ax = vec3{}
			case 2:
				ax = x.u
			}
			bias := 1e-7 * float64(k%2)
			ok, rok := x.try(ax, bias), y.tryVectors(ax, bias)
			if ok != rok || x.apart != y.apart || math.Float64bits(x.best) != math.Float64bits(y.best) || bits(x.n) != bits(y.n) {
				t.Fatalf("pose %d, axis %d: %v, best %.17g along %v; vector form %v, %.17g along %v", i, k, ok, x.best, x.n, rok, y.best, y.n)
			}
			if !ok {
				break
			}
		}
	}
}
