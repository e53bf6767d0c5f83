package collide

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// TestPairCacheNextStep: the list the next step looks up holds, sorted by
// key, each key's last hint of this step, whether it was one of last step's
// kept in place or a new one, and none of last step's that were not kept;
// checked against a brute-force reference (a map from key to the hint of
// the largest seq) on random lists, with keys in both lists and keys made
// twice.
func TestPairCacheNextStep(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 9))
	for round := 0; round < 300; round++ {
		var c pairCache
		c.seq, c.from = 1000, 1000
		// Last step's list: sorted distinct keys.
		for k := uint64(0); k < 60; k++ {
			if rng.IntN(2) == 0 {
				c.prev = append(c.prev, pairHint{key: k, i: -1, seq: uint64(rng.IntN(1000))})
			}
		}
		// This step: some of last step's kept, new hints (sometimes for the
		// same key twice, sometimes for a key kept too), in any order.
		for q := 0; q < 40; q++ {
			key := uint64(rng.IntN(70))
			if rng.IntN(2) == 0 {
				if j, ok := slices.BinarySearchFunc(c.prev, key, func(h pairHint, k uint64) int { return int(h.key) - int(k) }); ok {
					c.keepHint(&c.prev[j])
					c.prev[j].i = int32(q)
					continue
				}
			}
			c.seq++
			c.cur = append(c.cur, pairHint{key: key, i: int32(q), seq: c.seq})
		}
		want := map[uint64]pairHint{}
		for _, h := range append(slices.Clone(c.prev), c.cur...) {
			if h.seq > c.from && h.seq > want[h.key].seq {
				want[h.key] = h
			}
		}
		c.nextStep()
		if len(c.prev) != len(want) {
			t.Fatalf("round %d: %d hints, want %d", round, len(c.prev), len(want))
		}
		for j, h := range c.prev {
			if j > 0 && c.prev[j-1].key >= h.key {
				t.Fatalf("round %d: keys not sorted and distinct at %d", round, j)
			}
			if w := want[h.key]; h != w {
				t.Fatalf("round %d: key %d holds the hint of query %d, want query %d", round, h.key, h.i, w.i)
			}
		}
		if len(c.cur) != 0 || c.from != c.seq {
			t.Fatalf("round %d: the step's new list was not emptied", round)
		}
	}
}
