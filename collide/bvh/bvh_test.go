package bvh

import (
	"errors"
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"sort"
	"testing"

	"gonum.org/v1/gonum/mat"

	"clatter/shapes"
)

// soup returns n unconnected random triangles of size 0.1 to 2 in a cube of
// side 20.
func soup(n int, seed uint64) *shapes.TriMesh {
	rng := rand.New(rand.NewPCG(seed, 11))
	m := &shapes.TriMesh{}
	for i := 0; i < n; i++ {
		c := shapes.Vec3{rng.Float64() * 20, rng.Float64() * 20, rng.Float64() * 20}
		s := 0.1 + 1.9*rng.Float64()
		for k := 0; k < 3; k++ {
			d := shapes.Vec3{rng.Float64() - 0.5, rng.Float64() - 0.5, rng.Float64() - 0.5}
			m.Vertices = append(m.Vertices, c.Add(d.Mul(s)))
		}
		m.Triangles = append(m.Triangles, [3]int32{int32(3 * i), int32(3*i + 1), int32(3*i + 2)})
	}
	return m
}

// grid returns an nx by ny grid of square cells of side cell, two triangles
// per cell, with height h(x, y).
func grid(nx, ny int, cell float64, h func(x, y float64) float64) *shapes.TriMesh {
	m := &shapes.TriMesh{}
	for j := 0; j <= ny; j++ {
		for i := 0; i <= nx; i++ {
			x, y := float64(i)*cell, float64(j)*cell
			m.Vertices = append(m.Vertices, shapes.Vec3{x, y, h(x, y)})
		}
	}
	at := func(i, j int) int32 { return int32(j*(nx+1) + i) }
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			m.Triangles = append(m.Triangles,
				[3]int32{at(i, j), at(i+1, j), at(i+1, j+1)},
				[3]int32{at(i, j), at(i+1, j+1), at(i, j+1)})
		}
	}
	return m
}

func flat(x, y float64) float64 { return 0 }
func bumpy(x, y float64) float64 {
	return 0.3*math.Sin(0.7*x) + 0.2*math.Cos(1.3*y)
}

// bruteQuery is the reference: every triangle's bounds from its corners,
// compared axis by axis (touching counts).
func bruteQuery(m *shapes.TriMesh, box shapes.AABB) []int32 {
	var out []int32
	for i, t := range m.Triangles {
		hit := true
		for k := 0; k < 3; k++ {
			lo, hi := math.Inf(1), math.Inf(-1)
			for _, vi := range t {
				lo = math.Min(lo, m.Vertices[vi][k])
				hi = math.Max(hi, m.Vertices[vi][k])
			}
			if lo > box.Max[k] || hi < box.Min[k] {
				hit = false
			}
		}
		if hit {
			out = append(out, int32(i))
		}
	}
	return out
}

// randomBoxes returns n boxes of assorted sizes: half centred anywhere in and
// around [lo, hi], half centred on a random vertex of m (so that meshes of
// any spread get hits), plus a few special boxes.
func randomBoxes(rng *rand.Rand, n int, m *shapes.TriMesh) []shapes.AABB {
	halves := []float64{0, 0.01, 0.3, 1, 4, 100}
	b := m.Bounds()
	lo, hi := b.Min, b.Max
	var out []shapes.AABB
	for i := 0; i < n; i++ {
		var c, h shapes.Vec3
		for k := 0; k < 3; k++ {
			c[k] = lo[k] - 2 + (hi[k]-lo[k]+4)*rng.Float64()
			h[k] = halves[rng.IntN(len(halves))]
		}
		if i%2 == 1 {
			c = m.Vertices[rng.IntN(len(m.Vertices))]
		}
		if i%7 == 0 {
			h[2] = 0 // a flat box
		}
		out = append(out, shapes.AABB{Min: c.Sub(h), Max: c.Add(h)})
	}
	inf := math.Inf(1)
	return append(out,
		shapes.AABB{Min: shapes.Vec3{-inf, -inf, -inf}, Max: shapes.Vec3{inf, inf, inf}},
		shapes.AABB{Min: shapes.Vec3{-inf, -inf, -inf}, Max: shapes.Vec3{inf, inf, lo[2]}}, // the half-space below
		shapes.AABB{Min: hi.Add(shapes.Vec3{1, 1, 1}), Max: hi.Add(shapes.Vec3{2, 2, 2})},  // beyond everything
	)
}

