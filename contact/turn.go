package contact

import "math"

// A stopping test that scales with the parts.
//
// The velocity sweeps stop once every row changes by at most Tolerance plus
// Convergence times the velocity change of its impulse (sweepPoints). Both
// are speeds: a row left that far from its target leaves its body turning
// at that speed divided by the body's size. For parts of centimetres and up
// that turn is nothing, but Convergence times a resting load is about
// 1e-4 g dt, up to 1.6e-5 m/s at 1/60 s, and on a 1 mm part that is a turn
// of 1e-2 rad/s. While a load shifts slowly (a block on a tilting table,
// whose load moves toward its downhill edge step after step) the sweeps
// stop short in the same direction every step, so the error does not
// average out: the downhill edge sinks into the support by that speed
// times the time, unseen by the position pass while within the slop, and
// a 1 mm block leans 0.01 rad before it tips (measured). Each row's test
// is therefore also bounded by turnTolerance times the size of the smaller
// moving body it joins (Body.Size), so the turn such an error leaves
// builds up to no more than turnTolerance times the time, however small
// the part.

// turnTolerance (rad/s) is the largest turn that a row's stopping error may
// leave a body with: 1e-5 rad/s builds up to 6e-4 rad in a minute, below
// the 1e-3 rad by which a part on a tilt table counts as starting to tip,
// and to 2e-5 rad over the 2 s of a drop. A 5 cm part's bound, 5e-7 m/s,
// is above the other tests at steps up to a few milliseconds, so only small
// parts and coarse steps iterate further.
const turnTolerance = 1e-5

// turnCap is the largest stopping error (m/s) of a row on a body of size
// r: unbounded for a size of 0 (not given, or a body that cannot move).
func turnCap(r float64) float64 {
	if !(r > 0) {
		return math.Inf(1)
	}
	return turnTolerance * r
}

// rowCap is the stopping error a row on slots a and b may keep.
func (s *slots) rowCap(a, b int32) float64 { return min(s.cap[a], s.cap[b]) }
