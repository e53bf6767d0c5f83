package shapes

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

// hullCheckTol is the tolerance of the brute-force hull checks: the hull
// drops points within hullPlaneTol (1e-7 of the size) of a face, and merged
// faces may tilt by up to hullMergeTol; 1e-5 of the size bounds both.
const hullCheckTol = 1e-5

// checkHull verifies a hull against its input by brute force: every input
// point on or inside every face plane, every hull vertex an input point,
// Euler's formula V - E + F = 2 for a convex polyhedron (Euler 1758; any
// topology text), outward normals, every edge between two distinct faces.
func checkHull(t *testing.T, pts []Vec3, h *Hull) {
	t.Helper()
	tol := hullCheckTol * h.Size()
	for fi, f := range h.Faces {
		if math.Abs(f.Normal.Len()-1) > 1e-9 {
			t.Fatalf("face %d normal not unit: %v", fi, f.Normal)
		}
		for _, p := range pts {
			if d := f.Normal.Dot(p) - f.Offset; d > tol {
				t.Fatalf("point %v lies %g outside face %d", p, d, fi)
			}
		}
		for _, v := range f.Verts {
			if d := math.Abs(f.Normal.Dot(h.Vertices[v]) - f.Offset); d > tol {
				t.Fatalf("face %d vertex %d off its plane by %g", fi, v, d)
			}
		}
		// Counter-clockwise seen from outside: Newell normal agrees.
		var nn Vec3
		for i := range f.Verts {
			a, b := h.Vertices[f.Verts[i]], h.Vertices[f.Verts[(i+1)%len(f.Verts)]]
			nn = nn.Add(a.Cross(b))
		}
		if nn.Dot(f.Normal) <= 0 {
			t.Fatalf("face %d winds clockwise", fi)
		}
	}
	for vi, v := range h.Vertices {
		found := false
		for _, p := range pts {
			if p == v {
				found = true
				break
			}
		}
		if !found {
			t.Fatalf("hull vertex %d %v is not an input point", vi, v)
		}
	}
	if x := len(h.Vertices) - len(h.Edges) + len(h.Faces); x != 2 {
		t.Fatalf("V - E + F = %d - %d + %d = %d, want 2", len(h.Vertices), len(h.Edges), len(h.Faces), x)
	}
	for ei, e := range h.Edges {
		if e.F[0] < 0 || e.F[1] < 0 || e.F[0] == e.F[1] {
			t.Fatalf("edge %d has faces %v", ei, e.F)
		}
	}
}

func TestHullRandomPoints(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 200; trial++ {
		n := 4 + rng.IntN(300)
		scale := math.Pow(10, float64(rng.IntN(9)-4)) // 1e-4 .. 1e4: tolerances are relative
		off := Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(scale * 100)
		pts := make([]Vec3, n)
		for i := range pts {
			pts[i] = Vec3{rng.Float64(), rng.Float64(), rng.Float64()}.Mul(scale).Add(off)
		}
		h, err := NewHull(pts)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		checkHull(t, pts, h)
	}
}

func TestHullSpherePoints(t *testing.T) {
	// Points on a sphere are all hull vertices (in general position, each
	// face a triangle): V = n and F = 2V - 4 for a triangulated sphere.
	rng := rand.New(rand.NewPCG(3, 4))
	pts := make([]Vec3, 500)
	for i := range pts {
		pts[i] = Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
	}
	h, err := NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	checkHull(t, pts, h)
	if len(h.Vertices) != len(pts) || len(h.Faces) != 2*len(pts)-4 {
		t.Fatalf("V=%d F=%d, want %d and %d", len(h.Vertices), len(h.Faces), len(pts), 2*len(pts)-4)
	}
}

// boxCloud returns the corners of a box plus points on its faces, edges and
// inside, with duplicates and near-coplanar noise of relative size noise.
func boxCloud(rng *rand.Rand, half Vec3, noise float64) []Vec3 {
	var pts []Vec3
	for _, sx := range []float64{-1, 1} {
		for _, sy := range []float64{-1, 1} {
			for _, sz := range []float64{-1, 1} {
				c := Vec3{sx * half[0], sy * half[1], sz * half[2]}
				pts = append(pts, c, c) // duplicate corners
			}
		}
	}
	for i := 0; i < 400; i++ {
		p := Vec3{(2*rng.Float64() - 1) * half[0], (2*rng.Float64() - 1) * half[1], (2*rng.Float64() - 1) * half[2]}
		k := rng.IntN(3)
		if rng.IntN(4) > 0 { // mostly on a face
			p[k] = math.Copysign(half[k], p[k])
			p[k] += (2*rng.Float64() - 1) * noise * half.Len()
			if p[k] > half[k] {
				p[k] = half[k]
			}
			if p[k] < -half[k] {
				p[k] = -half[k]
			}
		}
		pts = append(pts, p)
	}
	return pts
}