func mustBuild(t *testing.T, m *shapes.TriMesh) *Tree {
	t.Helper()
	tr, err := Build(m)
	if err != nil {
		t.Fatal(err)
	}
	checkStructure(t, tr)
	return tr
}

// checkStructure verifies the invariants of the tree: each triangle in
// exactly one leaf, boxes nested, leaves small, depth bounded.
func checkStructure(t *testing.T, tr *Tree) {
	t.Helper()
	seen := make([]int, len(tr.mesh.Triangles))
	contains := func(outer, inner shapes.AABB) bool {
		for k := 0; k < 3; k++ {
			if inner.Min[k] < outer.Min[k] || inner.Max[k] > outer.Max[k] {
				return false
			}
		}
		return true
	}
	var walk func(ni int32, depth int)
	walk = func(ni int32, depth int) {
		nd := tr.nodes[ni]
		if depth > tr.depth {
			t.Fatalf("node %d at depth %d below the recorded depth %d", ni, depth, tr.depth)
		}
		if nd.count > 0 {
			if nd.count > maxLeaf {
				t.Errorf("leaf %d holds %d triangles, more than %d", ni, nd.count, maxLeaf)
			}
			for k := nd.first; k < nd.first+nd.count; k++ {
				seen[tr.tris[k]]++
				if !contains(nd.box, tr.boxes[k]) {
					t.Errorf("leaf %d does not contain triangle %d", ni, tr.tris[k])
				}
			}
			return
		}
		for _, c := range []int32{nd.first, nd.first + 1} {
			if !contains(nd.box, tr.nodes[c].box) {
				t.Errorf("node %d does not contain child %d", ni, c)
			}
			walk(c, depth+1)
		}
	}
	if len(tr.nodes) > 0 {
		walk(0, 1)
	}
	for i, n := range seen {
		if n != 1 {
			t.Errorf("triangle %d is in %d leaves, want 1", i, n)
		}
	}
	if tr.depth > medianDepth+31 {
		t.Errorf("depth %d exceeds the bound %d", tr.depth, medianDepth+31)
	}
	if len(tr.nodes) > max(1, 2*len(tr.tris)-1) {
		t.Errorf("%d nodes for %d triangles, more than 2n-1", len(tr.nodes), len(tr.tris))
	}
}

// exponential returns triangles at x = 1.5^i, a spacing that makes binned
// splits peel off one triangle at a time: the case the median fallback is
// for.
func exponential(n int) *shapes.TriMesh {
	m := &shapes.TriMesh{}
	for i := 0; i < n; i++ {
		x := math.Pow(1.5, float64(i))
		m.Vertices = append(m.Vertices, shapes.Vec3{x, 0, 0}, shapes.Vec3{x * 1.01, 0, 0}, shapes.Vec3{x, 1, 0})
		m.Triangles = append(m.Triangles, [3]int32{int32(3 * i), int32(3*i + 1), int32(3*i + 2)})
	}
	return m
}

func degenerate() *shapes.TriMesh {
	v := func(x, y, z float64) shapes.Vec3 { return shapes.Vec3{x, y, z} }
	return &shapes.TriMesh{
		Vertices: []shapes.Vec3{v(0, 0, 0), v(1, 0, 0), v(0, 1, 0), v(2, 0, 0), v(5, 5, 5), v(3, 3, 3)},
		Triangles: [][3]int32{
			{0, 1, 2}, // a proper triangle
			{0, 0, 0}, // a point
			{0, 1, 3}, // collinear corners: a segment
			{4, 4, 5}, // repeated corner: a segment
			{4, 4, 4}, // a point
			{0, 1, 2}, // the first again
		},
	}
}

func identical(n int) *shapes.TriMesh {
	m := &shapes.TriMesh{Vertices: []shapes.Vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}}}
	for i := 0; i < n; i++ {
		m.Triangles = append(m.Triangles, [3]int32{0, 1, 2})
	}
	return m
}

