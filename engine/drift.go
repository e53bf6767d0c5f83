package engine

import "clatter/shapes"

// A body that nothing touched, held or pushed in a step is in free flight,
// and without gravity it keeps its velocity for ever (Newton's first law).
// Slower than the rest thresholds it counts as resting, as the scene's
// rest_speed defines, but it must not fall asleep: sleeping sets a body's
// velocity to zero, and a drifting body would stop dead, its momentum lost
// (a striker left at 5 mm/s by a cradle's impacts stopped 0.25 s later).
// Under gravity a body in flight is never slow for long, so this matters
// for bodies without gravity, and costs only their staying awake.

// keepDriftersAwake keeps awake the island of every awake body that moves
// in free flight this step.
func (w *World) keepDriftersAwake(awake []BodyID) {
	for _, id := range awake {
		if w.b.kind[id] != Dynamic || !w.inFlight(int(id)) {
			continue
		}
		if w.b.vel[id] != (shapes.Vec3{}) || w.b.spin[id] != (shapes.Vec3{}) {
			w.collision.islandRest[w.find(int32(id))] = 0
		}
	}
}
