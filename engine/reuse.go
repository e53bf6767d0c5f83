package engine

import (
	"fmt"
	"math"

	"clatter/collide"
	"clatter/internal/scratch"
	"clatter/shapes"
)

// Reset empties the world for another run with settings cfg: no bodies,
// materials, joints, drives, gates, kicks or events, time zero, and no
// memory of contacts, sleep or energy. Afterwards the world behaves
// exactly as NewWorld(cfg) would, bit for bit, but it keeps the memory of
// its buffers, the broad and narrow phase and the solver (zeroed), the
// narrow phase's form of the triangle meshes it used since the last Reset
// (their hierarchies are built once, not once a run) and the principal
// axes of its bodies' inertia. A study that runs
// trial after trial in one world so makes next to no garbage, which is
// what lets its workers run side by side without contending for the
// collector.
//
// The zero World is ready for use once Reset (NewWorld is a Reset of a
// zero World). Slices that the world returned before (Events, Crossings)
// must not be used after Reset. On an error (a bad cfg) the world is left
// as it was.
func (w *World) Reset(cfg Config) error {
	if err := cfg.fill(); err != nil {
		return fmt.Errorf("world: %w", err)
	}
	old := *w
	*w = World{cfg: cfg, settledAt: math.NaN()}
	w.materials = append(scratch.Reuse(old.materials), Material{Name: "default", Friction: 0.5, StaticFriction: 0.5})
	w.pairs, w.soft.laws = scratch.Reuse(old.pairs), scratch.Reuse(old.soft.laws)
	w.buildPairTable()
	w.b = old.b.reused()
	w.kicks = scratch.Reuse(old.kicks)
	w.motorChanges = scratch.Reuse(old.motorChanges)
	w.flight, w.pushed = scratch.Reuse(old.flight), scratch.Reuse(old.pushed)
	w.active = activeSet{ids: scratch.Reuse(old.active.ids), slept: scratch.Reuse(old.active.slept), dozed: scratch.Reuse(old.active.dozed)}
	w.collision = old.collision.reused()
	w.nap = napState{on: scratch.Reuse(old.nap.on), ids: scratch.Reuse(old.nap.ids), due: scratch.Reuse(old.nap.due),
		bad: scratch.Reuse(old.nap.bad), start: scratch.Reuse(old.nap.start)}
	w.steady = steadyState{vel: scratch.Reuse(old.steady.vel), spin: scratch.Reuse(old.steady.spin)}
	w.ledger.at = scratch.Reuse(old.ledger.at) // the bodies' energies at the ledger's low (ledger.go)
	w.initCollision()
	w.kept = old.kept.next()
	return nil
}

// reused is an empty body table with b's buffers.
func (b *bodyData) reused() bodyData {
	return bodyData{
		name: scratch.Reuse(b.name), kind: scratch.Reuse(b.kind), shape: scratch.Reuse(b.shape), mat: scratch.Reuse(b.mat),
		offset: scratch.Reuse(b.offset), pos: scratch.Reuse(b.pos), rot: scratch.Reuse(b.rot), vel: scratch.Reuse(b.vel),
		spin: scratch.Reuse(b.spin), mass: scratch.Reuse(b.mass), invM: scratch.Reuse(b.invM), axes: scratch.Reuse(b.axes),
		moments: scratch.Reuse(b.moments), radius: scratch.Reuse(b.radius), bounds: scratch.Reuse(b.bounds),
		awake: scratch.Reuse(b.awake), restFor: scratch.Reuse(b.restFor), maxHit: scratch.Reuse(b.maxHit),
	}
}

