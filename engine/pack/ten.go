package pack

import (
	"sort"

	"clatter/shapes"
)

// TenDrops returns the ten drops of the sequence the common parcel-test
// procedures use (ISTA 1A and 2A, after ASTM D5276's face identification)
// for a body whose box of bounds is b: corner 2-3-5; the three edges that
// meet at it, shortest first; then the faces in opposite pairs, the pair
// of smallest area first (within a pair, the lower number first). Ties keep
// the order 2-3, 3-5, 2-5 and 1-3, 2-4, 5-6.
func TenDrops(b shapes.AABB) []Feature {
	size := b.Size()
	edges := []struct {
		ft  Feature
		len float64
	}{{Feature{2, 3}, size[0]}, {Feature{3, 5}, size[1]}, {Feature{2, 5}, size[2]}}
	sort.SliceStable(edges, func(i, j int) bool { return edges[i].len < edges[j].len })
	pairs := []struct {
		a, b Face
		area float64
	}{{1, 3, size[0] * size[1]}, {2, 4, size[0] * size[2]}, {5, 6, size[1] * size[2]}}
	sort.SliceStable(pairs, func(i, j int) bool { return pairs[i].area < pairs[j].area })
	out := []Feature{{2, 3, 5}}
	for _, e := range edges {
		out = append(out, e.ft)
	}
	for _, p := range pairs {
		out = append(out, Feature{p.a}, Feature{p.b})
	}
	return out
}
