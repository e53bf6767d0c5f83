package contact

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// TestSortKeys: the solver's key order against a reference built with the
// standard library's stable sort and binary search, for point counts on
// both sides of the insertion-sort cutoff and with repeated keys: byKey is
// sorted and stable, and match finds the first entry of last step's memory
// with the same key (as a binary search in the sorted keys does).
func TestSortKeys(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, n := range []int{0, 1, 2, 7, 47, 48, 49, 300, 5000} {
		s := NewSolver(DefaultSettings())
		// Last step's memory: sorted keys, some of them repeated.
		prev := make([]warmPoint, n/2+1)
		for i := range prev {
			prev[i].key = rng.Uint64() >> uint(rng.IntN(3)*20) // some keys share high digits
		}
		slices.SortFunc(prev, func(a, b warmPoint) int {
			if a.key < b.key {
				return -1
			} else if a.key > b.key {
				return 1
			}
			return 0
		})
		for i := 1; i < len(prev); i += 7 {
			prev[i].key = prev[i-1].key
		}
		// The memory in another order than its keys (as the points of a
		// step come), and its index by key.
		perm := rng.Perm(len(prev))
		s.prevPts = make([]warmPoint, len(prev))
		for r, w := range prev {
			s.prevPts[perm[r]] = w
			s.prevKeys = append(s.prevKeys, keyIndex{w.key, int32(perm[r])})
		}
		pts := make([]Point, n)
		for i := range pts {
			switch rng.IntN(3) {
			case 0:
				pts[i].Key = prev[rng.IntN(len(prev))].key // persists
			case 1:
				if i > 0 {
					pts[i].Key = pts[rng.IntN(i)].Key // repeated this step
					break
				}
				fallthrough
			default:
				pts[i].Key = rng.Uint64()
			}
		}
		s.sortKeys(pts)
		want := make([]int32, n)
		for i := range want {
			want[i] = int32(i)
		}
		slices.SortStableFunc(want, func(a, b int32) int {
			if pts[a].Key < pts[b].Key {
				return -1
			} else if pts[a].Key > pts[b].Key {
				return 1
			}
			return 0
		})
		for r, i := range want {
			if s.byKey[r].i != i || s.byKey[r].key != pts[i].Key {
				t.Fatalf("n %d: place %d holds point %d, want %d", n, r, s.byKey[r].i, i)
			}
		}
		for i := range pts {
			k, ok := slices.BinarySearchFunc(prev, pts[i].Key, func(w warmPoint, key uint64) int {
				if w.key < key {
					return -1
				} else if w.key > key {
					return 1
				}
				return 0
			})
			if ok {
				k = perm[k]
			} else {
				k = -1
			}
			if s.match[i] != int32(k) {
				t.Fatalf("n %d: point %d matched %d, want %d", n, i, s.match[i], k)
			}
		}
	}
}
