package report

// A body that tips starts to turn slowly: on a table tilting at a steady
// rate its turn grows as the cube of the time past the onset (the moment
// that turns it grows with the tilt from zero), and by the time it has
// turned onsetAngle the table has turned on by an amount that grows with
// the body's size: 0.05 degree for a 1 cm block, 0.74 for a 2 m one, at 2
// degrees per second (rotation about the fixed edge, M = I alpha; J. L.
// Meriam and L. G. Kraige, "Engineering Mechanics: Dynamics"). A shove
// starts the turn at once and it grows in proportion to the time.
//
// tipClock dates the onset back from the times the turn passes onsetAngle
// and twice and four times that. A turn that starts as a power of the
// time, theta = k (t - t0)^p, whatever k and p, passes these levels at
// times whose gaps grow by the ratio q = 2^(1/p); so the gap from t0 to
// the first is the first gap over q - 1 (q = 2 for a shove, 2^(1/3) on a
// tilting table). The support's tilt at t0 is extrapolated along the
// line through its tilts at the first and last of these times. The onset
// is dated from the turn alone, not from the contact loads (the centre of
// pressure reaching the downhill edge): a face contact of four points is
// statically indeterminate, and at a step of 0.1 ms the velocity solve
// carried a 2 m block on its downhill edge alone for most of the
// approach (measured), a degree before the onset.
type tipClock struct {
	base float64    // the first level; the others are twice and four times it
	n    int        // levels passed since the turn was last below base
	at   [3]float64 // when it passed each
	tilt [3]float64 // the support's tilt then (degrees)
	// t, turn and deg are the time, turn and support's tilt of the last
	// step.
	t, turn, deg float64
}

// tick takes a step's end: its time, the body's turn on its support (rad)
// and the support's tilt (degrees). A level is passed at the time found by
// linear interpolation within the step.
func (c *tipClock) tick(t, turn, deg float64) {
	if turn < c.base {
		c.n = 0
	}
	for c.n < len(c.at) && turn >= c.level(c.n) {
		f := 1.0
		if turn > c.turn {
			f = min(max((c.level(c.n)-c.turn)/(turn-c.turn), 0), 1)
		}
		c.at[c.n] = c.t + f*(t-c.t)
		c.tilt[c.n] = c.deg + f*(deg-c.deg)
		c.n++
	}
	c.t, c.turn, c.deg = t, turn, deg
}

// onset returns the support's tilt at the dated onset, not before since;
// ok is false if the turn has not passed the three levels since it was
// last calm or its gaps do not widen (no power-law start to date).
func (c *tipClock) onset(since float64) (deg float64, ok bool) {
	if c.n < len(c.at) {
		return 0, false
	}
	g1, g2 := c.at[1]-c.at[0], c.at[2]-c.at[1]
	if !(g1 > 0) || !(g2 > g1) {
		return 0, false
	}
	t0 := max(c.at[0]-g1/(g2/g1-1), since)
	rate := (c.tilt[2] - c.tilt[0]) / (c.at[2] - c.at[0])
	return c.tilt[0] + rate*(t0-c.at[0]), true
}

// level is the k-th level: base times 2^k.
func (c *tipClock) level(k int) float64 { return c.base * float64(int(1)<<k) }
