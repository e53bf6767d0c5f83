package contact

// keyIndex is a point's warm-start key and its index in the step's points.
type keyIndex struct {
	key uint64
	i   int32
}

// smallSort: below this many points an insertion sort beats the eight
// counting passes (each clears 256 counters).
const smallSort = 48

// sortKeys orders this step's points by key and matches them with last
// step's memory: an LSD radix sort, 8 bits a pass and stable, so that equal
// keys keep the points' order, and then one merge with prevKeys (the first
// entry of a repeated key wins).
// Both are linear in the number of points, where a comparison sort and a
// binary search per point cost n log n. A world's steps, whose points
// mostly keep their keys and order, mostly take a shorter path along last
// step's order (align.go), with the same result.
func (s *Solver) sortKeys(points []Point) {
	if s.sortKeysAligned(points) { // align.go
		return
	}
	s.sortKeysAll(points)
}

// sortKeysAll is sortKeys for any points: it sorts them all.
func (s *Solver) sortKeysAll(points []Point) {
	n := len(points)
	s.byKey = grow(s.byKey, n)
	s.match = grow(s.match, n)
	for i := range points {
		s.byKey[i] = keyIndex{points[i].Key, int32(i)}
	}
	src, dst := s.byKey, s.keyTmp[:0]
	if n <= smallSort {
		insertionSort(src[:n]) // few points (a part on a floor); align.go
	} else {
		src, dst = radixKeys(src, grow(dst, n))
	}
	// The scratch buffer is left empty between uses, so that what it held
	// is no part of the solver's state (World.Reset compares it).
	s.byKey, s.keyTmp = src, dst[:0]
	prev := s.prevKeys
	k := 0
	for _, e := range s.byKey {
		for k < len(prev) && prev[k].key < e.key {
			k++
		}
		if k < len(prev) && prev[k].key == e.key {
			s.match[e.i] = prev[k].i
		} else {
			s.match[e.i] = -1
		}
	}
}

// radixKeys sorts src by key, 8 bits a pass and stable, using dst as
// scratch, and returns the sorted slice and the other one. It is a
// function of its own so that its 256 counters are cleared only when it
// runs: a small step's insertion sort would otherwise pay for them too.
func radixKeys(src, dst []keyIndex) (sorted, scratch []keyIndex) {
	n := len(src)
	var count [256]int
	for shift := 0; shift < 64; shift += 8 {
		count = [256]int{}
		for _, e := range src {
			count[byte(e.key>>shift)]++
		}
		if count[byte(src[0].key>>shift)] == n {
			continue // every key has this digit
		}
		sum := 0
		for d, c := range count {
			count[d] = sum
			sum += c
		}
		for _, e := range src {
			d := byte(e.key >> shift)
			dst[count[d]] = e
			count[d]++
		}
		src, dst = dst, src
	}
	return src, dst
}
