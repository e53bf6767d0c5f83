package engine

import (
	"math"

	"clatter/collide"
	"clatter/collide/broad"
	"clatter/contact"
	"clatter/internal/splitmix"
	"clatter/shapes"
)

// collisionState holds the broad phase, the narrow phase, the solver and
// their per-step buffers, all reused from step to step.
type collisionState struct {
	bp     *broad.SAP
	det    *collide.Detector
	solver *contact.Solver
	margin []float64     // speculative margin of each body this step
	local  []localBounds // each body's shape bounds in its own frame, taken once
	pose   []shapes.Pose // each body's shape pose this step, computed once

	planes    planeSet // planes, kept out of the sweep (planes.go)
	pairs     [][2]int32
	manifolds []collide.Manifold
	points    []contact.Point
	bodies    []contact.Body
	inertia   []shapes.Mat3 // world inertia tensor of each awake dynamic body this step
	rows      []contact.Row

	touching, prevTouching []touchPair // pairs with an awake body, this step and the last
	rest                   restState   // touching pairs of still bodies (touching.go)
	sleep                  sleepState  // islands, wakes and the warm memory of sleepers (sleep_wake.go)

	parent, size []int32   // the step's union-find of islands (sleep.go)
	islandRest   []float64 // by island root: how long its least rested body has rested
	isl          islandState
	skip         apartSkip // pairs apart by the room their bound left (apartskip.go)
}

// touchPair is a pair of bodies with at least one contact point at or
// inside the slop this step, and where its largest impulse acted.
type touchPair struct{ a, b BodyID }

// initCollision sets up the broad and narrow phase and the solver, new or
// emptied (a world's Reset keeps them).
func (w *World) initCollision() {
	c := &w.collision
	if c.bp == nil {
		c.bp, c.det, c.solver = broad.New(), collide.NewDetector(), &contact.Solver{}
	} else {
		c.bp.Reset()
		c.det.Reset()
	}
	c.det.SetPersistence(w.cfg.Slop) // resting pairs refresh their points (collide/persist.go)
	// A body at rest moves far less than the slop in a step, so the sweep
	// reuses its pairs while each body's bounds stay within the slop of
	// where they were last swept (collide/broad/slack.go); the pairs are
	// the same as without.
	c.bp.SetSlack(w.cfg.Slop)
	s := contact.DefaultSettings()
	s.VelocityIterations = w.cfg.VelocityIterations
	s.PositionIterations = w.cfg.PositionIterations
	s.Slop = w.cfg.Slop
	c.det.SetSlopSize(s.SlopSize) // as the solver's slop: small for small parts (collide/persistsize.go)
	c.solver.Clear(s)
}

// prepareShape turns a static triangle mesh into the narrow phase's mesh
// with its bounding volume hierarchy, built once.
func (w *World) prepareShape(s shapes.Shape) shapes.Shape {
	if m, ok := s.(*shapes.TriMesh); ok {
		return w.mesh(m) // made once (reuse.go)
	}
	return s
}

func (w *World) addToBroadPhase(id BodyID, cat, mask uint32) error {
	c := &w.collision
	kind := broad.Dynamic
	if w.b.kind[id] == Static {
		kind = broad.Static
	}
	w.b.bounds[id] = w.worldBounds(id, 0)
	if unbounded(w.b.shape[id]) {
		w.addPlane(id) // (planes.go)
	} else if err := c.bp.Insert(int32(id), w.b.bounds[id], kind); err != nil {
		return err
	} else if err := c.bp.SetFilter(int32(id), cat, mask); err != nil {
		return err
	}
	c.margin = append(c.margin, 0)
	c.local = append(c.local, shapeBounds(w.b.shape[id]))
	c.planes.filter = append(c.planes.filter, [2]uint32{cat, mask})
	return nil
}

func (w *World) setActive(id BodyID, active bool) {
	_ = w.collision.bp.SetAsleep(int32(id), !active)
}

// worldBounds is the body's shape bounds in the world, grown by margin.
func (w *World) worldBounds(id BodyID, margin float64) shapes.AABB {
	b := w.b.shape[id].Bounds()
	if !finiteVec(b.Min) || !finiteVec(b.Max) {
		return b // a plane: unbounded
	}
	return b.Transform(w.ShapePose(id)).Grow(margin)
}

