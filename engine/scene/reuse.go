package scene

import "clatter/engine"

// BuildIn is BuildWith into a world that already exists: it empties w
// (engine.World.Reset, which keeps its buffers and prepared meshes) and
// puts the scene into it. A worker of a study builds each trial in its one
// world this way; the result is the same, bit for bit, as a world made by
// BuildWith. A zero engine.World is fine as w. After an error w holds part
// of the scene, or nothing, and must be built again before use.
func (s *Scene) BuildIn(w *engine.World, cfg engine.Config) ([]engine.BodyID, error) {
	if err := w.Reset(cfg); err != nil {
		return nil, s.fail(s.lineOf("world"), "[world]: %v", err)
	}
	return s.build(w)
}
