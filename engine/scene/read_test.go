package scene

import (
	"errors"
	"math"
	"os"
	"strings"
	"testing"
	"testing/fstest"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// siTol: conversions to SI are products of exact factors; rounding only.
const siTol = 1e-12

func near(a, b float64) bool { return math.Abs(a-b) <= siTol*math.Max(1, math.Abs(b)) }

func nearVec(a, b shapes.Vec3) bool { return near(a[0], b[0]) && near(a[1], b[1]) && near(a[2], b[2]) }

func mustLoad(t *testing.T, path string) *Scene {
	t.Helper()
	s, err := Load(path)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestLoadMillimetres(t *testing.T) {
	// testdata/scenes/slide.toml is in mm and g: everything comes out in SI.
	s := mustLoad(t, "../../testdata/scenes/slide.toml")
	if s.Units.Length != "mm" || s.Units.Mass != "g" {
		t.Fatalf("units %+v", s.Units)
	}
	if !nearVec(s.World.Gravity, shapes.Vec3{0, 0, -9.80665}) || s.World.Step != 0.001 || s.World.Duration != 2 {
		t.Errorf("world %+v", s.World)
	}
	b := s.Bodies[s.BodyIndex("block")]
	box, ok := b.Shape.(shapes.Box)
	if !ok || !nearVec(box.Half, shapes.Vec3{0.025, 0.025, 0.025}) {
		t.Errorf("shape %#v, want a box of half edge 0.025 m", b.Shape)
	}
	// 7.8 g/cm3 x (5 cm)^3 = 975 g.
	if !near(b.Density, 7800) || !near(b.Props.Mass, 0.975) {
		t.Errorf("density %g kg/m3, mass %g kg; want 7800 and 0.975", b.Density, b.Props.Mass)
	}
	if !nearVec(b.Position, shapes.Vec3{0, 0, 0.025}) || !nearVec(b.Velocity, shapes.Vec3{2, 0, 0}) {
		t.Errorf("position %v velocity %v", b.Position, b.Velocity)
	}
	m := s.Materials[s.MaterialIndex("steel")]
	if m.Friction != 0.3 || m.StaticFriction != 0.3 || m.Restitution != 0 {
		t.Errorf("material %+v: static friction defaults to friction", m)
	}
	if !s.Bodies[s.BodyIndex("floor")].Static {
		t.Error("a plane is static")
	}
}

func TestLoadInches(t *testing.T) {
	s := mustLoad(t, "../../testdata/scenes/incline.toml")
	b := s.Bodies[s.BodyIndex("box")]
	if box := b.Shape.(shapes.Box); !nearVec(box.Half, shapes.Vec3{0.0254, 0.0254, 0.0254}) {
		t.Errorf("half edges %v, want 1 in = 0.0254 m", box.Half)
	}
	// mass = "500 g" overrides the file's pound.
	if !near(b.Props.Mass, 0.5) || b.Mass != 0.5 {
		t.Errorf("mass %g kg, want 0.5", b.Props.Mass)
	}
	// 30 degrees about y: (cos 15, 0, sin 15, 0).
	want := mgl64.QuatRotate(math.Pi/6, shapes.Vec3{0, 1, 0})
	if q := b.Orientation; !near(q.W, want.W) || !nearVec(q.V, want.V) {
		t.Errorf("orientation %v, want %v", q, want)
	}
	if !near(s.World.Gravity[2], -9.80665) {
		t.Errorf("default gravity %v", s.World.Gravity)
	}
}

func TestLoadMeshPart(t *testing.T) {
	// testdata/scenes/drop.toml: the bracket of 7000 mm3 at 1.05 g/cm3 is
	// 7.35 g; its centre of mass is (12.5, 10, 10) mm in the file's axes
	// (base 40 x 20 x 5 and upright 5 x 20 x 30 mm, by the parallel-axis
	// composition of two blocks). STL's float32 corners are whole mm.
	s := mustLoad(t, "../../testdata/scenes/drop.toml")
	b := s.Bodies[s.BodyIndex("bracket")]
	if b.Part == nil || b.Kind != "mesh" {
		t.Fatalf("body %+v is not a mesh part", b)
	}
	if math.Abs(b.Props.Mass-0.00735) > 1e-12 || !nearVec(b.Props.Center, shapes.Vec3{0.0125, 0.01, 0.01}) {
		t.Errorf("mass %g kg centre %v", b.Props.Mass, b.Props.Center)
	}
	if !b.RandomOrientation || math.Abs(b.Orientation.Len()-1) > 1e-12 {
		t.Errorf("orientation %v", b.Orientation)
	}
	again := mustLoad(t, "../../testdata/scenes/drop.toml")
	if again.Bodies[1].Orientation != b.Orientation {
		t.Error("random orientation is not reproducible from the seed")
	}
	other, err := s.With("world.seed", 4)
	if err != nil {
		t.Fatal(err)
	}
	if other.Bodies[1].Orientation == b.Orientation {
		t.Error("another seed gave the same orientation")
	}
}

func TestRandomOrientationUniform(t *testing.T) {
	// Uniform rotations (Shoemake 1992) turn the z axis to a direction
	// uniform on the sphere: its z component is uniform on [-1, 1], with
	// mean 0 and variance 1/3. 20000 draws: standard errors 0.004 and
	// 0.0027; 5 of them are allowed.
	const n = 20000
	rng := newTestRand()
	sum, sum2 := 0.0, 0.0
	for i := 0; i < n; i++ {
		z := RandomOrientation(rng).Rotate(shapes.Vec3{0, 0, 1})[2]
		sum += z
		sum2 += z * z
	}
	if mean := sum / n; math.Abs(mean) > 5*math.Sqrt(1.0/3/n) {
		t.Errorf("mean z %g, want 0", mean)
	}
	if v := sum2 / n; math.Abs(v-1.0/3) > 5*math.Sqrt(4.0/45/n) {
		t.Errorf("mean z^2 %g, want 1/3", v)
	}
}

func TestLines(t *testing.T) {
	src := `# a comment with key = 1
units = { length = "mm" }

[[body]]
name = "a"
note = """
position = 9
"""
position = [
  0,
  "x",
  0 ]
[[body]]
name = 'b'
shape = { box = [1, 2, -3] }
[body.extra]
k = 1
[material."abs.x"]
friction = 0.1
`
	ix := locate([]byte(src)).lines
	for _, c := range []struct {
		path []string
		line int
	}{
		{[]string{"units"}, 2},
		{[]string{"units", "length"}, 2},
		{[]string{"body", "0"}, 4},
		{[]string{"body", "0", "name"}, 5},
		{[]string{"body", "0", "note"}, 6},
		{[]string{"body", "0", "position"}, 9},
		{[]string{"body", "0", "position", "1"}, 11},
		{[]string{"body", "1"}, 13},
		{[]string{"body", "1", "shape", "box", "2"}, 15},
		{[]string{"body", "1", "extra", "k"}, 17},
		{[]string{"material", "abs.x", "friction"}, 19},
		{[]string{"body", "1", "nothing", "here"}, 13}, // the nearest ancestor
	} {
		if got := ix.line(c.path); got != c.line {
			t.Errorf("line of %v = %d, want %d", c.path, got, c.line)
		}
	}
}

func parseErr(t *testing.T, src string) string {
	t.Helper()
	_, err := Parse([]byte(src), "s.toml", Options{FS: fstest.MapFS{}})
	if err == nil {
		t.Fatalf("no error for\n%s", src)
	}
	if !errors.Is(err, ErrBadScene) {
		t.Errorf("error %v does not wrap ErrBadScene", err)
	}
	return err.Error()
}

func TestErrorsNameTheirLine(t *testing.T) {
	src := `[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "cap"
shape = { box = [0.01, 0.01, 0.01] }
density = 1000
position = [
  0,
  "2 kg",
  0.005 ]
[[body]]
name = "lid"
shape = { box = [0.01, 0.01, -0.01] }
density = 1000
`
	msg := parseErr(t, src)
	for _, want := range []string{
		`s.toml:10: body "cap": position[1] must be a length, got "2 kg", which is a mass`,
		`s.toml:14: body "lid": box z edge must be positive, got -0.01 m`,
	} {
		if !strings.Contains(msg, want) {
			t.Errorf("errors lack %q:\n%s", want, msg)
		}
	}
	// Line order.
	if strings.Index(msg, "s.toml:10") > strings.Index(msg, "s.toml:14") {
		t.Errorf("errors out of line order:\n%s", msg)
	}
}

func TestWith(t *testing.T) {
	s := mustLoad(t, "../../testdata/scenes/slide.toml")
	n, err := s.With("material.steel.friction", 0.5)
	if err != nil {
		t.Fatal(err)
	}
	if f := n.Materials[n.MaterialIndex("steel")].Friction; f != 0.5 {
		t.Errorf("friction %g, want 0.5", f)
	}
	if f := s.Materials[s.MaterialIndex("steel")].Friction; f != 0.3 {
		t.Errorf("With changed the original: friction %g", f)
	}
	// Elements by index, bodies by name, in the file's units (mm).
	n, err = s.With("body.block.position.2", 30)
	if err != nil {
		t.Fatal(err)
	}
	if z := n.Bodies[n.BodyIndex("block")].Position[2]; !near(z, 0.03) {
		t.Errorf("z %g m, want 0.03", z)
	}
	// A quantity with its own unit becomes a plain number in the file's.
	n, err = s.With("body.block.velocity.0", 1000)
	if err != nil {
		t.Fatal(err)
	}
	if v := n.Bodies[n.BodyIndex("block")].Velocity[0]; !near(v, 1) {
		t.Errorf("v %g m/s, want 1", v)
	}
	for _, c := range []struct{ key, want string }{
		{"body.blok.density", `no body is named "blok"; did you mean "block"?`},
		{"material.steel.fricton", `did you mean "friction"?`},
		{"body.block.position", "not a number"},
		{"body.block.position.3", "not an index"},
		{"friction", "dotted path"},
	} {
		if _, err := s.With(c.key, 1); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("With(%q): %v, want %q", c.key, err, c.want)
		}
	}
	// A value the scene refuses is refused through With too.
	if _, err := s.With("material.steel.restitution", 2); err == nil || !strings.Contains(err.Error(), "between 0 and 1") {
		t.Errorf("With restitution 2: %v", err)
	}
}

func TestSweepSection(t *testing.T) {
	src := `units = { length = "mm", mass = "g" }
[material.abs]
friction = 0.3
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "cap"
shape = { box = [10, 10, 10] }
density = 1
position = [0, 0, 5]
material = "abs"
[sweep]
trials = 200
seed = 7
[[sweep.vary]]
key = "material.abs.friction"
from = 0.1
to = 0.9
count = 9
[[sweep.vary]]
key = "body.cap.position.2"
from = 1
to = 100
count = 3
log = true
[sweep.randomize]
orientation = ["cap"]
position = { cap = [5, 5, 0] }
`
	s, err := Parse([]byte(src), "s.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	sw := s.Sweep
	if sw == nil || sw.Trials != 200 || sw.Seed != 7 || len(sw.Vary) != 2 || sw.Cases() != 27 {
		t.Fatalf("sweep %+v", sw)
	}
	for i, v := range sw.Vary[0].Values {
		if want := 0.1 + 0.1*float64(i); math.Abs(v-want) > 1e-12 {
			t.Errorf("friction value %d = %g, want %g", i, v, want)
		}
	}
	for i, want := range []float64{1, 10, 100} { // a geometric series
		if v := sw.Vary[1].Values[i]; math.Abs(v-want) > 1e-12*want {
			t.Errorf("log value %d = %g, want %g", i, v, want)
		}
	}
	if len(sw.RandomOrientation) != 1 || len(sw.Jitter) != 1 || !nearVec(sw.Jitter[0].Amount, shapes.Vec3{0.005, 0.005, 0}) {
		t.Errorf("randomize %+v %+v", sw.RandomOrientation, sw.Jitter)
	}
	bad := strings.Replace(src, `orientation = ["cap"]`, `orientation = ["floor"]`, 1)
	if msg := parseErr(t, bad); !strings.Contains(msg, `body "floor" is static and cannot be randomized`) {
		t.Errorf("randomizing a static body: %s", msg)
	}
}

func TestStepWarnings(t *testing.T) {
	// A 10 mm part dropped 100 mm reaches 1.4 m/s: a 10 ms step moves it
	// 14 mm, more than its size (a warning), and 0.1 s would move it 140
	// mm, more than 10 times its size (refused).
	src := func(step string) string {
		return `units = { length = "mm", mass = "g" }
[world]
step = ` + step + `
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "cap"
shape = { box = [10, 10, 10] }
density = 1
position = [0, 0, 105]
`
	}
	s, err := Parse([]byte(src("0.01")), "s.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Warnings) == 0 || !strings.Contains(s.Warnings[0], "s.toml:3: [world] step 0.01 s is coarse") {
		t.Errorf("warnings %q", s.Warnings)
	}
	if msg := parseErr(t, src("0.1")); !strings.Contains(msg, "is too large for body \"cap\"") {
		t.Errorf("0.1 s: %s", msg)
	}
	if s, err := Parse([]byte(src("0.001")), "s.toml", Options{}); err != nil || len(s.Warnings) != 0 {
		t.Errorf("1 ms: %v %q", err, s.Warnings)
	}
}

func TestSmallPartsAtCoarseStep(t *testing.T) {
	// Gravity's motion in one step (g step^2 = 2.7 mm at 1/60 s) is no limit
	// on part size: the engine rests 2 mm cubes at 1/60 s within the slop
	// (engine TestSmallPartsAtCoarseSteps), so a 3 mm cube resting on the
	// floor at 1/60 s is accepted without a warning.
	src := `units = { length = "mm", mass = "g" }
[world]
step = 0.0166667
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "bead"
shape = { box = [3, 3, 3] }
density = 1
position = [0, 0, 1.5]
`
	s, err := Parse([]byte(src), "s.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Warnings) != 0 {
		t.Errorf("warnings %q", s.Warnings)
	}
}

func TestBuild(t *testing.T) {
	src := `[material.abs]
friction = 0.3
restitution = 0.5
[material.steel]
friction = 0.6
restitution = 0.2
[[pair]]
materials = ["steel", "abs"]
restitution = 0.9
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "steel"
[[body]]
name = "cap"
shape = { sphere = 0.01 }
mass = 0.2
position = [0, 0, 0.01]
material = "abs"
[[kick]]
body = "cap"
time = 0
impulse = [0.4, 0, 0]
`
	s, err := Parse([]byte(src), "s.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	w, ids, err := s.Build()
	if err != nil {
		t.Fatal(err)
	}
	if len(ids) != 2 || w.MassOf(ids[1]) != 0.2 || w.Name(ids[1]) != "cap" {
		t.Fatalf("bodies: %v mass %g", ids, w.MassOf(ids[1]))
	}
	// Materials are added in name order after the default: abs 1, steel 2.
	// The pair keeps the mixed friction sqrt(0.3 x 0.6) and overrides restitution.
	c := w.Pair(1, 2)
	if math.Abs(c.Friction-math.Sqrt(0.18)) > 1e-12 || c.Restitution != 0.9 {
		t.Errorf("pair %+v", c)
	}
	// The kick at t = 0 gives 0.4 N s / 0.2 kg = 2 m/s in the first step.
	if err := w.Step(1e-3); err != nil {
		t.Fatal(err)
	}
	if v := w.Velocity(ids[1])[0]; math.Abs(v-2) > 0.05 {
		t.Errorf("after the kick vx = %g, want about 2 (less the first step's friction)", v)
	}
}

func TestFSMesh(t *testing.T) {
	// Mesh paths resolve inside an fs.FS, as for an embedded study.
	stl, err := os.ReadFile("../../testdata/parts/cube.stl")
	if err != nil {
		t.Fatal(err)
	}
	fsys := fstest.MapFS{"study/parts/cube.stl": {Data: stl}}
	src := `units = { length = "mm", mass = "g" }
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "cube"
shape = { mesh = "parts/cube.stl" }
mass = 8
position = [0, 0, 10]
`
	s, err := Parse([]byte(src), "s.toml", Options{Dir: "study", FS: fsys})
	if err != nil {
		t.Fatal(err)
	}
	b := s.Bodies[1]
	// The 20 mm cube's centre is at (10, 10, 10) mm in the file's axes.
	if !near(b.Props.Mass, 0.008) || !nearVec(b.Props.Center, shapes.Vec3{0.01, 0.01, 0.01}) {
		t.Errorf("mass %g centre %v", b.Props.Mass, b.Props.Center)
	}
	if msg := parseErr(t, strings.Replace(src, "parts/cube.stl", "parts/none.stl", 1)); !strings.Contains(msg, `mesh file "parts/none.stl" not found`) {
		t.Errorf("missing mesh in FS: %s", msg)
	}
}
