package contact

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

func TestBlockBudget(t *testing.T) {
	// The sum of the first m squares is m(m+1)(2m+1)/6 (any algebra text);
	// checked here against the sum itself.
	for _, m := range []int{0, 1, 2, 96, 1000} {
		sum := int64(0)
		for k := 1; k <= m; k++ {
			sum += int64(k * k)
		}
		if got := blockBudget(m); got != sum {
			t.Errorf("blockBudget(%d) = %d, want %d", m, got, sum)
		}
	}
}

// bandLoadTol: the loads of a tall tower's direct solve, relative. Its
// shift (blockShift, 1e-9 of the largest diagonal entry) acts along a chain
// of n bodies about n^2 times over, 4e-5 at 200 levels (measured); the
// sweeps' own accuracy, sweepTol, bounds it, and the speeds it leaves
// relative to g dt.
const bandLoadTol = sweepTol

func TestBandedTowerLoads(t *testing.T) {
	// A tower of levels cubes, more points than MaxBlock, set on the ground
	// without warm start, its pairs listed in a random order. Statics
	// (Meriam and Kraige, "Engineering Mechanics: Statics", ch. 3): the face
	// under level l carries the weight of the levels - l cubes above it, so
	// over one step its normal impulse is (levels - l) m g dt, and the tower
	// stays at rest. The sweeps alone (ten of them) pass a load down a few
	// faces only; the banded direct solve is exact from the first step in
	// any order of the points, as its order follows the tower.
	const dt = 1.0 / 120
	for _, levels := range []int{30, 60, 90} {
		t.Run(fmt.Sprintf("%d levels", levels), func(t *testing.T) {
			bodies, pts := stack(1, levels, 0.05, 0.5)
			// Shuffle the pairs (four points each, kept together).
			rng := rand.New(rand.NewPCG(1, uint64(levels)))
			perm := rng.Perm(levels)
			shuffled := make([]Point, 0, len(pts))
			for _, l := range perm {
				shuffled = append(shuffled, pts[4*l:4*l+4]...)
			}
			pts = shuffled
			s := NewSolver(DefaultSettings())
			gravityStep(bodies, dt)
			if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
			load := make([]float64, levels)
			for _, p := range pts {
				load[p.B-1] += p.NormalImpulse
			}
			for l := range load {
				want := float64(levels-l) * gStd * dt
				if e := relErr(load[l], want); e > bandLoadTol {
					t.Errorf("face under level %d carries %.6g N s, want %.6g (error %.2g)", l, load[l], want, e)
				}
			}
			if v := maxSpeed(bodies); v > bandLoadTol*gStd*dt {
				t.Errorf("a cube moves at %.3g m/s after the solve, want rest", v)
			}
		})
	}
}