// reused is an empty collision state with c's buffers, broad and narrow
// phase and solver (emptied by initCollision).
func (c *collisionState) reused() collisionState {
	return collisionState{
		bp: c.bp, det: c.det, solver: c.solver,
		margin: scratch.Reuse(c.margin), pose: scratch.Reuse(c.pose), local: scratch.Reuse(c.local),
		planes: planeSet{ids: scratch.Reuse(c.planes.ids), filter: scratch.Reuse(c.planes.filter),
			sap: scratch.Reuse(c.planes.sap), found: scratch.Reuse(c.planes.found), nd: scratch.Reuse(c.planes.nd)},
		pairs: scratch.Reuse(c.pairs), manifolds: scratch.Reuse(c.manifolds), points: scratch.Reuse(c.points),
		bodies: scratch.Reuse(c.bodies), inertia: scratch.Reuse(c.inertia), rows: scratch.Reuse(c.rows),
		touching: scratch.Reuse(c.touching), prevTouching: scratch.Reuse(c.prevTouching),
		rest: restState{pairs: scratch.Reuse(c.rest.pairs), count: scratch.Reuse(c.rest.count), out: scratch.Reuse(c.rest.out),
			merged: scratch.Reuse(c.rest.merged), mark: scratch.Reuse(c.rest.mark)},
		sleep: sleepState{ring: scratch.Reuse(c.sleep.ring), wokePass: scratch.Reuse(c.sleep.wokePass), woken: scratch.Reuse(c.sleep.woken),
			memory: scratch.Reuse(c.sleep.memory), buf: scratch.Reuse(c.sleep.buf), pairs: scratch.Reuse(c.sleep.pairs)},
		parent: scratch.Reuse(c.parent), size: scratch.Reuse(c.size), islandRest: scratch.Reuse(c.islandRest),
		isl: islandState{stamp: scratch.Reuse(c.isl.stamp), reps: scratch.Reuse(c.isl.reps), doze: scratch.Reuse(c.isl.doze),
			isle: scratch.Reuse(c.isl.isle), dozing: scratch.Reuse(c.isl.dozing)},
		skip: apartSkip{moves: scratch.Reuse(c.skip.moves),
			prev: scratch.Reuse(c.skip.prev), cur: scratch.Reuse(c.skip.cur)},
	}
}

// kept is what a world works out from a shape or a body's mass
// properties once and keeps through Reset: the values used since the last
// Reset and those of the run before, so that a world reset for trial after
// trial of one scene works each out once, while values no longer used are
// let go. Each value is a function of its key alone, so a kept value is
// the one a new world would work out.
type kept[K comparable, V any] struct {
	cur, prev map[K]V
}

// get returns the value of k, worked out by make once.
func (c *kept[K, V]) get(k K, make func(K) V) V {
	if v, ok := c.cur[k]; ok {
		return v
	}
	v, ok := c.prev[k]
	if !ok {
		v = make(k)
	}
	if c.cur == nil {
		c.cur = map[K]V{}
	}
	c.cur[k] = v
	return v
}

// next is the cache for the next run.
func (c kept[K, V]) next() kept[K, V] {
	clear(c.prev)
	return kept[K, V]{cur: c.prev, prev: c.cur}
}

// keptState is what Reset keeps: the narrow phase's form of static
// triangle meshes (collide.NewMesh: adjacency and bounding volume
// hierarchy; neither a collide.Mesh nor a TriMesh given to a world is
// changed afterwards), and the principal axes of inertia tensors.
type keptState struct {
	meshes     kept[*shapes.TriMesh, *collide.Mesh]
	principals kept[shapes.Mat3, principal]
}

func (k *keptState) next() keptState {
	return keptState{meshes: k.meshes.next(), principals: k.principals.next()}
}

// principal is what shapes.Principal returns.
type principal struct {
	moments shapes.Vec3
	axes    shapes.Mat3
	err     error
}

// principal is shapes.Principal of a body's inertia tensor, worked out
// once.
func (w *World) principal(inertia shapes.Mat3) (shapes.Vec3, shapes.Mat3, error) {
	p := w.kept.principals.get(inertia, func(in shapes.Mat3) principal {
		m, a, err := shapes.Principal(in)
		return principal{m, a, err}
	})
	return p.moments, p.axes, p.err
}

// mesh is collide.NewMesh of m, made once.
func (w *World) mesh(m *shapes.TriMesh) *collide.Mesh {
	return w.kept.meshes.get(m, collide.NewMesh)
}
