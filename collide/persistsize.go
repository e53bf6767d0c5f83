package collide

// Persistence that follows the size of the parts.
//
// The refresh of persist.go is good while the shapes have moved relative
// to each other by less than persistFraction of the slop since the full
// query. A fixed slop makes that limit a fixed length, and on a small
// part it is a large one: a curved surface rolling on another carries
// the refreshed point with the material (a ball's lowest point turns away
// with the ball), so the point lags behind the true one by up to the
// motion limit, and the normal force acting there turns the part. At the
// engine's 0.2 mm slop, a 1 mm ball rolling at 4 mm/s on a level floor
// sped up to 38 mm/s in a second (measured), where the same ball ten
// times larger, at the same speed relative to sqrt(g r), kept its speed.
// SetSlopSize caps the slop the memory works with at a fraction of the
// pair's smaller shape's bound radius (the rho of persist.go), as the
// contact solver caps its slop (contact/slop.go). The engine uses the
// solver's 1 percent: the 1 mm ball then gains 1.4 percent in a second at
// a step scaled to its size and nothing at 1 ms. A cap of 0.2 percent
// removed that too, but cost a resting pile of 3 cm parts a fifth more
// time per step (more full queries; measured).

// SetSlopSize caps the slop of each pair's persistence at frac times the
// bound radius of its smaller shape; 0 (the default, and what
// SetPersistence leaves) uses the slop as it is. Call it after
// SetPersistence.
func (d *Detector) SetSlopSize(frac float64) {
	if !(frac > 0) || frac > 1 {
		frac = 0
	}
	d.persist.size = frac
}

// pairSlop is the slop of entry e's pair.
func (p *persistMem) pairSlop(e *persistEntry) float64 {
	if p.size > 0 {
		return min(p.slop, p.size*e.rho)
	}
	return p.slop
}
