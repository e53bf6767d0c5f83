package collide

import (
	"math"
	"sort"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// prismHull is a regular n-gon prism of circumradius r and half height h
// about z.
func prismHull(t testing.TB, n int, r, h float64) *shapes.Hull {
	t.Helper()
	var pts []vec3
	for k := 0; k < n; k++ {
		th := 2 * math.Pi * float64(k) / float64(n)
		pts = append(pts, vec3{r * math.Cos(th), r * math.Sin(th), -h}, vec3{r * math.Cos(th), r * math.Sin(th), h})
	}
	hl, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	return hl
}

// lowestVertices returns the world vertices of pts at pose p whose height
// is within tol of the lowest, with that height.
func lowestVertices(pts []vec3, p shapes.Pose, tol float64) ([]vec3, float64) {
	lo := math.Inf(1)
	for _, v := range pts {
		lo = math.Min(lo, p.Apply(v)[2])
	}
	var out []vec3
	for _, v := range pts {
		if w := p.Apply(v); w[2] <= lo+tol {
			out = append(out, w)
		}
	}
	return out, lo
}

// matchPoints checks that the manifold's points are want (any order) within
// tol, each with separation sep.
func matchPoints(t *testing.T, m Manifold, want []vec3, sep, tol float64) {
	t.Helper()
	if m.Count != len(want) {
		t.Fatalf("%d points, want %d: %+v", m.Count, len(want), m.Points[:m.Count])
	}
	used := make([]bool, len(want))
	for i := 0; i < m.Count; i++ {
		p := m.Points[i]
		bi, bd := -1, math.Inf(1)
		for j, w := range want {
			if dd := p.Position.Sub(w).Len(); !used[j] && dd < bd {
				bi, bd = j, dd
			}
		}
		if bd > tol {
			t.Errorf("point %v: nearest expected %v at %g", p.Position, want[bi], bd)
		}
		used[bi] = true
		if math.Abs(p.Separation-sep) > tol {
			t.Errorf("point %v: separation %.15g, want %.15g", p.Position, p.Separation, sep)
		}
	}
}

// TestManifoldsResting checks the manifolds of parts resting on a support:
// points at the corners, edges and rims that touch, with the known
// penetration; the expected points are the touching vertices of the part
// (found by brute force over its vertices) moved up by half the
// penetration, midway between the surfaces.
func TestManifoldsResting(t *testing.T) {
	const (
		pen = 1e-3
		// tol: the contact geometry is exact up to rounding of coordinates
		// of size about 1.
		tol = 1e-12
	)
	floor := shapes.Plane{Normal: vec3{0, 0, 1}}
	table := shapes.Box{Half: vec3{3, 3, 1}} // top face at z = 1
	part := shapes.Box{Half: vec3{0.5, 0.3, 0.2}}
	var partPts []vec3
	for i := 0; i < 8; i++ {
		partPts = append(partPts, boxVertex(part.Half, i))
	}
	prism := prismHull(t, 6, 0.5, 0.3)
	s2, s3 := 1/math.Sqrt2, 1/math.Sqrt(3)
	// The rotation that turns the body diagonal (1,1,1) down to -z.
	diag := mgl64.QuatBetweenVectors(vec3{s3, s3, s3}, vec3{0, 0, -1})
	flat := mgl64.QuatRotate(0.4, vec3{0, 0, 1})
	onEdge := mgl64.QuatRotate(math.Pi/4, vec3{1, 0, 0})
	tilt := mgl64.QuatRotate(0.2, vec3{1, 0, 0})
	type tc struct {
		name  string
		rot   shapes.Quat
		pts   []vec3
		shape shapes.Shape
		count int // touching vertices: 4 flat, 2 on an edge, 1 on a corner
	}
	cases := []tc{
		{"box flat", flat, partPts, part, 4},
		{"box on edge", onEdge, partPts, part, 2},
		{"box on corner", diag, partPts, part, 1},
		{"hull flat", flat, prism.Vertices, prism, 6},
		{"hull tilted onto an edge", tilt, prism.Vertices, prism, 2},
	}
	d := NewDetector()
	for _, c := range cases {
		for _, sup := range []struct {
			name string
			s    shapes.Shape
			top  float64
		}{{"plane", floor, 0}, {"box", table, 1}} {
			t.Run(c.name+" on "+sup.name, func(t *testing.T) {
				pose := shapes.Pose{Position: vec3{0.2, -0.1, 0}, Orientation: c.rot}
				_, lo := lowestVertices(c.pts, pose, 0)
				pose.Position[2] = sup.top - lo - pen
				touch, _ := lowestVertices(c.pts, pose, 1e-9)
				if len(touch) != c.count {
					t.Fatalf("test setup: %d touching vertices, want %d", len(touch), c.count)
				}
				want := make([]vec3, len(touch))
				for i, w := range touch {
					want[i] = w.Add(vec3{0, 0, pen / 2})
				}
				ms := d.Collide(nil, sup.s, shapes.IdentityPose, c.shape, pose, 0)
				if len(ms) != 1 {
					t.Fatalf("%d manifolds", len(ms))
				}
				if ms[0].Normal != (vec3{0, 0, 1}) && ms[0].Normal.Sub(vec3{0, 0, 1}).Len() > tol {
					t.Errorf("normal %v", ms[0].Normal)
				}
				if len(want) > 4 {
					// Six corners of the hexagon reduced to four: the deepest,
					// then the largest area; all are corners.
					if ms[0].Count != 4 {
						t.Fatalf("%d points, want 4", ms[0].Count)
					}
					for i := 0; i < 4; i++ {
						p := ms[0].Points[i]
						ok := false
						for _, w := range want {
							ok = ok || p.Position.Sub(w).Len() < tol
						}
						if !ok || math.Abs(p.Separation+pen) > tol {
							t.Errorf("point %+v is not a touching corner", p)
						}
					}
					return
				}
				matchPoints(t, ms[0], want, -pen, tol)
				// Swapped order: the same points, the normal reversed.
				ms = d.Collide(nil, c.shape, pose, sup.s, shapes.IdentityPose, 0)
				if len(ms) != 1 || ms[0].Normal.Add(vec3{0, 0, 1}).Len() > tol {
					t.Fatalf("swapped: %+v", ms)
				}
				matchPoints(t, ms[0], want, -pen, tol)
			})
		}
	}
	_ = s2
}

// TestManifoldsRound checks cylinders, capsules and spheres resting on a
// plane and on a box: a cylinder on its cap gets four rim points around its
// axis, on its side the two ends of the touching line, a capsule lying flat
// the bottoms of its two end spheres.
func TestManifoldsRound(t *testing.T) {
	const (
		pen = 1e-3
		// tol: the plane and clipping paths are exact; the cylinder's normal
		// on a box comes from EPA but is snapped to the box's face, and its
		// depth lies on the flat part of the Minkowski difference (exact).
		tol = 1e-9
	)
	cyl := shapes.Cylinder{Radius: 0.3, HalfLength: 0.5}
	capsule := shapes.Capsule{Radius: 0.2, HalfLength: 0.6}
	side := mgl64.QuatRotate(math.Pi/2, vec3{1, 0, 0}) // axis along -y
	type tc struct {
		name  string
		shape shapes.Shape
		rot   shapes.Quat
		low   float64 // height of the lowest point above the centre
		want  func(c vec3) []vec3
	}
	rim := func(c vec3) []vec3 { return nil } // checked by radius below
	line := func(l float64) func(c vec3) []vec3 {
		return func(c vec3) []vec3 { return []vec3{{c[0], c[1] - l, 0}, {c[0], c[1] + l, 0}} }
	}
	cases := []tc{
		{"cylinder on cap", cyl, mgl64.QuatIdent(), cyl.HalfLength, rim},
		{"cylinder on side", cyl, side, cyl.Radius, line(cyl.HalfLength)},
		{"capsule lying", capsule, side, capsule.Radius, line(capsule.HalfLength)},
		{"sphere", shapes.Sphere{Radius: 0.4}, mgl64.QuatIdent(), 0.4, func(c vec3) []vec3 { return []vec3{{c[0], c[1], 0}} }},
	}
	d := NewDetector()
	for _, c := range cases {
		for _, sup := range []struct {
			name string
			s    shapes.Shape
			top  float64
		}{{"plane", shapes.Plane{Normal: vec3{0, 0, 1}, Offset: 0.25}, 0.25}, {"box", shapes.Box{Half: vec3{2, 2, 0.25}}, 0.25}} {
			t.Run(c.name+" on "+sup.name, func(t *testing.T) {
				center := vec3{0.1, 0.2, sup.top + c.low - pen}
				pose := shapes.Pose{Position: center, Orientation: c.rot}
				ms := d.Collide(nil, sup.s, shapes.IdentityPose, c.shape, pose, 0)
				if len(ms) != 1 {
					t.Fatalf("%d manifolds", len(ms))
				}
				m := ms[0]
				if m.Normal.Sub(vec3{0, 0, 1}).Len() > tol {
					t.Errorf("normal %v", m.Normal)
				}
				if w := c.want(center); w != nil {
					for i := range w {
						w[i][2] = sup.top - pen/2
					}
					matchPoints(t, m, w, -pen, tol)
					return
				}
				// A cap: four points on the rim, a support polygon around the axis.
				if m.Count != 4 {
					t.Fatalf("%d points, want 4", m.Count)
				}
				var angles []float64
				for i := 0; i < m.Count; i++ {
					p := m.Points[i]
					r := math.Hypot(p.Position[0]-center[0], p.Position[1]-center[1])
					if math.Abs(r-cyl.Radius) > tol || math.Abs(p.Separation+pen) > tol || math.Abs(p.Position[2]-(sup.top-pen/2)) > tol {
						t.Errorf("point %+v: radius %g", p, r)
					}
					angles = append(angles, math.Atan2(p.Position[1]-center[1], p.Position[0]-center[0]))
				}
				sort.Float64s(angles)
				for i := range angles {
					gap := angles[(i+1)%4] - angles[i]
					if i == 3 {
						gap += 2 * math.Pi
					}
					if math.Abs(gap-math.Pi/2) > 1e-9 {
						t.Errorf("rim points not a square: angles %v", angles)
					}
				}
			})
		}
	}
}

// TestTiltedCylinderPivot: a cylinder tilted past the flat tolerance keeps
// the exact deepest rim point (the pivot of tipping), on a plane and a box.
func TestTiltedCylinderPivot(t *testing.T) {
	const tol = 1e-9 // exact geometry, EPA normal snapped to the box face
	cyl := shapes.Cylinder{Radius: 0.3, HalfLength: 0.5}
	for _, tilt := range []float64{0.005, 0.05, 0.3} {
		q := mgl64.QuatRotate(tilt, vec3{1, 0, 0})
		pose := shapes.Pose{Orientation: q}
		// The lowest rim point: local (0, -r, -h) rotated about x by tilt.
		low := pose.Apply(vec3{0, -cyl.Radius, -cyl.HalfLength})
		pose.Position = vec3{0, 0, 1 - low[2] - 1e-3}
		want := pose.Apply(vec3{0, -cyl.Radius, -cyl.HalfLength}).Add(vec3{0, 0, 0.5e-3})
		for _, sup := range []shapes.Shape{shapes.Plane{Normal: vec3{0, 0, 1}, Offset: 1}, shapes.Box{Half: vec3{2, 2, 0.5}}} {
			p0 := shapes.IdentityPose
			if _, ok := sup.(shapes.Box); ok {
				p0 = at(0, 0, 0.5)
			}
			ms := NewDetector().Collide(nil, sup, p0, cyl, pose, 0)
			if len(ms) != 1 {
				t.Fatalf("tilt %g: %d manifolds", tilt, len(ms))
			}
			found := false
			for i := 0; i < ms[0].Count; i++ {
				p := ms[0].Points[i]
				if p.Position.Sub(want).Len() < tol && math.Abs(p.Separation+1e-3) < tol {
					found = true
				}
			}
			if !found {
				t.Errorf("tilt %g on %T: deepest rim point %v missing from %+v", tilt, sup, want, ms[0].Points[:ms[0].Count])
			}
		}
	}
}