// collide runs the broad and narrow phases and fills the contact points.
func (w *World) collide(dt float64) {
	c := &w.collision
	w.shapePoses() // (active.go)
	w.beginWakes() // sleep_wake.go
	for _, id := range w.awakeBodies() {
		w.moveBounds(id, dt)
	}
	c.pairs = w.broadPairs(c.pairs) // (planes.go)
	c.points = c.points[:0]
	w.soft.pts = w.soft.pts[:0] // compliant.go
	c.prevTouching, c.touching = c.touching, c.prevTouching[:0]
	for _, p := range c.pairs {
		w.collidePair(BodyID(p[0]), BodyID(p[1]), dt)
	}
	w.collideWoken(dt) // pairs of the islands that this loop woke (sleep_wake.go)
	c.det.NextStep()
	c.skip.nextStep()
	w.contactEvents()
}

// localBounds is a shape's bounds in its own frame and whether they are
// finite (not a plane's). A body's shape does not change once added, and
// its bounds were a tenth of a flying part's step behind an interface call
// and the finiteness tests.
type localBounds struct {
	box    shapes.AABB
	finite bool
}

func shapeBounds(s shapes.Shape) localBounds {
	b := s.Bounds()
	return localBounds{box: b, finite: finiteVec(b.Min) && finiteVec(b.Max)}
}

// moveBounds grows an awake body's bounds by its speculative margin: how
// far its surface can travel this step, plus its slop (the step, stage 2).
func (w *World) moveBounds(id BodyID, dt float64) {
	c := &w.collision
	m := (w.b.vel[id].Len()+w.b.spin[id].Len()*w.b.radius[id])*dt + w.bodySlop(id) // (slop.go)
	if w.soft.on {
		m += w.softLookAhead(int(id)) // compliant.go
	}
	c.margin[id] = m
	if lb := &c.local[id]; lb.finite {
		w.b.bounds[id] = lb.box.Transform(c.pose[id]).Grow(m)
	} else {
		w.b.bounds[id] = lb.box // a plane: unbounded, outside the broad phase
		return
	}
	_ = c.bp.Move(int32(id), w.b.bounds[id])
}

// collidePair runs the narrow phase on one pair from the broad phase and
// appends its contact points.
func (w *World) collidePair(a, b BodyID, dt float64) {
	c := &w.collision
	ka, kb := w.b.kind[a], w.b.kind[b]
	if ka != Dynamic && kb != Dynamic {
		return // kinematic against static or kinematic: nothing to solve
	}
	if w.jointedApart(a, b) {
		return // linked by a joint (joint.go)
	}
	if len(w.nap.ids) > 0 {
		w.wakeNapping(a, b) // another body reaches a napping island (nap.go)
	}
	margin := c.margin[a] + c.margin[b]
	if ka == Static {
		margin = c.margin[b]
	} else if kb == Static {
		margin = c.margin[a]
	}
	// The pair's key lets the narrow phase reuse what it found last step.
	key := uint64(uint32(a))<<32 | uint64(uint32(b))
	if !w.soft.on && w.skipApart(a, b, key, margin) {
		return // apart by the room its bound left (apartskip.go)
	}
	c.manifolds = c.det.CollidePair(c.manifolds[:0], key, w.b.shape[a], c.pose[a], w.b.shape[b], c.pose[b], margin)
	if len(c.manifolds) == 0 && !w.soft.on {
		w.noteApart(a, b, key)
	}
	// A sleeping body wakes, with its island, only when a contact presses on it.
	if (ka == Dynamic && !w.b.awake[a] || kb == Dynamic && !w.b.awake[b]) && w.presses(a, b, dt) {
		if ka == Dynamic && !w.b.awake[a] {
			w.wake(a)
		}
		if kb == Dynamic && !w.b.awake[b] {
			w.wake(b)
		}
	}
	if len(c.manifolds) == 0 && !w.soft.on {
		return // apart, as most pairs of the broad phase are
	}
	nmat := len(w.materials)
	coef := w.pairs[int(w.b.mat[a])*nmat+int(w.b.mat[b])]
	if w.soft.on && w.softPair(a, b, c.manifolds, coef) {
		return // a compliant pair: springs, not rows (compliant.go)
	}
	if len(c.manifolds) == 0 {
		return // apart, as most pairs of the broad phase are
	}
	touch := false
	slop := w.pairSlop(a, b)      // (slop.go)
	sv := w.surfaceVelocity(a, b) // conveyors (driver.go)
	turning := w.turns(a) || w.turns(b)
	for m := range c.manifolds {
		mf := &c.manifolds[m]
		for k := 0; k < mf.Count; k++ {
			pt := &mf.Points[k]
			if pt.Separation <= slop {
				touch = true
			}
			svk := sv
			if turning { // a turning support's material moves along arcs (turning.go)
				at := pt.Position
				if mf.PatchRadius > 0 {
					at = mf.PatchCenter // the patch's friction acts there (contact/twist.go)
				}
				svk = sv.Add(w.turnSurface(a, b, at, dt))
			}
			// Filled in place: a Point built and then appended is
			// written twice (some 250 bytes).
			c.points = append(c.points, contact.Point{})
			cp := &c.points[len(c.points)-1]
			cp.A, cp.B = int32(a), int32(b)
			cp.Position, cp.Normal, cp.Separation = pt.Position, mf.Normal, pt.Separation
			cp.Friction, cp.StaticFriction, cp.Restitution = coef.Friction, coef.StaticFriction, coef.Restitution
			cp.Key = contactKey(a, b, mf.SubA, mf.SubB, pt.ID)
			cp.PatchCenter, cp.PatchRadius = mf.PatchCenter, mf.PatchRadius // patch friction (contact/twist.go)
			cp.SurfaceVelocity = svk
		}
	}
	if touch {
		c.touching = append(c.touching, touchPair{a, b})
	}
}

