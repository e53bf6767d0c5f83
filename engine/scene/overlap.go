package scene

import (
	"errors"

	"clatter/engine"
)

// checkOverlaps refuses bodies that start inside each other, at the line
// of the body to move.
func (s *Scene) checkOverlaps(w *engine.World, ids []engine.BodyID) error {
	err := w.CheckOverlaps()
	var oe *engine.OverlapError
	if !errors.As(err, &oe) {
		return err
	}
	line := 0
	for i, id := range ids {
		if id == oe.Inner {
			line = s.Bodies[i].Line
		}
	}
	return Errors{{File: s.File, Line: line, Msg: oe.Error(), Cause: oe}}
}
