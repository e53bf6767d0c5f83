package bench

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
	"clatter/shapes/mesh"
)

func init() {
	Register(
		Benchmark{Name: "Hull10k", Fn: Hull10k},
		Benchmark{Name: "MeshMass100k", Fn: MeshMass100k},
	)
}

// Hull10k builds the convex hull (shapes.NewHull) of 10,000 points drawn
// uniformly from the unit ball with a fixed seed. Target: under 20 ms.
func Hull10k(b *testing.B) {
	rng := rand.New(rand.NewPCG(10_000, 0x4811))
	pts := make([]shapes.Vec3, 0, 10_000)
	for len(pts) < cap(pts) {
		p := shapes.Vec3{2*rng.Float64() - 1, 2*rng.Float64() - 1, 2*rng.Float64() - 1}
		if p.LenSqr() <= 1 { // rejection sampling: uniform in the ball
			pts = append(pts, p)
		}
	}
	b.ReportAllocs()
	var h *shapes.Hull
	for b.Loop() {
		var err error
		if h, err = shapes.NewHull(pts); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(len(h.Vertices)), "hull-verts")
}

// MeshMass100k computes the mass properties (mesh.Mesh.Mass: topology check
// and shapes.PolyhedronMass) of a closed UV sphere of 100,000 triangles.
// Target: under 10 ms.
func MeshMass100k(b *testing.B) {
	m, err := shapesUVSphere(250, 201, 0.05) // 2 * 250 * (201 - 1) triangles
	if err != nil {
		b.Fatal(err)
	}
	if len(m.Triangles) != 100_000 {
		b.Fatalf("%d triangles", len(m.Triangles))
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := m.Mass(1000); err != nil {
			b.Fatal(err)
		}
	}
}

// shapesUVSphere is a closed sphere of radius r: slices around the z axis,
// stacks from pole to pole, the pole rows fanned.
func shapesUVSphere(slices, stacks int, r float64) (*mesh.Mesh, error) {
	verts := []shapes.Vec3{{0, 0, r}, {0, 0, -r}}
	ring := func(j int) int32 { return int32(2 + (j-1)*slices) } // first vertex of ring j, 1 <= j < stacks
	for j := 1; j < stacks; j++ {
		th := math.Pi * float64(j) / float64(stacks)
		for i := 0; i < slices; i++ {
			ph := 2 * math.Pi * float64(i) / float64(slices)
			verts = append(verts, shapes.Vec3{r * math.Sin(th) * math.Cos(ph), r * math.Sin(th) * math.Sin(ph), r * math.Cos(th)})
		}
	}
	// Ring by ring, as a sphere is usually tessellated and exported, so that
	// consecutive triangles share vertices.
	tris := make([][3]int32, 0, 2*slices*(stacks-1))
	for i := 0; i < slices; i++ {
		tris = append(tris, [3]int32{0, ring(1) + int32(i), ring(1) + int32((i+1)%slices)})
	}
	for j := 1; j < stacks-1; j++ {
		for i := 0; i < slices; i++ {
			i1 := (i + 1) % slices
			a, c := ring(j)+int32(i), ring(j)+int32(i1)
			d, e := ring(j+1)+int32(i), ring(j+1)+int32(i1)
			tris = append(tris, [3]int32{a, d, e}, [3]int32{a, e, c})
		}
	}
	last := ring(stacks - 1)
	for i := 0; i < slices; i++ {
		tris = append(tris, [3]int32{1, last + int32((i+1)%slices), last + int32(i)})
	}
	return mesh.FromIndexed("uv sphere", verts, tris)
}
