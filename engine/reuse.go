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
// its buffers, the broad and narrow phase and the solver (zeroed), and the
// narrow phase's form of the triangle meshes it used since the last Reset
// (their hierarchies are built once, not once a run). A study that runs
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
	w.materials = []Material{{Name: "default", Friction: 0.5, StaticFriction: 0.5}}
	w.buildPairTable()
	w.b = old.b.reused()
	w.kicks = scratch.Reuse(old.kicks)
	w.motorChanges = scratch.Reuse(old.motorChanges)
	w.flight, w.pushed = scratch.Reuse(old.flight), scratch.Reuse(old.pushed)
	w.active = activeSet{ids: scratch.Reuse(old.active.ids), slept: scratch.Reuse(old.active.slept), dozed: scratch.Reuse(old.active.dozed)}
	w.collision = old.collision.reused()
	w.initCollision()
	w.meshes = old.meshes.next()
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
		margin: scratch.Reuse(c.margin), pose: scratch.Reuse(c.pose),
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
	}
}

// meshCache holds the narrow phase's form of the static triangle meshes
// (collide.NewMesh: adjacency and bounding volume hierarchy) that the
// world has used since its last Reset and those of the run before, so that
// a world reset for trial after trial of one scene builds each once. A
// collide.Mesh is not changed after it is made, and a TriMesh given to a
// world must not be changed either, so the two runs see the same mesh.
type meshCache struct {
	cur, prev map[*shapes.TriMesh]*collide.Mesh
}

// mesh returns the narrow phase's form of m, made once.
func (mc *meshCache) mesh(m *shapes.TriMesh) *collide.Mesh {
	if me, ok := mc.cur[m]; ok {
		return me
	}
	me, ok := mc.prev[m]
	if !ok {
		me = collide.NewMesh(m)
	}
	if mc.cur == nil {
		mc.cur = make(map[*shapes.TriMesh]*collide.Mesh)
	}
	mc.cur[m] = me
	return me
}

// next is the cache for the next run: the meshes of this run, kept while
// the next uses them; older ones are let go.
func (mc meshCache) next() meshCache {
	clear(mc.prev)
	return meshCache{cur: mc.prev, prev: mc.cur}
}
