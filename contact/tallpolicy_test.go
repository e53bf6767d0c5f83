package contact

import (
	"fmt"
	"math"
	"testing"
)

func TestTallTowerHeldStepAfterStep(t *testing.T) {
	// A tower of cubes on a floor tilted by a small angle, solved step
	// after step with its warm start, as a world kept awake does. Statics
	// of a body on an incline (Meriam and Kraige, "Engineering Mechanics:
	// Statics", chapter 6): the face under level l carries (levels - l)
	// m g dt cos(tilt) per step along its normal and (levels - l) m g dt
	// sin(tilt) by friction, at every step, and nothing moves. From the
	// second step on the warm start holds the tower and its banded solve
	// is skipped (warmSticks): the loads must stay those of statics. (With
	// the bodies' positions fixed, as here, a skip whose precision is too
	// loose leaves no trace; in a world it lets the sweeps' errors pass on
	// from step to step, which the engine's tilted tower of 50 boxes at
	// 1/60 s catches, TestTallTowersStand.)
	const dt, tilt, steps = 1.0 / 60, 0.5 * math.Pi / 180, 40
	for _, levels := range []int{30, 45} {
		t.Run(fmt.Sprintf("%d levels", levels), func(t *testing.T) {
			bodies, pts := stack(1, levels, 0.05, 0.6)
			g := vec{gStd * math.Sin(tilt), 0, -gStd * math.Cos(tilt)}
			s := NewSolver(DefaultSettings())
			for k := 0; k < steps; k++ {
				for i := range bodies {
					bodies[i].DV = vec{}
					if bodies[i].InvMass > 0 {
						bodies[i].DV = g.Mul(dt)
						bodies[i].V = bodies[i].V.Add(bodies[i].DV)
					}
				}
				for i := range pts {
					pts[i].NormalImpulse, pts[i].FrictionImpulse = 0, vec{}
				}
				if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
					t.Fatal(err)
				}
				normal := make([]float64, levels)
				friction := make([]vec, levels)
				for _, p := range pts {
					normal[p.B-1] += p.NormalImpulse
					friction[p.B-1] = friction[p.B-1].Add(p.FrictionImpulse)
				}
				for l := range normal {
					w := float64(levels-l) * gStd * dt // each cube is 1 kg
					if e := relErr(normal[l], w*math.Cos(tilt)); e > bandLoadTol {
						t.Fatalf("step %d: face under level %d carries %.8g N s, want %.8g (error %.2g)", k, l, normal[l], w*math.Cos(tilt), e)
					}
					if e := relErr(friction[l].Len(), w*math.Sin(tilt)); e > bandLoadTol {
						t.Fatalf("step %d: face under level %d holds %.8g N s by friction, want %.8g (error %.2g)", k, l, friction[l].Len(), w*math.Sin(tilt), e)
					}
				}
				if v := maxSpeed(bodies); v > bandLoadTol*gStd*dt {
					t.Fatalf("step %d: a cube moves at %.3g m/s, want rest", k, v)
				}
			}
		})
	}
}
