package contact

import (
	"math/rand/v2"
	"slices"
	"testing"
)

func TestSetTrailFindsRepeatedSets(t *testing.T) {
	// The trail must report a repeat exactly when the active set equals
	// one seen since the run began, whatever order the rows were flipped
	// in. The reference is the brute force: the sets themselves, kept and
	// compared element by element.
	cases := []struct {
		name        string
		rows, flips int
		seed        uint64
	}{
		{"4 rows, many repeats", 4, 200, 1},
		{"12 rows", 12, 500, 2},
		{"64 rows, few repeats", 64, 500, 3},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(c.seed, 7))
			b := &blockState{kind: make([]rowKind, c.rows), active: make([]bool, c.rows)}
			for i := range b.active {
				b.active[i] = rng.IntN(2) == 1
			}
			var tr setTrail
			tr.start(b, c.rows)
			var seen [][]bool
			repeats := 0
			for k := 0; k < c.flips; k++ {
				want := slices.ContainsFunc(seen, func(s []bool) bool { return slices.Equal(s, b.active) })
				if !want {
					seen = append(seen, slices.Clone(b.active))
				}
				if got := tr.repeats(); got != want {
					t.Fatalf("flip %d: repeats() = %v, want %v", k, got, want)
				}
				if want {
					repeats++
				}
				// Flip one to three rows, in any order.
				for range 1 + rng.IntN(3) {
					i := rng.IntN(c.rows)
					b.active[i] = !b.active[i]
					tr.flip(int32(i))
				}
			}
			if c.rows <= 12 && repeats == 0 {
				t.Fatalf("no set came back in %d flips of %d rows: the case tests nothing", c.flips, c.rows)
			}
		})
	}
}

func TestSetTrailNewLowForgets(t *testing.T) {
	// After a new lowest count the pivots take another course: a set seen
	// before it is no repeat (bandpivot.go).
	b := &blockState{kind: make([]rowKind, 3), active: []bool{true, false, true}}
	var tr setTrail
	tr.start(b, 3)
	if tr.repeats() {
		t.Fatal("the first set counts as a repeat")
	}
	tr.newLow()
	if tr.repeats() {
		t.Error("a set seen before a new low counts as a repeat")
	}
	if !tr.repeats() {
		t.Error("a set seen twice after a new low is not a repeat")
	}
}

func TestSetTrailStartCountsNormalRowsOnly(t *testing.T) {
	// Friction rows follow their normal rows (follow): two systems whose
	// normal rows are active alike are the same set of pivots.
	a := &blockState{kind: []rowKind{normalRow, tangentRow, tangentRow}, active: []bool{true, true, true}}
	b := &blockState{kind: []rowKind{normalRow, tangentRow, tangentRow}, active: []bool{true, false, false}}
	var ta, tb setTrail
	ta.start(a, 3)
	tb.start(b, 3)
	if ta.set != tb.set {
		t.Errorf("hashes %x and %x differ for the same normal rows", ta.set, tb.set)
	}
}
