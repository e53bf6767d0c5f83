package contact

import "math"

// Points the sweeps cannot close.
//
// A point with no impulse whose bodies separate along its normal faster
// than its target (a speculative point's gap per step, -sep/dt) is left
// unchanged by a sweep: its update computes a zero impulse and, with no
// friction to take back, touches nothing else (solvePoint). A quarter of
// a resting pile's points are such gaps that stay open, and every sweep
// read their three rows only to find that again. Their velocity along the
// normal can change only as their bodies' velocities do, by at most
//
//	|dV_A| + |cA| |dW_A| + |dV_B| + |cB| |dW_B|
//
// (Cauchy-Schwarz on each term of the row's Jacobian, d a unit vector), so
// the sweeps skip such a point while that bound, on the velocities
// changed since the sweeps began, stays below the margin its row had then
// (less a bound on the rounding of both evaluations of its velocity).
// Once the bound reaches the margin, the point is swept as before. A
// skipped point's update would have changed nothing, bit for bit, so the
// sweeps give the results of full sweeps exactly.

// apartRound bounds, relative to the sum of the magnitudes of its terms,
// the rounding of a row velocity: seven roundings of float64 (1e-16 each),
// with a wide margin.
const apartRound = 1e-9

// apartGrow scales the bound on the change of a row's velocity: a point's
// normal may be off unit length by 5e-7 (check accepts a squared length
// within 1e-6 of 1), and the bound has roundings of its own (1e-16 each).
const apartGrow = 1 + 1e-5

// apartPoint is what the sweeps' test of a point reads: kept apart from the
// rows, so that a skipped point's rows are not loaded.
type apartPoint struct {
	margin float64 // the row's velocity less its target and rounding; 0: swept
	ca, cb float64 // |cA|, |cB|: the lever terms of its normal row
	a, b   int32   // body slots
}

// apartState is the Solver's bookkeeping of the points the sweeps skip.
type apartState struct {
	pts  []apartPoint // per point
	vel0 []sbody      // the slots' velocities when the sweeps began
	off  bool         // skip nothing (for tests: the full sweeps to compare with)
	n    int          // points skipped from the first sweep on
}

// markApart finds, before the sweeps, the points that no sweep will
// change while their bodies' velocities stay within their margins, and
// gives them what their first update would have: friction impulses of
// +0 and no saturated cone (solvePoint). The first sweep updates every
// point (live.go), so no point escapes that update.
func (s *Solver) markApart() {
	ap := &s.apart
	ap.pts = grow(ap.pts, len(s.pts))
	ap.vel0 = append(ap.vel0[:0], s.sl.vel...)
	vel := s.sl.vel
	for i := range s.pts {
		fp := &ap.pts[i]
		*fp = apartPoint{}
		rn := &s.nrows[i]
		if ap.off || !(rn.target < 0) || rn.lambda != 0 || rn.mass == 0 {
			continue // not a gap, carrying load, or moving nothing
		}
		ps := &s.pts[i]
		own := ps.patch == 0 // friction of its own (else its patch's)
		r1, r2 := &s.trows[2*i], &s.trows[2*i+1]
		if own && (r1.lambda != 0 || r2.lambda != 0) {
			continue // its update would take friction back
		}
		v, mag := rowVelMag(&vel[rn.a], &vel[rn.b], rn)
		m := v - rn.target - apartRound*(2*mag+math.Abs(rn.target))
		if !(m > 0) {
			continue
		}
		ap.n++
		*fp = apartPoint{margin: m, ca: math.Sqrt(dot3(&rn.cA, &rn.cA)), cb: math.Sqrt(dot3(&rn.cB, &rn.cB)), a: rn.a, b: rn.b}
		if own {
			if ps.inv11 != 0 || ps.inv22 != 0 {
				r1.lambda, r2.lambda = 0, 0
			}
			ps.sat = false
		}
	}
}

// rowVelMag is rowVel (the same operations, so the same bits) and the sum
// of the magnitudes of its terms, which bounds its rounding.
func rowVelMag(A, B *sbody, r *crow) (v, mag float64) {
	onA, onB := r.a != fixedSlot, r.b != fixedSlot
	if onA {
		v = -dot3(&r.d, &A.v) - dot3(&r.cA, &A.w)
		mag = absDot(&r.d, &A.v) + absDot(&r.cA, &A.w)
	}
	if onB {
		v += dot3(&r.d, &B.v)
		v += dot3(&r.cB, &B.w)
		mag += absDot(&r.d, &B.v) + absDot(&r.cB, &B.w)
	}
	return v, mag
}

func absDot(a, b *vec) float64 {
	return math.Abs(a[0]*b[0]) + math.Abs(a[1]*b[1]) + math.Abs(a[2]*b[2])
}

// apartDiffs caches the velocity changes of one pair of body slots for
// the test of skip: the points of a pair group share their bodies, and
// their velocities do not change while the group's points are skipped.
type apartDiffs struct {
	ok     bool    // valid: no velocity changed since they were taken
	a, b   int32   // the slots
	lin    float64 // L1 norms of the changes of V_a plus V_b
	wa, wb float64 // L1 norms of the changes of W_a and W_b
}

// skip reports whether point fp is still certain to be left unchanged by
// its update on velocities vel (the sweeps began at vel0); c holds the
// changes of fp's slots if c.ok and c.a, c.b are fp's, and is set to them.
// The change of its row's velocity since the sweeps began is at most the
// sum of the L1 norms of its bodies' velocity changes, the angular ones
// times the lever terms (and the length of the normal, within apartGrow
// of 1); the rounding of the velocity at its update is within the
// margin's allowance for rounding plus apartRound times that change. A
// false answer is final: the caller sets margin to 0.
func (fp *apartPoint) skip(vel, vel0 []sbody, c *apartDiffs) bool {
	if !c.ok || c.a != fp.a || c.b != fp.b {
		A, A0, B, B0 := &vel[fp.a], &vel0[fp.a], &vel[fp.b], &vel0[fp.b]
		*c = apartDiffs{ok: true, a: fp.a, b: fp.b, lin: l1Diff(&A.v, &A0.v) + l1Diff(&B.v, &B0.v), wa: l1Diff(&A.w, &A0.w), wb: l1Diff(&B.w, &B0.w)}
	}
	dv := c.lin + fp.ca*c.wa + fp.cb*c.wb
	return dv*apartGrow < fp.margin
}

func l1Diff(a, b *vec) float64 {
	return math.Abs(a[0]-b[0]) + math.Abs(a[1]-b[1]) + math.Abs(a[2]-b[2])
}
