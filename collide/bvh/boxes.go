package bvh

import (
	"slices"

	"clatter/shapes"
)

// BoxHit is a triangle found by QueryBoxes and the box the tree keeps for
// it.
type BoxHit struct {
	Tri int32
	Box shapes.AABB
}

// QueryBoxes is Query that also returns each triangle's box, so that a
// caller may keep the hits of a generous box and later pick those of any
// box inside it without walking the tree: the hits whose Box overlaps a
// smaller box are exactly the triangles Query returns for it (the same
// test on the same boxes), and in the same ascending order.
func (t *Tree) QueryBoxes(dst []BoxHit, box shapes.AABB) []BoxHit {
	if len(t.nodes) == 0 || !t.nodes[0].box.Overlaps(box) {
		return dst
	}
	start := len(dst)
	var stack [stackSize]int32
	sp := 1 // stack[0] = 0, the root
	for sp > 0 {
		sp--
		nd := &t.nodes[stack[sp]]
		if nd.count > 0 {
			for k := nd.first; k < nd.first+nd.count; k++ {
				if t.boxes[k].Overlaps(box) {
					dst = append(dst, BoxHit{Tri: t.tris[k], Box: t.boxes[k]})
				}
			}
			continue
		}
		if t.nodes[nd.first+1].box.Overlaps(box) {
			stack[sp] = nd.first + 1
			sp++
		}
		if t.nodes[nd.first].box.Overlaps(box) {
			stack[sp] = nd.first
			sp++
		}
	}
	slices.SortFunc(dst[start:], func(a, b BoxHit) int { return int(a.Tri) - int(b.Tri) })
	return dst
}
