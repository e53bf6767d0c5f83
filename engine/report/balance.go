package report

import "clatter/engine"

// atRest reports whether a body is asleep or slower than the world's rest
// speed and spin.
func atRest(w *engine.World, id engine.BodyID) bool {
	cfg := w.Config()
	return !w.Awake(id) || w.Velocity(id).Len() < cfg.RestSpeed && w.Spin(id).Len() < cfg.RestSpin
}

// Balanced returns "edge" or "corner" for a body that rests balanced on an
// edge or a corner (see engine.World.Balanced), nil otherwise: when it
// rests on a face (onFace), touches nothing or is not at rest.
func Balanced(w *engine.World, id engine.BodyID, onFace, touching bool) *string {
	if onFace || !touching || !atRest(w, id) {
		return nil
	}
	b := w.Balanced(id)
	if b == engine.NotBalanced {
		return nil
	}
	s := b.String()
	return &s
}
