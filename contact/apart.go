package contact

// Points the sweeps cannot close.
//
// A point with no impulse whose bodies separate along its normal faster
// than its target (a speculative point's gap per step, -sep/dt) is left
// unchanged by a sweep: its update computes a zero impulse and, with no
// friction to take back, touches nothing else (solvePoint). A quarter of
// a resting pile's points are such gaps that stay open, and every sweep
// read their three rows and their state only to find that again. The
// sweeps test such a point on a copy of the part of its normal row that
// gives its velocity, kept in a short list of their own, with the same
// operations as solveNormal (so with the same bits), and update it only
// once that velocity falls below the target. A skipped point's update
// would have changed nothing, so the sweeps give the results of full
// sweeps exactly.

// apartRow is the part of a skipped point's normal row that its velocity
// needs.
type apartRow struct {
	d, cA, cB vec
	target    float64
	a, b      int32
}

// apartState is the Solver's bookkeeping of the points the sweeps skip.
type apartState struct {
	of   []int32    // per point: 1 + its entry in rows, 0 if swept
	rows []apartRow // the skipped points, in the order of the points
	off  bool       // skip nothing (for tests: the full sweeps to compare with)
}

// markApart finds, before the sweeps, the points that a sweep would now
// leave unchanged, and gives them what their first update would have:
// friction impulses of +0 and no saturated cone (solvePoint). The first
// sweep updates every point (live.go), so no point escapes that update.
func (s *Solver) markApart() {
	ap := &s.apart
	ap.of = grow(ap.of, len(s.pts))
	clear(ap.of)
	ap.rows = ap.rows[:0]
	if ap.off {
		return
	}
	vel := s.sl.vel
	for i := range s.pts {
		rn := &s.nrows[i]
		if !(rn.target < 0) || rn.lambda != 0 || rn.mass == 0 {
			continue // not a gap, carrying load, or moving nothing
		}
		ps := &s.pts[i]
		own := ps.patch == 0 // friction of its own (else its patch's)
		r1, r2 := &s.trows[2*i], &s.trows[2*i+1]
		if own && (r1.lambda != 0 || r2.lambda != 0) {
			continue // its update would take friction back
		}
		ar := apartRow{d: rn.d, cA: rn.cA, cB: rn.cB, target: rn.target, a: rn.a, b: rn.b}
		if !ar.apart(vel) {
			continue
		}
		ap.rows = append(ap.rows, ar)
		ap.of[i] = int32(len(ap.rows))
		if own {
			if ps.inv11 != 0 || ps.inv22 != 0 {
				r1.lambda, r2.lambda = 0, 0
			}
			ps.sat = false
		}
	}
}

// apart reports whether the row's velocity on vel, computed as
// solveNormal computes it, is at least its target, so that from a zero
// impulse solveNormal would change nothing (a NaN is not apart).
func (r *apartRow) apart(vel []sbody) bool {
	A, B := &vel[r.a], &vel[r.b]
	cdot := 0.0
	if r.a != fixedSlot {
		cdot = -dot3(&r.d, &A.v) - dot3(&r.cA, &A.w)
	}
	if r.b != fixedSlot {
		cdot += dot3(&r.d, &B.v)
		cdot += dot3(&r.cB, &B.w)
	}
	return cdot >= r.target
}
