package pack

import (
	"math"
	"testing"

	"clatter/shapes"
)

// aboveTol is the corner-drop orientation check: the centre of mass must
// lie vertically above the struck edge or corner to 1e-9 of the box's
// size, the standards' rule (ASTM D5276 sec. 8, ISTA 1A) held to rounding.
const aboveTol = 1e-9

// An off-centre box, a carton with its contents low and to one side.
var (
	carton = shapes.AABB{Min: shapes.Vec3{-0.2, -0.15, -0.125}, Max: shapes.Vec3{0.2, 0.15, 0.125}}
	offCOM = shapes.Vec3{0.03, -0.02, -0.04}
	up     = shapes.Vec3{0, 0, 1}
)

func TestDropOrientationPutsTheCentreOfMassAboveTheFeature(t *testing.T) {
	for _, s := range []string{"corner 2-3-5", "corner 1-4-6", "corner 1-2-5", "edge 3-5", "edge 2-3", "edge 1-6", "edge 2-5"} {
		ft, err := ParseFeature(s)
		if err != nil {
			t.Fatal(err)
		}
		q, err := DropOrientation(carton, offCOM, ft, up)
		if err != nil {
			t.Fatal(err)
		}
		foot := ft.Point(carton, offCOM)
		v := q.Rotate(offCOM.Sub(foot)) // feature to centre of mass, in the world
		horiz := math.Hypot(v[0], v[1]) / carton.Size().Len()
		if horiz > aboveTol || v[2] <= 0 {
			t.Errorf("%s: centre of mass off the vertical through the feature by %g of the diagonal (v = %v)", s, horiz, v)
		}
		// The feature is the lowest part of the box: every corner at or
		// above it (it is convex and the centre of mass is inside).
		low := q.Rotate(foot)[2]
		for k := 0; k < 8; k++ {
			if z := q.Rotate(corner(carton, k))[2]; z < low-aboveTol {
				t.Errorf("%s: corner %d (%v) is below the struck feature", s, k, cornerFaces(k))
			}
		}
	}
}

func TestDropOrientationOfAFaceFacesIt(t *testing.T) {
	for f := Face(1); f <= 6; f++ {
		q, err := DropOrientation(carton, offCOM, Feature{f}, up)
		if err != nil {
			t.Fatal(err)
		}
		n := q.Rotate(f.Normal())
		if n.Sub(shapes.Vec3{0, 0, -1}).Len() > aboveTol {
			t.Errorf("face %d points %v, not down", f, n)
		}
		if got := FaceDown(q.Conjugate().Rotate(shapes.Vec3{0, 0, -1}), 1); got != f {
			t.Errorf("face %d: FaceDown says %d", f, got)
		}
	}
}

func TestParseFeature(t *testing.T) {
	good := map[string]string{"face 3": "face 3", "edge 5-3": "edge 3-5", "corner 5-2-3": "corner 2-3-5", " corner 1-4-6 ": "corner 1-4-6"}
	for in, want := range good {
		ft, err := ParseFeature(in)
		if err != nil || ft.String() != want {
			t.Errorf("ParseFeature(%q) = %v, %v; want %s", in, ft, err, want)
		}
	}
	for _, bad := range []string{"", "face", "face 7", "edge 1-3", "edge 2-4", "corner 2-3-3", "corner 2-3", "side 3", "edge 2-x", "corner 5-6-1"} {
		if ft, err := ParseFeature(bad); err == nil {
			t.Errorf("ParseFeature(%q) = %v, want an error", bad, ft)
		}
	}
}

// The ISTA 1A drop-height table (International Safe Transit Association,
// Procedure 1A), from its published text: below 10 kg 760 mm, 10-19 kg 610
// mm, 19-28 kg 460 mm, 28-45 kg 310 mm, 45-68 kg 200 mm.
func TestHeightByMass(t *testing.T) {
	cases := []struct{ mass, height float64 }{
		{0.1, 0.760}, {9.99, 0.760}, {10, 0.610}, {18.9, 0.610}, {19, 0.460}, {27.9, 0.460},
		{28, 0.310}, {44.9, 0.310}, {45, 0.200}, {67.9, 0.200},
	}
	for _, c := range cases {
		h, err := HeightByMass(c.mass)
		if err != nil || h != c.height {
			t.Errorf("HeightByMass(%g) = %g, %v; want %g", c.mass, h, err, c.height)
		}
	}
	for _, m := range []float64{68, 120, 0, -1, math.NaN()} {
		if h, err := HeightByMass(m); err == nil {
			t.Errorf("HeightByMass(%g) = %g, want an error", m, h)
		}
	}
}

// The ten-drop sequence of the parcel procedures (ISTA 1A): corner 2-3-5,
// the edges from it shortest first, the faces in pairs of smallest area
// first. For a 400 x 300 x 250 carton: edges 2-5 (250), 3-5 (300), 2-3
// (400); face pairs 5-6 (300 x 250), 2-4 (400 x 250), 1-3 (400 x 300).
func TestTenDrops(t *testing.T) {
	want := []string{"corner 2-3-5", "edge 2-5", "edge 3-5", "edge 2-3", "face 5", "face 6", "face 2", "face 4", "face 1", "face 3"}
	got := TenDrops(carton)
	if len(got) != len(want) {
		t.Fatalf("%d drops, want %d", len(got), len(want))
	}
	for i := range want {
		if got[i].String() != want[i] {
			t.Errorf("drop %d is %s, want %s", i+1, got[i], want[i])
		}
	}
}

func TestStruck(t *testing.T) {
	down := shapes.Vec3{0, 0, -1}
	cases := []struct {
		name       string
		point, dir shapes.Vec3
		want       string
	}{
		{"flat on the bottom, point at a corner", shapes.Vec3{-0.2, -0.15, -0.125}, down, "face 3"},
		{"flat on an edge, point at its end", shapes.Vec3{-0.2, -0.15, -0.125}, shapes.Vec3{0, -1, -1}, "edge 2-3"},
		{"on a corner", shapes.Vec3{-0.2, -0.15, -0.125}, shapes.Vec3{-1, -1.3, -1.1}, "corner 2-3-5"},
		{"on the top far end", shapes.Vec3{0.2, 0, 0.125}, shapes.Vec3{1, 0, 1}, "edge 1-6"},
	}
	for _, c := range cases {
		if got := Struck(carton, c.point, c.dir).String(); got != c.want {
			t.Errorf("%s: %q, want %q", c.name, got, c.want)
		}
	}
}