// contactKey mixes the bodies, the sub-shapes and the feature id into the
// solver's warm-start key (the SplitMix64 output function, splitmix.Mix):
// equal features give equal keys, and distinct ones collide with
// probability about 2^-64 per pair.
func contactKey(a, b BodyID, subA, subB int32, id uint32) uint64 {
	x := uint64(uint32(a))<<32 | uint64(uint32(b))
	for _, v := range [2]uint64{uint64(uint32(subA))<<32 | uint64(uint32(subB)), uint64(id)} {
		x = splitmix.Mix(x ^ (v + splitmix.Golden + (x << 6) + (x >> 2)))
	}
	return x
}

// contactEvents compares this step's touching pairs with the last step's
// (both in the broad phase's sorted order) and emits begin and end events.
//
// A pair of bodies that are both asleep (or one static) is not examined
// while they sleep; it is set aside, with events or without, so that the
// islands of sleeping bodies hold together (sleep.go), and comes back to
// this comparison when one of them wakes (touching.go).
func (w *World) contactEvents() {
	c := &w.collision
	cur, prev := c.touching, c.prevTouching
	if c.rest.woke {
		prev = w.wokenPairs(prev)
	}
	i, j := 0, 0
	for i < len(cur) || j < len(prev) {
		switch {
		case j >= len(prev) || (i < len(cur) && touchLess(cur[i], prev[j])):
			w.emit(Event{Kind: ContactBegin, Time: w.time, A: cur[i].a, B: cur[i].b})
			i++
		case i >= len(cur) || touchLess(prev[j], cur[i]):
			// A pair that merely fell asleep has not ended its contact.
			if w.b.awake[prev[j].a] || w.b.awake[prev[j].b] {
				w.emit(Event{Kind: ContactEnd, Time: w.time, A: prev[j].a, B: prev[j].b})
			} else {
				w.keepResting(prev[j])
			}
			j++
		default:
			i++
			j++
		}
	}
	w.markTouching()
}

