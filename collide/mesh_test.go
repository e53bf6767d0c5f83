package collide

import (
	"math"
	"sort"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// gridMesh tessellates the square [-half, half]^2 into n x n cells of two
// triangles each, the diagonals alternating, counter-clockwise seen from +z,
// at height h(x, y).
func gridMesh(n int, half float64, h func(x, y float64) float64) *shapes.TriMesh {
	m := &shapes.TriMesh{}
	cell := 2 * half / float64(n)
	for j := 0; j <= n; j++ {
		for i := 0; i <= n; i++ {
			x, y := -half+cell*float64(i), -half+cell*float64(j)
			m.Vertices = append(m.Vertices, vec3{x, y, h(x, y)})
		}
	}
	at := func(i, j int) int32 { return int32(j*(n+1) + i) }
	for j := 0; j < n; j++ {
		for i := 0; i < n; i++ {
			if (i+j)%2 == 0 {
				m.Triangles = append(m.Triangles, [3]int32{at(i, j), at(i+1, j), at(i+1, j+1)}, [3]int32{at(i, j), at(i+1, j+1), at(i, j+1)})
			} else {
				m.Triangles = append(m.Triangles, [3]int32{at(i, j), at(i+1, j), at(i, j+1)}, [3]int32{at(i+1, j), at(i+1, j+1), at(i, j+1)})
			}
		}
	}
	return m
}

func flatZero(x, y float64) float64 { return 0 }

type sortedPoint struct {
	p   vec3
	sep float64
}

func manifoldPoints(ms []Manifold) []sortedPoint {
	var out []sortedPoint
	for _, m := range ms {
		for i := 0; i < m.Count; i++ {
			out = append(out, sortedPoint{m.Points[i].Position, m.Points[i].Separation})
		}
	}
	sort.Slice(out, func(i, j int) bool {
		for k := 0; k < 3; k++ {
			if math.Abs(out[i].p[k]-out[j].p[k]) > 1e-9 {
				return out[i].p[k] < out[j].p[k]
			}
		}
		return false
	})
	return out
}

// TestMeshFlatMatchesPlane slides and turns parts over a flat of 200
// triangles: each contact must be the one the analytic plane gives, normal
// exactly the face normal, the same points and separations (the reference
// is the plane path, whose vertex heights are exact).
func TestMeshFlatMatchesPlane(t *testing.T) {
	const (
		// tol: both paths compute the same vertex heights; only the order
		// of operations differs.
		tol = 1e-12
	)
	for _, cells := range []int{10, 40} {
		// 0.2 m cells, larger than most parts, and 5 cm cells, smaller.
		testMeshFlatMatchesPlane(t, cells, tol)
	}
}

func testMeshFlatMatchesPlane(t *testing.T, cells int, tol float64) {
	tri := gridMesh(cells, 1, flatZero)
	if len(tri.Triangles) != 2*cells*cells {
		t.Fatalf("%d triangles", len(tri.Triangles))
	}
	mesh := NewMesh(tri)
	floor := shapes.Plane{Normal: vec3{0, 0, 1}}
	up := vec3{0, 0, 1}
	parts := []struct {
		name  string
		s     shapes.Shape
		low   float64 // lowest point below the centre, untilted
		tilts []float64
	}{
		{"small box", shapes.Box{Half: vec3{0.07, 0.05, 0.03}}, 0.03, []float64{0, 0.01}},
		{"large box", shapes.Box{Half: vec3{0.35, 0.25, 0.1}}, 0.1, []float64{0, 0.02}},
		{"hull", prismHull(t, 6, 0.12, 0.05), 0.05, []float64{0, 0.03}},
		{"sphere", shapes.Sphere{Radius: 0.1}, 0.1, []float64{0}},
		{"capsule", shapes.Capsule{Radius: 0.05, HalfLength: 0.2}, 0.05, nil},
		{"cylinder cap", shapes.Cylinder{Radius: 0.15, HalfLength: 0.1}, 0.1, []float64{0, 0.05}},
	}
	d := NewDetector()
	checked := 0
	for _, part := range parts {
		tilts := part.tilts
		base := mgl64.QuatIdent()
		if part.name == "capsule" {
			base = mgl64.QuatRotate(math.Pi/2, vec3{1, 0, 0}) // lying down
			tilts = []float64{0}
		}
		for _, tilt := range tilts {
			for _, yaw := range []float64{0, 0.37, math.Pi / 4} {
				for x := -0.5; x <= 0.5; x += 0.0731 {
					q := mgl64.QuatRotate(yaw, up).Mul(mgl64.QuatRotate(tilt, vec3{1, 0, 0})).Mul(base)
					pose := shapes.Pose{Position: vec3{x, 0.37 * x, 0}, Orientation: q}
					// Rest the part 1e-3 deep on the surface.
					var v view
					v.setConvex(part.s, shapes.RotationMatrix(q), vec3{})
					pose.Position[2] = -v.supportFull(vec3{0, 0, -1})[2] - 1e-3
					for _, margin := range []float64{0, 0.01} {
						pm := d.Collide(nil, floor, shapes.IdentityPose, part.s, pose, margin)
						mm := d.Collide(nil, mesh, shapes.IdentityPose, part.s, pose, margin)
						if len(pm) != 1 || len(mm) != 1 {
							t.Fatalf("%s x=%g yaw=%g tilt=%g: %d plane and %d mesh manifolds", part.name, x, yaw, tilt, len(pm), len(mm))
						}
						if mm[0].Normal != up {
							t.Errorf("%s x=%g yaw=%g tilt=%g: mesh normal %v, want exactly %v", part.name, x, yaw, tilt, mm[0].Normal, up)
						}
						pp, mp := manifoldPoints(pm), manifoldPoints(mm)
						if len(pp) != len(mp) {
							t.Errorf("%s x=%g yaw=%g tilt=%g margin %g: %d plane points, %d mesh points\nplane %+v\nmesh  %+v", part.name, x, yaw, tilt, margin, len(pp), len(mp), pp, mp)
							continue
						}
						for i := range pp {
							if pp[i].p.Sub(mp[i].p).Len() > tol || math.Abs(pp[i].sep-mp[i].sep) > tol {
								t.Errorf("%s x=%g yaw=%g tilt=%g: point %d plane %+v mesh %+v", part.name, x, yaw, tilt, i, pp[i], mp[i])
							}
						}
						// The same with the mesh as B: normal reversed.
						mb := d.Collide(nil, part.s, pose, mesh, shapes.IdentityPose, margin)
						if len(mb) != 1 || mb[0].Normal != up.Mul(-1) || mb[0].Count != mm[0].Count {
							t.Errorf("%s: mesh as B: %+v", part.name, mb)
						}
						checked++
					}
				}
			}
		}
	}
	t.Logf("%d poses compared", checked)
}

// TestMeshInternalEdges checks the correction at each kind of edge: on a
// ridge (convex) a normal between the two faces is kept, in a valley
// (concave) each face keeps its own normal, at a free boundary the edge
// normal is kept.
func TestMeshInternalEdges(t *testing.T) {
	const tol = 1e-12 // exact closest-point geometry
	slope := 0.3
	// Roof: z = -slope |x| over [-1, 1]^2 (a ridge along y at x = 0).
	roof := NewMesh(gridMesh(2, 1, func(x, y float64) float64 { return -slope * math.Abs(x) }))
	valley := NewMesh(gridMesh(2, 1, func(x, y float64) float64 { return slope * math.Abs(x) }))
	ball := shapes.Sphere{Radius: 0.2}
	d := NewDetector()

	// A ball straight over the ridge touches the ridge line: normal +z,
	// which lies between the two face normals (valid on a convex edge).
	ms := d.Collide(nil, roof, shapes.IdentityPose, ball, at(0, 0.1, 0.19), 0)
	if len(ms) != 1 || ms[0].Normal.Sub(vec3{0, 0, 1}).Len() > tol || math.Abs(ms[0].Points[0].Separation+0.01) > tol {
		t.Errorf("ball on ridge: %+v", ms)
	}
	// Over the valley's fold the ball touches both faces: two manifolds
	// with the two face normals (-slope, 0, 1) and (slope, 0, 1) normalised,
	// depth from the plane distance r - (z0 cos(a)) ... computed directly.
	z0 := 0.2/math.Cos(math.Atan(slope)) - 0.01
	ms = d.Collide(nil, valley, shapes.IdentityPose, ball, at(0, 0.1, z0), 0)
	if len(ms) != 2 {
		t.Fatalf("ball in valley: %d manifolds %+v", len(ms), ms)
	}
	c := 1 / math.Sqrt(1+slope*slope)
	for _, m := range ms {
		wantX := slope * c
		if m.Normal[0] <= 0 {
			wantX = -slope * c
		}
		if math.Abs(m.Normal[0]-wantX) > tol || math.Abs(m.Normal[2]-c) > tol {
			t.Errorf("valley normal %v", m.Normal)
		}
		// Plane distance of the centre: z0 cos(a) for both faces.
		if want := z0*c - 0.2; math.Abs(m.Points[0].Separation-want) > tol {
			t.Errorf("valley separation %g, want %g", m.Points[0].Separation, want)
		}
	}
	// A single triangle: a ball beside its free edge keeps the edge normal.
	one := NewMesh(&shapes.TriMesh{Vertices: []vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}}, Triangles: [][3]int32{{0, 1, 2}}})
	dir := vec3{0, -1, 1}.Normalize()
	ms = d.Collide(nil, one, shapes.IdentityPose, ball, shapes.Pose{Position: vec3{0.3, 0, 0}.Add(dir.Mul(0.19)), Orientation: mgl64.QuatIdent()}, 0)
	if len(ms) != 1 || ms[0].Normal.Sub(dir).Len() > tol || math.Abs(ms[0].Points[0].Separation+0.01) > tol {
		t.Errorf("ball at a free edge: %+v", ms)
	}
	// A box edge lying along the ridge: the box's own face normal (tilted
	// between the two roof faces) is kept, one manifold on the ridge edge.
	box := shapes.Box{Half: vec3{0.2, 0.2, 0.2}}
	q := mgl64.QuatRotate(math.Pi/4, vec3{0, 1, 0})
	ms = d.Collide(nil, roof, shapes.IdentityPose, box, shapes.Pose{Position: vec3{0, 0, 0.2*math.Sqrt2 - 0.005}, Orientation: q}, 0)
	if len(ms) == 0 {
		t.Fatal("box on ridge: no contact")
	}
	for _, m := range ms {
		if m.Normal[2] < 0.9 || m.Count < 1 {
			t.Errorf("box on ridge: %+v", m)
		}
	}
}

