package contact

import "testing"

// bandEntriesPerRow bounds the entries that the banded solve keeps per row
// of a tower's system, A's band and the factor's envelope together. A row
// couples only with the rows of the faces of its boxes (George and Liu,
// "Computer Solution of Large Sparse Positive Definite Systems", 1981,
// chapter 4: the envelope of a banded matrix): a face of four points with
// friction has 12 rows, so A's band spans at most three faces, 36 entries,
// and L's envelope the rows back to the face below, 24 (measured: 54 per
// row together); 100 leaves room for faces of more points. Stored densely,
// each row took as many entries as the system has rows, 1000 and more here.
const bandEntriesPerRow = 100

func TestBandedTowerStoredInBand(t *testing.T) {
	// A tower of 250 cubes, 1000 points: its system with friction (a tall
	// island, band.go) is stored in its band, so that its memory grows
	// with its height and not with its square.
	const dt = 1.0 / 120
	for _, levels := range []int{100, 250} {
		bodies, pts := stack(1, levels, 0.05, 0.5)
		s := NewSolver(DefaultSettings())
		gravityStep(bodies, dt)
		if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
			t.Fatal(err)
		}
		b := &s.blk
		rows := len(b.rows)
		if rows < 4*levels {
			t.Fatalf("%d levels: the last direct solve had %d rows, want the tower's %d points and more", levels, rows, 4*levels)
		}
		if got := len(b.a) + len(b.l); got > bandEntriesPerRow*rows {
			t.Errorf("%d levels: A and L keep %d entries for %d rows, want at most %d", levels, got, rows, bandEntriesPerRow*rows)
		}
		if v := maxSpeed(bodies); v > bandLoadTol*gStd*dt {
			t.Errorf("%d levels: a cube moves at %.3g m/s after the solve, want rest", levels, v)
		}
	}
}
