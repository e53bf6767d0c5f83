package contact

// islandOne is islands for a step whose points all join one moving body to
// bodies that do not move (a part on a floor or in a fixture), without
// extra rows: its one island is the body's slot, 1, and holds every point
// in order. It fills the same fields as islands, and reports false,
// leaving them alone, for any other step. The union-find and the counting
// sort of islands cost a resting part's step more than its block solve's
// test that the warm start already solves it.
func (s *Solver) islandOne(points []Point, rows []Row) bool {
	im := s.sl.im
	if len(rows) > 0 || len(im) != 2 || !(im[1] > 0) {
		return false
	}
	n := len(points)
	for i := range points {
		if r := &s.nrows[i]; r.a != 1 && r.b != 1 {
			return false // two bodies that do not move (an input islands keeps apart)
		}
	}
	b := &s.blk
	b.parent, b.size, b.start = grow(b.parent, 2), grow(b.size, 2), grow(b.start, 2)
	b.parent[0], b.parent[1] = 0, 1
	b.size[0], b.size[1] = 0, int32(n)
	b.start[0], b.start[1] = 0, 0
	b.root = grow(b.root, n)
	b.excess = grow(b.excess, 2)
	b.order = grow(b.order, n)
	for i := range points {
		b.root[i], b.order[i] = 1, int32(i)
	}
	s.orderBands() // band.go
	return true
}
