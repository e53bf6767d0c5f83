package contact

// A slop that follows the size of the parts.
//
// The slop is the penetration the position pass leaves alone and the gap
// within which a point counts as touching: a point that arrives within it
// bounces at once, from where it is, instead of being stopped at the gap
// and bouncing the next step (held.go). A fixed 0.2 mm is one percent of a
// 2 cm part but a fifth of a 1 mm one, and a 1 mm ball dropped 1 mm at a
// 1 ms step then bounced from up to 0.2 mm above the floor: its second
// rebound came out 24 percent high, where the same ball ten times larger
// was within 0.01 percent (measured). Rigid-body motion under gravity has
// no length scale of its own (dynamic similarity: a case s times larger is
// the same case at s^(1/2) times the times), so every length the solver
// judges by should be a part of the bodies' size; Settings.SlopSize caps
// each point's slop at that fraction of the radius of the smaller moving
// body it joins.

// PointSlop is the slop (m) of a point between bodies of sizes sizeA and
// sizeB (Body.Size: 0 for a body that does not move, which sets no cap).
func PointSlop(s *Settings, sizeA, sizeB float64) float64 {
	slop := s.Slop
	if s.SlopSize > 0 {
		if sizeA > 0 {
			slop = min(slop, s.SlopSize*sizeA)
		}
		if sizeB > 0 {
			slop = min(slop, s.SlopSize*sizeB)
		}
	}
	return slop
}
