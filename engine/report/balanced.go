package report

import (
	"clatter/engine"
	"clatter/shapes"
	"clatter/shapes/resting"
)

// Balanced says whether a body at rest stands balanced with its centre
// of mass above an edge or a corner, an unstable equilibrium that any
// disturbance tips: "edge" or "corner", or "" when it rests on a face, is
// not at rest, or its shape has no edges and corners (a ball, a capsule).
// A cylinder standing on its rim stands on an edge. The corners that
// carry it are those whose height above the lowest is within
// resting.FaceDownTolerance of its distance from it: the tilt within
// which FaceDown would take a face for the one it rests on.
func Balanced(w *engine.World, id engine.BodyID, faces []resting.Face, touching bool) string {
	if !touching || len(faces) == 0 || RestingFace(w, id, faces, touching) >= 0 {
		return ""
	}
	cfg := w.Config()
	if w.Awake(id) && (w.Velocity(id).Len() >= cfg.RestSpeed || w.Spin(id).Len() >= cfg.RestSpin) {
		return ""
	}
	down := w.ShapePose(id).RotateInv(cfg.Gravity)
	if !(down.Len() > 0) {
		return ""
	}
	down = down.Normalize()
	var corners []shapes.Vec3
	switch s := w.Shape(id).(type) {
	case shapes.Box:
		for i := 0; i < 8; i++ {
			c := s.Half
			for k := 0; k < 3; k++ {
				if i&(1<<k) != 0 {
					c[k] = -c[k]
				}
			}
			corners = append(corners, c)
		}
	case *shapes.Hull:
		corners = s.Vertices
	case shapes.Cylinder:
		return "edge" // neither on a cap nor on its side: on its rim
	default:
		return ""
	}
	return supportKind(corners, down)
}

// supportKind counts the corners on which a body with these corners
// stands when gravity points along down (unit): "corner" for one, "edge"
// for more in a line, "" for more spread over an area.
func supportKind(corners []shapes.Vec3, down shapes.Vec3) string {
	low := 0
	for i, c := range corners {
		if c.Dot(down) > corners[low].Dot(down) {
			low = i
		}
	}
	var on []shapes.Vec3
	for _, c := range corners {
		d := c.Sub(corners[low])
		if corners[low].Dot(down)-c.Dot(down) <= resting.FaceDownTolerance*d.Len() {
			on = append(on, d)
		}
	}
	if len(on) == 1 {
		return "corner"
	}
	// In a line when every offset is parallel to the longest one.
	far := on[0]
	for _, d := range on {
		if d.Len() > far.Len() {
			far = d
		}
	}
	for _, d := range on {
		if d.Cross(far).Len() > resting.FaceDownTolerance*d.Len()*far.Len() {
			return ""
		}
	}
	return "edge"
}
