package collide

import (
	"math"
	"testing"

	"clatter/shapes"
	"clatter/testdata/gen/partgen"

	"github.com/go-gl/mathgl/mgl64"
)

// restPointTol is how far the kept points may lie from the face's plane, as
// a length: the face of a generated cylinder is flat to rounding (1e-15 m);
// the fillet's first ring stands 17 um above it, so 1 um tells them apart.
const restPointTol = 1e-6

// TestRestingFaceKeepsItsCorners stands a cylinder with filleted edges on
// its end face, 10 um above a floor, flat and tilted by 1e-4 rad (far less
// than restBand): the four points kept are corners of the end face (by
// construction all at the face's height, plus the tilt), not the higher,
// wider-spread points of the fillet beside it. Tilted by 3e-3 rad it leans
// on the face's rim: the points kept are the rim's lowest, within reduce's
// contactBand of the deepest (the ones that carry it), not the fillet's
// speculative points higher up.
func TestRestingFaceKeepsItsCorners(t *testing.T) {
	g := partgen.FilletCylinder(128, 10, 30, 2, 12)
	var pts []shapes.Vec3
	for _, p := range g.V {
		pts = append(pts, shapes.Vec3{p[0], p[1], p[2]}.Mul(1e-3))
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	const lift = 1e-5
	for _, c := range []struct {
		tilt   float64
		onFace bool
	}{{0, true}, {1e-4, true}, {3e-3, true}} {
		q := mgl64.QuatRotate(c.tilt, shapes.Vec3{1, 0, 0})
		pose := shapes.Pose{Orientation: q, Position: shapes.Vec3{0, 0, lift}}
		floor := shapes.Pose{Orientation: mgl64.QuatIdent()}
		ms := NewDetector().Collide(nil, shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, floor, h, pose, 3e-4)
		if len(ms) != 1 || ms[0].Count != 4 {
			t.Fatalf("tilt %g: want one manifold of 4 points, got %v", c.tilt, ms)
		}
		// The end face's height at a point's distance y from the tilt axis
		// (the rotation takes (0, y, 0) of the part to (0, y cos, y sin)).
		onFace := true
		for _, p := range ms[0].Points[:4] {
			want := lift + p.Position[1]*math.Tan(c.tilt)
			if math.Abs(p.Separation-want) > restPointTol {
				onFace = false
			}
		}
		if onFace != c.onFace {
			t.Errorf("tilt %g: points on the end face %v, want %v: %+v", c.tilt, onFace, c.onFace, ms[0].Points)
		}
	}
}
