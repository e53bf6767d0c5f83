package mesh

import (
	"fmt"
	"slices"
	"strings"
)

// Topology counts the edges of a mesh by how the triangles use them.
type Topology struct {
	// Edges is the number of distinct edges.
	Edges int
	// Boundary counts edges used by one triangle only: the rims of holes.
	Boundary int
	// NonManifold counts edges shared by more than two triangles.
	NonManifold int
	// Misoriented counts edges shared by two or more triangles that do not
	// run them as often in one direction as in the other: neighbours whose
	// windings disagree.
	Misoriented int
}

// Closed reports whether every edge is shared by exactly two triangles.
func (t Topology) Closed() bool { return t.Boundary == 0 && t.NonManifold == 0 }

// Oriented reports whether neighbouring triangles agree on their winding:
// every shared edge is run once in each direction.
func (t Topology) Oriented() bool { return t.Misoriented == 0 }

// Solid reports whether the mesh bounds a solid: closed and oriented.
func (t Topology) Solid() bool { return t.Closed() && t.Oriented() }

// Problem describes what keeps the mesh from bounding a solid, e.g.
// "open (12 boundary edges)", or returns "" when it does.
func (t Topology) Problem() string {
	var p []string
	if t.Boundary > 0 {
		p = append(p, fmt.Sprintf("open (%d boundary %s)", t.Boundary, plural(t.Boundary, "edge", "edges")))
	}
	if t.NonManifold > 0 {
		p = append(p, fmt.Sprintf("non-manifold (%d %s shared by more than two triangles)", t.NonManifold, plural(t.NonManifold, "edge", "edges")))
	}
	if t.Misoriented > 0 {
		p = append(p, fmt.Sprintf("inconsistently oriented (%d %s where neighbouring triangles disagree on their winding)", t.Misoriented, plural(t.Misoriented, "edge", "edges")))
	}
	return strings.Join(p, ", ")
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// Topology counts how each undirected edge is used. The directed edges are
// bucketed by their lower vertex (a counting sort, O(n)); a vertex has only
// a few such edges, which sort in place.
func (m *Mesh) Topology() Topology {
	nv := len(m.Vertices)
	// start[v+1] counts, then locates, the edges whose lower vertex is v.
	start := make([]int32, nv+2)
	for _, t := range m.Triangles {
		start[min(t[0], t[1])+2]++
		start[min(t[1], t[2])+2]++
		start[min(t[2], t[0])+2]++
	}
	for i := 2; i < len(start); i++ {
		start[i] += start[i-1]
	}
	// Each entry is the higher vertex << 1 | direction (1 when the triangle
	// runs the edge from high to low). Indices are below 2^31.
	entries := make([]uint32, 3*len(m.Triangles))
	for _, t := range m.Triangles {
		for e := 0; e < 3; e++ {
			a, b := t[e], t[(e+1)%3]
			key := uint32(b) << 1
			if a > b {
				a, key = b, uint32(a)<<1|1
			}
			entries[start[a+1]] = key
			start[a+1]++
		}
	}
	var top Topology
	for v := 0; v < nv; v++ {
		bucket := entries[start[v]:start[v+1]]
		sortSmall(bucket)
		for i := 0; i < len(bucket); {
			j, back := i, 0
			for ; j < len(bucket) && bucket[j]>>1 == bucket[i]>>1; j++ {
				back += int(bucket[j] & 1)
			}
			uses := j - i
			top.Edges++
			switch {
			case uses == 1:
				top.Boundary++
			case 2*back != uses:
				top.Misoriented++
			}
			if uses > 2 {
				top.NonManifold++
			}
			i = j
		}
	}
	return top
}

// sortSmall sorts a bucket of a vertex's edges: by insertion for the usual
// handful, by the library for the rare hub of a large fan.
func sortSmall(a []uint32) {
	if len(a) > 16 {
		slices.Sort(a)
		return
	}
	for i := 1; i < len(a); i++ {
		for j := i; j > 0 && a[j] < a[j-1]; j-- {
			a[j], a[j-1] = a[j-1], a[j]
		}
	}
}
