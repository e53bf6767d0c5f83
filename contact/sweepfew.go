package contact

// sweepFew is sweepPoints for a step in which no row may be skipped (no
// island of more than MaxBlock points, live.go): a part on a floor, a few
// parts touching. It makes the same updates in the same order and returns
// the same res and excess, bit for bit, but walks each pair group as runs
// of points without and with a patch instead of testing every point for
// its patch and its live state: those tests cost as much as a resting
// part's row updates themselves (measured: some 160 instructions a point,
// a twentieth of a drop trial).
func (s *Solver) sweepFew(block bool) (res, excess float64) {
	vel := s.sl.vel
	t := sweepTally{conv: s.Settings.Convergence, tol: s.Settings.Tolerance}
	if block {
		t.root, t.island = s.blk.root, s.blk.excess
	}
	ps := &s.patches
	for g := 0; g+1 < len(s.groups); g++ {
		i, hi := int(s.groups[g]), int(s.groups[g+1])
		k0, k1 := ps.ofGroup[g], ps.ofGroup[g+1]
		for k := k0; k <= k1; k++ {
			// Points [i, end) have their own friction rows, [end, pend)
			// belong to patch k (none after the group's last patch).
			end, pend := hi, hi
			if k < k1 {
				end, pend = int(ps.list[k].lo), int(ps.list[k].hi)
			}
			for ; i < pend; i++ {
				rn := &s.nrows[i]
				var d float64
				if i < end {
					d = s.solvePoint(vel, i)
				} else {
					d = solveNormal(vel, rn)
				}
				res = max(res, d)
				if c := s.sl.rowCap(rn.a, rn.b); !(d <= t.tol && d <= c) && t.mayRaise(d, c, i) {
					t.note(d, s.pointScale(i), c, i)
				}
			}
		}
		for k := k0; k < k1; k++ {
			pa := &ps.list[k]
			d := s.solvePatchVel(pa)
			res = max(res, d)
			r0 := &pa.rows[0]
			if c := s.sl.rowCap(r0.a, r0.b); !(d <= t.tol && d <= c) && t.mayRaise(d, c, int(pa.lo)) {
				t.note(d, pa.scale(), c, int(pa.lo))
			}
		}
	}
	return res, t.excess
}
