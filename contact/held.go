package contact

// The energy held by a deferred impact.
//
// A point that closes its gap within the step, but is not yet touching, is
// stopped at the gap by the velocity solve and bounces the next step with e
// times its arrival speed (impacts). The stop takes energy out of the
// motion, the bounce gives it back. Where the bodies' motion carries on as
// it was between the steps, the two match. Where it does not, Newton's
// target e times the arrival speed can give back more than the stops took,
// and the impact gains energy, which an impact with e <= 1 never does:
// the work of the normal impulse in restitution is at most e^2 times the
// energy absorbed in compression (the energetic coefficient of restitution:
// Stronge, "Impact Mechanics", Cambridge University Press, 2000). Seen in a
// bin of parts with e = 1: a box turning about its landing corner reached
// the gap more slowly than it left, or came down on an edge whose second
// point doubled the corner's effective mass, and a third of the bin's
// energy appeared in one step.
//
// So the stops' energy is kept with the point, and the pair's impact in
// the step it arrives may add at most e^2 times it to the kinetic energy of
// the two bodies: the stops and the bounce together then never gain
// energy. Where Newton's targets would add more, the arriving points'
// approach is scaled back, from the arrival speed toward their approach
// now, until the impact adds that much.
//
// The stops' normal impulse is kept with the point too, and handed out
// with the impact when it arrives (Point.StopImpulse): the stop is the
// impact's compression begun a step early, and the impulse of the impact
// is the stop's and the bounce's together, m v (1+e) for a central impact
// (Newton's impact law: W. Goldsmith, "Impact", 1960, ch. 1). Reporting the
// bounce's part alone made the impulse depend on the step: a 12 kg carton
// dropped flat from 610 mm, e = 0.2, read 23.1 N s at 2 ms and 49.8 at
// 0.1 ms, where its gap closes within the slop and no stop is deferred.

const (
	// heldRelTol: in a clean deferred impact (one stop, the bodies' motion
	// unchanged between the steps, e = 1) the impact adds exactly what the
	// stop took, the same energy computed two ways; 1e-9 of it is far above
	// their roundings and far below a measurable bounce.
	heldRelTol = 1e-9
	// heldRoundTol: the impact's gain is a difference of the pair's kinetic
	// energies; 1e-12 of them covers its rounding.
	heldRoundTol = 1e-12
	// heldHalvings: the scale of the arriving approach is found by
	// bisection to 2^-30, 1e-9 of the arrival speed.
	heldHalvings = 30
)

// noteStops completes, for the points whose impact is deferred, the
// approach a0 at which the velocity solve starts to stop them: impacts left
// their arrival speed in aStart, and the approach before the velocity
// solve, this step's forces included, may be larger.
func (s *Solver) noteStops() {
	for i := range s.pts {
		if ps := &s.pts[i]; ps.deferred > 0 {
			ps.aStart = max(ps.aStart, -s.nrows[i].cdot(s.sl.vel))
		}
	}
}

// stopEnergy is the energy that the velocity solve's normal impulse lambda
// at a point took from the motion while the point's approach went from a0
// to a1: its work along the straight path from the velocities before the
// solve to those after, on which every relative velocity changes linearly,
// lambda (a0 + a1) / 2 (the trapezoid rule, exact for a linear integrand).
// Never negative.
func stopEnergy(lambda, a0, a1 float64) float64 {
	if !(lambda > 0) {
		return 0
	}
	return max(0.5*lambda*(a0+a1), 0)
}

