package engine

// Islands and sleeping. Bodies joined by touching contacts form islands
// (union-find with path halving and union by size); an island whose every
// body has been below the rest thresholds for RestTime sleeps as a whole,
// and wakes as a whole when a contact presses on it or it is kicked
// (sleep_wake.go).
//
// The union-find of a step covers the awake bodies only, and a sleeping
// island enters it as one node (its representative, islandOf) when an
// awake body touches it; the sleeping islands keep the links and rings
// they fell asleep with. So the step's island work follows the awake
// bodies, not every body.

// islandState holds the step's union-find and the sleeping islands.
type islandState struct {
	// The step's union-find (collisionState's parent, size and
	// islandRest) covers the nodes stamped with the step's mark; a node
	// not stamped this step is a root of size 1 whose island rests for
	// RestTime.
	stamp []uint32
	mark  uint32
	reps  []int32 // sleeping islands stamped this step
	// doze marks, with mark, the roots of the islands falling asleep.
	doze []uint32
	// isle links each sleeping body toward its island's representative
	// (itself for an awake body).
	isle []int32
	// dozing: the awake bodies that fall asleep this step.
	dozing []BodyID
	// dynamic is the number of dynamic bodies among the first counted.
	dynamic, counted int
}

// growIslands sizes the per-body arrays of the islands for n bodies.
func (w *World) growIslands(n int) {
	c := &w.collision
	s := &c.isl
	for len(s.isle) < n {
		i := int32(len(s.isle))
		c.parent = append(c.parent, i)
		c.size = append(c.size, 1)
		c.islandRest = append(c.islandRest, 0)
		s.stamp = append(s.stamp, 0)
		s.doze = append(s.doze, 0)
		s.isle = append(s.isle, i)
		c.sleep.ring = append(c.sleep.ring, i)
	}
}

// islandOf is the representative of a sleeping body's island, or the body
// itself when it is awake, static or kinematic.
func (w *World) islandOf(i int32) int32 {
	s := &w.collision.isl
	for s.isle[i] != i {
		s.isle[i] = s.isle[s.isle[i]]
		i = s.isle[i]
	}
	return i
}

// node returns i's node in the step's union-find, creating it on first use.
func (w *World) node(i int32) int32 {
	c := &w.collision
	s := &c.isl
	i = w.islandOf(i)
	if s.stamp[i] != s.mark {
		s.stamp[i] = s.mark
		c.parent[i], c.size[i] = i, 1
		c.islandRest[i] = w.cfg.RestTime
		if w.b.kind[i] == Dynamic && !w.b.awake[i] {
			s.reps = append(s.reps, i)
		}
	}
	return i
}

// find returns the root of i's island this step.
func (w *World) find(i int32) int32 {
	i = w.node(i)
	p := w.collision.parent
	for p[i] != i {
		p[i] = p[p[i]]
		i = p[i]
	}
	return i
}

func (w *World) union(a, b int32) {
	ra, rb := w.find(a), w.find(b)
	if ra == rb {
		return
	}
	s := w.collision.size
	if s[ra] < s[rb] {
		ra, rb = rb, ra
	}
	w.collision.parent[rb] = ra
	s[ra] += s[rb]
}

