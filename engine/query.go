package engine

// Touching reports whether the body had a contact point at or inside the
// slop with another body in the last step's narrow phase: it rests on or
// leans against something. A body asleep since before the last step is not
// examined again; it keeps the pairs it had as it fell asleep.
func (w *World) Touching(id BodyID) bool {
	r := &w.collision.rest
	if id < 0 || int(id) >= len(w.b.kind) {
		return false
	}
	if int(id) < len(r.mark) && r.stamp != 0 && r.mark[id] == r.stamp {
		return true
	}
	return int(id) < len(r.count) && r.count[id] > 0
}
