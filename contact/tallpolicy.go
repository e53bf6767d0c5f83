package contact

import "math"

// When a tall island (band.go) gets its banded solve with friction.
//
// The solve is for structures at rest, whose loads the sweeps pass on too
// slowly (towers, pyramids). Where it has nothing to do, or cannot
// succeed, it is skipped: a factorisation of a thousand rows costs more
// than the rest of the island's step.
//
//   - A structure at rest kept awake starts each step from the impulses
//     that held it the step before, and they hold it again: in a pyramid
//     of ten rows of boxes at 1 ms its rows' velocities are within 2e-15 of
//     their scale (measured), while the factorisation that found the same
//     velocities again (and, the system being singular, another spread of
//     the same loads over each face) cost 17 times the rest of its step.
//     warmSticks finds such a warm start.
//   - An island in motion has points that slide faster than their
//     friction can stop, and the solve with every point sticking fails its
//     cone test or cycles (bandcycle.go) after a few factorisations:
//     parts poured into a bin failed so in 172 of 175 solves (measured).
//     outrunsFriction finds such a point.

// warmTall is the relative precision of a tall island's warm start that
// counts as solved: below that of the banded solve itself, whose rows
// (after its refinement step, refine.go) stay about 6e-12 of their scale
// off (measured on a tower of 50 boxes on a floor tilted 0.5 degrees, at
// 1/60 s). The shift's share blockShift (1e-9) is too loose here: over 50
// boxes the friction of a face then wandered by 0.15 percent and the top
// box by 5e-8 m within a few steps, as the sweeps after each skipped solve
// left errors of about that share for the next step's warm start
// (measured).
const warmTall = 1e-12

// warmSticks reports whether the warm start already solves the system
// with friction of the tall island of points idx (the friction of its
// first nf points; denseloose.go): every pressing row's
// velocity, normal or friction, within warmTall of the velocity change its
// point's normal impulse makes (for a patch's rows, the largest of its
// points'), no free normal row approaching faster than Tolerance (the
// solve's own test for a row to enter), and every friction impulse inside
// its cone or limit surface (sticks). The friction rows of a point without
// load have no scale and must be still: with no normal impulse they carry
// none either. A load that changes (a part that lands, a row that tips)
// fails the test and is solved directly again.
func (s *Solver) warmSticks(idx []int32, nf int) bool {
	b := &s.blk
	vel, tol := s.sl.vel, s.Settings.Tolerance
	s.systemRows(idx, nf, true)
	n := len(b.rows)
	b.x = grow(b.x, n)
	for i, r := range b.rows {
		e := r.cdot(vel) - r.target
		b.x[i] = r.lambda
		if b.kind[i] == normalRow && r.lambda <= 0 {
			if e < -tol {
				return false
			}
		} else if math.Abs(e) > warmTall*s.warmScale(i) {
			return false
		}
	}
	return s.sticks(idx)
}

// warmScale is the velocity change of the normal impulse behind row i of
// the system (systemRows with friction, banded): its own for a normal
// row, its point's for a tangent row, the largest of its points' for a
// patch row.
func (s *Solver) warmScale(i int) float64 {
	b := &s.blk
	k, cnt := i, int32(1)
	switch b.kind[i] {
	case tangentRow:
		k = int(b.of[i])
	case patchRow:
		k, cnt = int(b.of[i]), b.cnt[i]
	}
	scale := 0.0
	for _, r := range b.rows[k : k+int(cnt)] {
		scale = max(scale, r.lambda*r.k)
	}
	return scale
}

// outrunsFriction reports whether a point of idx without a patch slides
// faster than SlipSpeed, the solver's own mark of sliding (classify), and
// faster than its friction at its present normal impulse can stop it
// within the step, mu times that impulse times its tangent rows' larger
// response. Such a point moves with the island rather than rests in it.
// In the tests' pyramids and towers, at every step and mass ratio, no
// point of a tall island did so; in the pour of 1000 parts every solve
// had a dozen or more such points (measured). A patch's points are not
// looked at: an island whose patches alone slide gets the solve as before.
func (s *Solver) outrunsFriction(idx []int32) bool {
	vel, slip := s.sl.vel, s.Settings.SlipSpeed
	for _, i := range idx {
		if s.pts[i].patch > 0 {
			continue
		}
		rn, r1, r2 := &s.nrows[i], &s.trows[2*i], &s.trows[2*i+1]
		stop := max(slip, s.pts[i].mu*max(rn.lambda, 0)*max(r1.k, r2.k))
		if hypotAbove(r1.cdot(vel)-r1.target, r2.cdot(vel)-r2.target, stop) {
			return true
		}
	}
	return false
}