func TestQueryMatchesBruteForce(t *testing.T) {
	cases := []struct {
		name   string
		mesh   *shapes.TriMesh
		boxes  int
		minHit int // queries that must find something, so the test proves something
	}{
		{"random soup of 3000", soup(3000, 1), 400, 200},
		{"bumpy grid 40x40", grid(40, 40, 0.5, bumpy), 400, 200},
		{"flat grid 10x10 (200 triangles)", grid(10, 10, 1, flat), 400, 200},
		{"one triangle", soup(1, 2), 400, 200},
		{"degenerate triangles", degenerate(), 400, 200},
		{"500 identical triangles", identical(500), 400, 200},
		{"exponential spacing", exponential(300), 400, 200},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			tr := mustBuild(t, tc.mesh)
			rng := rand.New(rand.NewPCG(7, 7))
			var dst []int32
			hits := 0
			for _, box := range randomBoxes(rng, tc.boxes, tc.mesh) {
				dst = tr.Query(dst[:0], box)
				want := bruteQuery(tc.mesh, box)
				if !slices.Equal(dst, want) {
					t.Fatalf("box %v: got %d triangles %v, brute force %d %v", box, len(dst), head(dst), len(want), head(want))
				}
				if len(want) > 0 {
					hits++
				}
			}
			if hits < tc.minHit {
				t.Errorf("only %d queries found triangles, want at least %d", hits, tc.minHit)
			}
		})
	}
}

func head(s []int32) []int32 { return s[:min(len(s), 8)] }

// TestFlatGrid checks a flat grid of 200 triangles against answers worked out
// by hand from the grid layout (cell (i, j) holds triangles 2(10j+i) and
// 2(10j+i)+1).
func TestFlatGrid(t *testing.T) {
	m := grid(10, 10, 1, flat)
	tr := mustBuild(t, m)
	cell := func(i, j int) []int32 { return []int32{int32(2 * (10*j + i)), int32(2*(10*j+i) + 1)} }
	box := func(x0, y0, z0, x1, y1, z1 float64) shapes.AABB {
		return shapes.AABB{Min: shapes.Vec3{x0, y0, z0}, Max: shapes.Vec3{x1, y1, z1}}
	}
	eps := 1e-9 // clearly inside a cell, far from floating-point ties
	cases := []struct {
		name string
		box  shapes.AABB
		want []int32
	}{
		{"inside cell (3,4)", box(3+eps, 4+eps, -1, 4-eps, 5-eps, 1), cell(3, 4)},
		{"touching the plane from above", box(3+eps, 4+eps, 0, 4-eps, 5-eps, 1), cell(3, 4)},
		{"just above the plane", box(3+eps, 4+eps, math.Nextafter(0, 1), 4-eps, 5-eps, 1), nil},
		{"a point on a grid vertex", box(5, 5, 0, 5, 5, 0), slices.Concat(cell(4, 4), cell(5, 4), cell(4, 5), cell(5, 5))},
		{"outside the grid", box(10+eps, 0, -1, 11, 10, 1), nil},
		{"whole grid", box(-1, -1, -1, 11, 11, 1), func() []int32 {
			var all []int32
			for i := range m.Triangles {
				all = append(all, int32(i))
			}
			return all
		}()},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			want := slices.Clone(tc.want)
			slices.Sort(want)
			if got := tr.Query(nil, tc.box); !slices.Equal(got, want) {
				t.Errorf("got %v, want %v", got, want)
			}
		})
	}
	if got := len(m.Triangles); got != 200 {
		t.Fatalf("grid has %d triangles, want 200", got)
	}
}

func TestQueryAppends(t *testing.T) {
	tr := mustBuild(t, grid(2, 1, 1, flat))
	all := shapes.AABB{Min: shapes.Vec3{-1, -1, -1}, Max: shapes.Vec3{3, 3, 1}}
	got := tr.Query([]int32{42}, all)
	if want := []int32{42, 0, 1, 2, 3}; !slices.Equal(got, want) {
		t.Errorf("Query(prefix) = %v, want %v", got, want)
	}
}

