package collide

import "math"

// basisMemo remembers the axes of the contact plane of the last normal
// asked for: a part on a floor has the floor's normal step after step,
// and patch and reduce each need its axes. The normal is compared bit for
// bit, so the axes are those perpendicular gives for that very normal.
type basisMemo struct {
	key  [3]uint64
	u, v vec3
	ok   bool
}

// basis returns perpendicular(n) and n x perpendicular(n).
func (m *basisMemo) basis(n vec3) (u, v vec3) {
	key := [3]uint64{math.Float64bits(n[0]), math.Float64bits(n[1]), math.Float64bits(n[2])}
	if !m.ok || key != m.key {
		m.u = perpendicular(n)
		m.v = n.Cross(m.u)
		m.key, m.ok = key, true
	}
	return m.u, m.v
}
