package collide

import (
	"cmp"
	"slices"
)

// The per-pair memories (persist.go, gjkwarm.go) keep their entries sorted
// by pair key, so that a step's queries, which come in key order, find
// them with a forward cursor. At the end of a step each keeps the entries
// it still wants and merges in the step's new ones.

// mergeKeyed returns mem[:n] (the kept entries, sorted by key) merged with
// add, the step's new entries in the order they were made, as one list
// sorted by key, reusing mem's memory. A key added twice in one step keeps
// its last entry; keys in add are not in mem[:n]. add is sorted in place.
func mergeKeyed[T any](mem []T, n int, add []T, key func(*T) uint64) []T {
	slices.SortStableFunc(add, func(x, y T) int { return cmp.Compare(key(&x), key(&y)) })
	k := 0
	for i := range add {
		if k > 0 && key(&add[k-1]) == key(&add[i]) {
			add[k-1] = add[i]
			continue
		}
		add[k] = add[i]
		k++
	}
	// Merge from the back, in place.
	out := slices.Grow(mem[:n], k)[:n+k]
	i, j := n-1, k-1
	for w := n + k - 1; j >= 0; w-- {
		if i >= 0 && key(&out[i]) > key(&add[j]) {
			out[w] = out[i]
			i--
		} else {
			out[w] = add[j]
			j--
		}
	}
	return out
}