// TestMeshBadTriangles: out-of-range indices and zero-area triangles are
// skipped, not fatal.
func TestMeshBadTriangles(t *testing.T) {
	tri := &shapes.TriMesh{
		Vertices:  []vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {2, 0, 0}, {math.NaN(), 0, 0}},
		Triangles: [][3]int32{{0, 1, 2}, {0, 1, 3}, {0, 1, 9}, {0, 4, 2}, {-1, 0, 1}},
	}
	m := NewMesh(tri)
	if m.Skipped() != 4 {
		t.Errorf("skipped %d, want 4", m.Skipped())
	}
	ms := NewDetector().Collide(nil, m, shapes.IdentityPose, shapes.Sphere{Radius: 0.1}, at(0.2, 0.2, 0.05), 0)
	if len(ms) != 1 || ms[0].SubA != 0 {
		t.Errorf("contact with the one good triangle: %+v", ms)
	}
	if NewMesh(nil).Bounds().Overlaps(shapes.AABB{}) {
		t.Error("an empty mesh has empty bounds")
	}
}

// TestMeshSlideIDs: a box sliding across the tessellated flat keeps one
// manifold with the same name and the same four point ids (its corners), so
// warm starting carries over as the corners cross triangle edges.
func TestMeshSlideIDs(t *testing.T) {
	mesh := NewMesh(gridMesh(10, 1, flatZero))
	box := shapes.Box{Half: vec3{0.15, 0.1, 0.05}}
	d := NewDetector()
	q := mgl64.QuatRotate(0.3, vec3{0, 0, 1})
	var ref []uint64
	for x := -0.6; x <= 0.6; x += 0.0123 {
		ms := d.Collide(nil, mesh, shapes.IdentityPose, box, shapes.Pose{Position: vec3{x, 0.1, 0.049}, Orientation: q}, 0.002)
		got := idSet(ms)
		if len(ms) != 1 || len(got) != 4 {
			t.Fatalf("x=%g: %d manifolds, ids %x", x, len(ms), got)
		}
		if ref == nil {
			ref = got
		} else if !sameIDs(got, ref) {
			t.Fatalf("x=%g: ids %x, want %x", x, got, ref)
		}
	}
}
