package engine

// Touching reports whether the body had a contact point at or inside the
// slop with another body in the last step's narrow phase: it rests on or
// leans against something. A body asleep since before the last step is not
// examined again; it keeps the pairs it had as it fell asleep.
func (w *World) Touching(id BodyID) bool {
	for _, p := range w.collision.touching {
		if p.a == id || p.b == id {
			return true
		}
	}
	return false
}