func TestEmptyAndErrors(t *testing.T) {
	tr, err := Build(&shapes.TriMesh{})
	if err != nil {
		t.Fatalf("empty mesh: %v", err)
	}
	all := shapes.AABB{Min: shapes.Vec3{-1, -1, -1}, Max: shapes.Vec3{1, 1, 1}}
	if got := tr.Query(nil, all); len(got) != 0 || tr.Len() != 0 {
		t.Errorf("empty tree: query %v, Len %d", got, tr.Len())
	}
	if _, ok := tr.Raycast(shapes.Vec3{}, shapes.Vec3{0, 0, 1}, 10); ok {
		t.Errorf("empty tree: ray hit")
	}
	v := []shapes.Vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}}
	bad := []struct {
		name string
		m    *shapes.TriMesh
	}{
		{"nil", nil},
		{"index too large", &shapes.TriMesh{Vertices: v, Triangles: [][3]int32{{0, 1, 3}}}},
		{"negative index", &shapes.TriMesh{Vertices: v, Triangles: [][3]int32{{0, -1, 2}}}},
		{"NaN vertex", &shapes.TriMesh{Vertices: []shapes.Vec3{{0, 0, 0}, {math.NaN(), 0, 0}, {0, 1, 0}}, Triangles: [][3]int32{{0, 1, 2}}}},
		{"infinite vertex", &shapes.TriMesh{Vertices: []shapes.Vec3{{0, 0, 0}, {1, 0, 0}, {0, math.Inf(-1), 0}}, Triangles: [][3]int32{{0, 1, 2}}}},
	}
	for _, tc := range bad {
		if _, err := Build(tc.m); !errors.Is(err, ErrBadMesh) {
			t.Errorf("%s: error %v, want ErrBadMesh", tc.name, err)
		}
	}
}

func TestDeterministicBuild(t *testing.T) {
	m := soup(2000, 5)
	a, b := mustBuild(t, m), mustBuild(t, m)
	if !reflect.DeepEqual(a.nodes, b.nodes) || !slices.Equal(a.tris, b.tris) {
		t.Errorf("two builds of the same mesh differ")
	}
}

func TestDepthBounded(t *testing.T) {
	tr := mustBuild(t, exponential(1000))
	if tr.depth < medianDepth {
		t.Errorf("depth %d: the exponential mesh no longer exercises the median fallback (depth >= %d expected)", tr.depth, medianDepth)
	}
}

func TestQueryAllocs(t *testing.T) {
	tr := mustBuild(t, grid(50, 50, 1, bumpy))
	box := shapes.AABB{Min: shapes.Vec3{10, 10, -1}, Max: shapes.Vec3{13, 12, 1}}
	dst := make([]int32, 0, 256)
	allocs := testing.AllocsPerRun(50, func() { dst = tr.Query(dst[:0], box) })
	if len(dst) == 0 {
		t.Fatal("query found nothing; the box lies on the grid")
	}
	if allocs != 0 {
		t.Errorf("%v allocations per query, want 0", allocs)
	}
}

// refHits is the reference ray test: for every triangle, solve
// a + u e1 + v e2 = o + t d for (u, v, t) with gonum's LU solver, an
// implementation independent of Moller-Trumbore. It returns the hits sorted
// by t.
func refHits(m *shapes.TriMesh, o, d shapes.Vec3, maxT float64) []Hit {
	var hits []Hit
	for i := range m.Triangles {
		a, b, c := m.Triangle(i)
		e1, e2 := b.Sub(a), c.Sub(a)
		A := mat.NewDense(3, 3, []float64{
			e1[0], e2[0], -d[0],
			e1[1], e2[1], -d[1],
			e1[2], e2[2], -d[2],
		})
		rhs := mat.NewVecDense(3, []float64{o[0] - a[0], o[1] - a[1], o[2] - a[2]})
		var x mat.VecDense
		if err := x.SolveVec(A, rhs); err != nil {
			continue // singular: parallel or degenerate
		}
		u, v, t := x.AtVec(0), x.AtVec(1), x.AtVec(2)
		if u >= 0 && v >= 0 && u+v <= 1 && t >= 0 && t <= maxT {
			hits = append(hits, Hit{Triangle: int32(i), T: t, U: u, V: v})
		}
	}
	sort.Slice(hits, func(i, j int) bool { return hits[i].T < hits[j].T })
	return hits
}

