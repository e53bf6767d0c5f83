package mesh_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"clatter/shapes"
	"clatter/shapes/mesh"
	"clatter/testdata/gen/partgen"
)

// cubeSoup is the unindexed soup of the 20 mm generator cube (in metres):
// 12 triangles, 36 corners, 8 distinct points.
func cubeSoup() [][3]shapes.Vec3 {
	g := partgen.Cube()
	soup := make([][3]shapes.Vec3, len(g.T))
	for i, tr := range g.T {
		for k, v := range tr {
			p := g.V[v]
			soup[i][k] = shapes.Vec3{p[0], p[1], p[2]}.Mul(mm)
		}
	}
	return soup
}

// TestWeldCubeSoup: welding the corners of an unindexed cube leaves the
// cube's 8 vertices (Euler: V - E + F = 8 - 18 + 12 = 2) when the copies
// agree to within the tolerance, and keeps them apart when they do not.
func TestWeldCubeSoup(t *testing.T) {
	diag := 20 * mm * math.Sqrt(3)
	tol := mesh.WeldTolerance * diag
	cases := []struct {
		name   string
		jitter float64 // largest displacement of each corner copy
		verts  int     // exact count, or -1 for "more than 8"
	}{
		{"exact copies", 0, 8},
		{"copies within a third of the tolerance", tol / 3 / math.Sqrt(3), 8},
		{"copies 100 tolerances apart", 100 * tol, -1},
	}
	rng := rand.New(rand.NewPCG(1, 9))
	for _, c := range cases {
		soup := cubeSoup()
		for i := range soup {
			for k := range soup[i] {
				for a := 0; a < 3; a++ {
					soup[i][k][a] += c.jitter * (2*rng.Float64() - 1)
				}
			}
		}
		m, err := mesh.FromSoup("cube", soup)
		if err != nil {
			t.Fatal(err)
		}
		switch {
		case c.verts >= 0 && len(m.Vertices) != c.verts:
			t.Errorf("%s: %d vertices, want %d", c.name, len(m.Vertices), c.verts)
		case c.verts < 0 && len(m.Vertices) <= 8:
			t.Errorf("%s: %d vertices, want the copies kept apart", c.name, len(m.Vertices))
		}
		if c.verts == 8 && (!m.Topology().Solid() || len(m.Triangles) != 12) {
			t.Errorf("%s: %d triangles, topology %+v", c.name, len(m.Triangles), m.Topology())
		}
	}
}

// TestWeldDeterministic: the same soup welds to the same mesh every time.
func TestWeldDeterministic(t *testing.T) {
	soup := icosphere(3, 1)
	a, err := mesh.FromSoup("a", soup)
	if err != nil {
		t.Fatal(err)
	}
	for run := 0; run < 3; run++ {
		b, _ := mesh.FromSoup("b", soup)
		if len(a.Vertices) != len(b.Vertices) || len(a.Triangles) != len(b.Triangles) {
			t.Fatal("different sizes")
		}
		for i := range a.Vertices {
			if a.Vertices[i] != b.Vertices[i] {
				t.Fatalf("vertex %d differs", i)
			}
		}
		for i := range a.Triangles {
			if a.Triangles[i] != b.Triangles[i] {
				t.Fatalf("triangle %d differs", i)
			}
		}
	}
}

// TestDegenerateTriangles: triangles whose corners weld together are
// dropped and counted; the cube stays solid; their unused corners go.
func TestDegenerateTriangles(t *testing.T) {
	soup := cubeSoup()
	p := soup[0][0]
	far := shapes.Vec3{0.5, 0.5, 0.5} // a corner only the dropped triangles use
	soup = append(soup,
		[3]shapes.Vec3{p, p, soup[0][1]},                               // two equal corners
		[3]shapes.Vec3{p, p.Add(shapes.Vec3{1e-12, 0, 0}), soup[0][2]}, // two corners within the tolerance
		[3]shapes.Vec3{far, far, far},                                  // a point
	)
	m, err := mesh.FromSoup("cube", soup)
	if err != nil {
		t.Fatal(err)
	}
	if m.Stats.Degenerate != 3 || len(m.Triangles) != 12 || len(m.Vertices) != 8 || m.Stats.Facets != 15 {
		t.Fatalf("stats %+v, %d triangles, %d vertices; want 3 dropped, 12, 8", m.Stats, len(m.Triangles), len(m.Vertices))
	}
	if !m.Topology().Solid() {
		t.Fatalf("topology %+v", m.Topology())
	}
}

