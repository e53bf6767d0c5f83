package contact

// A landing from within the slop.
//
// A point that arrives within its slop of the surface, a gap sep > 0 short
// of it, bounces at once from where it is (gapbounce.go). Where the bounce
// from the surface would not rise above the gap (gapRebound 0: e = 0, or a
// slow arrival with small e), leaving the bodies at rest a gap apart hung
// them there, without friction, until the step's forces closed the gap:
// a part landing on a vibrating track with e = 0.2 hovered for 2 to 5
// steps while the track slid past beneath it, and its conveying speed
// depended on where within the slop each landing happened to start
// (measured). The gap is within the slop, where a point counts as
// touching, so the bodies land: the point strikes the surface a time
// tau = 2 sep / (a0 + ac) into the step (its approach a0 grown by the
// step's forces to the arrival speed ac, arrivalSpeed), and leaves it at
// e ac, Newton's law at the surface (W. Goldsmith, "Impact", 1960, ch. 1),
// with the impact's friction bounded by mu times its normal impulse at
// that instant (Coulomb friction in a collision: W. J. Stronge, "Impact
// Mechanics", Cambridge University Press, 2000, ch. 5). The velocity solve
// then holds the point at the surface (target 0, not the gap's approach),
// so that what presses the bodies together in the rest of the step, the
// part's weight on a track, carries friction in this step too.
//
// The world moves each body by its velocity at the end of the step, that
// is by the impact's result from the start of the step, where the bodies
// really moved at their arrival velocities up to tau. So each body is
// moved back by what the impact's impulses P did over tau, the
// displacement -tau M^-1 J^T P, through the pseudo-velocities of the
// position pass (split impulses: they move positions and change no
// momentum; Catto 2005). To first order in tau the step ends where a
// landing at tau leaves the bodies: on the surface after a stop, a
// rebound's height above it after a bounce. Only these landings are moved;
// a bounce that clears the gap keeps gapRebound's speed, which reaches the
// apex of the bounce from the surface. And only where the step's forces
// press the point onto the surface (fd > 0): where nothing does (free
// bodies without gravity, e = 0), nothing hangs, a stop at the gap leaves
// the bodies resting there as before, and moving them would change their
// angular momentum, the impulses having acted with the lever arms of the
// step's start (hulls colliding in space with e = 0 lost 8e-5 of it,
// measured; TestSpinningHullsConserveMomentum asks for 1e-6).

// land makes point ps, approaching at a0 (m/s) a gap ps.sep within its slop
// with the forces adding fd > 0 to the approach over the step dt, a landing
// (see above): it notes the time of the strike, holds the point at the
// surface in the velocity solve and returns Newton's rebound speed at the
// surface. A point struck again in a later pass keeps its first strike time.
func (s *Solver) land(ps *pstate, rn *crow, a0, fd, dt float64) float64 {
	ac := arrivalSpeed(a0, fd, ps.sep, dt)
	if ps.tau == 0 {
		ps.tau = min(2*ps.sep/(a0+ac), dt)
	}
	rn.target = 0
	return ps.e * ac
}

// strikeLate adds to the pseudo-velocities the displacement that moves the
// bodies of each landing back by what its impact impulses did before the
// point struck (see above), and reports whether there was any.
func (s *Solver) strikeLate(dt float64, points []Point) bool {
	pv, any := s.sl.ps, false
	for i := range points {
		ps, p := &s.pts[i], &points[i]
		if !(ps.tau > 0) || p.ImpactImpulse == 0 {
			continue
		}
		any = true
		f := -ps.tau / dt
		s.nrows[i].apply(pv, f*p.ImpactImpulse)
		switch {
		case ps.patch > 0:
			// The patch's friction, once for the patch: at its first point.
			pa := &s.patches.list[ps.patch-1]
			if int(pa.lo) == i {
				for k := range pa.rows {
					pa.rows[k].apply(pv, f*pa.impSum[k])
				}
			}
		case ps.inv11 != 0 || ps.inv22 != 0:
			r1, r2 := &s.trows[2*i], &s.trows[2*i+1]
			r1.apply(pv, f*dot3(&p.ImpactFriction, &r1.d))
			r2.apply(pv, f*dot3(&p.ImpactFriction, &r2.d))
		}
	}
	return any
}
