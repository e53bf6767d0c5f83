package contact

import (
	"slices"
	"testing"
)

// TestLoneIslandAsJoined: where loneIsland takes a scene, the island arrays
// it leaves must be those of the union-find (joinIslands), entry for entry,
// since the block solve and the sweeps read them; and it must refuse every
// scene with more than one dynamic body in contact. The reference is the
// general union-find path, which every other scene takes.
func TestLoneIslandAsJoined(t *testing.T) {
	cases := []struct {
		name            string
		columns, levels int
		lone            bool
		plate           bool // the floor moves (kinematic) and is named after the box
	}{
		{"one box on the floor", 1, 1, true, false},
		{"one box on a moving plate", 1, 1, true, true},
		{"two boxes stacked", 1, 2, false, false},
		{"two boxes side by side", 2, 1, false, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bodies, pts := stack(c.columns, c.levels, 0.1, 0.5)
			if c.plate {
				// A moving plate has a slot of its own after the box's,
				// so the box's island is not the last.
				bodies[0].V = vec{0.1, 0, 0}
				for i := range pts {
					p := &pts[i]
					p.A, p.B, p.Normal = p.B, p.A, p.Normal.Mul(-1)
				}
			}
			s := NewSolver(DefaultSettings())
			if _, err := s.Solve(1e-3, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
			if got := s.loneIsland(pts, nil); got != c.lone {
				t.Fatalf("loneIsland took the scene: %v, want %v", got, c.lone)
			}
			b := &s.blk
			n := len(pts)
			size, start := slices.Clone(b.size), slices.Clone(b.start)
			root, order := slices.Clone(b.root[:n]), slices.Clone(b.order[:n])
			s.joinIslands(pts, nil)
			if !slices.Equal(size, b.size) || !slices.Equal(start, b.start) ||
				!slices.Equal(root, b.root[:n]) || !slices.Equal(order, b.order[:n]) {
				t.Errorf("island arrays differ from the union-find's:\nsize %v / %v\nstart %v / %v\nroot %v / %v\norder %v / %v",
					size, b.size, start, b.start, root, b.root[:n], order, b.order[:n])
			}
		})
	}
}