// boundHeld runs the impact of pair group g when a deferred impact arrives
// at one of its points, bounded by the energy its stops held (see above),
// and reports whether it did; tol ends the pair's sweeps (pairImpact).
func (s *Solver) boundHeld(bodies []Body, g int, points []Point, tol float64) bool {
	lo, hi := int(s.groups[g]), int(s.groups[g+1])
	budget, arrived := 0.0, false
	for i := lo; i < hi; i++ {
		if ps := &s.pts[i]; ps.arrived && ps.active {
			arrived = true
			budget += ps.e * ps.e * ps.held
		}
	}
	if !arrived {
		return false
	}
	vel := s.sl.vel
	a, b := s.nrows[lo].a, s.nrows[lo].b
	va, vb := vel[a], vel[b]
	p0, p1 := s.patches.ofGroup[g], s.patches.ofGroup[g+1]
	s.heldSums = s.heldSums[:0]
	for k := p0; k < p1; k++ {
		s.heldSums = append(s.heldSums, s.patches.list[k].impSum)
	}
	e0 := s.slotEnergy(bodies, a) + s.slotEnergy(bodies, b)
	limit := budget*(1+heldRelTol) + heldRoundTol*e0
	// gain runs the impact with the arriving points' approach at the
	// fraction f of the way from their approach now to the arrival speed.
	gain := func(f float64) float64 {
		vel[a], vel[b] = va, vb
		for k := p0; k < p1; k++ {
			s.patches.list[k].impSum = s.heldSums[k-p0]
		}
		for i := lo; i < hi; i++ {
			if ps := &s.pts[i]; ps.arrived && ps.active {
				v := ps.aArr // Newton's target as it is, bit for bit
				if f < 1 {
					v = ps.aNow + f*(ps.aArr-ps.aNow)
				}
				ps.iTarget = ps.e * v
				points[i].ImpactSpeed = v
			}
		}
		s.pairImpact(g, tol)
		return s.slotEnergy(bodies, a) + s.slotEnergy(bodies, b) - e0
	}
	if gain(1) <= limit {
		return true
	}
	fLo, fHi := 0.0, 1.0
	for k := 0; k < heldHalvings; k++ {
		if f := 0.5 * (fLo + fHi); gain(f) <= limit {
			fLo = f
		} else {
			fHi = f
		}
	}
	gain(fLo)
	return true
}

// slotEnergy is the kinetic energy of the body in slot k; zero for the
// fixed slot and for bodies that impulses cannot move.
func (s *Solver) slotEnergy(bodies []Body, k int32) float64 {
	im := s.sl.im[k]
	if k == fixedSlot || im == 0 {
		return 0
	}
	bd := &bodies[s.sl.gid[k]]
	v, w := &s.sl.vel[k].v, &s.sl.vel[k].w
	in := bd.InvInertia.Inv() // the world inertia
	iw := in.Mul3x1(*w)
	return 0.5*dot3(v, v)/im + 0.5*dot3(w, &iw)
}

// stoppedAtGap reports whether the velocity solve stopped deferred point i
// at its gap: it pressed, or the pair's other points stopped the bodies
// so that it arrives at its gap all the same, its normal velocity at its
// target (-sep/dt) within arriveRelTol of the approach it started from.
// The four corners of a face that lands flat stop it together, and a
// solve may load three of them and leave the fourth at zero (four
// coplanar points constrain only three motions: any share among them is a
// solution). That corner arrives like the others; dropping its deferred
// impact bounced the face on three corners with e times the arrival speed
// and the fourth with e times the speed left after the stop, targets no
// rigid motion meets, and the pair's sweeps ended with a spin: a 1 g box
// dropped flat onto a 1 kg box, e = 0.93, 1 ms steps, left its first
// bounce turning at 0.78 rad/s (measured) and came to rest 3 mm to the
// side. A point that other contacts turned away ends slower than its gap
// closes, and loses its deferred impact as before.
func (s *Solver) stoppedAtGap(i int) bool {
	rn, ps := &s.nrows[i], &s.pts[i]
	if rn.lambda > 0 {
		return true
	}
	return rn.cdot(s.sl.vel)-rn.target <= arriveRelTol*ps.aStart+s.Settings.Tolerance
}

// arriveRelTol: a velocity solve that converged leaves an unloaded corner
// of a landing face within Convergence (1e-4) of its share of the velocity
// change, well inside 1e-3 of the approach; a point that other contacts
// turn away loses a measurable part of its approach.
const arriveRelTol = 1e-3
