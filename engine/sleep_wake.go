package engine

import (
	"slices"

	"clatter/contact"
)

// Waking. A sleeping island wakes as a whole, and only when something acts
// on it: a contact point of a moving body that penetrates it or closes on
// it within the step (not a mere overlap of bounding boxes), a kick, a
// changed pose or velocity, a moving support. Its contacts then resume with
// the impulses they carried when it fell asleep (warm starting; Catto,
// "Iterative dynamics with temporal coherence", 2005), so a woken pile
// holds its load from the first step instead of settling again from zero.

// sleepState holds the islands of sleeping bodies and their contacts' memory.
type sleepState struct {
	// ring links the bodies of each island of the last rest update in a
	// cycle (ring[i] is the next body of i's island), so that waking one
	// body wakes its island in time proportional to its size.
	ring []int32
	// wokePass is, for a body woken during this step's narrow phase, the
	// pass of pairs that woke it (1 for the broad phase's pairs); 0 for the
	// others. woken lists the bodies woken since the narrow phase began.
	wokePass []int32
	woken    []BodyID
	pass     int32
	// memory holds the warm-start memory of the contacts of sleeping
	// bodies; recall is set when a body has woken since the last solve.
	memory []sleptPoint
	recall bool
	buf    []contact.Memory
	pairs  [][2]int32
}

// sleptPoint is a remembered contact point of a sleeping body.
type sleptPoint struct {
	a, b BodyID
	m    contact.Memory
}

// beginWakes starts the narrow phase's record of woken bodies.
func (w *World) beginWakes() {
	s := &w.collision.sleep
	for _, id := range s.woken {
		if int(id) < len(s.wokePass) {
			s.wokePass[id] = 0
		}
	}
	s.woken = s.woken[:0]
	s.pass = 1
	for len(s.wokePass) < len(w.b.kind) {
		s.wokePass = append(s.wokePass, 0)
	}
}

// presses reports whether a contact point of the pair just found by the
// narrow phase presses on its bodies: it penetrates, or its gap closes,
// by the end of the step at the bodies' present velocities. A body that
// only passes near a sleeping one (their bounds overlap, their surfaces do
// not meet) does not press on it.
func (w *World) presses(a, b BodyID, dt float64) bool {
	for _, mf := range w.collision.manifolds {
		for k := 0; k < mf.Count; k++ {
			pt := &mf.Points[k]
			va := w.b.vel[a].Add(w.b.spin[a].Cross(pt.Position.Sub(w.b.pos[a])))
			vb := w.b.vel[b].Add(w.b.spin[b].Cross(pt.Position.Sub(w.b.pos[b])))
			vn := vb.Sub(va).Dot(mf.Normal) // < 0: closing
			if pt.Separation+min(vn, 0)*dt < 0 {
				return true
			}
		}
	}
	return false
}

// wakeIsland wakes the sleeping bodies of id's island (id itself asleep).
func (w *World) wakeIsland(id BodyID) {
	s := &w.collision.sleep
	if int(id) >= len(s.ring) {
		w.wakeOne(id)
		return
	}
	for j := id; ; {
		if w.b.kind[j] == Dynamic && !w.b.awake[j] {
			w.wakeOne(j)
		}
		if j = BodyID(s.ring[j]); j == id {
			break
		}
	}
}

// wakeOne wakes one sleeping dynamic body and whatever is jointed to it.
func (w *World) wakeOne(id BodyID) {
	s := &w.collision.sleep
	napped := w.endNap(id) // its rest time runs on, and it never slept (nap.go)
	w.b.awake[id] = true
	if !napped {
		w.b.restFor[id] = 0
	}
	if int(id) < len(w.collision.isl.isle) {
		w.collision.isl.isle[id] = int32(id) // its island is no longer asleep (sleep.go)
	}
	w.setActive(id, true)
	w.wokeUp(id)                 // (active.go)
	w.collision.rest.woke = true // (touching.go)
	s.recall = true
	if int(id) < len(s.wokePass) {
		s.wokePass[id] = s.pass
	}
	s.woken = append(s.woken, id)
	if !napped {
		w.emit(Event{Kind: Wake, Time: w.time, A: id, B: -1})
	}
	w.wakeJointed(id) // (jointsleep.go)
}

