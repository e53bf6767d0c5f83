package shapes_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
	"clatter/testdata/gen/partgen"
)

// The support search against a brute-force scan over every vertex: the
// scan is the reference, and the values must agree exactly (the two compute
// the same dot products, so any difference is a vertex the search missed),
// except along face normals, where a face's corners tie to within rounding.

// tieTol is how far, as a fraction of the largest |v| times |d|, the value
// along a face normal may fall short of the scan's: the corners of a face
// square to d differ only by the rounding of a three-term dot product, a
// few units of 2^-53 (Higham, "Accuracy and Stability of Numerical
// Algorithms", 2nd ed., SIAM 2002, section 3.1: |error| <= 3u/(1-3u) sum
// |d_i v_i|); 16 units leave room.
const tieTol = 16 * 0x1p-53

func meshHull(t *testing.T, m *partgen.Mesh, scale float64) *shapes.Hull {
	t.Helper()
	pts := make([]shapes.Vec3, len(m.V))
	for i, p := range m.V {
		pts[i] = shapes.Vec3{p[0], p[1], p[2]}.Mul(scale)
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	return h
}

// ballHull is the hull of n seeded points on an ellipsoid: all of them are
// corners, so the hull has about n vertices.
func ballHull(t *testing.T, n int) *shapes.Hull {
	t.Helper()
	rng := rand.New(rand.NewPCG(12, 5))
	pts := make([]shapes.Vec3, n)
	for i := range pts {
		d := shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
		pts[i] = shapes.Vec3{0.05 * d[0], 0.03 * d[1], 0.02 * d[2]}
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	return h
}

func scanMax(h *shapes.Hull, d shapes.Vec3) float64 {
	best := math.Inf(-1)
	for _, v := range h.Vertices {
		best = math.Max(best, v.Dot(d))
	}
	return best
}

// directions returns n seeded random unit directions followed by the
// directions that make ties: the axes, and the normals of up to 500 faces of
// h, spread over its list (a whole face is then farthest, up to rounding).
func directions(h *shapes.Hull, n int) (ds []shapes.Vec3, random int) {
	rng := rand.New(rand.NewPCG(3, 9))
	for i := 0; i < n; i++ {
		ds = append(ds, shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize())
	}
	for k := 0; k < 3; k++ {
		var e shapes.Vec3
		e[k] = 1
		ds = append(ds, e, e.Mul(-1))
	}
	step := max(1, len(h.Faces)/500)
	for i := 0; i < len(h.Faces); i += step {
		ds = append(ds, h.Faces[i].Normal)
	}
	return ds, n
}

func TestSupportMatchesScan(t *testing.T) {
	cases := []struct {
		name string
		hull func(t *testing.T) *shapes.Hull
		long bool // a slow case: skipped by -short, fewer directions
	}{
		// The case: the UV sphere whose merged polar faces once
		// stopped the climb on the wrong side of the ball.
		{"UV sphere 100 x 100, r 10 mm", func(t *testing.T) *shapes.Hull { return meshHull(t, partgen.UVSphere(100, 100, 10), 1e-3) }, false},
		{"UV sphere 40 x 40, r 1 km", func(t *testing.T) *shapes.Hull { return meshHull(t, partgen.UVSphere(40, 40, 1e3), 1) }, false},
		{"filleted cylinder 128 columns", func(t *testing.T) *shapes.Hull {
			return meshHull(t, partgen.FilletCylinder(128, 10, 30, 2, 12), 1e-3)
		}, false},
		{"moulded cap", func(t *testing.T) *shapes.Hull { return meshHull(t, partgen.Cap(), 1e-3) }, false},
		{"2000 points on an ellipsoid", func(t *testing.T) *shapes.Hull { return ballHull(t, 2000) }, false},
		{"100k points on an ellipsoid", func(t *testing.T) *shapes.Hull { return ballHull(t, 100000) }, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if c.long && testing.Short() {
				t.Skip("builds a 100k-vertex hull")
			}
			h := c.hull(t)
			n := 3000
			if c.long {
				n = 300
			}
			reach := 0.0
			for _, v := range h.Vertices {
				reach = math.Max(reach, v.Len())
			}
			rng := rand.New(rand.NewPCG(4, 4))
			ds, random := directions(h, n)
			for i, d := range ds {
				want := scanMax(h, d)
				tol := 0.0 // random directions: exact
				if i >= random {
					tol = tieTol * reach * d.Len()
				}
				if got := h.Vertices[h.SupportIndex(d)].Dot(d); !(want-got <= tol) {
					t.Fatalf("direction %d %v: SupportIndex gives %.17g, scan %.17g (short by %g)", i, d, got, want, want-got)
				}
				start := rng.IntN(len(h.Vertices))
				if got := h.Vertices[h.SupportFrom(d, start)].Dot(d); !(want-got <= tol) {
					t.Fatalf("direction %d %v from vertex %d: SupportFrom gives %.17g, scan %.17g", i, d, start, got, want)
				}
			}
		})
	}
}

// TestAdjacentComplete checks the climbing graph against the polygon faces:
// every polygon edge is in it, it is symmetric, and it is connected (a
// graph in which a climb can reach every vertex).
func TestAdjacentComplete(t *testing.T) {
	h := meshHull(t, partgen.UVSphere(100, 100, 10), 1e-3)
	has := func(i int, j int32) bool {
		for _, k := range h.Adjacent(i) {
			if k == j {
				return true
			}
		}
		return false
	}
	for _, e := range h.Edges {
		if !has(int(e.V[0]), e.V[1]) || !has(int(e.V[1]), e.V[0]) {
			t.Fatalf("polygon edge %v missing from Adjacent", e.V)
		}
	}
	seen := make([]bool, len(h.Vertices))
	stack := []int32{0}
	seen[0] = true
	count := 1
	for len(stack) > 0 {
		i := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for _, j := range h.Adjacent(int(i)) {
			if !has(int(j), i) {
				t.Fatalf("Adjacent not symmetric: %d -> %d", i, j)
			}
			if !seen[j] {
				seen[j] = true
				count++
				stack = append(stack, j)
			}
		}
	}
	if count != len(h.Vertices) {
		t.Fatalf("Adjacent reaches %d of %d vertices", count, len(h.Vertices))
	}
}
