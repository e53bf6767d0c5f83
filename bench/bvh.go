package bench

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/collide/bvh"
	"clatter/shapes"
)

func init() {
	Register(
		Benchmark{Name: "BVHBuild100k", Fn: BVHBuild100k},
		Benchmark{Name: "BVHQuery100k", Fn: BVHQuery100k, Baseline: "BVHQueryBrute100k"},
		Benchmark{Name: "BVHQueryBrute100k", Fn: BVHQueryBrute100k},
		Benchmark{Name: "BVHRay100k", Fn: BVHRay100k},
	)
}

// The benchmark mesh: a bumpy tray of 224 x 224 unit cells, two triangles
// each (100,352 triangles), and parts of size 1 to 2 resting on it.
const bvhCells = 224

func bvhHeight(x, y float64) float64 { return 0.5*math.Sin(0.31*x) + 0.4*math.Cos(0.23*y) }

func bvhMesh() *shapes.TriMesh {
	m := &shapes.TriMesh{}
	for j := 0; j <= bvhCells; j++ {
		for i := 0; i <= bvhCells; i++ {
			x, y := float64(i), float64(j)
			m.Vertices = append(m.Vertices, shapes.Vec3{x, y, bvhHeight(x, y)})
		}
	}
	at := func(i, j int) int32 { return int32(j*(bvhCells+1) + i) }
	for j := 0; j < bvhCells; j++ {
		for i := 0; i < bvhCells; i++ {
			m.Triangles = append(m.Triangles,
				[3]int32{at(i, j), at(i+1, j), at(i+1, j+1)},
				[3]int32{at(i, j), at(i+1, j+1), at(i, j+1)})
		}
	}
	return m
}

// bvhBoxes returns n part boxes (edges 1 to 2) resting on the surface at
// random places.
func bvhBoxes(n int) []shapes.AABB {
	rng := rand.New(rand.NewPCG(3, 0xb0c5))
	out := make([]shapes.AABB, n)
	for i := range out {
		x, y := rng.Float64()*bvhCells, rng.Float64()*bvhCells
		h := shapes.Vec3{0.5 + 0.5*rng.Float64(), 0.5 + 0.5*rng.Float64(), 0.5 + 0.5*rng.Float64()}
		c := shapes.Vec3{x, y, bvhHeight(x, y) + h[2]*0.9}
		out[i] = shapes.AABB{Min: c.Sub(h), Max: c.Add(h)}
	}
	return out
}

// BVHBuild100k measures building the hierarchy of the 100k-triangle tray.
func BVHBuild100k(b *testing.B) {
	m := bvhMesh()
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := bvh.Build(m); err != nil {
			b.Fatal(err)
		}
	}
}

// BVHQuery100k measures one box query (a part on the tray): ns/op is the
// time per query.
func BVHQuery100k(b *testing.B) {
	t, err := bvh.Build(bvhMesh())
	if err != nil {
		b.Fatal(err)
	}
	boxes := bvhBoxes(1024)
	dst := make([]int32, 0, 256)
	found := 0
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		dst = t.Query(dst[:0], boxes[i%len(boxes)])
		found += len(dst)
	}
	b.StopTimer() // ReportMetric allocates; keep it out of allocs/op
	b.ReportMetric(float64(found)/float64(b.N), "tris/query")
}

// BVHQueryBrute100k is BVHQuery100k by testing every triangle's box (the
// reference).
func BVHQueryBrute100k(b *testing.B) {
	m := bvhMesh()
	tri := make([]shapes.AABB, len(m.Triangles))
	for i := range tri {
		p, q, r := m.Triangle(i)
		tri[i] = shapes.EmptyAABB().Extend(p).Extend(q).Extend(r)
	}
	boxes := bvhBoxes(1024)
	dst := make([]int32, 0, 256)
	found := 0
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		box := boxes[i%len(boxes)]
		dst = dst[:0]
		for k := range tri {
			if tri[k].Overlaps(box) {
				dst = append(dst, int32(k))
			}
		}
		found += len(dst)
	}
	b.StopTimer() // ReportMetric allocates; keep it out of allocs/op
	b.ReportMetric(float64(found)/float64(b.N), "tris/query")
}

// BVHRay100k measures one ray cast down onto the tray from a random point
// above it, tilted up to 45 degrees.
func BVHRay100k(b *testing.B) {
	t, err := bvh.Build(bvhMesh())
	if err != nil {
		b.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(4, 0x4a7))
	type ray struct{ o, d shapes.Vec3 }
	rays := make([]ray, 1024)
	for i := range rays {
		rays[i] = ray{
			o: shapes.Vec3{rng.Float64() * bvhCells, rng.Float64() * bvhCells, 5},
			d: shapes.Vec3{rng.Float64() - 0.5, rng.Float64() - 0.5, -1},
		}
	}
	hits := 0
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		r := rays[i%len(rays)]
		if _, ok := t.Raycast(r.o, r.d, math.Inf(1)); ok {
			hits++
		}
	}
	b.StopTimer() // ReportMetric allocates; keep it out of allocs/op
	b.ReportMetric(float64(hits)/float64(b.N), "hits/ray")
}
