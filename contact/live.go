package contact

// Sweeping only the rows that can still change.
//
// Near convergence most rows of a large island change by nothing worth a
// sweep: a resting pile of a thousand parts has a few dozen of its four
// thousand points still moving after two sweeps, and the rest would be
// visited only to find again that their bodies have not moved. A row's
// update depends on nothing but the velocities of its two bodies (and, for
// friction, its own normal impulse), so a row whose bodies have not moved
// since its last update would change by no more than rounding. The sweeps
// therefore keep, per body slot, the time of its last velocity change and
// skip a point (or patch) when neither of its bodies has moved since the
// point was last updated. This is the sweep of Gauss-Seidel restricted to
// the rows with a nonzero residual, as in the "Gauss-Southwell" and
// active-set variants of relaxation (Y. Saad, "Iterative Methods for Sparse
// Linear Systems", 2nd ed., SIAM 2003, section 5.2.1).
//
// Changes below the solver's Tolerance do not count one by one, or rounding
// would keep every row awake: they add up per body, and a body counts as
// moved once their sum exceeds Tolerance. A skipped row's velocity is thus
// off from the one a full sweep would see by about Tolerance (times the
// ratio of the rows' lever terms on the shared body), the floor of the
// stopping test itself, so a step that stops converged stops with every
// row within about the same bound as before.
//
// Only the islands of more than MaxBlock points skip rows (mostly left to
// the sweeps; a banded one is solved exactly before and after them): a
// small island converges in a few cheap sweeps, and its results stay bit
// for bit those of full sweeps.

// liveState is the sweeps' bookkeeping of moved bodies, reset per Solve.
type liveState struct {
	clock int32     // counts updates of points and patches
	moved []int32   // per body slot: clock of its last counted velocity change
	drift []float64 // per body slot: the velocity changes since then that did not count
	seen  []int32   // per point, then per patch: clock of its last update
}

// reset starts the bookkeeping for nb body slots and n points and patches:
// every row is due.
func (l *liveState) reset(nb, n int) {
	l.clock = 0
	l.moved, l.drift = grow(l.moved, nb), grow(l.drift, nb)
	clear(l.moved)
	clear(l.drift)
	l.seen = grow(l.seen, n)
	for i := range l.seen {
		l.seen[i] = -1
	}
}

// due reports whether entry i (a point, or len(points) + a patch) on slots
// a, b needs an update: one of its bodies moved since its last one.
func (l *liveState) due(i int, a, b int32) bool {
	t := l.seen[i]
	return l.moved[a] > t || l.moved[b] > t
}

// tick records an update of entry i, made after those before it, and
// returns its time.
func (l *liveState) tick(i int) int32 {
	l.clock++
	l.seen[i] = l.clock
	return l.clock
}

// note records that an update at time t changed a row on slots a, b by d
// (m/s); tol is the Tolerance below which changes add up before they count.
func (l *liveState) note(a, b int32, d, tol float64, t int32) {
	if d == 0 {
		return
	}
	for _, x := range [2]int32{a, b} {
		if x == fixedSlot {
			continue
		}
		l.drift[x] += d
		if l.drift[x] > tol {
			l.moved[x], l.drift[x] = t, 0
		}
	}
}

// large reports whether point i belongs to an island that the sweeps alone
// solve (more than MaxBlock points, no joint rows; islands as found by
// velocities). Only there are rows skipped: a small island's sweeps are
// few and cheap, and its impulses stay exactly those of full sweeps.
func (s *Solver) large(i int) bool {
	return int(s.blk.size[s.blk.root[i]]) > s.Settings.MaxBlock
}
