package engine

import "slices"

// Naps: the rest timer's wait without its steps.
//
// An island falls asleep once its bodies have been below the rest
// thresholds for RestTime (sleep.go). Until then it is stepped in full: a
// part dropped on a floor spends a quarter of its trial waiting out the
// timer, some 250 steps at 1 ms, and once its contacts have converged those
// steps change its state by rounding alone (velocities of 1e-17 m/s).
//
// An island whose bodies all move slower than napSpeed, and that touches
// nothing but static bodies, is put to sleep at once instead, by the
// machinery of sleep.go and sleep_wake.go, but as a nap: its bodies still
// count as awake (World.Awake), their rest time runs on, and their Sleep
// events and Settled come when it has run out, at the step they would have
// come without the nap. Any other body's pair with a napping one, or a
// kick, a push or a placement, wakes the island without Wake events and
// with its bodies' rest time as it was (unless the wake itself restarts it,
// as World.wake does for the body it acts on); the island is then stepped
// in full again from the pose it napped in.
//
// What a nap changes is the motion it leaves out: below napSpeed, the rest
// of the wait would have moved a body by less than napFraction of the slop,
// and the island's sleep at the end of it would have dropped its velocity
// anyway.

// napFraction is the largest part of the slop by which the steps a nap
// leaves out could have moved a body: a millionth of the slop, 0.1 nm at
// the default, far below anything a contact resolves (the slop itself) or
// the solver's Tolerance over a rest time (25 nm at 0.1 um/s for 0.25 s).
// A resting part's velocity falls below it some thirty steps into the
// wait (measured: DropTrial's part), so the nap still spares most of it.
const napFraction = 1e-6

// napState holds the napping bodies.
type napState struct {
	on    []bool   // by body: napping
	ids   []BodyID // the napping bodies, in id order (and, if stale, some that woke)
	stale bool     // a body in ids has woken
	due   []BodyID // the napping bodies whose rest ran out this step
	bad   []uint32 // by island root, == isl.mark: the island cannot nap
	start []BodyID // the bodies that start a nap this step
	off   bool     // no naps: the tests' reference
}

// napping reports whether body id naps.
func (w *World) napping(id BodyID) bool {
	return int(id) < len(w.nap.on) && w.nap.on[id]
}

// napSpeed is the speed below which a body may nap: over the rest time it
// moves less than napFraction of the slop.
func (w *World) napSpeed() float64 {
	return napFraction * w.cfg.Slop / w.cfg.RestTime
}

// napRest runs the rest time of the napping bodies on by dt, as
// updateRest does for the awake ones (a napping body is at rest), and
// reports whether all of them have rested RestTime.
func (w *World) napRest(dt float64) bool {
	w.dropNaps()
	all := true
	for _, id := range w.nap.ids {
		w.b.restFor[id] += dt
		if w.b.restFor[id] < w.cfg.RestTime {
			all = false
		}
	}
	return all
}

// napsDue ends the naps of the islands whose every napping body has rested
// RestTime: from now on they sleep as any island does. It returns them in
// id order, for their Sleep events.
func (w *World) napsDue() []BodyID {
	n := &w.nap
	n.due = n.due[:0]
	if len(n.ids) == 0 {
		return n.due
	}
	ring := w.collision.sleep.ring
	for _, id := range n.ids {
		due := true
		for j := id; ; {
			if w.napping(j) && w.b.restFor[j] < w.cfg.RestTime {
				due = false
				break
			}
			if j = BodyID(ring[j]); j == id {
				break
			}
		}
		if due {
			n.due = append(n.due, id)
		}
	}
	for _, id := range n.due {
		n.on[id] = false
	}
	n.stale = len(n.due) > 0
	w.dropNaps()
	return n.due
}

// dropNaps removes from the list the bodies no longer napping.
func (w *World) dropNaps() {
	n := &w.nap
	if !n.stale {
		return
	}
	n.stale = false
	k := 0
	for _, id := range n.ids {
		if n.on[id] {
			n.ids[k] = id
			k++
		}
	}
	n.ids = n.ids[:k]
}

