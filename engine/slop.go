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

// bodySlop is the slop (m) of body id's contacts with a static support,
// the largest any of its contacts has: the part of its speculative margin
// (collision.go) that lets a resting contact, which may sink that far,
// stay in the narrow phase. A fixed 0.2 mm there gave a 1 mm part
// speculative points from a fifth of its size away.
func (w *World) bodySlop(id BodyID) float64 {
	return w.pairSlop(id, id)
}
