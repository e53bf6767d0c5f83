package scene

import (
	"math"
	"testing"
)

// TestWithSharesMeshShapes checks that the scenes With makes for a study's
// cases share the shapes made from mesh files (a part's hull, a fixture's
// triangles) with the scene they come from, and keep the mass properties
// the file gives.
func TestWithSharesMeshShapes(t *testing.T) {
	for _, c := range []struct{ file, body, key string }{
		{"../../testdata/scenes/drop.toml", "bracket", "material.abs.friction"},
		{"../../testdata/scenes/fixture.toml", "fixture", "material.pom.friction"},
	} {
		s, err := Load(c.file)
		if err != nil {
			t.Fatal(err)
		}
		n, err := s.With(c.key, 0.25)
		if err != nil {
			t.Fatal(err)
		}
		i := s.BodyIndex(c.body)
		if i < 0 {
			t.Fatalf("%s: no body %q", c.file, c.body)
		}
		a, b := s.Bodies[i], n.Bodies[i]
		if a.Shape != b.Shape || a.Part != b.Part {
			t.Errorf("%s: body %q has a shape of its own after With; want the one made for the scene", c.file, c.body)
		}
		if a.Props != b.Props {
			t.Errorf("%s: body %q: mass properties %+v after With, %+v before", c.file, c.body, b.Props, a.Props)
		}
		if m := n.MaterialIndex(c.key[len("material.") : len(c.key)-len(".friction")]); n.Materials[m].Friction != 0.25 {
			t.Errorf("%s: %s is %g after With, want 0.25", c.file, c.key, n.Materials[m].Friction)
		}
	}
}

// TestMeshUnitsMakeOwnShapes checks that one file read in two length units
// makes two shapes, 1000 times apart in size (1 m = 1000 mm, the SI
// definition of the millimetre), not one shared.
func TestMeshUnitsMakeOwnShapes(t *testing.T) {
	const src = `units = { length = "mm", mass = "g" }
[[body]]
name = "small"
shape = { mesh = "box.stl" }
density = 1
position = [0, 0, 100]
[[body]]
name = "large"
shape = { mesh = "box.stl", units = "m" }
density = 1
position = [0, 0, 100000]
`
	s, err := Parse([]byte(src), "units.toml", Options{Dir: "../../testdata/parts"})
	if err != nil {
		t.Fatal(err)
	}
	small, large := s.Bodies[0].Shape.Bounds(), s.Bodies[1].Shape.Bounds()
	if s.Bodies[0].Shape == s.Bodies[1].Shape {
		t.Fatal("one shape for a file read in millimetres and in metres")
	}
	// tol: the sizes are the file's float32 coordinates times 1e-3 and
	// times 1 in float64, so their ratio is 1000 to a few roundings.
	const tol = 1e-12
	const want = 1000.0 // 1 m = 1000 mm (SI)
	for k := 0; k < 3; k++ {
		ls, ll := small.Max[k]-small.Min[k], large.Max[k]-large.Min[k]
		if math.Abs(ll/ls-want) > tol*want {
			t.Errorf("axis %d: sizes %g m and %g m, ratio %g, want %g", k, ls, ll, ll/ls, want)
		}
	}
}