// napStart picks the islands that nap from this step: every body of the
// island dynamic, awake, slower than napSpeed, resting for some time but
// less than RestTime, and the island kept awake by nothing (islandRest
// above zero: no moving kinematic body, no free flight) and touching no
// sleeping island. Worlds with joints or compliant contacts do not nap.
// It returns the bodies, in id order, to fall asleep with isl.dozing.
func (w *World) napStart(awake []BodyID) []BodyID {
	n := &w.nap
	n.start = n.start[:0]
	c := &w.collision
	if n.off || len(w.mech.joints) > 0 || w.soft.on || !(w.cfg.RestTime > 0) {
		return n.start
	}
	for len(n.on) < len(w.b.kind) {
		n.on = append(n.on, false)
		n.bad = append(n.bad, 0)
	}
	v2 := w.napSpeed() * w.napSpeed()
	still := func(id BodyID) bool {
		r2 := w.b.radius[id] * w.b.radius[id]
		// The position pass's pseudo-velocities too: a body it is still
		// pushing out of an overlap (one placed by hand) must not nap in it.
		vp, wp := w.pseudoVelocity(id)
		return w.b.vel[id].LenSqr() < v2 && w.b.spin[id].LenSqr()*r2 < v2 &&
			vp.LenSqr() < v2 && wp.LenSqr()*r2 < v2
	}
	if !slices.ContainsFunc(awake, func(id BodyID) bool { return w.b.kind[id] == Dynamic && still(id) }) {
		return n.start // the common case while anything moves: no island to look at
	}
	mark := c.isl.mark
	for _, id := range awake {
		if w.b.kind[id] == Dynamic {
			if r := w.find(int32(id)); !(c.islandRest[r] > 0 && c.islandRest[r] < w.cfg.RestTime) || !still(id) {
				n.bad[r] = mark
			}
		}
	}
	for _, rep := range c.isl.reps { // a sleeping island in contact
		n.bad[w.find(rep)] = mark
	}
	for _, id := range awake {
		if w.b.kind[id] == Dynamic && n.bad[w.find(int32(id))] != mark {
			n.start = append(n.start, id)
			n.on[id] = true
			n.ids = append(n.ids, id)
		}
	}
	if len(n.start) > 0 {
		slices.Sort(n.ids)
	}
	return n.start
}

// wakeNapping wakes the island of a napping body that another body's pair
// has reached (collidePair): it is stepped in full again, with its rest
// time as it was.
func (w *World) wakeNapping(a, b BodyID) {
	for _, id := range [2]BodyID{a, b} {
		if w.napping(id) {
			w.wakeIsland(id)
		}
	}
}

// wakeNaps wakes every napping island: a static or kinematic body was
// placed or set moving by hand, and what napped on it must feel it.
func (w *World) wakeNaps() {
	for _, id := range w.nap.ids {
		if w.napping(id) {
			w.wakeIsland(id)
		}
	}
}

// endNap is wakeOne's part for a napping body: it reports whether id
// napped, and ends its nap.
func (w *World) endNap(id BodyID) bool {
	if !w.napping(id) {
		return false
	}
	w.nap.on[id], w.nap.stale = false, true
	return true
}

// emitSleeps emits the Sleep events of the step in id order: those of the
// bodies that fall asleep (isl.dozing without the naps that start) and of
// the naps that end.
func (w *World) emitSleeps(asleep, due []BodyID) {
	i, j := 0, 0
	for i < len(asleep) || j < len(due) {
		var id BodyID
		if j >= len(due) || i < len(asleep) && asleep[i] < due[j] {
			id, i = asleep[i], i+1
		} else {
			id, j = due[j], j+1
		}
		w.emit(Event{Kind: Sleep, Time: w.time, A: id, B: -1})
	}
}
