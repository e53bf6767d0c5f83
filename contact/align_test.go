package contact

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// TestSortKeysAligned: the key order and matches found along last step's
// order against those of sortKeysAll (which sorts every key; TestSortKeys
// checks it against the standard library's stable sort and binary
// search), for the changes a world's points go through from one step to
// the next, and whether the aligned path is taken: it must be where keys
// are unique and new ones few, and must not be where its shortcuts would
// differ (a repeated key) or cost more (many new keys).
func TestSortKeysAligned(t *testing.T) {
	const n = 3000 // points of last step, a pile's order of size
	cases := []struct {
		name      string
		drop, add int  // points removed, points with new keys inserted
		swaps     int  // adjacent points exchanged
		repeatNow bool // a key repeated among this step's points
		repeatOld bool // a key repeated in last step's memory
		recalled  int  // memories added by Recall (a woken island)
		taken     bool
	}{
		{name: "same points", taken: true},
		{name: "some gone, some new", drop: 30, add: 20, taken: true},
		{name: "reordered", drop: 5, add: 5, swaps: 40, taken: true},
		{name: "recalled memories", add: 10, recalled: 200, taken: true},
		{name: "many new keys", add: smallSort + 1},
		{name: "key repeated this step", add: 3, repeatNow: true},
		{name: "key repeated in memory", repeatOld: true},
	}
	for ci, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(5, uint64(ci)))
			s := NewSolver(DefaultSettings())
			old := make([]Point, n)
			for i := range old {
				old[i].Key = rng.Uint64()
			}
			if c.repeatOld {
				old[n/2].Key = old[n/3].Key
			}
			// Last step as Solve leaves it: the memory in point order,
			// the key index from the sort (store).
			s.sortKeysAll(old)
			s.prevKeys, s.byKey = s.byKey, nil
			s.prevPts = make([]warmPoint, n)
			for i := range old {
				s.prevPts[i].key = old[i].Key
			}
			if c.recalled > 0 {
				ms := make([]Memory, c.recalled)
				for i := range ms {
					ms[i].w.key = rng.Uint64()
				}
				s.Recall(ms)
			}
			// This step: last step's points with changes.
			pts := slices.Clone(old)
			for range c.drop {
				k := rng.IntN(len(pts))
				pts = slices.Delete(pts, k, k+1)
			}
			for range c.add {
				k := rng.IntN(len(pts) + 1)
				pts = slices.Insert(pts, k, Point{Key: rng.Uint64()})
			}
			for range c.swaps {
				k := rng.IntN(len(pts) - 1)
				pts[k], pts[k+1] = pts[k+1], pts[k]
			}
			for i := 0; i < c.recalled; i += 20 {
				pts[rng.IntN(len(pts))].Key = s.prevPts[n+i].key // a woken point
			}
			if c.repeatNow {
				pts[len(pts)-1].Key = pts[0].Key
			}

			ref := &Solver{prevKeys: s.prevKeys, prevPts: s.prevPts}
			ref.sortKeysAll(pts)
			if got := s.sortKeysAligned(pts); got != c.taken {
				t.Fatalf("aligned path taken %v, want %v", got, c.taken)
			}
			if len(s.owner) != 0 || len(s.keyTmp) != 0 {
				t.Fatalf("scratch left with %d, %d entries, want none", len(s.owner), len(s.keyTmp))
			}
			if !c.taken {
				return
			}
			if !slices.Equal(s.byKey, ref.byKey) {
				t.Errorf("key order differs from the full sort's")
			}
			if !slices.Equal(s.match, ref.match) {
				t.Errorf("matches differ from the full sort's")
			}
		})
	}
}
