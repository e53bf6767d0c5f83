package view

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/go-gl/mathgl/mgl64"
	"github.com/qmuntal/gltf"

	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/engine/view/viewtest"
	"clatter/shapes"
)

// signedVolume is the volume a closed triangle mesh encloses, by the
// divergence theorem: the sum over its triangles of a . (b x c) / 6
// (positive when every triangle faces outward).
func signedVolume(tris []Tri) float64 {
	v := 0.0
	for _, t := range tris {
		v += t[0].Dot(t[1].Cross(t[2])) / 6
	}
	return v
}

// TestTessellationVolume checks that every shape is drawn closed and
// facing outward, with the volume of the solid it stands for.
func TestTessellationVolume(t *testing.T) {
	// A polygon of n sides inscribed in a circle keeps the fraction
	// n sin(2 pi/n) / (2 pi) of its area: 0.9936 for the 32 segments
	// round an axis, 0.9886 for the 24 a whole circle of the 12 pole-to-
	// pole segments would have; a solid of revolution loses about the sum
	// of both, 1.8 percent, a little more near the poles. So round shapes
	// lie within 3 percent below their exact volume.
	const roundTol = 0.03
	const exactTol = 1e-12 // flat-faced shapes: rounding only
	r, h := 0.03, 0.05
	compound := &shapes.Compound{Pieces: []shapes.Piece{
		{Shape: shapes.Box{Half: shapes.Vec3{0.02, 0.005, 0.005}}, Pose: shapes.Pose{Orientation: shapes.Quat{W: 1}}},
		{Shape: shapes.Box{Half: shapes.Vec3{0.005, 0.005, 0.015}}, Pose: shapes.Pose{Position: shapes.Vec3{0.015, 0, 0.02}, Orientation: mgl64.QuatRotate(0.3, shapes.Vec3{0, 0, 1})}},
	}}
	cases := []struct {
		name  string
		shape shapes.Shape
		want  float64 // textbook volume formulas
		tol   float64
	}{
		{"box", shapes.Box{Half: shapes.Vec3{0.2, 0.15, 0.125}}, 0.4 * 0.3 * 0.25, exactTol},
		{"sphere", shapes.Sphere{Radius: r}, 4.0 / 3 * math.Pi * r * r * r, roundTol},
		{"cylinder", shapes.Cylinder{Radius: r, HalfLength: h}, math.Pi * r * r * 2 * h, roundTol},
		{"capsule", shapes.Capsule{Radius: r, HalfLength: h}, math.Pi*r*r*2*h + 4.0/3*math.Pi*r*r*r, roundTol},
		{"compound", compound, 0.04*0.01*0.01 + 0.01*0.01*0.03, exactTol},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := signedVolume(triangles(c.shape))
			if got > c.want*(1+exactTol) || got < c.want*(1-c.tol) {
				t.Errorf("volume %g, want %g (within -%g)", got, c.want, c.tol)
			}
		})
	}
}

// record runs a scene file and records it.
func record(t *testing.T, file string) (*scene.Scene, *Recorder) {
	t.Helper()
	s, err := scene.Load(file)
	if err != nil {
		t.Fatal(err)
	}
	rec := NewRecorder(s)
	if _, err := report.Run(context.Background(), s, report.Options{Sample: 0.02, Observe: rec.Observe}); err != nil {
		t.Fatal(err)
	}
	return s, rec
}

// everyShape is a scene with a body of every kind of shape, for the
// validator; the cup is a mesh part kept as its hull.
const everyShape = `
units = { length = "mm", mass = "g" }
[world]
duration = 0.2
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "ball"
shape = { sphere = 10 }
density = "1 g/cm3"
position = [0, 0, 30]
[[body]]
name = "roller"
shape = { cylinder = [8, 30] }
density = "1 g/cm3"
position = [40, 0, 30]
[[body]]
name = "pin"
shape = { capsule = [5, 20] }
density = "1 g/cm3"
position = [80, 0, 30]
[[body]]
name = "cup"
shape = { mesh = "../../testdata/parts/cup.stl" }
density = "1 g/cm3"
position = [0, 60, 60]
`

