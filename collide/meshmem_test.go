package collide

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"clatter/shapes"
)

// bruteCandidates is the reference of the mesh memory: every valid
// triangle whose bounds overlap q, by a plain loop over the mesh.
func bruteCandidates(m *Mesh, q shapes.AABB) []int32 {
	var out []int32
	for i := range m.tri.Triangles {
		if m.normals[i] == (vec3{}) {
			continue
		}
		a, b, c := m.tri.Triangle(i)
		if shapes.EmptyAABB().Extend(a).Extend(b).Extend(c).Overlaps(q) {
			out = append(out, int32(i))
		}
	}
	return out
}

// TestMeshMemoryExact: the remembered candidate lists give, query by query,
// exactly the triangles (and order) of a brute-force loop, for parts that
// creep (served from memory), jump (refilled) and interleave, on a mesh with
// skipped triangles (remapped indices).
func TestMeshMemoryExact(t *testing.T) {
	tm := gridMesh(40, 1, func(x, y float64) float64 { return 0.05 * math.Sin(3*x) * math.Cos(2*y) })
	tm.Triangles = append(tm.Triangles, [3]int32{0, 0, 1}) // no area: skipped
	tm.Triangles = append([][3]int32{{0, 1, 1}}, tm.Triangles...)
	m := NewMesh(tm)
	if m.Skipped() != 2 {
		t.Fatalf("skipped %d triangles, want 2", m.Skipped())
	}
	rng := rand.New(rand.NewPCG(3, 5))
	const parts = 7
	var pos [parts]vec3
	for i := range pos {
		pos[i] = vec3{2*rng.Float64() - 1, 2*rng.Float64() - 1, 0}
	}
	var mm meshMemory
	var got []int32
	for step := 0; step < 300; step++ {
		for i := range pos {
			switch {
			case rng.IntN(20) == 0: // a jump: the memory must refill
				pos[i] = vec3{2*rng.Float64() - 1, 2*rng.Float64() - 1, 0}
			default: // a creep of about a millimetre
				pos[i] = pos[i].Add(vec3{0.002 * rng.NormFloat64(), 0.002 * rng.NormFloat64(), 0.001 * rng.NormFloat64()})
			}
			h := vec3{0.05, 0.04, 0.03}
			q := shapes.AABB{Min: pos[i].Sub(h), Max: pos[i].Add(h)}
			got = mm.candidates(m, q, got[:0])
			if want := bruteCandidates(m, q); !slices.Equal(got, want) {
				t.Fatalf("step %d part %d: memory gave %v, brute force %v", step, i, got, want)
			}
		}
	}
	// About one jump in 20 refills; creeping parts leave their box now and then.
	if q := int(mm.clock); mm.fills > q/5 {
		t.Errorf("%d of %d queries walked the hierarchy: the memory is not used", mm.fills, q)
	}
	if len(mm.entries) > 4*parts {
		t.Errorf("%d entries for %d parts: stale entries are not reused", len(mm.entries), parts)
	}
}