func TestRaycastMatchesReference(t *testing.T) {
	// tolRay: the two methods round differently; 1e-9 relative to the scene
	// size (20) is far above double rounding on these well-conditioned hits
	// and far below the spacing of distinct triangles along a random ray.
	const tolRay = 1e-9 * 20
	cases := []struct {
		name   string
		mesh   *shapes.TriMesh
		rays   int
		minHit int
	}{
		{"random soup of 400", soup(400, 3), 300, 150},
		{"bumpy grid 14x14", grid(14, 14, 0.5, bumpy), 300, 150},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			tr := mustBuild(t, tc.mesh)
			b := tc.mesh.Bounds()
			rng := rand.New(rand.NewPCG(9, 9))
			hits := 0
			for i := 0; i < tc.rays; i++ {
				// From anywhere around the mesh towards a random point of a
				// random triangle, so that most rays hit something.
				var o shapes.Vec3
				for k := 0; k < 3; k++ {
					o[k] = b.Min[k] - 3 + (b.Max[k]-b.Min[k]+6)*rng.Float64()
				}
				ta, tb, tc3 := tc.mesh.Triangle(rng.IntN(len(tc.mesh.Triangles)))
				u, w := rng.Float64(), rng.Float64()
				if u+w > 1 {
					u, w = 1-u, 1-w
				}
				target := ta.Add(tb.Sub(ta).Mul(u)).Add(tc3.Sub(ta).Mul(w))
				d := target.Sub(o)
				if i%5 == 0 { // axis-aligned rays exercise the flat slabs
					d = shapes.Vec3{0, 0, -1}
					o[2] = b.Max[2] + 1
				}
				maxT := math.Inf(1)
				if i%3 == 0 {
					maxT = 0.7 // the segment ends 70 percent of the way to target
				}
				got, ok := tr.Raycast(o, d, maxT)
				want := refHits(tc.mesh, o, d, maxT)
				if !ok {
					if len(want) > 0 {
						t.Fatalf("ray %d: missed, reference hits triangle %d at t=%g", i, want[0].Triangle, want[0].T)
					}
					continue
				}
				hits++
				if len(want) == 0 {
					t.Fatalf("ray %d: hit triangle %d at t=%g, reference misses", i, got.Triangle, got.T)
				}
				if math.Abs(got.T-want[0].T) > tolRay {
					t.Fatalf("ray %d: t=%g, reference %g", i, got.T, want[0].T)
				}
				found := false
				for _, w := range want {
					if math.Abs(w.T-want[0].T) <= tolRay && w.Triangle == got.Triangle {
						found = true
						if math.Abs(got.U-w.U) > 1e-7 || math.Abs(got.V-w.V) > 1e-7 {
							t.Fatalf("ray %d: barycentric (%g, %g), reference (%g, %g)", i, got.U, got.V, w.U, w.V)
						}
					}
				}
				if !found {
					t.Fatalf("ray %d: triangle %d is not among the nearest reference hits %v", i, got.Triangle, want[:1])
				}
			}
			if hits < tc.minHit {
				t.Errorf("only %d rays hit, want at least %d", hits, tc.minHit)
			}
		})
	}
}