// TestGLBValid writes the animations of scenes with every kind of shape
// and motion and checks them with the Khronos glTF validator, then reads
// them back with the glTF library's decoder.
func TestGLBValid(t *testing.T) {
	dir := t.TempDir()
	shapesFile := filepath.Join(dir, "shapes.toml")
	if err := os.WriteFile(shapesFile, []byte(strings.ReplaceAll(everyShape, "../../", mustAbs(t, "../..")+"/")), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, file := range []string{
		shapesFile,                           // sphere, cylinder, capsule, a part
		"../../testdata/scenes/fixture.toml", // plane, static mesh, box
		"../../testdata/mechanisms/vibrating-track.toml", // a driven body, cylinders
		"../../testdata/mechanisms/cam-follower.toml",    // joints
		"../../testdata/sweeps/bracket.toml",             // a mesh part's hull
	} {
		t.Run(filepath.Base(file), func(t *testing.T) {
			s, rec := record(t, file)
			path := filepath.Join(t.TempDir(), AnimationFile)
			if err := rec.WriteGLB(path); err != nil {
				t.Fatal(err)
			}
			is := viewtest.Validate(t, path)
			if is.NumErrors != 0 {
				t.Errorf("the glTF validator found %s", is)
			}
			t.Logf("glTF validator: %s", is)
			doc, err := gltf.Open(path)
			if err != nil {
				t.Fatal(err)
			}
			if got, want := len(doc.Nodes), len(s.Bodies)+1; got != want {
				t.Errorf("%d nodes, want a root and one per body: %d", got, want)
			}
			moving := 0
			for _, b := range s.Bodies {
				if !b.Static || b.Driven {
					moving++
				}
			}
			if len(doc.Animations) != 1 || len(doc.Animations[0].Channels) != 2*moving {
				t.Errorf("want one animation with a translation and a rotation channel for each of the %d moving bodies", moving)
			}
		})
	}
}

// TestGLBMetres checks the keyframes against the scene: the block of
// fixture.toml starts at [20, 10, 40] mm (the scene file), which glTF,
// in metres, must hold as 0.02, 0.01, 0.04.
func TestGLBMetres(t *testing.T) {
	const float32Tol = 1e-7 // float32 keeps 7 significant digits
	_, rec := record(t, "../../testdata/scenes/fixture.toml")
	path := filepath.Join(t.TempDir(), AnimationFile)
	if err := rec.WriteGLB(path); err != nil {
		t.Fatal(err)
	}
	doc, err := gltf.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	block := doc.Nodes[3]
	want := [3]float64{0.02, 0.01, 0.04}
	for i := range want {
		if math.Abs(block.Translation[i]-want[i]) > float32Tol {
			t.Fatalf("block starts at %v m, want %v", block.Translation, want)
		}
	}
	if doc.Nodes[0].Rotation[0] > -0.7 {
		t.Errorf("the root node turns +z up to glTF's +Y by -90 degrees about x; got %v", doc.Nodes[0].Rotation)
	}
}

// TestPicturesShowTheFall checks that the pictures of a dropped bracket
// show it: pixels of its colour, reaching lower in the end picture than at
// the start (the end picture also draws its path, which ends above its
// lowest point).
func TestPicturesShowTheFall(t *testing.T) {
	_, rec := record(t, "../../testdata/scenes/drop.toml")
	dir := t.TempDir()
	start, end := filepath.Join(dir, StartPicture), filepath.Join(dir, EndPicture)
	if err := rec.WritePictures(start, end); err != nil {
		t.Fatal(err)
	}
	var rows [2]float64
	for i, p := range []string{start, end} {
		img := viewtest.ReadPNG(t, p)
		if b := img.Bounds(); b.Dx() != pictureWidth || b.Dy() != pictureHeight {
			t.Fatalf("%s is %v, want %dx%d", p, b, pictureWidth, pictureHeight)
		}
		n, lowest := 0, 0
		for y := 0; y < pictureHeight; y++ {
			for x := 0; x < pictureWidth; x++ {
				r, g, b, _ := img.At(x, y).RGBA()
				// The orange of the palette, shaded: red well above blue.
				if r>>8 > 60 && b>>8 < 40 && r > 2*g/3*1 && r > 3*b {
					n++
					lowest = max(lowest, y)
				}
			}
		}
		if n < 200 {
			t.Fatalf("%s shows %d pixels of the block's colour, want a visible block", p, n)
		}
		rows[i] = float64(lowest)
	}
	if rows[1] <= rows[0] {
		t.Errorf("the bracket reaches down to row %.0f at the start and %.0f at the end: it fell, so it must be lower", rows[0], rows[1])
	}
}

func mustAbs(t *testing.T, p string) string {
	a, err := filepath.Abs(p)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// TestRoundSize checks the floor's tile sizes: the 1-2-5 series of scale
// bars and instrument ranges (common drafting practice), rounded down.
func TestRoundSize(t *testing.T) {
	const tol = 1e-12 // decimal powers of ten in floating point
	for _, c := range []struct{ x, want float64 }{
		{37, 20}, {0.06, 0.05}, {1, 1}, {9.99, 5}, {0.0199, 0.01}, {2e3, 2e3},
	} {
		if got := roundSize(c.x); math.Abs(got-c.want) > tol*c.want {
			t.Errorf("roundSize(%g) = %g, want %g", c.x, got, c.want)
		}
	}
}

// TestFixturesPalerThanParts checks that a driven track and a static
// blade, both of the block's material, are drawn paler (nearer the light
// grey background) than the block, so that the part stands out on its
// tooling.
func TestFixturesPalerThanParts(t *testing.T) {
	_, rec := record(t, "../../testdata/feeder/wiper.toml")
	colour := map[string][3]float64{}
	for _, b := range rec.Bodies {
		if len(b.Parts) > 0 {
			c := b.Parts[0].Colour
			colour[b.Name] = [3]float64{float64(c.R), float64(c.G), float64(c.B)}
		}
	}
	// saturation is the spread of the channels: a colour mixed toward
	// grey has less of it.
	saturation := func(c [3]float64) float64 {
		return math.Max(c[0], math.Max(c[1], c[2])) - math.Min(c[0], math.Min(c[1], c[2]))
	}
	part := saturation(colour["block"])
	for _, fixture := range []string{"track", "blade"} {
		if got := saturation(colour[fixture]); !(got < part) {
			t.Errorf("%s drawn in %v, as saturated as the block's %v: the part does not stand out", fixture, colour[fixture], colour["block"])
		}
	}
}
