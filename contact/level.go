package contact

import "math"

// Levelling a face that lies flat.
//
// The position pass pushes a point out only by its depth beyond the slop,
// so a face resting on another keeps whatever tilt leaves its points'
// depths within the slop. The first steps' solve of a new contact (whose
// cold pre-solve stops at a relative tolerance) leaves a box on a floor
// tilted by some 1e-9 g dt^2 / L rad (L its half width, measured), and a
// ball on the box rolls down that tilt at 5/7 g times it, as on any
// incline; where the ball presses, the solver's leftover errors sink the
// corners further, so the tilt grows and at 1/30 s the ball left a 10 cm
// box near 290 s. A face lying flat has one depth: its contact points
// penetrate equally (rigid bodies in contact over a plane patch; the slop
// only says how deep that one depth may be). The position pass therefore
// also lifts the deeper points of a manifold (several points of one pair
// with one normal, all within the slop of touching at the end of the step
// and none apart and opening) to the depth of its shallowest point (to the
// surface if that one is apart, to the slop if it is deeper): the tilt goes
// and the depth within the slop stays, so a resting part is neither lifted
// nor pressed in. Only tilts far within the slop are levelled (levelMax).
// It moves positions only (pseudo-velocities), adding no kinetic energy,
// at the pass's Correction rate, as the penetration beyond the slop is
// removed (Catto 2005, split impulses).

// levelTol is the depth difference, as a fraction of the slop, that
// levelling leaves alone: a billionth, far above the rounding of a depth
// (1e-16 of the positions, 1e-17 m for parts a tenth of a metre from the
// origin, a part far from the origin 1e-15 m at 10 m, below 1e-9 of even
// a 1 mm part's 1e-5 m slop), far below the differences that roll a ball
// (1e-11 m over a 10 cm box at 1/30 s). A part on a face tilted by this
// much, levelTol slop / (2 L), rolls 0.3 um in 300 s on a 10 cm box.
const levelTol = 1e-9

// levelMax is the depth difference, as a fraction of the slop, from which
// levelling leaves a face to the velocity solve: a thousandth (0.2 um at
// the engine's 0.2 mm slop). The tilts that roll a part away are those the
// solve's tolerances leave (6e-11 m under a 10 cm box at 1/30 s, measured,
// a few millionths of the slop); a larger difference is a real tilt, a
// load shifting or a part starting to tip, and the pass's pseudo-velocities
// have no friction, so levelling it turns the face's body about its centre
// of mass and slides the parts resting on it: a carton on a tilting pallet
// slid 0.8 degrees early, out of the half degree of statics, when the
// pallet under a tipping carton was levelled at every depth (measured; at
// 1e-2 it slid as without levelling, 0.1 degree late).
const levelMax = 1e-3

// levelSpeed is the largest depth difference levelled, as a fraction of
// the velocity solve's Tolerance times the step: a tenth. Levelling moves
// points by up to that difference, and a point moved to a gap is let
// approach at gap / dt by the next velocity solve; below a tenth of its
// tolerance this stays below what the solve resolves (a cube resting on a
// cube at 0.1 ms reached 2e-7 m/s, 2e-3 g dt, without this bound;
// measured).
const levelSpeed = 0.1

// levelNormal is the cosine below which two points of a pair do not share
// a normal: manifold points carry one normal, equal to the last bit, so
// this only keeps apart the points of different faces (a mesh's
// triangles, a pair touching at two features).
const levelNormal = 1 - 1e-12

// level raises the position targets of the points of each manifold lying
// flat so that its deeper points come up to the depth of its shallowest
// (or to the slop), and reports whether any target was raised.
func (s *Solver) level(dt float64) bool {
	vel, corr := s.sl.vel, s.Settings.Correction
	work := false
	for g := 0; g+1 < len(s.groups); g++ {
		lo, hi := int(s.groups[g]), int(s.groups[g+1])
		for lo+1 < hi {
			end := s.sameNormal(lo, hi)
			shallow, deep := s.depths(lo, end, dt)
			d, slop := deep-shallow, s.pts[lo].slop
			if d > levelTol*slop && d < min(levelMax*slop, levelSpeed*s.Settings.Tolerance*dt) {
				base := max(0, min(shallow, s.pts[lo].slop))
				for i := lo; i < end; i++ {
					ps, rn := &s.pts[i], &s.nrows[i]
					pen := -(ps.sep + rn.cdot(vel)*dt)
					if t := corr * (pen - base) / dt; t > ps.pTarget {
						ps.pTarget = t
						work = true
					}
				}
			}
			lo = end
		}
	}
	return work
}

// sameNormal returns the end of the run of points from lo (before hi) that
// share point lo's normal.
func (s *Solver) sameNormal(lo, hi int) int {
	n := s.nrows[lo].d
	end := lo + 1
	for end < hi && n.Dot(s.nrows[end].d) >= levelNormal {
		end++
	}
	return end
}

// depths returns the smallest and largest penetration predicted at the end
// of the step over points lo to end, or two equal values if the run is not
// a face lying flat: fewer than two points, a point that cannot move, one
// farther apart than the slop, or one apart and opening (a part tipping
// onto an edge, whose deeper edge must stay where its rotation puts it).
func (s *Solver) depths(lo, end int, dt float64) (shallow, deep float64) {
	if end-lo < 2 {
		return 0, 0
	}
	shallow, deep = math.Inf(1), math.Inf(-1)
	for i := lo; i < end; i++ {
		rn, ps := &s.nrows[i], &s.pts[i]
		open := rn.cdot(s.sl.vel) * dt
		pen := -(ps.sep + open)
		if rn.mass == 0 || pen < -ps.slop || pen < 0 && open > levelTol*ps.slop {
			return 0, 0
		}
		shallow, deep = min(shallow, pen), max(deep, pen)
	}
	return shallow, deep
}
