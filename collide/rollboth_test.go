package collide

import (
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// bothCase is a pair of curved shapes touching, moved a little each step:
// at s both roll, spin or slide by amounts that grow with s.
type bothCase struct {
	name string
	a, b shapes.Shape
	pose func(s float64) (pa, pb shapes.Pose)
	// ridge: the fresh query finds this contact by EPA (overlapping) or
	// GJK (apart) on curved shapes, whose stopping tests leave the normal
	// off by up to the square root of their tolerance over the radius (a
	// milliradian for EPA's 1e-7); the reference for refreshed contacts is
	// then the search along B's side (see ridgeSeparation) instead.
	ridge bool
	// smooth: the same, for two rims, whose supports are single points
	// near the contact; the reference is then gapMax.
	smooth bool
}

func pose(p vec3, q mgl64.Quat) shapes.Pose { return shapes.Pose{Position: p, Orientation: q} }

func rot(angle float64, axis vec3) mgl64.Quat { return mgl64.QuatRotate(angle, axis.Normalize()) }

// bothCases returns the pairs with gap g (negative: overlap).
func bothCases(g float64) []bothCase {
	const r, h = 0.02, 0.05
	cyl := shapes.Cylinder{Radius: r, HalfLength: h}
	capsule := shapes.Capsule{Radius: r, HalfLength: h}
	ball := shapes.Sphere{Radius: 0.015}
	alongX := rot(math.Pi/2, vec3{0, 1, 0}) // the z axis turned onto x
	alongY := rot(math.Pi/2, vec3{1, 0, 0}) // onto y
	// crossed: B lies across A (axis x) along y, on its top, rolling
	// along +x and A spinning about its axis.
	crossed := func(ra, rb float64) func(s float64) (shapes.Pose, shapes.Pose) {
		return func(s float64) (shapes.Pose, shapes.Pose) {
			x := 1e-7 * s
			pa := pose(vec3{0, 0, 0}, rot(3e-6*s, vec3{1, 0, 0}).Mul(alongX))
			pb := pose(vec3{x, 1e-7 * s, ra + rb + g}, rot(x/rb, vec3{0, 1, 0}).Mul(alongY))
			return pa, pb
		}
	}
	// onRim: A stands upright; B touches its top rim at (r, 0, h) at 40
	// degrees above the horizontal, and slides round it while A turns
	// about its axis.
	onRim := func(rb float64) func(s float64) (shapes.Pose, shapes.Pose) {
		return func(s float64) (shapes.Pose, shapes.Pose) {
			el := 40 * math.Pi / 180
			d := vec3{math.Cos(el), 0, math.Sin(el)}
			c := vec3{r, 1e-7 * s, h}.Add(d.Mul(rb + g))
			pa := pose(vec3{0, 0, 0}, rot(2e-6*s, vec3{0, 0, 1}))
			pb := pose(c, rot(5e-6*s, vec3{1, 2, 0}).Mul(alongY))
			return pa, pb
		}
	}
	// rimOnSide: A tilted 0.5 rad about x stands with its bottom rim's
	// lowest point (x = 0 by symmetry) on the top of B lying along y; A
	// spins about its axis and slides along B, B rolls about its axis.
	rimOnSide := func(s float64) (shapes.Pose, shapes.Pose) {
		qa := rot(1e-6*s, vec3{0, 0, 1}).Mul(rot(0.5, vec3{1, 0, 0})).Mul(rot(4e-6*s, vec3{0, 0, 1}))
		low := qa.Rotate(cyl.Support(qa.Conjugate().Rotate(vec3{0, 0, -1})))
		pa := pose(vec3{0, 1e-7 * s, r + g}.Sub(low), qa)
		pb := pose(vec3{0, 0, 0}, rot(3e-6*s, vec3{0, 1, 0}).Mul(alongY))
		return pa, pb
	}
	// rimOnRim: A stands upright; B, tilted, touches A's top rim at
	// (r, 0, h) with its own rim, the normal n0 40 degrees above the
	// horizontal: B's support along -n0 placed g beyond A's along n0 makes
	// n0 the contact normal (the gap along it is then stationary). B
	// spins about its axis and slides along y, A turns about its axis.
	rimOnRim := func(s float64) (shapes.Pose, shapes.Pose) {
		el := 40 * math.Pi / 180
		n0 := vec3{math.Cos(el), 0, math.Sin(el)}
		qb := rot(0.4, vec3{0, 0, 1}).Mul(rot(1.0, vec3{1, 0, 0})).Mul(rot(5e-6*s, vec3{0, 0, 1}))
		sb := qb.Rotate(cyl.Support(qb.Conjugate().Rotate(n0.Mul(-1))))
		pb := pose(vec3{r, 1e-7 * s, h}.Add(n0.Mul(g)).Sub(sb), qb)
		return pose(vec3{}, rot(2e-6*s, vec3{0, 0, 1})), pb
	}
	return []bothCase{
		{name: "cylinder across cylinder", a: cyl, b: cyl, pose: crossed(r, r)},
		{name: "capsule across capsule", a: capsule, b: capsule, pose: crossed(r, r)},
		{name: "capsule across cylinder", a: cyl, b: capsule, pose: crossed(r, r)},
		{name: "ball on cylinder's side", a: cyl, b: ball, pose: crossed(r, ball.Radius)},
		{name: "ball on ball", a: ball, b: ball, pose: crossed(ball.Radius, ball.Radius)},
		{name: "ball on a rim", a: cyl, b: ball, pose: onRim(ball.Radius)},
		{name: "capsule on a rim", a: cyl, b: capsule, pose: onRim(r), ridge: true},
		{name: "rim on a cylinder's side", a: cyl, b: cyl, pose: rimOnSide, ridge: g < 0},
		{name: "rim on a rim", a: cyl, b: cyl, pose: rimOnRim, smooth: true},
	}
}

// TestBothCurvedRefreshMatchesFresh moves pairs of curved shapes touching
// along both their curved surfaces (rolling, spinning, sliding round a
// rim) by small steps, so that most queries are refreshed, and compares
// each refreshed contact with the exact one: a fresh query's where that is
// exact (closest points of cores, the common perpendicular of two sides,
// GJK's nearest points of shapes apart), or the largest gap along the
// normals of B's side (ridgeSeparation) where the fresh query takes its
// normal from EPA. A refresh that kept the material points of the last
// full query would lag by the distance rolled since (up to 2e-5 m).
func TestBothCurvedRefreshMatchesFresh(t *testing.T) {
	// exactTol: both contacts are found from the same exact surfaces and
	// differ by rounding of poses of unit size (1e-16) carried through
	// closest-point formulas and square roots (1e-12 m at most here).
	const exactTol = 1e-10
	// ridgeTol: the reference searches the angle about B's axis to
	// rounding of the gap, which is flat at its top: the angle is found to
	// about sqrt(1e-17 / 0.02) = 2e-8 rad, so the points to 0.02 x 2e-8 =
	// 4e-10 m, and the gap to rounding.
	const ridgeTol, ridgeSepTol = 2e-9, 1e-12
	const margin = 1e-3
	for _, g := range []float64{-5e-5, 2e-4} {
		for _, c := range bothCases(g) {
			t.Run(c.name+gapName(g), func(t *testing.T) {
				kept, fresh := NewDetector(), NewDetector()
				kept.SetPersistence(persistSlop)
				var r1, r2 []Manifold
				var nref int
				const steps = 200
				for s := 0; s < steps; s++ {
					pa, pb := c.pose(float64(s))
					r1 = kept.CollidePair(r1[:0], 9, c.a, pa, c.b, pb, margin)
					r2 = fresh.Collide(r2[:0], c.a, pa, c.b, pb, margin)
					kept.NextStep()
					refreshed := kept.Stats().Persisted > nref
					nref = kept.Stats().Persisted
					if len(r1) != 1 || len(r2) != 1 || r1[0].Count != 1 || r2[0].Count != 1 {
						t.Fatalf("step %d: kept %+v, fresh %+v", s, r1, r2)
					}
					k, f := r1[0].Points[0], r2[0].Points[0]
					n, sep, at, tol, sepTol := r2[0].Normal, f.Separation, f.Position, exactTol, exactTol
					if (c.ridge || c.smooth) && !refreshed {
						continue // a full query: its own method's tolerance
					}
					switch {
					case c.ridge:
						n, sep, at = ridgeSeparation(c.a, pa, c.b, pb, r1[0].Normal)
						tol, sepTol = ridgeTol, ridgeSepTol
					case c.smooth:
						n, sep, at = gapMax(c.a, pa, c.b, pb, r1[0].Normal)
						tol, sepTol = ridgeTol, ridgeSepTol
					}
					if d := k.Position.Sub(at).Len(); d > tol {
						t.Fatalf("step %d: refreshed point %v, exact %v: %.3g m off", s, k.Position, at, d)
					}
					if d := math.Abs(k.Separation - sep); d > sepTol {
						t.Fatalf("step %d: refreshed separation %.12g, exact %.12g", s, k.Separation, sep)
					}
					if d := r1[0].Normal.Sub(n).Len(); d > tol/0.02 {
						t.Fatalf("step %d: refreshed normal %v, exact %v", s, r1[0].Normal, n)
					}
				}
				if st := kept.Stats(); st.Persisted < steps/2 {
					t.Errorf("%d of %d queries refreshed: the test does not test the refresh", st.Persisted, steps)
				}
			})
		}
	}
}

func gapName(g float64) string {
	if g < 0 {
		return " overlapping"
	}
	return " apart"
}

// ridgeSeparation is the contact of convex a and b where b touches with
// its side (a cylinder's or capsule's, axis z in its frame): the largest
// over unit directions n square to b's axis of the gap min(b.n) - max(a.n)
// between the shapes' extents (their supports, from package shapes), the
// signed distance or penetration depth of two convex shapes (G. van den
// Bergen, "Collision Detection in Interactive 3D Environments", 2003, sec.
// 4.3, from memory). It searches the angle about b's axis by golden
// section within 0.05 rad of n0, and returns the normal, the gap and the
// point midway between the two supports along it.
func ridgeSeparation(a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose, n0 vec3) (vec3, float64, vec3) {
	ca, cb := a.(shapes.Convex), b.(shapes.Convex)
	ax := pb.Orientation.Rotate(vec3{0, 0, 1})
	e1 := n0.Sub(ax.Mul(n0.Dot(ax))).Normalize()
	e2 := ax.Cross(e1)
	dir := func(th float64) vec3 { return e1.Mul(math.Cos(th)).Add(e2.Mul(math.Sin(th))) }
	support := func(s shapes.Convex, p shapes.Pose, d vec3) vec3 {
		return p.Position.Add(p.Orientation.Rotate(s.Support(p.Orientation.Conjugate().Rotate(d))))
	}
	gap := func(th float64) float64 {
		n := dir(th)
		return support(cb, pb, n.Mul(-1)).Dot(n) - support(ca, pa, n).Dot(n)
	}
	lo, hi := -0.05, 0.05
	phi := (math.Sqrt(5) - 1) / 2
	x1, x2 := hi-phi*(hi-lo), lo+phi*(hi-lo)
	g1, g2 := gap(x1), gap(x2)
	for i := 0; i < 200 && hi-lo > 1e-15; i++ {
		if g1 < g2 {
			lo, x1, g1 = x1, x2, g2
			x2 = lo + phi*(hi-lo)
			g2 = gap(x2)
		} else {
			hi, x2, g2 = x2, x1, g1
			x1 = hi - phi*(hi-lo)
			g1 = gap(x1)
		}
	}
	n := dir(0.5 * (lo + hi))
	// b's support along -n is a whole segment of its side: the point of
	// it across from a's support.
	xa := support(ca, pa, n)
	o := pb.Position
	foot := o.Add(ax.Mul(xa.Sub(o).Dot(ax)))
	r := support(cb, pb, n.Mul(-1)).Sub(o)
	xb := foot.Add(r.Sub(ax.Mul(r.Dot(ax))))
	return n, xb.Sub(xa).Dot(n), xa.Add(xb).Mul(0.5)
}

// gapMax is the contact of convex a and b near normal n0 where both
// supports are single points: the largest over unit directions n of the
// gap min(b.n) - max(a.n) between the shapes' extents (as in
// ridgeSeparation), found by compass search (Kolda, Lewis and Torczon,
// "Optimization by direct search", SIAM Review 45, 2003) over n = n0 +
// x e1 + y e2 normalised, the step halved down to 1e-13; it returns the
// normal, the gap and the point midway between the supports.
func gapMax(a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose, n0 vec3) (vec3, float64, vec3) {
	ca, cb := a.(shapes.Convex), b.(shapes.Convex)
	support := func(s shapes.Convex, p shapes.Pose, d vec3) vec3 {
		return p.Position.Add(p.Orientation.Rotate(s.Support(p.Orientation.Conjugate().Rotate(d))))
	}
	e1 := perpendicular(n0)
	e2 := n0.Cross(e1)
	dir := func(x, y float64) vec3 { return n0.Add(e1.Mul(x)).Add(e2.Mul(y)).Normalize() }
	gap := func(x, y float64) float64 {
		n := dir(x, y)
		return support(cb, pb, n.Mul(-1)).Dot(n) - support(ca, pa, n).Dot(n)
	}
	x, y, best := 0.0, 0.0, gap(0, 0)
	for step := 1e-2; step > 1e-13; {
		moved := false
		for _, m := range [4][2]float64{{1, 0}, {-1, 0}, {0, 1}, {0, -1}} {
			if v := gap(x+m[0]*step, y+m[1]*step); v > best {
				x, y, best, moved = x+m[0]*step, y+m[1]*step, v, true
				break
			}
		}
		if !moved {
			step *= 0.5
		}
	}
	n := dir(x, y)
	xa, xb := support(ca, pa, n), support(cb, pb, n.Mul(-1))
	return n, xb.Sub(xa).Dot(n), xa.Add(xb).Mul(0.5)
}
