package sweep

import (
	"clatter/engine"
	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/shapes"
	"clatter/shapes/resting"
)

// A hull's resting faces depend on the hull and the centre of mass in its
// frame alone, never on a trial's draws or the case's varied values
// (friction, heights, ...), and the scenes of a study's cases share their
// hulls (scene.Scene.With), so a worker works them out once a hull for
// the whole study. The centre of mass is the scene's own (shapes.Mass
// Center, the origin for a driven body), not the one a trial's pose gives
// back, which differs from trial to trial by roundings: the faces then do
// not depend on which trial of a case a worker happens to run first.

// faceKey is what a hull's resting faces are worked out from.
type faceKey struct {
	hull *shapes.Hull
	com  shapes.Vec3
}

// facesOf returns the resting faces of body id, scene body b.
func (wk *worker) facesOf(b *scene.Body, w *engine.World, id engine.BodyID) []resting.Face {
	h, ok := b.Shape.(*shapes.Hull)
	if !ok || w.Shape(id) != b.Shape {
		return report.Faces(w, id)
	}
	key := faceKey{hull: h}
	if w.KindOf(id) == engine.Dynamic {
		key.com = b.Props.Center
	}
	if f, ok := wk.hullFaces[key]; ok {
		return f
	}
	f, err := resting.OfShape(h, key.com)
	if err != nil {
		f = nil // as report.Faces: no faces
	}
	if wk.hullFaces == nil {
		wk.hullFaces = map[faceKey][]resting.Face{}
	}
	wk.hullFaces[key] = f
	return f
}
