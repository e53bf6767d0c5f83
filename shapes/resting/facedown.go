package resting

import (
	"math"

	"clatter/shapes"
)

// FaceDownTolerance is the angle in radians within which FaceDown accepts a
// face as the one the part rests on. It is well above the tilt that contact
// slop leaves on a part at rest (a sink of s across a face of width w tilts
// it by about s/w: 0.5 mm across 20 mm is 0.025 rad) and below the angle
// between the faces of ordinary parts; when several faces are within it, the
// closest wins.
const FaceDownTolerance = 0.05

// FaceDown returns the index of the face a part rests on when gravity points
// along down (any length) in the part's frame: the face whose outward normal
// is closest in angle to down, or for a curved face the one whose surface
// normals include a direction that close (down perpendicular to its Axis),
// provided the angle is at most FaceDownTolerance. It returns -1 when no face
// is that close (the part leans on something, or it is a ball) or down is
// zero or not finite.
func FaceDown(faces []Face, down shapes.Vec3) int {
	return FaceDownWithin(faces, down, FaceDownTolerance)
}

// FaceDownWithin is FaceDown with the angle tolerance tol in radians.
func FaceDownWithin(faces []Face, down shapes.Vec3, tol float64) int {
	l := down.Len()
	if !(l > 0) || math.IsInf(l, 0) {
		return -1
	}
	d := down.Mul(1 / l)
	best, bestAng := -1, math.Inf(1)
	for i, f := range faces {
		var ang float64
		if f.Curved() {
			// Angle between d and the plane perpendicular to the axis.
			ang = math.Asin(math.Min(1, math.Abs(d.Dot(f.Axis.Normalize()))))
		} else {
			ang = math.Atan2(d.Cross(f.Normal).Len(), d.Dot(f.Normal))
		}
		if ang <= tol && ang < bestAng {
			best, bestAng = i, ang
		}
	}
	return best
}