func TestConstructionErrors(t *testing.T) {
	nan := math.NaN()
	cases := []struct {
		name string
		make func() error
		want string
	}{
		{"soup with NaN", func() error {
			_, err := mesh.FromSoup("s", [][3]shapes.Vec3{{{0, 0, 0}, {1, 0, 0}, {0, nan, 0}}})
			return err
		}, "triangle 1 has a corner that is not a finite number"},
		{"soup with Inf", func() error {
			_, err := mesh.FromSoup("s", [][3]shapes.Vec3{{{0, 0, 0}, {1, 0, 0}, {0, math.Inf(1), 0}}})
			return err
		}, "not a finite number"},
		{"empty soup", func() error { _, err := mesh.FromSoup("s", nil); return err }, "no triangles"},
		{"index out of range", func() error {
			_, err := mesh.FromIndexed("s", []shapes.Vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}}, [][3]int32{{0, 1, 3}})
			return err
		}, "triangle 1 refers to vertex 3, but there are 3 vertices"},
		{"negative index", func() error {
			_, err := mesh.FromIndexed("s", []shapes.Vec3{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}}, [][3]int32{{0, -1, 2}})
			return err
		}, "refers to vertex -1"},
		{"NaN vertex", func() error {
			_, err := mesh.FromIndexed("s", []shapes.Vec3{{0, 0, 0}, {nan, 0, 0}, {0, 1, 0}}, [][3]int32{{0, 1, 2}})
			return err
		}, "vertex 1 is not a finite point"},
	}
	for _, c := range cases {
		err := c.make()
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), "s: ") {
			t.Errorf("%s: got %v, want %q", c.name, err, c.want)
		}
	}
}

// TestTopologyCases: edge counts of damaged cubes, counted by hand from the
// cube's 18 edges (12 sides, 6 face diagonals).
func TestTopologyCases(t *testing.T) {
	base := func() *mesh.Mesh {
		m, err := mesh.FromSoup("cube", cubeSoup())
		if err != nil {
			t.Fatal(err)
		}
		return m
	}
	cases := []struct {
		name   string
		edit   func(m *mesh.Mesh)
		want   mesh.Topology
		solid  bool
		phrase string
	}{
		{"closed cube", func(*mesh.Mesh) {}, mesh.Topology{Edges: 18}, true, ""},
		// A triangle gone: its 3 edges are left with one user each.
		{"one triangle missing", func(m *mesh.Mesh) { m.Triangles = m.Triangles[1:] }, mesh.Topology{Edges: 18, Boundary: 3}, false, "open (3 boundary edges)"},
		// A face (2 triangles) gone: its diagonal vanishes, its 4 sides are open.
		{"one face missing", func(m *mesh.Mesh) { m.Triangles = m.Triangles[2:] }, mesh.Topology{Edges: 17, Boundary: 4}, false, "open (4 boundary edges)"},
		// One triangle wound the wrong way: each of its 3 edges is run twice in one direction.
		{"one triangle flipped", func(m *mesh.Mesh) { t := &m.Triangles[0]; t[1], t[2] = t[2], t[1] },
			mesh.Topology{Edges: 18, Misoriented: 3}, false, "inconsistently oriented (3 edges"},
		// A triangle twice: its 3 edges have three users, two of them in one direction.
		{"one triangle doubled", func(m *mesh.Mesh) { m.Triangles = append(m.Triangles, m.Triangles[0]) },
			mesh.Topology{Edges: 18, NonManifold: 3, Misoriented: 3}, false, "non-manifold (3 edges shared by more than two triangles)"},
		{"all flipped", func(m *mesh.Mesh) { m.Flip() }, mesh.Topology{Edges: 18}, true, ""},
	}
	for _, c := range cases {
		m := base()
		c.edit(m)
		got := m.Topology()
		if got != c.want || got.Solid() != c.solid || !strings.Contains(got.Problem(), c.phrase) || (c.phrase == "") != (got.Problem() == "") {
			t.Errorf("%s: %+v solid=%v %q; want %+v solid=%v %q", c.name, got, got.Solid(), got.Problem(), c.want, c.solid, c.phrase)
		}
	}
}

// TestTwoCubesSharingAnEdge: a union of two cubes that touch along one edge
// is non-manifold there (four triangles) but balanced; it is reported, and
// its mass falls back to the hull's.
func TestTwoCubesSharingAnEdge(t *testing.T) {
	a := cubeSoup()
	b := cubeSoup()
	for i := range b {
		for k := range b[i] {
			b[i][k] = b[i][k].Add(shapes.Vec3{20 * mm, 20 * mm, 0})
		}
	}
	m, err := mesh.FromSoup("pair.stl", append(a, b...))
	if err != nil {
		t.Fatal(err)
	}
	if top := m.Topology(); top.NonManifold != 1 || top.Misoriented != 0 || top.Boundary != 0 {
		t.Fatalf("topology %+v, want one balanced non-manifold edge", top)
	}
	p, err := mesh.NewPart(m)
	if err != nil {
		t.Fatal(err)
	}
	if p.Solid || len(p.Warnings) != 1 || !strings.Contains(p.Warnings[0], "pair.stl: mesh is non-manifold (1 edge shared") {
		t.Fatalf("solid=%v warnings %q", p.Solid, p.Warnings)
	}
}

