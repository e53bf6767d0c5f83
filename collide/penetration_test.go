package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

func at(x, y, z float64) shapes.Pose {
	return shapes.Pose{Position: vec3{x, y, z}, Orientation: mgl64.QuatIdent()}
}

func atRot(p vec3, angle float64, axis vec3) shapes.Pose {
	return shapes.Pose{Position: p, Orientation: mgl64.QuatRotate(angle, axis)}
}

func minSeparation(ms []Manifold) (float64, vec3) {
	best, n := math.Inf(1), vec3{}
	for _, m := range ms {
		for i := 0; i < m.Count; i++ {
			if s := m.Points[i].Separation; s < best {
				best, n = s, m.Normal
			}
		}
	}
	return best, n
}

func boxHull(t testing.TB, h vec3) *shapes.Hull {
	t.Helper()
	var pts []vec3
	for i := 0; i < 8; i++ {
		pts = append(pts, boxVertex(h, i))
	}
	hl, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	return hl
}

// TestPenetrationAnalytic checks depth and normal of overlaps whose answer
// is known in closed form, through the manifold (Collide) and through EPA
// (Penetration) where the pair is convex.
func TestPenetrationAnalytic(t *testing.T) {
	const (
		// exactTol: fast paths and polytope EPA are exact up to rounding of
		// coordinates of size about 1.
		exactTol = 1e-12
		// curvedTol: EPA on a cylinder stops when the support point lies
		// within epaRelTol (1e-10) of the size of the Minkowski difference
		// beyond the face; polytopes and faces of the box are exact, so the
		// error stays near that bound.
		curvedTol = 1e-8
	)
	unitBox := shapes.Box{Half: vec3{1, 1, 1}}
	half := shapes.Box{Half: vec3{0.5, 0.5, 0.5}}
	ball := shapes.Sphere{Radius: 0.5}
	capz := shapes.Capsule{Radius: 0.3, HalfLength: 1}
	cyl := shapes.Cylinder{Radius: 0.5, HalfLength: 0.75}
	hull := boxHull(t, vec3{1, 1, 1})
	s2 := 1 / math.Sqrt2
	s3 := 1 / math.Sqrt(3)
	type tc struct {
		name   string
		a      shapes.Shape
		pa     shapes.Pose
		b      shapes.Shape
		pb     shapes.Pose
		depth  float64 // analytic, source in the comment of each row
		normal vec3    // zero: any unit normal
		tol    float64
		points int // expected manifold points (0: do not check)
		// epaTol, when set, is the tolerance of Penetration (plain EPA)
		// where Collide is exact but EPA meets two curved sides: its depth
		// is good to about epaCurvedTol of the size, its normal only to the
		// square root of that (the normal check uses the square root).
		epaTol float64
	}
	cases := []tc{
		// Interval overlap on the axis: [-1, 1] and [1.4-0.5, 1.4+0.5] overlap by 0.1.
		{"box-box +x", unitBox, at(0, 0, 0), half, at(1.4, 0, 0), 0.1, vec3{1, 0, 0}, exactTol, 4, 0},
		{"box-box -x", unitBox, at(0, 0, 0), half, at(-1.4, 0, 0), 0.1, vec3{-1, 0, 0}, exactTol, 4, 0},
		{"box-box +y", unitBox, at(0, 0, 0), half, at(0, 1.4, 0), 0.1, vec3{0, 1, 0}, exactTol, 4, 0},
		{"box-box -y", unitBox, at(0, 0, 0), half, at(0, -1.4, 0), 0.1, vec3{0, -1, 0}, exactTol, 4, 0},
		{"box-box +z", unitBox, at(0, 0, 0), half, at(0, 0, 1.4), 0.1, vec3{0, 0, 1}, exactTol, 4, 0},
		{"box-box -z", unitBox, at(0, 0, 0), half, at(0, 0, -1.4), 0.1, vec3{0, 0, -1}, exactTol, 4, 0},
		// Sphere centre at distance r - 0.1 outside a face, an edge, a corner:
		// depth 0.1 along the outward direction from the nearest feature.
		{"sphere-box face", unitBox, at(0, 0, 0), ball, at(1.4, 0, 0), 0.1, vec3{1, 0, 0}, exactTol, 1, 0},
		{"sphere-box edge", unitBox, at(0, 0, 0), ball, at(1+0.4*s2, 1+0.4*s2, 0.3), 0.1, vec3{s2, s2, 0}, exactTol, 1, 0},
		{"sphere-box corner", unitBox, at(0, 0, 0), ball, at(1+0.4*s3, 1+0.4*s3, 1+0.4*s3), 0.1, vec3{s3, s3, s3}, exactTol, 1, 0},
		// Centre inside the box, 0.2 below the +z face: leaves through +z, depth 0.2 + r.
		{"sphere in box", unitBox, at(0, 0, 0), ball, at(0.1, -0.3, 0.8), 0.7, vec3{0, 0, 1}, exactTol, 1, 0},
		{"sphere-hull face", hull, at(0, 0, 0), ball, at(0, 1.4, 0), 0.1, vec3{0, 1, 0}, exactTol, 1, 0},
		{"sphere-hull corner", hull, at(0, 0, 0), ball, at(1+0.4*s3, 1+0.4*s3, 1+0.4*s3), 0.1, vec3{s3, s3, s3}, exactTol, 1, 0},
		// Two spheres: depth rA + rB - |cA - cB| = 1 + 0.5 - 1.2.
		{"sphere-sphere", shapes.Sphere{Radius: 1}, at(0, 0, 0), ball, at(0.4, 0.8, 0.8), 0.3, vec3{1.0 / 3, 2.0 / 3, 2.0 / 3}, exactTol, 1, 0},
		{"sphere-sphere coincident", shapes.Sphere{Radius: 1}, at(1, 2, 3), ball, at(1, 2, 3), 1.5, vec3{}, exactTol, 1, 0},
		// Capsules: depth rA + rB - distance of the core segments.
		{"capsule-capsule parallel", capz, at(0, 0, 0), capz, at(0.5, 0, 0.2), 0.1, vec3{1, 0, 0}, exactTol, 2, 0},
		{"capsule-capsule crossed", capz, at(0, 0, 0), capz, atRot(vec3{0, 0.5, 0}, math.Pi/2, vec3{0, 1, 0}), 0.1, vec3{0, 1, 0}, exactTol, 1, 0},
		{"capsule-capsule coincident", capz, at(0, 0, 0), capz, at(0, 0, 0), 0.6, vec3{}, exactTol, 0, 0},
		{"sphere-capsule", ball, at(0, 0, 0.5), capz, at(0.7, 0, 0), 0.1, vec3{1, 0, 0}, exactTol, 1, 0},
		// Capsule lying on a box face: depth r - (height of the axis above the face).
		{"capsule-box flat", unitBox, at(0, 0, 0), capz, atRot(vec3{0, 0, 1.25}, math.Pi/2, vec3{1, 0, 0}), 0.05, vec3{0, 0, 1}, exactTol, 2, 0},
		// Sphere and cylinder: side (radial) and cap (axial) overlaps of 0.1.
		{"sphere-cylinder side", cyl, at(0, 0, 0), ball, at(0.9, 0, 0.2), 0.1, vec3{1, 0, 0}, exactTol, 1, 0},
		{"sphere-cylinder cap", cyl, at(0, 0, 0), ball, at(0.1, 0.1, 1.15), 0.1, vec3{0, 0, 1}, exactTol, 1, 0},
		// Cylinder standing on its cap on a box, overlapping by 0.01.
		{"cylinder-box cap", unitBox, at(0, 0, 0), cyl, at(0.2, 0, 1.74), 0.01, vec3{0, 0, 1}, curvedTol, 4, 0},
		// Cylinder lying on its side on a box, overlapping by 0.01.
		{"cylinder-box side", unitBox, at(0, 0, 0), cyl, atRot(vec3{0, 0, 1.49}, math.Pi/2, vec3{0, 1, 0}), 0.01, vec3{0, 0, 1}, curvedTol, 2, 0},
		// Cylinders lying on each other: the axes 0.5 + 0.5 - 0.01 apart,
		// crossed (one point) and parallel (two points at the ends of the
		// shorter overlap of the lines).
		{"cylinder-cylinder crossed sides", cyl, atRot(vec3{}, math.Pi/2, vec3{1, 0, 0}), cyl, atRot(vec3{0.1, 0.2, 0.99}, math.Pi/2, vec3{0, 1, 0}), 0.01, vec3{0, 0, 1}, exactTol, 1, 1e-6},
		{"cylinder-cylinder parallel sides", cyl, atRot(vec3{}, math.Pi/2, vec3{1, 0, 0}), cyl, atRot(vec3{0, 0.3, 0.99}, math.Pi/2, vec3{1, 0, 0}), 0.01, vec3{0, 0, 1}, exactTol, 2, 1e-6},
		// A capsule along a cylinder's side: axes 0.5 + 0.3 - 0.01 apart.
		{"cylinder-capsule parallel", cyl, atRot(vec3{}, math.Pi/2, vec3{1, 0, 0}), capz, atRot(vec3{0, 0, 0.79}, math.Pi/2, vec3{1, 0, 0}), 0.01, vec3{0, 0, 1}, exactTol, 2, 1e-6},
		// Identical shapes at one pose: the least translation is the smallest
		// width of the Minkowski difference (twice the shape), along an axis.
		{"box-box coincident", unitBox, at(0, 0, 0), unitBox, at(0, 0, 0), 2, vec3{}, exactTol, 0, 0},
		{"hull-hull coincident", hull, at(1, 1, 1), hull, at(1, 1, 1), 2, vec3{}, exactTol, 0, 0},
		{"box-sphere coincident", unitBox, at(0, 0, 0), ball, at(0, 0, 0), 1.5, vec3{}, exactTol, 1, 0},
		// Cylinder with itself: D is a cylinder of radius 2r and half length
		// 2h, so depth min(2r, 2h) = 1 across the axis. Every radial
		// direction is a least translation: EPA approaches that circle by a
		// polygon and ends on its iteration cap (counted in Stats), so the
		// tolerance is that of a polygon of a few dozen sides, 2e-3.
		{"cylinder-cylinder coincident", cyl, at(0, 0, 0), cyl, at(0, 0, 0), 1, vec3{}, 2e-3, 0, 0},
	}
	d := NewDetector()
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			ms := d.Collide(nil, c.a, c.pa, c.b, c.pb, 0)
			if len(ms) == 0 {
				t.Fatal("no contact")
			}
			sep, n := minSeparation(ms)
			if math.Abs(-sep-c.depth) > c.tol {
				t.Errorf("Collide depth %.15g, want %.15g", -sep, c.depth)
			}
			if math.IsNaN(n.Len()) || math.Abs(n.Len()-1) > 1e-12 {
				t.Errorf("Collide normal %v is not unit", n)
			}
			if c.normal != (vec3{}) && n.Sub(c.normal).Len() > math.Sqrt(c.tol) {
				t.Errorf("Collide normal %v, want %v", n, c.normal)
			}
			if c.points > 0 && ms[0].Count != c.points {
				t.Errorf("%d points, want %d", ms[0].Count, c.points)
			}
			ca, okA := c.a.(shapes.Convex)
			cb, okB := c.b.(shapes.Convex)
			if !okA || !okB {
				return
			}
			p := d.Penetration(ca, c.pa, cb, c.pb)
			if !p.Overlap || p.Failed {
				t.Fatalf("Penetration: %+v", p)
			}
			tol := c.tol
			if c.epaTol > 0 {
				tol = c.epaTol
			}
			if math.Abs(p.Depth-c.depth) > tol {
				t.Errorf("Penetration depth %.15g, want %.15g", p.Depth, c.depth)
			}
			if c.normal != (vec3{}) && p.Normal.Sub(c.normal).Len() > math.Sqrt(tol) {
				t.Errorf("Penetration normal %v, want %v", p.Normal, c.normal)
			}
		})
	}
}

