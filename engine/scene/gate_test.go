package scene

import (
	"math"
	"strings"
	"testing"

	"clatter/shapes"
)

func TestGates(t *testing.T) {
	s, err := Parse([]byte(`units = { length = "mm", mass = "g" }
[world]
duration = 0.1
[[body]]
name = "part"
shape = { sphere = 5 }
density = 1
[[gate]]
name = "outlet"
at = [600, 0, 20]
normal = [2, 0, 0]
radius = "4 cm"
wanted = [4, 5]
`), "g.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	g := s.Gates[0]
	// Lengths in the file's mm, to SI (to rounding); the normal made unit.
	const tol = 1e-15
	if g.Name != "outlet" || g.At.Sub(shapes.Vec3{0.6, 0, 0.02}).Len() > tol || g.Normal != (shapes.Vec3{1, 0, 0}) ||
		math.Abs(g.Radius-0.04) > tol || len(g.Wanted) != 2 || g.Line != 8 {
		t.Errorf("gate %+v", g)
	}
	w, _, err := s.Build()
	if err != nil || len(w.Gates()) != 1 {
		t.Errorf("built gates %v, %v", w.Gates(), err)
	}
}

func TestBadGates(t *testing.T) {
	for _, c := range []struct{ src, want string }{
		{"[[gate]]\nat = [0, 0, 0]\nnormal = [1, 0, 0]\n", `g.toml:1: [[gate]] number 1: name is missing`},
		{"[[gate]]\nname = \"a\"\nnormal = [1, 0, 0]\n", `gate "a": at is missing`},
		{"[[gate]]\nname = \"a\"\nat = [0, 0, 0]\nnormal = [0, 0, 0]\n", `g.toml:4: gate "a": normal must not be zero`},
		{"[[gate]]\nname = \"a\"\nat = [0, 0, 0]\nnormal = [1, 0, 0]\nradius = -1\n", `g.toml:5: gate "a": radius must be positive`},
		{"[[gate]]\nname = \"a\"\nat = [0, 0, 0]\nnormal = [1, 0, 0]\nwanted = [-1]\n", `gate "a": wanted[0] must be a face number`},
		{"[[gate]]\nname = \"a\"\nat = [0, 0, 0]\nnormal = [1, 0, 0]\nnormals = 1\n", `unknown key "normals" in gate "a"; did you mean "normal"?`},
		{"[[gate]]\nname = \"a\"\nat = [0, 0, 0]\nnormal = [1, 0, 0]\n[[gate]]\nname = \"a\"\nat = [0, 0, 0]\nnormal = [1, 0, 0]\n", `g.toml:6: gate "a": the name is already used by the gate at line 1`},
		{"gate = 3\n", `gate must be an array of tables`},
	} {
		_, err := Parse([]byte(c.src), "g.toml", Options{})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want %q", c.src, err, c.want)
		}
	}
}
