package collide

import "clatter/internal/scratch"

// Reset empties the Detector for a new world: it forgets every pair and
// mesh it has met, its counters and its persistence setting, and is then
// what NewDetector returns, except that it keeps the memory of its
// buffers (zeroed), so that a study that runs trial after trial in one
// world makes no new ones. Every field not handed on here starts from its
// zero value, as in a new Detector.
func (d *Detector) Reset() {
	old := *d
	*d = Detector{
		epaW:      scratch.Reuse(old.epaW),
		epaA:      scratch.Reuse(old.epaA),
		epaB:      scratch.Reuse(old.epaB),
		epaFaces:  scratch.Reuse(old.epaFaces),
		epaEdges:  scratch.Reuse(old.epaEdges),
		epaKilled: scratch.Reuse(old.epaKilled),
		polyP:     old.polyP.reused(),
		polyQ:     old.polyQ.reused(),
		cylP:      old.cylP.reused(),
		clip0:     scratch.Reuse(old.clip0),
		clip1:     scratch.Reuse(old.clip1),
		featA:     feature{pts: scratch.Reuse(old.featA.pts)},
		featB:     feature{pts: scratch.Reuse(old.featB.pts)},
		cand:      scratch.Reuse(old.cand),
		tris:      scratch.Reuse(old.tris),
		meshMem:   meshMemory{entries: scratch.Reuse(old.meshMem.entries)},
		meshCands: scratch.Reuse(old.meshCands),
		groups:    scratch.Reuse(old.groups),
		capWalk:   scratch.Reuse(old.capWalk),
		restFace:  scratch.Reuse(old.restFace),
		patchPts:  scratch.Reuse(old.patchPts),
		patchHull: scratch.Reuse(old.patchHull),
		cache:     pairCache{prev: scratch.Reuse(old.cache.prev), cur: scratch.Reuse(old.cache.cur)},
		faceCos:   scratch.Reuse(old.faceCos),
		faceSgn:   scratch.Reuse(old.faceSgn),
		persist:   persistMem{mem: scratch.Reuse(old.persist.mem), add: scratch.Reuse(old.persist.add)},
		warm:      warmMem{mem: scratch.Reuse(old.warm.mem), add: scratch.Reuse(old.warm.add)},
	}
}

// reused is an empty polytope with p's buffers.
func (p *polytope) reused() polytope {
	return polytope{vbuf: scratch.Reuse(p.vbuf), pbuf: scratch.Reuse(p.pbuf), arcs: scratch.Reuse(p.arcs), sideCos: scratch.Reuse(p.sideCos)}
}

// reused is an empty cylinder partner with c's buffers.
func (c *cylPolytope) reused() cylPolytope {
	return cylPolytope{verts: scratch.Reuse(c.verts), norms: scratch.Reuse(c.norms), edges: scratch.Reuse(c.edges),
		dirs: scratch.Reuse(c.dirs), vz: scratch.Reuse(c.vz), vr: scratch.Reuse(c.vr), vd: scratch.Reuse(c.vd)}
}
