package engine

import "clatter/shapes"

// The bodies that move. A sleeping body's state does not change while it
// sleeps, so the per-step passes (gravity, bounds, integration, the
// finiteness check, the energy guard's sums) walk the list of awake bodies
// instead of every body: a resting world's step costs what its awake bodies
// cost. The list is rebuilt, in id order so that sums keep their order,
// only when a body falls asleep, wakes or is added.

// activeSet holds the awake bodies and the energy ledger of the sleeping ones.
type activeSet struct {
	ids   []BodyID // awake dynamic and kinematic bodies, in id order
	stale bool     // a body slept or woke since ids was built
	n     int      // bodies when ids was built
	// sleepPot is the potential energy of the sleeping bodies (their
	// kinetic energy is zero), kept as they fall asleep and wake, so that
	// the guard's totals include them without visiting them.
	sleepPot float64
	sleepers int
	slept    []float64 // each sleeper's share of sleepPot, by id
	dozed    []BodyID  // fell asleep since the last finiteness check
	// poseAll asks the next narrow phase to recompute every body's pose,
	// not only the awake ones' (a body was placed by hand).
	poseAll bool
	// end holds the energies the guard summed at the end of step endStep
	// (linear and rotational kinetic, potential); the next step starts
	// from them unless a body was woken, moved or pushed by hand since.
	end     [3]float64
	endStep int
	endN    int // bodies then
	endOK   bool
	// floor is the guard's energy floor (checkEnergy) for floorN bodies
	// under gravity floorG.
	floor  float64
	floorN int
	floorG shapes.Vec3
}

// awakeBodies returns the awake dynamic and kinematic bodies in id order.
// The slice is rebuilt in place when bodies sleep or wake: a loop over it
// must not wake or put to sleep a body.
func (w *World) awakeBodies() []BodyID {
	a := &w.active
	if a.stale || a.n != len(w.b.kind) {
		a.ids = a.ids[:0]
		for i, k := range w.b.kind {
			if k != Static && w.b.awake[i] {
				a.ids = append(a.ids, BodyID(i))
			}
		}
		a.stale, a.n = false, len(w.b.kind)
	}
	return a.ids
}

// fellAsleep and wokeUp keep the list and the ledger of a dynamic body
// that has just fallen asleep (velocities already zero) or woken.
func (w *World) fellAsleep(id BodyID) {
	a := &w.active
	a.stale = true
	for len(a.slept) <= int(id) {
		a.slept = append(a.slept, 0)
	}
	a.slept[id] = w.potential(id)
	a.sleepPot += a.slept[id]
	a.sleepers++
	a.dozed = append(a.dozed, id)
	if c := &w.collision; int(id) < len(c.pose) {
		p := w.ShapePose(id) // the pose it sleeps in
		if c.skip.tracking() {
			c.skip.moved(id, &c.pose[id], &p) // (apartskip.go)
		}
		c.pose[id] = p
	}
}

// shapePoses brings each body's shape pose for this step up to date: all
// of them when bodies were added or placed by hand, else the awake ones
// (the others have not moved).
func (w *World) shapePoses() {
	c := &w.collision
	if len(c.pose) != len(w.b.kind) || w.active.poseAll {
		c.planes.ndOK = false // (planes.go)
		c.pose = c.pose[:0]
		for i := range w.b.kind {
			c.pose = append(c.pose, w.ShapePose(BodyID(i)))
		}
		c.skip.resetMotion(len(c.pose)) // (apartskip.go)
		w.active.poseAll = false
		return
	}
	track := c.skip.tracking() // (apartskip.go)
	for _, id := range w.awakeBodies() {
		p := w.ShapePose(id)
		if track {
			c.skip.moved(id, &c.pose[id], &p)
		}
		c.pose[id] = p
	}
}

func (w *World) wokeUp(id BodyID) {
	a := &w.active
	a.stale = true
	if a.sleepers--; a.sleepers <= 0 {
		a.sleepPot, a.sleepers = 0, 0 // no drift of the ledger's rounding
	} else {
		a.sleepPot -= a.slept[id]
	}
}

// potential is a dynamic body's gravitational potential energy, -m g . x.
func (w *World) potential(id BodyID) float64 {
	return -w.b.mass[id] * w.cfg.Gravity.Dot(w.b.pos[id])
}

// awakeEnergies returns, in one pass over the awake dynamic bodies, their
// linear and rotational kinetic energy and their potential energy plus
// that of the sleeping bodies.
func (w *World) awakeEnergies() (lin, rot, pot float64) {
	g := w.cfg.Gravity
	for _, id := range w.awakeBodies() {
		if w.b.kind[id] != Dynamic {
			continue
		}
		v := &w.b.vel[id]
		m := w.b.mass[id]
		lin += 0.5 * m * (v[0]*v[0] + v[1]*v[1] + v[2]*v[2])
		rot += w.spinEnergy(id)
		pot -= m * g.Dot(w.b.pos[id])
	}
	return lin, rot, pot + w.active.sleepPot
}

// awakeLinear is the linear kinetic energy of the awake dynamic bodies.
func (w *World) awakeLinear() float64 {
	e := 0.0
	for _, id := range w.awakeBodies() {
		if w.b.kind[id] == Dynamic {
			v := &w.b.vel[id]
			e += 0.5 * w.b.mass[id] * (v[0]*v[0] + v[1]*v[1] + v[2]*v[2])
		}
	}
	return e
}

// energyFloor is the guard's floor: the energy of each dynamic body lifted
// by a hundredth of its own size, so that resting bodies' rounding never
// trips the guard. It changes only with the bodies and gravity.
func (w *World) energyFloor() float64 {
	a := &w.active
	if a.floorN != len(w.b.kind) || a.floorG != w.cfg.Gravity {
		floor, g := 0.0, w.cfg.Gravity.Len()
		for i, k := range w.b.kind {
			if k == Dynamic {
				floor += w.b.mass[i] * g * w.b.radius[i] * 0.01
			}
		}
		a.floor, a.floorN, a.floorG = floor, len(w.b.kind), w.cfg.Gravity
	}
	return a.floor
}

// startEnergies returns the energies at the start of a step, as
// awakeEnergies, reusing the sums of the last step's end when nothing has
// changed them since.
func (w *World) startEnergies() (lin, rot, pot float64) {
	a := &w.active
	if a.endOK && a.endStep == w.steps && a.endN == len(w.b.kind) {
		return a.end[0], a.end[1], a.end[2]
	}
	return w.awakeEnergies()
}

// endEnergies sums the energies at the end of a step for the guard and
// keeps them for the next step's start.
func (w *World) endEnergies() (lin, rot, pot float64) {
	lin, rot, pot = w.awakeEnergies()
	a := &w.active
	a.end, a.endStep, a.endN, a.endOK = [3]float64{lin, rot, pot}, w.steps, len(w.b.kind), true
	return lin, rot, pot
}

// stateChanged drops the kept energies: a body was woken, placed, pushed
// or gravity changed between steps.
func (w *World) stateChanged() { w.active.endOK = false }
