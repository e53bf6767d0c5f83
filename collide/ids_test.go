package collide

import (
	"math"
	"math/rand"
	"sort"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

func idSet(ms []Manifold) []uint64 {
	var out []uint64
	for _, m := range ms {
		for i := 0; i < m.Count; i++ {
			out = append(out, uint64(m.SubA)<<48|uint64(m.SubB)<<32|uint64(m.Points[i].ID))
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i] < out[j] })
	return out
}

func sameIDs(a, b []uint64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// jitter moves a pose by about eps: a translation of that size and a
// rotation by that angle about a random axis.
func jitter(p shapes.Pose, rng *rand.Rand, eps float64) shapes.Pose {
	dir, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
	ax, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
	return shapes.Pose{Position: p.Position.Add(dir.Mul(eps)), Orientation: mgl64.QuatRotate(eps, ax).Mul(p.Orientation).Normalize()}
}

// TestFeatureIDsStable: small motions (1e-6 of the part size, far below a
// step's motion of a resting part being corrected) keep every id, so warm
// starting carries the impulses; moving onto other features changes them.
func TestFeatureIDsStable(t *testing.T) {
	const eps = 1e-6
	table := shapes.Box{Half: vec3{2, 2, 0.5}}
	floor := shapes.Plane{Normal: vec3{0, 0, 1}, Offset: 0.5}
	flatMesh := NewMesh(gridMesh(8, 2, func(x, y float64) float64 { return 0.5 }))
	part := shapes.Box{Half: vec3{0.3, 0.2, 0.1}}
	hull := prismHull(t, 6, 0.3, 0.1)
	cyl := shapes.Cylinder{Radius: 0.25, HalfLength: 0.1}
	capsule := shapes.Capsule{Radius: 0.1, HalfLength: 0.3}
	lying := mgl64.QuatRotate(math.Pi/2, vec3{1, 0, 0})
	upsideDown := mgl64.QuatRotate(math.Pi, vec3{1, 0, 0}) // the opposite face (no shared vertex) down
	yaw := mgl64.QuatRotate(0.3, vec3{0, 0, 1})
	type tc struct {
		name    string
		support shapes.Shape
		s       shapes.Shape
		q, q2   shapes.Quat // resting orientation, and one on other features
		low     float64     // depth of the lowest point below the centre for q
		low2    float64
	}
	cases := []tc{
		{"box on box", table, part, yaw, yaw.Mul(upsideDown), 0.1, 0.1},
		{"box on plane", floor, part, yaw, yaw.Mul(upsideDown), 0.1, 0.1},
		{"box on mesh", flatMesh, part, yaw, yaw.Mul(upsideDown), 0.1, 0.1},
		{"hull on box", table, hull, yaw, yaw.Mul(mgl64.QuatRotate(math.Pi/2, vec3{0, 1, 0})), 0.1, 0.3},
		{"hull on plane", floor, hull, yaw, yaw.Mul(mgl64.QuatRotate(math.Pi/2, vec3{0, 1, 0})), 0.1, 0.3},
		{"cylinder on plane", floor, cyl, yaw, yaw.Mul(lying), 0.1, 0.25},
		{"cylinder on box", table, cyl, yaw, yaw.Mul(lying), 0.1, 0.25},
		{"cylinder on mesh", flatMesh, cyl, yaw, yaw.Mul(lying), 0.1, 0.25},
		{"capsule on box", table, capsule, yaw.Mul(lying), yaw, 0.1, 0.4},
		{"capsule on mesh", flatMesh, capsule, yaw.Mul(lying), yaw, 0.1, 0.4},
	}
	rng := rand.New(rand.NewSource(7))
	d := NewDetector()
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			pose := shapes.Pose{Position: vec3{0.13, -0.07, 0.5 + c.low - 1e-3}, Orientation: c.q}
			ref := idSet(d.Collide(nil, c.support, shapes.IdentityPose, c.s, pose, 0.002))
			if len(ref) == 0 {
				t.Fatal("no contact")
			}
			for k := 0; k < 20; k++ {
				got := idSet(d.Collide(nil, c.support, shapes.IdentityPose, c.s, jitter(pose, rng, eps), 0.002))
				if !sameIDs(got, ref) {
					t.Fatalf("jitter %d: ids %x, want %x", k, got, ref)
				}
			}
			other := shapes.Pose{Position: vec3{0.13, -0.07, 0.5 + c.low2 - 1e-3}, Orientation: c.q2}
			got := idSet(d.Collide(nil, c.support, shapes.IdentityPose, c.s, other, 0.002))
			if len(got) == 0 {
				t.Fatal("no contact on the other features")
			}
			for _, a := range got {
				for _, b := range ref {
					if a == b {
						t.Errorf("id %x shared by contacts on different features", a)
					}
				}
			}
		})
	}
}
