package contact

// Loose points before a banded solve.
//
// A banded solve leaves its island's loose points (band.go: apart beyond
// the slop, without a load last step) out of its system, and the sweeps
// after it take them. Whatever impulse such a point holds when the solve
// starts comes from this step's pre-solve of its own pair (velocities: a
// pair without warm start is swept on its own first), which stops a part
// at the gap of its speculative point as if nothing else held it up. Kept,
// that impulse is a load the direct solve works around: on the first step
// of a pyramid of ten rows of 1 mm cubes, heavy rows on light ones 100:1
// at 1/60 s, 113 speculative points a cube or two apart were left pressing
// with up to g dt of velocity change each; the sweeps, slow between heavy
// and light bodies, unloaded only part of them in their 30 sweeps, so 74
// had pressed at the next step, counted as pressing (pressed), made the
// island's system dense, and it was left to the sweeps and fell 11 mm in
// 3 s (measured). The banded solve therefore takes those impulses back
// first; a loose point that must press (a part falling through its gap
// within the step) gets its impulse again from the sweeps.
//
// Only a banded solve does so. An island whose points other than the
// loose ones are few enough for the dense solve (maxFrictionBlock) takes
// its loose points into its system as normal rows instead (denseloose.go),
// which sets their impulses; taken back here, the top cube of a pyramid of
// three rows of 1 mm cubes at 1/60 s tipped over (measured).
//
// Only a point between bodies that the banded solve holds (each has a
// point in its system) is so treated: a part falling onto a structure,
// touching nothing yet, is stopped at its gap by its pre-solve, and
// without that impulse a 4 g cube dropped onto a woken pile of boxes at
// 4 ms steps pushed into it and set it moving at 3 cm/s (measured).

// dropLoose takes back the impulses of the loose points loose (normal and
// friction rows, and the rows of a patch that starts among them) and their
// velocity changes, where each of the point's moving bodies has a point in
// held, the system of the banded solve.
func (s *Solver) dropLoose(held, loose []int32) {
	vel, im := s.sl.vel, s.sl.im
	mark := &s.blk.band.held
	*mark = grow(*mark, len(im))
	for _, i := range held {
		(*mark)[s.nrows[i].a], (*mark)[s.nrows[i].b] = true, true
	}
	undo := func(r *crow) {
		if r.lambda != 0 {
			r.apply(vel, -r.lambda)
			r.lambda = 0
		}
	}
	for _, i := range loose {
		if a, b := s.nrows[i].a, s.nrows[i].b; im[a] > 0 && !(*mark)[a] || im[b] > 0 && !(*mark)[b] {
			continue
		}
		undo(&s.nrows[i])
		undo(&s.trows[2*i])
		undo(&s.trows[2*i+1])
		if q := s.pts[i].patch; q > 0 && s.patches.list[q-1].lo == i {
			for j := range s.patches.list[q-1].rows {
				undo(&s.patches.list[q-1].rows[j])
			}
		}
	}
	for _, i := range held {
		(*mark)[s.nrows[i].a], (*mark)[s.nrows[i].b] = false, false
	}
}