// updateRest tracks each body's time at rest, puts resting islands to
// sleep and reports Settled once every dynamic body rests.
func (w *World) updateRest(dt float64) {
	c := &w.collision
	s := &c.isl
	n := len(w.b.kind)
	w.growIslands(n)
	if s.mark++; s.mark == 0 { // wrapped: clear the stamps
		clear(s.stamp)
		clear(s.doze)
		clear(w.nap.bad) // (nap.go)
		s.mark = 1
	}
	s.reps = s.reps[:0]
	for ; s.counted < n; s.counted++ {
		if w.b.kind[s.counted] == Dynamic {
			s.dynamic++
		}
	}
	rs2, rw2 := w.cfg.RestSpeed*w.cfg.RestSpeed, w.cfg.RestSpin*w.cfg.RestSpin
	allRest := true
	awake := w.awakeBodies()
	for _, id := range awake {
		if w.b.kind[id] != Dynamic {
			continue
		}
		if w.b.vel[id].LenSqr() < rs2 && w.b.spin[id].LenSqr() < rw2 {
			if w.unsteady(id) { // slow but gaining speed is not at rest (steady.go)
				w.b.restFor[id] = 0
			}
			w.b.restFor[id] += dt
		} else {
			w.b.restFor[id] = 0
		}
		if w.b.restFor[id] < w.cfg.RestTime {
			allRest = false
		}
	}
	if !w.napRest(dt) { // napping bodies rest on (nap.go)
		allRest = false
	}
	// The step's touching pairs each have an awake body; the pairs of two
	// sleeping bodies are already inside their islands.
	for _, p := range c.touching {
		a, b := p.a, p.b
		if w.b.kind[a] == Dynamic && w.b.kind[b] == Dynamic {
			w.union(int32(a), int32(b))
		}
	}
	w.unionJoints() // jointed bodies share an island (jointsleep.go)
	if s.dynamic > 0 && allRest && !w.settled && !w.pending() {
		w.settled, w.settledAt = true, w.time
		w.emit(Event{Kind: Settled, Time: w.time, A: -1, B: -1})
	}
	if w.cfg.NoSleep {
		return
	}
	// An island rests as long as its least rested body; touching a moving
	// kinematic body keeps it awake.
	for _, id := range awake {
		if w.b.kind[id] != Dynamic {
			continue
		}
		r := w.find(int32(id))
		if w.b.restFor[id] < c.islandRest[r] {
			c.islandRest[r] = w.b.restFor[id]
		}
	}
	for _, p := range c.touching {
		for _, pair := range [2][2]BodyID{{p.a, p.b}, {p.b, p.a}} {
			if w.b.kind[pair[0]] == Kinematic && w.b.kind[pair[1]] == Dynamic {
				c.islandRest[w.find(int32(pair[1]))] = 0
			}
		}
	}
	w.jointsKeepAwake()        // jointed to a moving kinematic body (jointsleep.go)
	w.keepDriftersAwake(awake) // in free flight (drift.go)
	s.dozing = s.dozing[:0]
	for _, id := range awake {
		if w.b.kind[id] == Dynamic && c.islandRest[w.find(int32(id))] >= w.cfg.RestTime {
			s.dozing = append(s.dozing, id)
		}
	}
	// Islands whose rest ran out while they napped sleep for good, and
	// islands that are still enough nap from now on (nap.go).
	due := w.napsDue()
	asleep := len(s.dozing)
	s.dozing = append(s.dozing, w.napStart(awake)...)
	if len(s.dozing) == 0 {
		w.emitSleeps(nil, due)
		return
	}
	w.linkSleepers() // (sleep_wake.go)
	for _, id := range s.dozing {
		w.sleep(id)
	}
	w.emitSleeps(s.dozing[:asleep], due)
	w.rememberSleepers() // (sleep_wake.go)
}

func (w *World) sleep(id BodyID) {
	w.b.awake[id] = false
	w.b.vel[id], w.b.spin[id] = [3]float64{}, [3]float64{}
	w.setActive(id, false)
	w.fellAsleep(id) // (active.go)
}

// wake restarts a dynamic body's rest time and wakes it, with its island,
// if it sleeps.
func (w *World) wake(id BodyID) {
	w.stateChanged() // the energies kept for the guard are stale (active.go)
	if w.b.kind[id] != Dynamic {
		w.wakeNaps() // a support placed or set moving by hand (nap.go)
		return
	}
	w.b.restFor[id] = 0
	if !w.b.awake[id] {
		w.wakeIsland(id) // (sleep_wake.go)
	}
}
