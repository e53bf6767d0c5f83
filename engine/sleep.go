package engine

// Islands and sleeping. Bodies joined by touching contacts form islands
// (union-find with path halving and union by size); an island whose every
// body has been below the rest thresholds for RestTime sleeps as a whole,
// and wakes as a whole when a contact presses on it or it is kicked
// (sleep_wake.go).

// find returns the root of i's island.
func (w *World) find(i int32) int32 {
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
	n := len(w.b.kind)
	c := &w.collision
	c.parent = c.parent[:0]
	c.size = c.size[:0]
	c.islandRest = c.islandRest[:0]
	for i := 0; i < n; i++ {
		c.parent = append(c.parent, int32(i))
		c.size = append(c.size, 1)
		c.islandRest = append(c.islandRest, 0)
	}
	rs2, rw2 := w.cfg.RestSpeed*w.cfg.RestSpeed, w.cfg.RestSpin*w.cfg.RestSpin
	allRest := true
	anyDynamic := false
	for i, k := range w.b.kind {
		if k != Dynamic {
			continue
		}
		anyDynamic = true
		if !w.b.awake[i] {
			continue
		}
		if w.b.vel[i].LenSqr() < rs2 && w.b.spin[i].LenSqr() < rw2 {
			w.b.restFor[i] += dt
		} else {
			w.b.restFor[i] = 0
		}
		if w.b.restFor[i] < w.cfg.RestTime {
			allRest = false
		}
	}
	for _, p := range c.touching {
		a, b := p.a, p.b
		if w.b.kind[a] == Dynamic && w.b.kind[b] == Dynamic {
			w.union(int32(a), int32(b))
		}
	}
	w.unionJoints() // jointed bodies share an island (joint.go)
	if anyDynamic && allRest && !w.settled && !w.pending() {
		w.settled, w.settledAt = true, w.time
		w.emit(Event{Kind: Settled, Time: w.time, A: -1, B: -1})
	}
	if w.cfg.NoSleep {
		return
	}
	// An island rests as long as its least rested body; touching a moving
	// kinematic body keeps it awake.
	for i := range c.islandRest {
		c.islandRest[i] = w.cfg.RestTime
	}
	for i, k := range w.b.kind {
		if k != Dynamic || !w.b.awake[i] {
			continue
		}
		r := w.find(int32(i))
		if w.b.restFor[i] < c.islandRest[r] {
			c.islandRest[r] = w.b.restFor[i]
		}
	}
	for _, p := range c.touching {
		for _, pair := range [2][2]BodyID{{p.a, p.b}, {p.b, p.a}} {
			if w.b.kind[pair[0]] == Kinematic && w.b.kind[pair[1]] == Dynamic {
				c.islandRest[w.find(int32(pair[1]))] = 0
			}
		}
	}
	w.jointsKeepAwake() // jointed to a moving kinematic body (joint.go)
	w.buildRings()      // (sleep_wake.go)
	slept := false
	for i, k := range w.b.kind {
		if k != Dynamic || !w.b.awake[i] {
			continue
		}
		if c.islandRest[w.find(int32(i))] >= w.cfg.RestTime {
			w.sleep(BodyID(i))
			slept = true
		}
	}
	if slept {
		w.rememberSleepers() // (sleep_wake.go)
	}
}

func (w *World) sleep(id BodyID) {
	w.b.awake[id] = false
	w.b.vel[id], w.b.spin[id] = [3]float64{}, [3]float64{}
	w.setActive(id, false)
	w.fellAsleep(id) // (active.go)
	w.emit(Event{Kind: Sleep, Time: w.time, A: id, B: -1})
}

// wake restarts a dynamic body's rest time and wakes it, with its island,
// if it sleeps.
func (w *World) wake(id BodyID) {
	if w.b.kind[id] != Dynamic {
		return
	}
	w.b.restFor[id] = 0
	if !w.b.awake[id] {
		w.wakeIsland(id) // (sleep_wake.go)
	}
}