// TestOpenPartUsesHull: the box without its top has the same convex hull as
// the full box, so its fallback mass properties are the box's (handbook
// m(b^2+c^2)/12), and Mesh.Mass refuses it.
func TestOpenPartUsesHull(t *testing.T) {
	p, err := mesh.LoadPart(dir("broken/open.stl"), mesh.Millimetre)
	if err != nil {
		t.Fatal(err)
	}
	if p.Solid || p.Topology.Boundary != 4 {
		t.Fatalf("solid=%v topology %+v", p.Solid, p.Topology)
	}
	rhoMM := density * 1e-9
	want := scaleMM(boxRef(0, 0, 0, partgen.BoxX, partgen.BoxY, partgen.BoxZ, rhoMM), rhoMM)
	if e := massErr(p.Mass(density), want, 40*mm); e > exactTol {
		t.Errorf("hull mass off by %.3g", e)
	}
	if _, err := p.Mesh.Mass(density); !errors.Is(err, mesh.ErrNotSolid) || !strings.Contains(err.Error(), "mesh is open (4 boundary edges)") {
		t.Errorf("Mesh.Mass of an open mesh: %v", err)
	}
	if len(p.Hull.Faces) != 6 || len(p.Hull.Vertices) != 8 {
		t.Errorf("hull has %d faces, %d vertices; want a box's 6 and 8", len(p.Hull.Faces), len(p.Hull.Vertices))
	}
}

// TestInwardPartFlipped: the inside-out cube is turned outward and gives
// the cube's mass properties.
func TestInwardPartFlipped(t *testing.T) {
	p, err := mesh.LoadPart(dir("broken/inward.stl"), mesh.Millimetre)
	if err != nil {
		t.Fatal(err)
	}
	if !p.Solid || p.Mesh.SignedVolume() <= 0 {
		t.Fatalf("solid=%v signed volume %g", p.Solid, p.Mesh.SignedVolume())
	}
	rhoMM := density * 1e-9
	want := scaleMM(boxRef(0, 0, 0, 20, 20, 20, rhoMM), rhoMM)
	if e := massErr(p.Mass(density), want, 20*mm); e > exactTol {
		t.Errorf("mass off by %.3g", e)
	}
}

// TestNonConvexBelowHull: the bracket, nut and cup are non-convex; their
// solids are strictly smaller than their hulls and carry no warning.
func TestNonConvexBelowHull(t *testing.T) {
	for _, f := range []string{"parts/bracket.stl", "parts/nut.stl", "parts/cup.stl"} {
		p := loadSolid(t, f, mesh.Millimetre)
		if v, h := p.Mass(1).Volume, p.Hull.Mass(1).Volume; !(v < 0.9*h) {
			t.Errorf("%s: solid volume %g, hull %g", f, v, h)
		}
	}
}

// TestOverlappingShellsWarn: two closed cubes that overlap form a closed,
// oriented mesh whose divergence-theorem volume counts the overlap twice,
// more than the hull holds; the part says so.
func TestOverlappingShellsWarn(t *testing.T) {
	a, b := cubeSoup(), cubeSoup()
	for i := range b {
		for k := range b[i] {
			b[i][k] = b[i][k].Add(shapes.Vec3{5 * mm, 5 * mm, 5 * mm})
		}
	}
	m, err := mesh.FromSoup("overlap.stl", append(a, b...))
	if err != nil {
		t.Fatal(err)
	}
	p, err := mesh.NewPart(m)
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Warnings) != 1 || !strings.Contains(p.Warnings[0], "exceeds its convex hull") {
		t.Fatalf("warnings %q", p.Warnings)
	}
}

// TestFixtureTriMesh: a mesh kept as a static triangle mesh has the file's
// triangles and bounds, open or not.
func TestFixtureTriMesh(t *testing.T) {
	m, err := mesh.LoadSTL(dir("broken/open.stl"), mesh.Millimetre)
	if err != nil {
		t.Fatal(err)
	}
	tm := m.TriMesh()
	if len(tm.Triangles) != 10 || len(tm.Vertices) != 8 {
		t.Fatalf("%d triangles, %d vertices", len(tm.Triangles), len(tm.Vertices))
	}
	b := tm.Bounds()
	if b.Min != (shapes.Vec3{}) || b.Max.Sub(shapes.Vec3{0.04, 0.02, 0.01}).Len() > 1e-15 {
		t.Fatalf("bounds %v", b)
	}
	// The file's winding: the bottom triangles face -z.
	a, c, d := tm.Triangle(8)
	if n := c.Sub(a).Cross(d.Sub(a)); n[2] >= 0 {
		t.Fatalf("triangle 8 normal %v, want -z", n)
	}
}
