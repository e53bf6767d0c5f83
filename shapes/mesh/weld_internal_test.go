package mesh

import (
	"bytes"
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
)

// weldBrute is the reference for weld: the same rule (each point joins the
// nearest earlier vertex within tol, the lowest index on a tie, else becomes
// a vertex) by comparing with every vertex.
func weldBrute(pts []shapes.Vec3, tol float64) (verts []shapes.Vec3, remap []int32) {
	remap = make([]int32, len(pts))
	for i, p := range pts {
		best, bestD := int32(-1), math.Inf(1)
		for v, q := range verts {
			d := q.Sub(p).LenSqr()
			if d <= tol*tol && d < bestD {
				best, bestD = int32(v), d
			}
		}
		if best < 0 {
			best = int32(len(verts))
			verts = append(verts, p)
		}
		remap[i] = best
	}
	return verts, remap
}

// TestWeldMatchesBruteForce welds clusters of points whose copies lie
// within, near and beyond the tolerance of each other, including across
// grid-cell boundaries, and compares with the brute-force reference.
func TestWeldMatchesBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for trial := 0; trial < 40; trial++ {
		var pts []shapes.Vec3
		// Bounds fixed by two far corners, so the tolerance is known.
		pts = append(pts, shapes.Vec3{0, 0, 0}, shapes.Vec3{1, 1, 1})
		tol := WeldTolerance * math.Sqrt(3)
		for c := 0; c < 300; c++ {
			centre := shapes.Vec3{rng.Float64(), rng.Float64(), rng.Float64()}
			if c%3 == 0 {
				// Snap to a multiple of the cell width: copies straddle cells.
				w := weldCell * tol
				for k := range centre {
					centre[k] = math.Round(centre[k]/w) * w
				}
			}
			copies := 1 + rng.IntN(6)
			for j := 0; j < copies; j++ {
				spread := tol * []float64{0, 0.3, 0.9, 1.5, 3}[rng.IntN(5)]
				d := shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize().Mul(spread * rng.Float64())
				pts = append(pts, centre.Add(d))
			}
		}
		coords := make([]float64, 0, 3*len(pts))
		for _, p := range pts {
			coords = append(coords, p[0], p[1], p[2])
		}
		verts, remap, gotTol := weld(coords, 1, WeldTolerance)
		if math.Abs(gotTol-tol) > 1e-15 {
			t.Fatalf("tolerance %g, want %g", gotTol, tol)
		}
		wantVerts, wantRemap := weldBrute(pts, tol)
		if len(verts) != len(wantVerts) {
			t.Fatalf("trial %d: %d vertices, brute force %d", trial, len(verts), len(wantVerts))
		}
		for i := range remap {
			if remap[i] != wantRemap[i] {
				t.Fatalf("trial %d: point %d -> %d, brute force %d", trial, i, remap[i], wantRemap[i])
			}
		}
	}
}

// TestWeldScale: coordinates are multiplied by the unit before welding, and
// the tolerance follows the scaled size.
func TestWeldScale(t *testing.T) {
	coords := []float32{0, 0, 0, 1000, 0, 0, 1000, 1e-4, 0, 0, 1000, 0}
	verts, remap, tol := weld(coords, 1e-3, WeldTolerance)
	// 1e-4 mm apart is 1e-7 of the 1414 mm diagonal: merged.
	if len(verts) != 3 || remap[2] != remap[1] {
		t.Fatalf("got %d vertices, remap %v", len(verts), remap)
	}
	if want := WeldTolerance * math.Sqrt2; math.Abs(tol-want) > 1e-9*want {
		t.Fatalf("tolerance %g m, want %g m", tol, want)
	}
	if verts[1] != (shapes.Vec3{1, 0, 0}) {
		t.Fatalf("vertex %v, want (1, 0, 0) m", verts[1])
	}
}

// topologyBrute counts edge uses with a map, the reference for Topology.
func topologyBrute(tris [][3]int32) Topology {
	type edge struct{ a, b int32 }
	fwd := map[edge]int{}
	for _, t := range tris {
		for e := 0; e < 3; e++ {
			fwd[edge{t[e], t[(e+1)%3]}]++
		}
	}
	var top Topology
	seen := map[edge]bool{}
	for e := range fwd {
		k := edge{min(e.a, e.b), max(e.a, e.b)}
		if seen[k] {
			continue
		}
		seen[k] = true
		f, r := fwd[edge{k.a, k.b}], fwd[edge{k.b, k.a}]
		top.Edges++
		if f+r == 1 {
			top.Boundary++
		} else if f != r {
			top.Misoriented++
		}
		if f+r > 2 {
			top.NonManifold++
		}
	}
	return top
}

// TestTopologyMatchesBruteForce: random meshes over few vertices (many
// shared and repeated edges, buckets of every size: the few-vertex cases
// put hundreds of edges on one vertex).
func TestTopologyMatchesBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	for _, c := range []struct{ verts, tris int }{{6, 10}, {20, 200}, {50, 3000}, {2000, 40000}} {
		m := &Mesh{Vertices: make([]shapes.Vec3, c.verts)}
		for len(m.Triangles) < c.tris {
			a, b, d := int32(rng.IntN(c.verts)), int32(rng.IntN(c.verts)), int32(rng.IntN(c.verts))
			if a != b && b != d && d != a {
				m.Triangles = append(m.Triangles, [3]int32{a, b, d})
			}
		}
		got, want := m.Topology(), topologyBrute(m.Triangles)
		if got != want {
			t.Errorf("%d triangles over %d vertices: %+v, brute force %+v", c.tris, c.verts, got, want)
		}
	}
}

// TestCountWord counts occurrences placed across the 64 KiB block ends,
// against bytes.Count over the whole input.
func TestCountWord(t *testing.T) {
	for _, at := range []int{0, 1<<16 - 8, 1<<16 - 4, 1<<16 - 1, 1 << 16, 2<<16 - 3, 3 << 16} {
		data := bytes.Repeat([]byte("x"), 3<<16+20)
		copy(data[at:], "endsolid")
		copy(data[100:], "endsolid")
		got, err := countWord(bytes.NewReader(data), "endsolid")
		if want := bytes.Count(data, []byte("endsolid")); err != nil || got != want {
			t.Errorf("word at %d: counted %d (%v), want %d", at, got, err, want)
		}
	}
}
