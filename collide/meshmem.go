package collide

import (
	"clatter/collide/bvh"
	"clatter/shapes"
)

// Temporal coherence for meshes, with a fattened box as in the broad phases
// of Ericson, "Real-Time Collision Detection", 2005 (from memory): a part
// near a static mesh moves little
// from one step to the next, so the triangles near it are found once for a
// generously enlarged box and then picked from that short list while the
// part's box stays inside the enlarged one, without walking the hierarchy.
// The pick applies the hierarchy's own leaf test (triangle box against query
// box) to the same boxes, so it returns exactly the triangles, in the same
// order, that a fresh query would: the memory changes the cost of a query,
// never its result, whatever the order or number of the queries.

// meshReuseGrow: the enlarged box is the query box grown by this fraction
// of its largest half extent on every side. A part then moves a quarter of
// its size before the hierarchy is walked again (a resting or slowly
// sliding part never), while the list it filters holds at most about
// (1.5/1)^2 as many triangles as the part overlaps on a surface.
const meshReuseGrow = 0.25

// meshMemoryCap bounds the number of remembered boxes (each holds its
// triangle list); beyond it the least recently used is replaced.
const meshMemoryCap = 4096

// meshEntry is the candidate list of one enlarged box.
type meshEntry struct {
	mesh *Mesh
	box  shapes.AABB
	hits []bvh.BoxHit // ascending by triangle (mesh indices)
	used uint64       // clock of the last query it answered
}

// meshMemory holds the entries. Queries of a world come in a stable order
// (the broad phase's), so the entry after the last one used is tried first.
type meshMemory struct {
	entries []meshEntry
	last    int
	clock   uint64
	evict   int // where the search for a stale entry resumes
	fills   int // queries that walked the hierarchy
}

// candidates appends to out the triangles of m whose boxes overlap q, in
// ascending order of their index in the mesh: the triangles a walk of the
// hierarchy (m.tree.Query, indices mapped through m.remap) returns.
func (mm *meshMemory) candidates(m *Mesh, q shapes.AABB, out []int32) []int32 {
	if m.tree == nil {
		return out
	}
	mm.clock++
	e := mm.find(m, q)
	if e == nil {
		e = mm.slot()
		mm.fills++
		h := q.Size()
		e.mesh = m
		e.box = q.Grow(meshReuseGrow * 0.5 * max(h[0], h[1], h[2]))
		e.hits = m.tree.QueryBoxes(e.hits[:0], e.box)
		if m.remap != nil {
			for i := range e.hits {
				e.hits[i].Tri = m.remap[e.hits[i].Tri] // monotonic: the order holds
			}
		}
	}
	e.used = mm.clock
	for i := range e.hits {
		if e.hits[i].Box.Overlaps(q) {
			out = append(out, e.hits[i].Tri)
		}
	}
	return out
}

// find returns an entry of m whose box contains q, or nil.
func (mm *meshMemory) find(m *Mesh, q shapes.AABB) *meshEntry {
	n := len(mm.entries)
	for k := 0; k < n; k++ {
		i := mm.last + 1 + k
		if i >= n {
			i -= n
		}
		e := &mm.entries[i]
		if e.mesh == m && contains(e.box, q) {
			mm.last = i
			return e
		}
	}
	return nil
}

// slot returns an entry to refill: one unused for longer than the memory
// has entries (its part has gone), a new one while under the cap, or else
// the least recently used.
func (mm *meshMemory) slot() *meshEntry {
	n := len(mm.entries)
	stale := uint64(2*n + 16)
	for k := 0; k < min(n, 8); k++ {
		i := (mm.evict + k) % n
		if mm.clock-mm.entries[i].used > stale {
			mm.evict = (i + 1) % n
			mm.last = i
			return &mm.entries[i]
		}
	}
	if n < meshMemoryCap {
		mm.entries = append(mm.entries, meshEntry{})
		mm.last = n
		return &mm.entries[n]
	}
	lru := 0
	for i := range mm.entries {
		if mm.entries[i].used < mm.entries[lru].used {
			lru = i
		}
	}
	mm.last = lru
	return &mm.entries[lru]
}

// contains reports whether box b contains box c.
func contains(b, c shapes.AABB) bool {
	return b.Min[0] <= c.Min[0] && b.Min[1] <= c.Min[1] && b.Min[2] <= c.Min[2] &&
		c.Max[0] <= b.Max[0] && c.Max[1] <= b.Max[1] && c.Max[2] <= b.Max[2]
}
