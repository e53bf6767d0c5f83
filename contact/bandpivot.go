package contact

// The active set of a banded solve (band.go) by block principal pivoting
// (J. J. Judice and F. M. Pires, "A block principal pivoting algorithm for
// large-scale strictly monotone linear complementarity problems",
// Computers & Operations Research 21, 1994). A pivot exchanges every
// infeasible row at once: a pressing row with a negative impulse leaves
// the active set, a free row that approaches faster than the tolerance
// enters it. While the number of infeasible rows keeps falling to a new
// low, whole sets are exchanged; after bandBlockTries exchanges that do
// not, one row at a time is, the infeasible row of largest index, which
// is Murty's single principal pivoting with the rows in reverse order and
// ends for any positive definite system (K. G. Murty, "Linear
// Complementarity, Linear and Nonlinear Programming", Heldermann 1988,
// chapter 4). The single exchange of the last row refactorises the
// shortest tail (refactorBand).
//
// Once whole-set exchanges have stalled, single exchanges run to the end,
// also past a new low: Judice and Pires return to whole-set exchanges
// there, but in a large island the few rows still infeasible then are
// the ones whose exchanges undo each other, and each return spent its
// bandBlockTries exchanges raising the count again before single ones
// brought it back. In the pour of 4000 parts into a bin (an island of up
// to 6700 points, the Pour4000 benchmark, 150 steps) the banded solves
// took 21 percent fewer pivots and 28 percent less factor work so, all
// ending as before (measured, December 2026).
//
// Murty's rule ends for a system of normal rows alone. With friction, a
// pressing row brings its friction rows in with it, and then it is no
// longer one row that enters: a light box squeezed by friction between
// two heavy ones, 100:1 at the top of a pyramid at 1/60 s, entered with a
// negative impulse and left again, pivot after pivot (measured). A row
// that leaves in a single exchange therefore releases its friction rows
// (releaseOf) and enters again, if it must, without them. Releases only
// grow and between them the system is a fixed mixed one (its sticking
// friction rows as equations, positive definite), whose single pivoting
// ends, so the whole ends; the sweeps give released contacts their
// friction.
//
// Exchanging one row a pivot, as the dense solve does, takes a pivot for
// each corner that lifts or lands: a pyramid of boxes side by side, heavy
// rows on light ones at 1/60 s, starts with about 190 of its 400 corners
// pressing that must not and 60 that must, and ran out of pivots step
// after step until it fell (measured).

// bandBlockTries is the number of whole-set exchanges in a row that may
// leave at least as many rows infeasible as the best so far before rows
// are exchanged one at a time: Judice and Pires' safeguard against a
// cycle of whole-set exchanges, with the small count they recommend.
const bandBlockTries = 3

// pivotBand finds the active rows of the banded system of n rows, from
// b.active, and leaves its solution in b.x. It reports false if the
// system is not positive definite, the pivots' factor work exceeds limit,
// the single exchanges cycle (bandcycle.go), or maxBandPivots pivots do
// not end it.
func (b *blockState) pivotBand(n int, shift, tol float64, limit int64) bool {
	bs := &b.band
	best, tries := n+1, bandBlockTries
	bs.cycle.start(b, n) // bandcycle.go
	for it := 0; it < maxBandPivots; it++ {
		if !b.refactorBand(n, shift, limit) {
			return false
		}
		b.solveBandFactor(n) // bandstore.go
		bs.flip = bs.flip[:0]
		for i := 0; i < n; i++ {
			if b.kind[i] == normalRow && b.infeasible(n, i, tol) {
				bs.flip = append(bs.flip, int32(i))
			}
		}
		nf := len(bs.flip)
		if nf == 0 {
			return true
		}
		single := tries == 0
		switch {
		case nf < best:
			best = nf
			bs.cycle.newLow()
			if !single {
				tries = bandBlockTries
			}
		case !single:
			tries--
		}
		if single {
			if bs.cycle.repeats() {
				return false // the single exchanges cycle: they cannot end
			}
			// The last row alone, kept at the buffer's start.
			bs.flip[0] = bs.flip[nf-1]
			bs.flip = bs.flip[:1]
			if i := int(bs.flip[0]); b.active[i] {
				b.releaseOf(i) // blockrows.go
			}
		}
		for _, i := range bs.flip {
			b.active[i] = !b.active[i]
			bs.cycle.flip(i)
		}
		b.follow()
	}
	return false
}

// infeasible reports whether normal row i of a banded system breaks the
// complementarity conditions by more than tol with the solution b.x: an
// active row with a negative impulse, or a free row approaching faster
// than tol.
func (b *blockState) infeasible(n, i int, tol float64) bool {
	if b.active[i] {
		return b.x[i] < 0
	}
	lo, hi := int(b.band.lo[i]), int(b.band.hi[i])
	v := b.v0[i] - b.tgt[i]
	x := b.x[lo : hi+1]
	for j, a := range b.bandRow(i)[lo : hi+1] {
		v += a * x[j]
	}
	return v < -tol
}

// pressed reports whether point i carried a load last step. A pair apart
// is loose (band.go), left out of the banded solve, unless it pressed last
// step: a point apart that carries an impulse only from this step's sweeps
// of its own pair, run first for a pair without warm start, or from the
// sweeps' rounding (they leave a speculative point a small impulse that a
// converged solve would not) is no reason to solve it directly. At 1/30 s
// a 1 mm cube's speculative points reach the floor and the cubes a dozen
// rows away; counted in, they made a tower of 20 such cubes dense, left it
// to the sweeps, and it fell (measured).
func (s *Solver) pressed(i int32) bool {
	return s.pts[i].found && s.pts[i].prevN > 0
}
