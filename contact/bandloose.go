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
// loose ones are few enough for the dense solve (maxFrictionBlock) is
// solved as before: a pyramid of three rows of 1 mm cubes at 1/60 s,
// solved so, stood within 3e-5 of a cube's width in 3 s with the impulses
// kept, and its top cube tipped over without them (measured).

// dropLoose takes back the impulses of loose points idx (normal and
// friction rows, and the rows of a patch that starts among them) and
// their velocity changes.
func (s *Solver) dropLoose(idx []int32) {
	vel := s.sl.vel
	undo := func(r *crow) {
		if r.lambda != 0 {
			r.apply(vel, -r.lambda)
			r.lambda = 0
		}
	}
	for _, i := range idx {
		undo(&s.nrows[i])
		undo(&s.trows[2*i])
		undo(&s.trows[2*i+1])
		if q := s.pts[i].patch; q > 0 && s.patches.list[q-1].lo == i {
			for j := range s.patches.list[q-1].rows {
				undo(&s.patches.list[q-1].rows[j])
			}
		}
	}
}
