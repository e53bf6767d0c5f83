package contact

// loneIsland fills the island arrays of the block solve (islands) directly
// when every point joins the same one dynamic body to a static one and
// there are no extra rows: a part resting on a floor. Then the union-find
// of islands would join nothing, and all points form the island of that
// body, in their own order. It reports false, having changed nothing, for
// any other scene.
func (s *Solver) loneIsland(points []Point, rows []Row) bool {
	if len(rows) > 0 || len(points) == 0 {
		return false
	}
	im := s.sl.im
	d := int32(-1)
	for i := range points {
		r := &s.nrows[i]
		x := r.a
		if (im[r.a] > 0) == (im[r.b] > 0) {
			return false // both dynamic or both static
		} else if im[r.b] > 0 {
			x = r.b
		}
		if d >= 0 && x != d {
			return false
		}
		d = x
	}
	b := &s.blk
	nb, n := len(im), len(points)
	b.size, b.start = grow(b.size, nb), grow(b.start, nb)
	b.root, b.order, b.excess = grow(b.root, n), grow(b.order, n), grow(b.excess, nb)
	// As islands leaves them: the roots up to d start at 0, those after
	// it at n, and only d has points.
	for r := range b.size {
		b.size[r], b.start[r] = 0, 0
		if int32(r) > d {
			b.start[r] = int32(n)
		}
	}
	b.size[d] = int32(n)
	for i := range points {
		b.root[i], b.order[i] = d, int32(i)
	}
	return true
}
