package engine

// Static supports placed by hand. A static body never moves by itself, so
// the step neither pairs it with sleeping bodies nor moves its bounds in
// the broad phase; an island asleep on it stays asleep until something
// acts on the island. When a program places the static body elsewhere
// (World.SetPose: a support lowered, swung away or taken out of reach)
// what slept on it has lost its support and must fall, and what sleeps
// where it now is must feel it: both are woken here.

// staticMoved updates a static body's bounds after it was placed by hand
// and wakes the sleeping islands that touched it or that its new place
// reaches.
func (w *World) staticMoved(id BodyID) {
	c := &w.collision
	w.b.bounds[id] = w.worldBounds(id, 0)
	plane := unbounded(w.b.shape[id])
	if !plane {
		_ = c.bp.Move(int32(id), w.b.bounds[id])
	}
	// The islands it held: pairs with it set aside while they sleep
	// (touching.go), and the step's pairs.
	for _, list := range [2][]touchPair{c.rest.pairs, c.touching} {
		for _, p := range list {
			switch id {
			case p.a:
				w.wakeSleeper(p.b)
			case p.b:
				w.wakeSleeper(p.a)
			}
		}
	}
	// The islands its new place reaches: their bounds (grown by their
	// margins when they fell asleep) overlap its bounds, or reach its
	// plane.
	var pw planeWorld
	if plane {
		pw = w.planeInWorld(id)
	}
	for i, k := range w.b.kind {
		if k != Dynamic || w.b.awake[i] || !w.collision.local[i].finite {
			continue
		}
		if plane && boxReaches(&w.b.bounds[i], &pw, 0) || !plane && w.b.bounds[i].Overlaps(w.b.bounds[id]) {
			w.wakeSleeper(BodyID(i))
		}
	}
}

// wakeSleeper wakes the island of body id if it is dynamic and asleep.
func (w *World) wakeSleeper(id BodyID) {
	if w.b.kind[id] == Dynamic && !w.b.awake[id] {
		w.wake(id)
	}
}