func TestHullBoxFaces(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	half := Vec3{0.02, 0.01, 0.005}
	pts := boxCloud(rng, half, 1e-9)
	h, err := NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	checkHull(t, pts, h)
	if len(h.Vertices) != 8 || len(h.Faces) != 6 || len(h.Edges) != 12 {
		t.Fatalf("box hull has V=%d E=%d F=%d, want 8, 12, 6", len(h.Vertices), len(h.Edges), len(h.Faces))
	}
	// The documented order of a box's faces (README, inspect): +x, -x, +y, -y, +z, -z.
	want := []Vec3{{1, 0, 0}, {-1, 0, 0}, {0, 1, 0}, {0, -1, 0}, {0, 0, 1}, {0, 0, -1}}
	for i, f := range h.Faces {
		if f.Normal.Sub(want[i]).Len() > 1e-9 || len(f.Verts) != 4 {
			t.Fatalf("face %d: normal %v with %d vertices, want %v with 4", i, f.Normal, len(f.Verts), want[i])
		}
	}
	// Box volume (x y z) and inertia m(b^2+c^2)/12 from the polyhedral integrals.
	m := h.Mass(1000)
	ref := Box{Half: half}.Mass(1000)
	if math.Abs(m.Volume-ref.Volume) > 1e-12*ref.Volume {
		t.Fatalf("volume %g, want %g", m.Volume, ref.Volume)
	}
	for k := 0; k < 9; k++ {
		if math.Abs(m.Inertia[k]-ref.Inertia[k]) > 1e-9*ref.Inertia[0] {
			t.Fatalf("inertia %v, want %v", m.Inertia, ref.Inertia)
		}
	}
}

func TestHullDegenerate(t *testing.T) {
	cases := []struct {
		name string
		pts  []Vec3
	}{
		{"empty", nil},
		{"three points", []Vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}}},
		{"coincident", []Vec3{{1, 1, 1}, {1, 1, 1}, {1, 1, 1}, {1, 1, 1}, {1, 1, 1}}},
		{"line", []Vec3{{0, 0, 0}, {1, 1, 1}, {2, 2, 2}, {3, 3, 3}, {0.5, 0.5, 0.5}}},
		{"plane", []Vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {1, 1, 0}, {0.3, 0.7, 0}}},
		{"nearly flat", []Vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {1, 1, 1e-12}}},
		// Found by fuzzing the STL reader: thickness 3.5e-7 of the size, between
		// the plane and the merge tolerances.
		{"thinner than the merge tolerance", []Vec3{
			{6.409690556097303e-13, 6.409690556097303e-13, 0.0003937010765075684},
			{1.6802619211375714e-07, 6.409690556097303e-13, 0.0003937013149261475},
			{6.409690556097303e-13, 1.6802619211375714e-07, 0.0003937010765075684},
			{1.6802619211375714e-07, 1.6802619211375714e-07, 0.0003937010765075684},
			{6.409690556097303e-13, 0.0006882352828979492, 0.0003929457664489746},
		}},
	}
	for _, c := range cases {
		_, err := NewHull(c.pts)
		if !errors.Is(err, ErrDegenerate) {
			t.Errorf("%s: got %v, want ErrDegenerate", c.name, err)
		}
	}
	if _, err := NewHull([]Vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, math.NaN()}}); err == nil {
		t.Error("NaN point accepted")
	}
}

func TestHullCylinderPoints(t *testing.T) {
	// A 48-gon prism: two 48-gon caps and 48 rectangles, V = 96.
	const n = 48
	var pts []Vec3
	for i := 0; i < n; i++ {
		a := 2 * math.Pi * float64(i) / n
		for _, z := range []float64{-0.01, 0.01} {
			pts = append(pts, Vec3{0.02 * math.Cos(a), 0.02 * math.Sin(a), z})
		}
	}
	h, err := NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	checkHull(t, pts, h)
	if len(h.Vertices) != 2*n || len(h.Faces) != n+2 {
		t.Fatalf("V=%d F=%d, want %d and %d", len(h.Vertices), len(h.Faces), 2*n, n+2)
	}
	// Regular n-gon prism volume: (n/2) R^2 sin(2 pi/n) h (elementary geometry).
	want := n / 2.0 * 0.02 * 0.02 * math.Sin(2*math.Pi/n) * 0.02
	if v := h.Mass(1).Volume; math.Abs(v-want) > 1e-12*want {
		t.Fatalf("volume %g, want %g", v, want)
	}
}

func TestHullSupport(t *testing.T) {
	// Hill climbing on a large hull agrees with a linear scan.
	rng := rand.New(rand.NewPCG(7, 8))
	pts := make([]Vec3, 2000)
	for i := range pts {
		pts[i] = Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
	}
	h, err := NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	if len(h.Vertices) <= supportScanLimit {
		t.Fatalf("hull too small (%d) to exercise hill climbing", len(h.Vertices))
	}
	for i := 0; i < 1000; i++ {
		d := Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		best := math.Inf(-1)
		for _, v := range h.Vertices {
			best = math.Max(best, v.Dot(d))
		}
		if got := h.Support(d).Dot(d); got < best-1e-12 {
			t.Fatalf("support along %v reaches %g, scan %g", d, got, best)
		}
	}
}
