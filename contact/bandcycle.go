package contact

import "clatter/internal/splitmix"

// Ending a banded solve that cycles.
//
// Murty's single principal pivoting (bandpivot.go) ends for a system whose
// matrix is a P-matrix (Murty, chapter 4). The system with friction is
// not one in general, since its tangent rows enter and leave with their
// normal rows, and a pile in motion cycles: after the exchanges of whole
// sets, the single exchanges bring back an active set already seen, with
// two to a dozen rows infeasible, until the pivot bound (maxBandPivots).
// Parts poured into a bin cycled so in nearly every solve with friction,
// which spent there about four fifths of its work (measured).
//
// While single exchanges run and no new lowest count of infeasible rows
// is reached, the next active set depends on the current one alone, so an
// active set seen twice in that run means the pivots repeat forever and
// the solve cannot end: it is left to the sweeps at once, which is what
// the pivot bound would have done later. The sets are compared by a hash
// that each exchanged row updates (Zobrist hashing: A. L. Zobrist, "A new
// hashing method with application for game playing", Technical Report 88,
// University of Wisconsin 1970), so the test costs a few operations per
// exchange; two different sets of one run share a 64-bit hash with a
// probability of about 1e-16.

// rowHash is a fixed pseudo-random 64-bit value of row i.
func rowHash(i int32) uint64 { return splitmix.Mix(uint64(i) + splitmix.Golden) }

// setTrail keeps the hashes of the active sets of one run of single
// exchanges.
type setTrail struct {
	set  uint64   // hash of the current active set (XOR of its rows' rowHash)
	seen []uint64 // the sets of the current run
}

// start takes the active set of a new solve of n rows: its normal rows,
// which the pivots exchange (the friction rows follow them).
func (c *setTrail) start(b *blockState, n int) {
	c.set, c.seen = 0, c.seen[:0]
	for i := 0; i < n; i++ {
		if b.kind[i] == normalRow && b.active[i] {
			c.set ^= rowHash(int32(i))
		}
	}
}

// flip notes that row i entered or left the active set.
func (c *setTrail) flip(i int32) { c.set ^= rowHash(i) }

// newLow ends the run: a new lowest count changes the pivots' course.
func (c *setTrail) newLow() { c.seen = c.seen[:0] }

// repeats records the current set in the run of single exchanges and
// reports whether the run has seen it before.
func (c *setTrail) repeats() bool {
	for _, h := range c.seen {
		if h == c.set {
			return true
		}
	}
	c.seen = append(c.seen, c.set)
	return false
}