// solve runs the contact solver and records impacts.
func (w *World) solve(dt float64) error {
	c := &w.collision
	if len(c.points) == 0 && len(w.mech.joints) == 0 {
		return nil
	}
	n := len(w.b.kind)
	if cap(c.bodies) < n {
		c.bodies = make([]contact.Body, n)
	}
	c.bodies = c.bodies[:n]
	if len(c.inertia) < n {
		c.inertia = append(c.inertia, make([]shapes.Mat3, n-len(c.inertia))...)
	}
	gdt := w.cfg.Gravity.Mul(dt)
	trees := len(w.mech.joints) > 0 // the joint trees read the inertia itself (jointtree.go)
	for i := 0; i < n; i++ {
		// Field by field: a Body is some two hundred and fifty bytes, and
		// Solve writes Vp and Wp of every body and leaves DW zero.
		sb := &c.bodies[i]
		sb.Position, sb.V, sb.W = w.b.pos[i], w.b.vel[i], w.b.spin[i]
		if w.b.kind[i] == Dynamic && w.b.awake[i] {
			sb.InvMass = w.b.invM[i]
			if trees {
				c.inertia[i], sb.InvInertia = w.inertiaWorld(BodyID(i))
			} else {
				sb.InvInertia = w.invInertiaWorld(BodyID(i))
			}
			sb.DV = gdt             // this step's gravity, already in V (World.step)
			sb.Size = w.b.radius[i] // bounds the sweeps' stopping error (contact/turn.go)
		} else {
			sb.InvMass, sb.InvInertia, sb.DV, sb.Size = 0, shapes.Mat3{}, shapes.Vec3{}, 0
		}
	}
	c.rows = w.jointRows(dt, c.rows[:0]) // joint rows (jointrows.go)
	w.recallWoken()                      // contacts of woken islands resume their load (sleep_wake.go)
	set := &c.solver.Settings
	set.BounceThreshold, set.BounceSteps, set.InelasticThreshold, set.ReboundThreshold = w.bounceThreshold(dt) // bounce.go
	set.SlipSpeed = w.slipSpeed(dt)                                                                            // slip.go
	if _, err := c.solver.Solve(dt, c.bodies, c.points, c.rows); err != nil {
		// Inputs are checked finite when bodies are added and after every
		// step, so this is a blow-up within this step (solveerr.go).
		return w.solveError(err)
	}
	w.afterJointSolve(dt) // exact joint projection and joint forces (jointrows.go)
	for i := 0; i < n; i++ {
		if w.b.kind[i] == Dynamic && w.b.awake[i] {
			w.b.vel[i], w.b.spin[i] = c.bodies[i].V, c.bodies[i].W
		}
	}
	w.markPushed() // flight.go
	w.impactEvents()
	return nil
}

// impactEvents emits one impact event per body pair that the impact phase
// processed this step, at its fastest point.
func (w *World) impactEvents() {
	pts := w.collision.points
	for i := 0; i < len(pts); {
		j := i
		best := -1
		impulse := 0.0
		for ; j < len(pts) && pts[j].A == pts[i].A && pts[j].B == pts[i].B; j++ {
			// With what stopped a deferred impact at its gap in the steps
			// before it arrived: part of the same impact (contact/held.go).
			impulse += pts[j].ImpactImpulse + pts[j].StopImpulse
			if pts[j].ImpactSpeed > 0 && (best < 0 || pts[j].ImpactSpeed > pts[best].ImpactSpeed) {
				best = j
			}
		}
		if best >= 0 {
			p := pts[best]
			a, b := BodyID(p.A), BodyID(p.B)
			w.b.maxHit[a] = math.Max(w.b.maxHit[a], p.ImpactSpeed)
			w.b.maxHit[b] = math.Max(w.b.maxHit[b], p.ImpactSpeed)
			w.emit(Event{Kind: Impact, Time: w.time, A: a, B: b, Point: p.Position, Normal: p.Normal, Speed: p.ImpactSpeed, Impulse: impulse})
		}
		i = j
	}
}

// pseudoVelocity returns the position correction's pseudo-velocities of a body.
func (w *World) pseudoVelocity(id BodyID) (shapes.Vec3, shapes.Vec3) {
	c := &w.collision
	if int(id) >= len(c.bodies) || len(c.points) == 0 && len(c.rows) == 0 && len(w.mech.joints) == 0 {
		return shapes.Vec3{}, shapes.Vec3{}
	}
	return c.bodies[id].Vp, c.bodies[id].Wp
}
