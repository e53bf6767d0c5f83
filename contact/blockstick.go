package contact

// Friction released, then taken back.
//
// A contact released from the direct solve with friction (release,
// blockrows.go) presses without friction, and the solution is kept if it
// does not slip there (holds): within the solver's Tolerance. That is a
// loose bound for a light part held by friction alone. At the top of a
// pyramid of 1 mm cubes, a light one on two heavy ones 1:100, the sticking
// solution squeezed the top cube by 9 times its weight (the least-impulse
// spread of the loads below it), so its friction was released at every
// step; solved without friction, its rows left its velocities off by the
// shift's share (blockShift), 1e-10 m/s, and the sweeps after did not
// bring them back below their tolerance. The errors rocked the cube a
// little more each step, as its rows follow its tilt, 15 percent a step
// at 1/30 s, until a corner lifted and the pyramid fell (10 mm in 5 s,
// measured at 1/60 and 1/30 s, 8 and 10 rows).
//
// A solution that holds is one of the sticking solutions (its released
// contacts do not slip): the sticking system is consistent there. The
// released rows therefore go back into the system, and one step of
// iterative refinement from the solution that holds (refine.go) finds the
// sticking solution nearest it, with friction where the released contacts
// need a little (iterated Tikhonov regularisation started from a given
// point: H. W. Engl, M. Hanke and A. Neubauer, "Regularization of Inverse
// Problems", Kluwer 1996, section 5.1), rather than the squeeze of the
// least impulses. It is kept if every friction impulse lies within its
// bound (sticks); else the solution that holds stands.

// Only a banded system, and a dense one that holds loose points
// (denseloose.go), does so: another small island's dense solve keeps the
// solution that holds, as before (a pyramid of three rows of 10 cm boxes,
// light on heavy 1:10 at 1/60 s, sank 10 um in 5 s when its dense solve
// did so too, measured). A pyramid of three rows of 1 mm cubes, heavy on
// light 1000:1 at 1/60 s, whose light top cube kept its released friction,
// turned on its two supports at 5e-7 rad/s and moved 32 um in 10 s
// (measured).

// restick puts the friction rows released from the system of n rows of
// points idx (banded or not) back into it and refines its solution b.x,
// which holds (holds), keeping the result if all of it sticks.
func (s *Solver) restick(idx []int32, n int, shift float64, band bool) {
	b := &s.blk
	released := false
	for _, f := range b.free[:n] {
		released = released || f != inSystem
	}
	if !released {
		return
	}
	b.held = append(b.held[:0], b.x[:n]...)
	b.hfree = append(b.hfree[:0], b.free[:n]...)
	clear(b.free[:n])
	b.follow()
	ok := false
	if band {
		ok = b.refactorBand(n, shift, s.bandLimit(n, true))
	} else {
		ok = b.refactor(n, shift)
	}
	if ok {
		b.refine(n, band) // refine.go
		if s.sticks(idx) {
			return
		}
	}
	copy(b.x, b.held)
	copy(b.free, b.hfree)
	b.follow()
}