// TestRaycastCases: rays against the triangle (0,0,0), (1,0,0), (0,1,0), with
// hits worked out by hand.
func TestRaycastCases(t *testing.T) {
	m := &shapes.TriMesh{Vertices: []shapes.Vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}}, Triangles: [][3]int32{{0, 1, 2}}}
	tr := mustBuild(t, m)
	v := func(x, y, z float64) shapes.Vec3 { return shapes.Vec3{x, y, z} }
	inf := math.Inf(1)
	const tolExact = 1e-15 // these hits are exact in binary floating point, up to one rounding
	cases := []struct {
		name    string
		o, d    shapes.Vec3
		maxT    float64
		hit     bool
		t, u, w float64
	}{
		{"straight down", v(0.25, 0.25, 1), v(0, 0, -1), inf, true, 1, 0.25, 0.25},
		{"longer direction halves t", v(0.25, 0.25, 1), v(0, 0, -2), inf, true, 0.5, 0.25, 0.25},
		{"from below (back side)", v(0.25, 0.5, -2), v(0, 0, 1), inf, true, 2, 0.25, 0.5},
		{"through a corner", v(0, 0, 1), v(0, 0, -1), inf, true, 1, 0, 0},
		{"through the far edge", v(0.5, 0.5, 1), v(0, 0, -1), inf, true, 1, 0.5, 0.5},
		{"slanted", v(-1, 0.25, 1), v(1.25, 0, -1), inf, true, 1, 0.25, 0.25},
		{"segment too short", v(0.25, 0.25, 1), v(0, 0, -1), 0.99, false, 0, 0, 0},
		{"segment just long enough", v(0.25, 0.25, 1), v(0, 0, -1), 1, true, 1, 0.25, 0.25},
		{"pointing away", v(0.25, 0.25, 1), v(0, 0, 1), inf, false, 0, 0, 0},
		{"outside the triangle", v(0.75, 0.75, 1), v(0, 0, -1), inf, false, 0, 0, 0},
		{"in the plane (edge-on)", v(-1, 0.25, 0), v(1, 0, 0), inf, false, 0, 0, 0},
		{"zero direction", v(0.25, 0.25, 0), v(0, 0, 0), inf, false, 0, 0, 0},
		{"NaN direction", v(0.25, 0.25, 1), v(0, math.NaN(), -1), inf, false, 0, 0, 0},
		{"NaN length", v(0.25, 0.25, 1), v(0, 0, -1), math.NaN(), false, 0, 0, 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			h, ok := tr.Raycast(tc.o, tc.d, tc.maxT)
			if ok != tc.hit {
				t.Fatalf("hit %v, want %v (%+v)", ok, tc.hit, h)
			}
			if !ok {
				return
			}
			if h.Triangle != 0 || math.Abs(h.T-tc.t) > tolExact || math.Abs(h.U-tc.u) > tolExact || math.Abs(h.V-tc.w) > tolExact {
				t.Errorf("got %+v, want triangle 0 t=%g u=%g v=%g", h, tc.t, tc.u, tc.w)
			}
		})
	}
}

// TestRaycastGridHeights: vertical rays onto a flat grid at z = 0 from
// z = 3 hit at t = 3 exactly, and on a shared edge the lower index wins.
func TestRaycastGridHeights(t *testing.T) {
	m := grid(10, 10, 1, flat)
	tr := mustBuild(t, m)
	rng := rand.New(rand.NewPCG(4, 4))
	for i := 0; i < 200; i++ {
		x, y := rng.Float64()*10, rng.Float64()*10
		h, ok := tr.Raycast(shapes.Vec3{x, y, 3}, shapes.Vec3{0, 0, -1}, math.Inf(1))
		if !ok || h.T != 3 {
			t.Fatalf("ray at (%g, %g): hit %v t=%g, want t=3", x, y, ok, h.T)
		}
		ci, cj := int(x), int(y)
		want := int32(2 * (10*cj + ci)) // lower triangle of the cell: below the diagonal y-j < x-i
		if y-float64(cj) > x-float64(ci) {
			want++
		}
		if h.Triangle != want {
			t.Fatalf("ray at (%g, %g): triangle %d, want %d", x, y, h.Triangle, want)
		}
	}
	// On the diagonal of cell (2, 3) both triangles are hit at t = 3: the
	// lower index must win.
	h, ok := tr.Raycast(shapes.Vec3{2.5, 3.5, 3}, shapes.Vec3{0, 0, -1}, math.Inf(1))
	if want := int32(2 * (10*3 + 2)); !ok || h.Triangle != want {
		t.Errorf("diagonal: triangle %d (hit %v), want %d", h.Triangle, ok, want)
	}
}
