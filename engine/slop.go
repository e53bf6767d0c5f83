package engine

import "clatter/contact"

// pairSlop is the slop (m) of the contacts between bodies a and b: the
// world's slop, capped for small parts at a part of the smaller moving
// body's radius, as the solver caps it (contact/slop.go), so that what
// counts as touching here (islands, sleep) is what the solver treats so.
func (w *World) pairSlop(a, b BodyID) float64 {
	size := func(id BodyID) float64 {
		if w.b.kind[id] != Dynamic {
			return 0
		}
		return w.b.radius[id]
	}
	return contact.PointSlop(&w.collision.solver.Settings, size(a), size(b))
}

// SlopOf is the contact slop (m) of a moving body of radius r (about its
// centre of mass) on a static support, under the default settings: what
// it may rest sunk into the support.
func SlopOf(r float64) float64 {
	set := contact.DefaultSettings()
	set.Slop = DefaultSlop
	return contact.PointSlop(&set, r, 0)
}
