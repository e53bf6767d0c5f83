package contact

import (
	"cmp"
	"slices"
)

// Matching keys along last step's order.
//
// A world hands the solver its points in nearly the same order step after
// step (pairs in the broad phase's order, each manifold's points in their
// order), and a resting pile keeps all but a few of its thousands of keys.
// Last step's memory (prevPts) is kept in the order of its points, so most
// points find their entry at a cursor that moves along it, and only a point
// out of step with it needs the key index (a binary search). The key order
// of this step's points (byKey, the next step's key index) is then last
// step's key order with the points that kept their key put in place of
// their entries, merged with the few new keys sorted: a walk over the index
// where sortKeys makes eight counting passes over the points. Both give
// the same byKey and match wherever this path is taken: keys unique in the
// index and among the points (a repeated key makes sortKeys' stable order
// and first-entry rule matter), and few new keys.

// keyOrder orders an index entry against a key.
func keyOrder(e keyIndex, k uint64) int { return cmp.Compare(e.key, k) }

// sortKeysAligned does sortKeys' work along last step's order, and
// reports whether it did; false leaves byKey and match for sortKeys to set,
// and every scratch buffer as it was.
func (s *Solver) sortKeysAligned(points []Point) bool {
	n := len(points)
	prev, mem := s.prevKeys, s.prevPts
	if n <= smallSort || len(prev) == 0 {
		return false
	}
	for k := 1; k < len(prev); k++ {
		if prev[k].key == prev[k-1].key {
			return false
		}
	}
	// owner[m] is 1 + the point that takes entry m of the memory, 0 if none.
	owner := grow(s.owner, len(mem))
	clear(owner)
	fresh := s.keyTmp[:0] // the points whose keys the memory lacks
	ok := s.alignKeys(points, owner, &fresh)
	if ok {
		ok = sortFew(fresh)
	}
	if ok {
		s.byKey = mergeAligned(s.byKey[:0], prev, owner, fresh)
	}
	s.owner, s.keyTmp = owner[:0], fresh[:0]
	return ok
}

// alignKeys sets match for points and records in owner which point took
// which entry, collecting the points with new keys in fresh. It reports
// false at a key repeated among the points, or at more new keys than a
// small sort takes.
func (s *Solver) alignKeys(points []Point, owner []int32, fresh *[]keyIndex) bool {
	prev, mem := s.prevKeys, s.prevPts
	s.match = grow(s.match, len(points))
	j := 0 // the cursor: the entry after the last one taken
	for i := range points {
		key := points[i].Key
		m := int32(-1)
		if j < len(mem) && mem[j].key == key {
			m = int32(j)
		} else if k, found := slices.BinarySearchFunc(prev, key, keyOrder); found {
			m = prev[k].i
		}
		s.match[i] = m
		if m < 0 {
			if len(*fresh) == smallSort {
				return false
			}
			*fresh = append(*fresh, keyIndex{key, int32(i)})
			continue
		}
		if owner[m] != 0 {
			return false // a key repeated among the points
		}
		owner[m] = int32(i) + 1
		j = int(m) + 1
	}
	return true
}

// sortFew sorts a few entries by key and reports whether their keys are
// unique.
func sortFew(f []keyIndex) bool {
	insertionSort(f)
	for i := 1; i < len(f); i++ {
		if f[i].key == f[i-1].key {
			return false
		}
	}
	return true
}

// insertionSort sorts f by key, stably: the fastest sort of a few entries.
func insertionSort(f []keyIndex) {
	for i := 1; i < len(f); i++ {
		e := f[i]
		j := i
		for j > 0 && f[j-1].key > e.key {
			f[j] = f[j-1]
			j--
		}
		f[j] = e
	}
}

// mergeAligned appends to out the points in key order: the entries of
// prev (in key order) that a point took, as that point, merged with fresh
// (sorted, keys not in prev).
func mergeAligned(out, prev []keyIndex, owner []int32, fresh []keyIndex) []keyIndex {
	f := 0
	for _, e := range prev {
		o := owner[e.i]
		if o == 0 {
			continue
		}
		for f < len(fresh) && fresh[f].key < e.key {
			out = append(out, fresh[f])
			f++
		}
		out = append(out, keyIndex{e.key, o - 1})
	}
	return append(out, fresh[f:]...)
}
