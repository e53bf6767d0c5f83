package contact

import (
	"slices"
	"testing"
)

// TestIslandOneAsUnionFind: for a step whose points all join one moving
// body to bodies that do not move, islandOne fills the island fields as
// the union-find of unionIslands does (the reference: the general method
// on the same input); for any other step it declines and changes nothing.
func TestIslandOneAsUnionFind(t *testing.T) {
	one := func() ([]Body, []Point) { return stack(1, 1, 0.1, 0.5) } // a cube on the ground, 4 points
	cases := []struct {
		name  string
		build func() ([]Body, []Point, []Row)
		want  bool
	}{
		{"cube on the ground", func() ([]Body, []Point, []Row) {
			b, p := one()
			return b, p, nil
		}, true},
		{"ground as body B", func() ([]Body, []Point, []Row) {
			b, p := one()
			for i := range p {
				p[i].A, p[i].B = p[i].B, p[i].A
				p[i].Normal = p[i].Normal.Mul(-1)
			}
			return b, p, nil
		}, true},
		{"two statics besides", func() ([]Body, []Point, []Row) {
			b, p := one()
			b = append(b, staticBody(vec{1, 0, 0}))
			q := p[0]
			q.A, q.Key = 2, 99
			return b, append(p, q), nil
		}, true},
		{"two cubes in a stack", func() ([]Body, []Point, []Row) {
			b, p := stack(1, 2, 0.1, 0.5)
			return b, p, nil
		}, false},
		{"a row besides", func() ([]Body, []Point, []Row) {
			b, p := one()
			return b, p, []Row{{A: 0, B: 1, LinB: vec{1, 0, 0}, Lo: -1, Hi: 1, Key: 1}}
		}, false},
	}
	for _, c := range cases {
		bodies, points, rows := c.build()
		s := NewSolver(DefaultSettings())
		s.sl.gather(bodies, points, rows)
		s.prepare(1e-3, bodies, points, rows)
		s.blk = blockState{}
		if got := s.islandOne(points, rows); got != c.want {
			t.Errorf("%s: islandOne = %v, want %v", c.name, got, c.want)
			continue
		}
		if !c.want {
			if s.blk.size != nil || s.blk.root != nil {
				t.Errorf("%s: islandOne declined but changed the island fields", c.name)
			}
			continue
		}
		got := s.blk
		s.blk = blockState{}
		s.unionIslands(points, rows)
		want := s.blk
		for _, f := range []struct {
			name      string
			got, want []int32
		}{
			{"parent", got.parent, want.parent}, {"size", got.size, want.size}, {"start", got.start, want.start},
			{"root", got.root, want.root}, {"order", got.order, want.order}, {"band cut", got.band.cut, want.band.cut},
		} {
			if !slices.Equal(f.got, f.want) {
				t.Errorf("%s: %s = %v, union-find gives %v", c.name, f.name, f.got, f.want)
			}
		}
		if len(got.excess) != len(want.excess) || !slices.Equal(got.band.ok, want.band.ok) {
			t.Errorf("%s: excess or band flags differ in size or value", c.name)
		}
	}
}
