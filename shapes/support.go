package shapes

import "math"

// The support point of a hull (its vertex farthest along a direction) is
// found by hill climbing over a vertex graph, which is exact on a convex
// polytope: a vertex that is not farthest along d has an edge along which d
// increases, since the edges at a vertex span the cone of directions into
// the polytope (the argument behind the simplex method: G. B. Dantzig,
// "Linear Programming and Extensions", Princeton University Press, 1963;
// for polytopes in general B. Grünbaum, "Convex Polytopes", Wiley, 1967,
// section 3.4, cited from memory).
//
// Two things break the plain climb on a hull built with tolerances, and
// both are handled here:
//
//   - the graph must join every vertex to all its hull neighbours. The
//     polygon faces merge near-coplanar triangles of finely curved surfaces
//     into faces that are neither flat nor convex, and a vertex on such a
//     face can lose the edges that lead uphill (a 100 x 100 UV sphere then
//     stops on the wrong side of the ball). The climb therefore walks the
//     hull's triangulation (climbGraph), not the polygon edges;
//   - the triangulated surface is convex only to within the hull's
//     tolerances, so a climb can stop in a dent a little below a better
//     vertex. When a neighbour comes within the dent depth of the vertex
//     reached, but not within rounding of it, the climb searches that
//     near-level plateau breadth first and resumes from anything better; a
//     plateau larger than its fixed buffer falls back to a full scan.
//
// The result equals the largest v.Dot(d) of a scan over all vertices, except
// when a face or edge is square to d: its corners then tie, and any of them
// is returned, equal to the scan's to within the rounding of a dot product.

// supportScanLimit is the vertex count up to which a linear scan beats hill
// climbing over the vertex graph.
const supportScanLimit = 32

// plateauCap is the number of near-level vertices the plateau search keeps
// on the stack before it gives up and scans; faces of ordinary parts have
// fewer corners.
const plateauCap = 64

// climbGraph is the vertex adjacency of a hull's triangulation in
// compressed rows: the neighbours of vertex i are adj[start[i]:start[i+1]].
type climbGraph struct {
	start []int32
	adj   []int32
	// extra[i] is where the edges of vertex i that are not polygon edges
	// (Neighbors) begin in adj: the polygon edges come first.
	extra []int32
	// dent is how far below a better vertex a climb may stop, as a length:
	// the hull's merge tolerance, which bounds how far its triangulated
	// surface departs from a convex one.
	dent float64
	// reach is the largest |v| of the vertices; dot products with it round
	// by a few ulps of reach.
	reach float64
}

// Adjacent returns the vertices joined to vertex i by an edge of the hull's
// triangulation: its polygon edges and the diagonals of merged faces, so
// that every vertex has all its hull neighbours. It returns Neighbors[i] for
// hulls assembled by hand. The slice must not be modified.
func (h *Hull) Adjacent(i int) []int32 {
	if h.climb.start == nil {
		return h.Neighbors[i]
	}
	return h.climb.adj[h.climb.start[i]:h.climb.start[i+1]]
}

// SupportIndex returns the index of a vertex farthest along d.
func (h *Hull) SupportIndex(d Vec3) int { return h.SupportFrom(d, 0) }

// SupportFrom is SupportIndex with the climb started at vertex start, which
// is fast when start is the answer to a nearby direction (a contact's last
// support point). Any start gives the same value v.Dot(d).
func (h *Hull) SupportFrom(d Vec3, start int) int {
	if len(h.Vertices) <= supportScanLimit || h.climb.start == nil || len(h.Neighbors) != len(h.Vertices) {
		return h.scanSupport(d) // small, or assembled (or altered) by hand
	}
	if start < 0 || start >= len(h.Vertices) {
		start = 0
	}
	// The dent depth for this d, plus the rounding of two dot products.
	dn := math.Abs(d[0]) + math.Abs(d[1]) + math.Abs(d[2]) // >= |d|
	round := dn * 8 * epsilon * h.climb.reach
	slack := dn*h.climb.dent + round
	// The polygon edges come first in each vertex's list; after the climb
	// over them the first pass looks only at the rest.
	cur, best, top := h.climbPolygons(d, start)
	from := h.climb.extra[cur]
	for {
		ti := -1
		for _, n := range h.climb.adj[from:h.climb.start[cur+1]] {
			if p := h.Vertices[n].Dot(d); p > top {
				top, ti = p, int(n)
			}
		}
		if top > best && ti >= 0 {
			cur, best = ti, top
			top, from = math.Inf(-1), h.climb.start[cur]
			continue
		}
		if top < best-slack || top >= best-round {
			// A clear top, or a tie within rounding: a face or edge
			// square to d, all of whose corners are farthest.
			return cur
		}
		next, ok := h.plateau(d, cur, best, best-slack)
		if !ok {
			return h.scanSupport(d)
		}
		if next == cur {
			return cur
		}
		cur, best = next, h.Vertices[next].Dot(d)
		top, from = math.Inf(-1), h.climb.start[cur]
	}
}

// climbPolygons climbs the polygon edges (Neighbors) from start, which have
// fewer edges per vertex than the triangulation and so reach the top of an
// ordinary hull with fewer dot products; SupportFrom then finishes, and
// checks the result, on the triangulation. It returns the vertex reached,
// its value and the largest value of its polygon neighbours.
func (h *Hull) climbPolygons(d Vec3, start int) (cur int, best, top float64) {
	cur, best = start, h.Vertices[start].Dot(d)
	for {
		top = math.Inf(-1)
		ti := -1
		for _, n := range h.Neighbors[cur] {
			if p := h.Vertices[n].Dot(d); p > top {
				top, ti = p, int(n)
			}
		}
		if !(top > best) {
			return cur, best, top
		}
		cur, best = ti, top
	}
}

// epsilon is the unit roundoff of float64, 2^-53.
const epsilon = 0x1p-53

// plateau searches breadth first from vertex cur (value best) over the
// vertices whose value along d is at least floor, and returns the first one
// found that beats best, or cur if none does. ok is false when the plateau
// outgrows its buffer.
func (h *Hull) plateau(d Vec3, cur int, best, floor float64) (next int, ok bool) {
	var seen [plateauCap]int32
	seen[0] = int32(cur)
	n := 1
	for k := 0; k < n; k++ {
		for _, j := range h.Adjacent(int(seen[k])) {
			p := h.Vertices[j].Dot(d)
			if p > best {
				return int(j), true
			}
			if p < floor || inList(seen[:n], j) {
				continue
			}
			if n == plateauCap {
				return cur, false
			}
			seen[n] = j
			n++
		}
	}
	return cur, true
}

func inList(s []int32, x int32) bool {
	for _, y := range s {
		if y == x {
			return true
		}
	}
	return false
}

// scanSupport is the index of the first vertex with the largest v.Dot(d).
func (h *Hull) scanSupport(d Vec3) int {
	best, bi := math.Inf(-1), 0
	for i, v := range h.Vertices {
		if p := v.Dot(d); p > best {
			best, bi = p, i
		}
	}
	return bi
}
