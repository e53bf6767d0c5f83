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
// Small changes do not count one by one, or rounding would keep every row
// awake: they add up per body, and a body counts as moved once their sum
// exceeds the sweep's bound. The first sweep's bound is the solver's
// Tolerance; each later one's is liveFraction of the largest excess of the
// sweep before (never below Tolerance). A pile far from converged thus
// spends its sweeps on the rows whose change is within two orders of the
// largest, as Gauss-Southwell relaxation would (Saad, section 5.2.1), and
// the bound follows the error down as the sweeps converge. A skipped row's
// velocity is off from the one a full sweep would see by about the bound
// (times the ratio of the rows' lever terms on the shared body). The sweeps
// stop as converged only after a sweep under the bound Tolerance, the floor
// of the stopping test itself, so a step that stops converged stops with
// every row within about the same bound as with full sweeps.
//
// Only the islands of more than MaxBlock points skip rows (mostly left to
// the sweeps; a banded one is solved exactly before and after them): a
// small island converges in a few cheap sweeps, and its results stay bit
// for bit those of full sweeps.

// liveFraction sets the bound of a sweep (see above) from the largest
// excess of the sweep before. The excess is the largest error the sweeps
// leave if they stop there; a row skipped because its bodies changed by
// less than a hundredth of it is off by about that hundredth, well inside
// the error the sweeps still have to remove. It is a ratio of two
// velocity errors of the same solve, so it holds whatever the step, the
// loads or the size of the parts. How much it saves depends on how far
// the island is from rest. On the pile of the Pile1000 benchmark (1000
// parts in a bin, one island of 4400 points and 660 patches at 1 ms,
// 1140 of the points speculative and apart, some parts still moving at a
// fraction of a millimetre per second) the sweeps' largest excess falls
// from 3e-4 to 5.5e-5 m/s in 8 sweeps, against a stopping test of about
// 2e-7 m/s there (turn.go), so every sweep runs, and they update 60
// percent of the rows. A tenth in place of a hundredth updated 39
// percent and cut the solve's CPU time by 13 percent, each sweep's
// largest excess within 4 percent, but the rows it skipped left 1.4 times
// as many rows more than 1e-6 m/s off at the start of the next step, the
// pile kept 4.4 times the kinetic energy after 300 steps, and pouring 1000
// parts (Pour1000) took 8 percent longer a step (all measured, December
// 2026).
const liveFraction = 0.01

// liveState is the sweeps' bookkeeping of moved bodies, reset per Solve.
type liveState struct {
	bound float64   // this sweep's bound on the changes that add up, m/s
	loose bool      // the bound may rise above Tolerance: some rows are skipped
	clock int32     // counts updates of points and patches
	moved []int32   // per body slot: clock of its last counted velocity change
	drift []float64 // per body slot: the velocity changes since then that did not count
	seen  []int32   // per point, then per patch: clock of its last update
	rows  []liveRow // per point, then per patch: its bodies, whether it may be skipped
}

// liveRow is what the sweeps' test of a point or patch reads, kept apart
// from its rows so that the test of a skipped one does not load them.
type liveRow struct {
	a, b  int32 // body slots
	track bool  // in a large island: skipped while its bodies have not moved
}

// reset starts the bookkeeping for nb body slots and n points and patches,
// with the bound tol (the solver's Tolerance): every row is due. Only with
// loose (some island's rows are skipped) do later sweeps get a looser bound.
func (l *liveState) reset(nb, n int, tol float64, loose bool) {
	l.bound, l.loose, l.clock = tol, loose, 0
	l.moved, l.drift = grow(l.moved, nb), grow(l.drift, nb)
	clear(l.moved)
	clear(l.drift)
	l.seen = grow(l.seen, n)
	for i := range l.seen {
		l.seen[i] = -1
	}
	l.rows = grow(l.rows, n)
}

// start is reset for a Solve: without loose no row is skipped, and the
// sweeps (sweepFew) and settle, whose bound stays tol, read none of the
// arrays, which it leaves as they are.
func (l *liveState) start(nb, n int, tol float64, loose bool) {
	if !loose {
		l.bound, l.loose, l.clock = tol, loose, 0
		return
	}
	l.reset(nb, n, tol, loose)
}

// liveRows fills s.live.rows for the points and patches of this step; with
// live off (no block solve, or Tolerance 0) nothing is skipped.
func (s *Solver) liveRows(live bool) {
	if !s.live.loose {
		return // no row is skipped: sweepFew reads no live rows
	}
	rows := s.live.rows
	for i := range s.pts {
		rn := &s.nrows[i]
		rows[i] = liveRow{a: rn.a, b: rn.b, track: live && s.large(i)}
	}
	np := len(s.pts)
	for k := range s.patches.list {
		pa := &s.patches.list[k]
		rows[np+k] = liveRow{a: pa.rows[0].a, b: pa.rows[0].b, track: live && s.large(int(pa.lo))}
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
// (m/s); changes add up below the sweep's bound before they count.
func (l *liveState) note(a, b int32, d float64, t int32) {
	if d == 0 {
		return
	}
	if a != fixedSlot {
		l.add(a, d, t)
	}
	if b != fixedSlot {
		l.add(b, d, t)
	}
}

// add adds change d at time t to the drift of slot x.
func (l *liveState) add(x int32, d float64, t int32) {
	if dx := l.drift[x] + d; dx > l.bound {
		l.moved[x], l.drift[x] = t, 0
	} else {
		l.drift[x] = dx
	}
}

// settle ends a sweep whose largest excess was ex: it reports whether the
// sweeps are converged (ex within tol under the bound tol) and sets the
// bound of the next sweep. A sweep that met tol under a looser bound is
// followed by one under tol, in which every body whose changes added up to
// more than tol counts as moved.
func (l *liveState) settle(ex, tol float64) bool {
	if ex <= tol {
		if l.bound <= tol {
			return true
		}
		l.clock++
		for x, d := range l.drift {
			if d > tol {
				l.moved[x], l.drift[x] = l.clock, 0
			}
		}
		l.bound = tol
		return false
	}
	if l.loose {
		l.bound = max(tol, liveFraction*ex)
	}
	return false
}

// large reports whether point i belongs to an island that the sweeps alone
// solve (more than MaxBlock points, no joint rows; islands as found by
// velocities). Only there are rows skipped: a small island's sweeps are
// few and cheap, and its impulses stay exactly those of full sweeps.
func (s *Solver) large(i int) bool {
	return int(s.blk.size[s.blk.root[i]]) > s.Settings.MaxBlock
}

// anyLarge reports whether some island's rows are skipped by the sweeps
// (large); block says whether the islands were found.
func (s *Solver) anyLarge(block bool) bool {
	if !block || s.Settings.Tolerance == 0 {
		return false
	}
	for _, n := range s.blk.size {
		if int(n) > s.Settings.MaxBlock {
			return true
		}
	}
	return false
}