// TestNoNaNDegenerate throws coincident, touching and deep configurations at
// every pair of shape kinds: results must be finite and iterations bounded.
func TestNoNaNDegenerate(t *testing.T) {
	hull := boxHull(t, vec3{0.4, 0.6, 0.5})
	all := []shapes.Shape{
		shapes.Sphere{Radius: 0.5}, shapes.Box{Half: vec3{0.5, 0.4, 0.3}}, shapes.Capsule{Radius: 0.2, HalfLength: 0.4},
		shapes.Cylinder{Radius: 0.4, HalfLength: 0.3}, hull, cloud{randomCloud(rand.New(rand.NewSource(3)), 12, vec3{0.5, 0.5, 0.5})},
	}
	offsets := []vec3{{0, 0, 0}, {1e-12, 0, 0}, {0, 0, 0.3}, {0.5, 0.5, 0.5}, {0, 0, 0.9}, {0.4, 0, 0}}
	d := NewDetector()
	for i, a := range all {
		for j, b := range all {
			for _, off := range offsets {
				for _, q := range []shapes.Quat{mgl64.QuatIdent(), mgl64.QuatRotate(math.Pi/2, vec3{1, 0, 0}), mgl64.QuatRotate(0.7, vec3{1, 2, 3}.Normalize())} {
					ms := d.Collide(nil, a, at(0, 0, 0), b, shapes.Pose{Position: off, Orientation: q}, 0.01)
					for _, m := range ms {
						if math.IsNaN(m.Normal.Len()) || math.Abs(m.Normal.Len()-1) > 1e-9 {
							t.Fatalf("%d-%d at %v: normal %v", i, j, off, m.Normal)
						}
						for k := 0; k < m.Count; k++ {
							p := m.Points[k]
							if math.IsNaN(p.Separation) || math.IsNaN(p.Position.Len()) {
								t.Fatalf("%d-%d at %v: NaN point %+v", i, j, off, p)
							}
						}
					}
					if len(ms) == 0 && off.Len() < 0.5 {
						t.Errorf("%d-%d at %v: overlapping shapes give no contact", i, j, off)
					}
				}
			}
		}
	}
	// Bad poses (NaN, infinite) must not panic nor loop.
	bad := []shapes.Pose{{Position: vec3{math.NaN(), 0, 0}, Orientation: mgl64.QuatIdent()}, {Position: vec3{math.Inf(1), 0, 0}, Orientation: mgl64.QuatIdent()}, {Orientation: shapes.Quat{W: math.NaN()}}}
	mesh := NewMesh(gridMesh(2, 1, flatZero))
	for _, a := range append(all, shapes.Plane{Normal: vec3{0, 0, 1}}, mesh) {
		for _, b := range all {
			for _, p := range bad {
				d.Collide(nil, a, at(0, 0, 0), b, p, 0.01)
				d.Collide(nil, b, p, a, at(0, 0, 0), math.NaN())
			}
		}
	}
	st := d.Stats()
	t.Logf("stats %+v", st)
	if st.GJKCapped > 0 {
		t.Errorf("GJK hit its iteration cap %d times", st.GJKCapped)
	}
}