// collideWoken finishes the narrow phase for bodies woken during it. They
// missed this step's gravity and their pairs with bodies that were asleep
// or static when the broad phase ran: both are made up here, pass after
// pass while the new pairs wake more islands.
func (w *World) collideWoken(dt float64) {
	c := &w.collision
	s := &c.sleep
	g := w.cfg.Gravity.Mul(dt)
	touched := len(c.touching)
	for done := 0; done < len(s.woken); {
		batch := s.woken[done:]
		done = len(s.woken)
		for _, id := range batch {
			w.b.vel[id] = w.b.vel[id].Add(g)
			w.moveBounds(id, dt)
		}
		pass := s.pass
		s.pass++
		s.pairs = w.broadPairs(s.pairs)
		for _, p := range s.pairs {
			a, b := BodyID(p[0]), BodyID(p[1])
			// The pass's pairs: at least one body woken in the last pass,
			// and neither awake before it (those pairs were done already).
			if min(w.level(a), w.level(b)) == pass {
				w.collidePair(a, b, dt)
			}
		}
	}
	if len(c.touching) > touched {
		sortTouching(c.touching)
	}
}

// level is the pass of pairs a body took part in first this step: 0 if it
// was awake (or kinematic) when the narrow phase began, the pass after the
// one that woke it, or a large number while it sleeps or is static.
func (w *World) level(id BodyID) int32 {
	const never = 1 << 30
	switch {
	case w.b.kind[id] == Static || !w.b.awake[id]:
		return never
	case w.collision.sleep.wokePass[id] > 0:
		return w.collision.sleep.wokePass[id]
	}
	return 0
}

// linkSleepers joins each island falling asleep this step (its awake
// bodies, isl.dozing, and the sleeping islands it touches) into one ring
// and one sleeping island, whose representative is the island's root.
// Two distinct rings become one by swapping the successors of one body of
// each.
func (w *World) linkSleepers() {
	c := &w.collision
	s, isl := &c.sleep, &c.isl
	for _, id := range isl.dozing {
		s.ring[id] = int32(id)
		isl.doze[w.find(int32(id))] = isl.mark
	}
	for _, id := range isl.dozing {
		if r := w.find(int32(id)); r != int32(id) {
			s.ring[id], s.ring[r] = s.ring[r], s.ring[id]
			isl.isle[id] = r
		}
	}
	for _, rep := range isl.reps {
		if r := w.find(rep); r != rep && isl.doze[r] == isl.mark {
			s.ring[rep], s.ring[r] = s.ring[r], s.ring[rep]
			isl.isle[rep] = r
		}
	}
}

// rememberSleepers keeps, from the step's solve, the memory of every
// contact point whose bodies are now all asleep or static: the solver will
// not see those points again until their island wakes.
func (w *World) rememberSleepers() {
	c := &w.collision
	still := func(id int32) bool {
		return w.b.kind[id] == Static || w.b.kind[id] == Dynamic && !w.b.awake[id]
	}
	for i := range c.points {
		p := &c.points[i]
		if still(p.A) && still(p.B) && p.NormalImpulse > 0 {
			c.sleep.memory = append(c.sleep.memory, sleptPoint{BodyID(p.A), BodyID(p.B), c.solver.Remembered(i)})
		}
	}
}

// recallWoken hands the solver back the memory of the contacts of bodies
// that have woken since the last solve.
func (w *World) recallWoken() {
	c := &w.collision
	s := &c.sleep
	if !s.recall {
		return
	}
	s.recall = false
	awake := func(id BodyID) bool { return w.b.kind[id] == Dynamic && w.b.awake[id] }
	s.buf = s.buf[:0]
	kept := s.memory[:0]
	for _, e := range s.memory {
		if awake(e.a) || awake(e.b) {
			s.buf = append(s.buf, e.m)
		} else {
			kept = append(kept, e)
		}
	}
	s.memory = kept
	c.solver.Recall(s.buf)
}

// sortTouching puts touching pairs back in the broad phase's order.
func sortTouching(t []touchPair) {
	slices.SortFunc(t, func(x, y touchPair) int {
		if x.a != y.a {
			return int(x.a) - int(y.a)
		}
		return int(x.b) - int(y.b)
	})
}
