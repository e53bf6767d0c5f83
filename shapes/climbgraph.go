package shapes

import (
	"math"
	"slices"
)

// buildClimbGraph fills h.climb from the hull's triangles tris (indices into
// the n points the hull was built from; corner maps a point to its vertex
// index, or is absent for points that are no corner). Points that are not
// corners (on a straight edge between two faces, or inside a merged face)
// are contracted: the corners around them become neighbours of each other,
// so that no path of the triangulation is lost. Each vertex lists its
// polygon edges (Neighbors, which must be built) first. dent is the merge
// tolerance as a length.
func buildClimbGraph(h *Hull, tris [][3]int, n int, corner map[int]int32, dent float64) {
	around := make([][]int32, n) // the triangulation's neighbours of each point
	for _, t := range tris {
		for e := 0; e < 3; e++ {
			a, b := t[e], t[(e+1)%3]
			around[a] = append(around[a], int32(b))
			around[b] = append(around[b], int32(a))
		}
	}
	isCorner := func(p int32) (int32, bool) {
		v, ok := corner[int(p)]
		return v, ok && v >= 0
	}
	byVertex := make([][]int32, len(h.Vertices))
	seen := make([]int, n) // stamp per point: visited from the current corner
	stamp := 0
	var stack []int32
	for p, v := range corner {
		if v < 0 {
			continue
		}
		stamp++
		seen[p] = stamp
		stack = append(stack[:0], int32(p))
		for len(stack) > 0 {
			q := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, r := range around[q] {
				if seen[r] == stamp {
					continue
				}
				seen[r] = stamp
				if w, ok := isCorner(r); ok {
					byVertex[v] = append(byVertex[v], w)
				} else {
					stack = append(stack, r) // walk on through the non-corner
				}
			}
		}
	}
	g := climbGraph{start: make([]int32, len(h.Vertices)+1), extra: make([]int32, len(h.Vertices)), dent: dent}
	for v, nb := range byVertex {
		slices.Sort(nb)
		nb = slices.Compact(nb)
		poly := h.Neighbors[v]
		g.adj = append(g.adj, poly...)
		g.extra[v] = int32(len(g.adj))
		for _, w := range nb {
			if !slices.Contains(poly, w) {
				g.adj = append(g.adj, w)
			}
		}
		g.start[v+1] = int32(len(g.adj))
	}
	for _, p := range h.Vertices {
		g.reach = math.Max(g.reach, p.Len())
	}
	h.climb = g
}
