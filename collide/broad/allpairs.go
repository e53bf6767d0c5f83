package broad

import (
	"slices"

	"clatter/shapes"
)

// Body is one body as AllPairs sees it. Unlike SAP.Insert, a zero Category
// or Mask here means "collides with nothing": set AllBits for the default.
type Body struct {
	ID       int32
	Box      shapes.AABB
	Kind     Kind
	Asleep   bool
	Category uint32
	Mask     uint32
}

// AllPairs is the brute-force reference of SAP.Pairs: it tests every pair of
// bodies, O(n^2), and appends the reportable overlapping pairs to dst in the
// same order and form as SAP.Pairs. Ids must be distinct.
func AllPairs(dst [][2]int32, bodies []Body) [][2]int32 {
	start := len(dst)
	for i := range bodies {
		a := &bodies[i]
		for j := i + 1; j < len(bodies); j++ {
			b := &bodies[j]
			if !a.Box.Overlaps(b.Box) {
				continue
			}
			awakeA := a.Kind == Dynamic && !a.Asleep
			awakeB := b.Kind == Dynamic && !b.Asleep
			if !awakeA && !awakeB {
				continue
			}
			if a.Category&b.Mask == 0 || b.Category&a.Mask == 0 {
				continue
			}
			lo, hi := a.ID, b.ID
			if lo > hi {
				lo, hi = hi, lo
			}
			dst = append(dst, [2]int32{lo, hi})
		}
	}
	slices.SortFunc(dst[start:], cmpPair)
	return dst
}
