package report

import (
	"math"

	"clatter/engine"
	"clatter/shapes"
	"clatter/shapes/resting"
)

// FaceDown returns the index in faces of the face whose outward normal is
// closest to the direction of gravity for a body whose shape axes are
// turned by q, whether it rests or not: how a part lies as it passes a
// place or ends a run. For a curved face the angle is to the nearest of
// its normals. It is -1 when the shape has no faces (a ball). When the
// body rests on a face, that face is also the one RestingFace gives: both
// take the closest face, RestingFace only within a tolerance.
func FaceDown(faces []resting.Face, q shapes.Quat, gravity shapes.Vec3) int {
	return resting.FaceDownWithin(faces, q.Conjugate().Rotate(gravity), math.Pi)
}

// BodyFaceDown is FaceDown for a body of w as it is now.
func BodyFaceDown(w *engine.World, id engine.BodyID, faces []resting.Face) int {
	return FaceDown(faces, w.Orientation(id), w.Config().Gravity)
}
