package contact

import "testing"

// TestTowerLoadsWhileResting: a tower of unit cubes stays exactly loaded
// step after step, when the warm start (not a new direct solve) carries
// the load. Statics (Meriam and Kraige, "Engineering Mechanics: Statics",
// ch. 3): the contact under level l carries the weight of the levels from
// l up, so over one step its normal impulse is (levels - l) m g dt. Steps
// at 0.1 ms, 1 ms and 1/60 s: a result that changes with the step is a bug,
// and at 0.1 ms a step's load (1e-3 m/s of velocity) is closest to the
// solver's Tolerance, within which the warm start counts as solved.
func TestTowerLoadsWhileResting(t *testing.T) {
	const levels, steps = 8, 300
	for _, dt := range []float64{1e-4, 1e-3, 1.0 / 60} {
		bodies, pts := stack(1, levels, 0.1, 0.5)
		s := NewSolver(DefaultSettings())
		for step := 0; step < steps; step++ {
			gravityStep(bodies, dt)
			if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
			load := make([]float64, levels)
			for _, p := range pts {
				load[p.B-1] += p.NormalImpulse // body l+1 sits on contact l
			}
			for l, got := range load {
				want := float64(levels-l) * gStd * dt
				if e := relErr(got, want); e > impulseTol {
					t.Fatalf("dt %.4g step %d: level %d carries %.9g N s, want %.9g (error %.2g)", dt, step, l, got, want, e)
				}
			}
			if v := maxSpeed(bodies); v > impulseTol*gStd*dt {
				t.Fatalf("dt %.4g step %d: a cube moves at %.3g m/s after the solve, want rest", dt, step, v)
			}
		}
	}
}
