package contact

import (
	"fmt"
	"math"
	"testing"
)

// gravityStep adds one step of gravity to V and records it as the step's
// force velocity DV, as the engine does.
func gravityStep(bs []Body, dt float64) {
	for i := range bs {
		bs[i].DV = vec{}
		if bs[i].InvMass > 0 {
			bs[i].V[2] -= gStd * dt
			bs[i].DV = vec{0, 0, -gStd * dt}
		}
	}
}

// impulseTol: the normal impulses of a resting stack against its statics,
// relative. The direct solve is exact up to its diagonal shift (1e-9 of
// the largest response, times the mass ratio 1000) and rounding.
const impulseTol = 1e-5

// sweepTol: results of the sweeps, relative; they stop once no impulse
// changes by more than Settings.Convergence (1e-4) of itself in a sweep.
const sweepTol = 1e-4

func TestMassRatioLoads(t *testing.T) {
	// Two cubes stacked on the ground, the upper one r times heavier.
	// Statics (Meriam and Kraige, "Engineering Mechanics: Statics", ch. 3):
	// the ground carries both weights, the middle contact the upper one, so
	// over one step the normal impulses are (m1+m2) g dt and m2 g dt, from
	// the first, cold step on. Gauss-Seidel sweeps alone pass the load
	// through the light cube a fraction 1/r per sweep and miss by far.
	const dt = 1e-3
	for _, r := range []float64{1, 10, 1000} {
		t.Run(fmt.Sprintf("ratio %g", r), func(t *testing.T) {
			bodies, pts := stack(1, 2, 0.05, 0.5)
			bodies[2].InvMass /= r
			bodies[2].InvInertia = bodies[2].InvInertia.Mul(1 / r)
			s := NewSolver(DefaultSettings())
			gravityStep(bodies, dt)
			if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
			ground, middle := 0.0, 0.0
			for _, p := range pts {
				if p.A == 0 {
					ground += p.NormalImpulse
				} else {
					middle += p.NormalImpulse
				}
			}
			if e := relErr(ground, (1+r)*gStd*dt); e > impulseTol {
				t.Errorf("ground carries %.6g N s, want %.6g (error %.2g)", ground, (1+r)*gStd*dt, e)
			}
			if e := relErr(middle, r*gStd*dt); e > impulseTol {
				t.Errorf("middle carries %.6g N s, want %.6g (error %.2g)", middle, r*gStd*dt, e)
			}
			if v := maxSpeed(bodies); v > impulseTol*gStd*dt {
				t.Errorf("a cube moves at %.3g m/s after the solve, want rest", v)
			}
		})
	}
}

func TestLoadedPointNeverImpacts(t *testing.T) {
	// A cube resting on the ground with e = 1: once its corners carry its
	// weight, an approach above the bounce threshold left by an unconverged
	// solve is no impact (a resting contact stays resting), and the step's
	// own gravity never counts as approach, even when g dt (0.16 m/s at
	// 1/60 s) is above the threshold (Newton's law of restitution applies to
	// the velocity with which bodies collide, not to a force's increment).
	for _, dt := range []float64{1e-3, 1.0 / 60} {
		bodies, pts := stack(1, 1, 0.05, 0.5)
		for i := range pts {
			pts[i].Restitution = 1
		}
		s := NewSolver(DefaultSettings())
		for step := 0; step < 5; step++ {
			gravityStep(bodies, dt)
			if step == 4 {
				bodies[1].V[2] -= 2 * s.Settings.BounceThreshold // a push left by an unconverged step
			}
			rep, err := s.Solve(dt, bodies, pts, nil)
			if err != nil {
				t.Fatal(err)
			}
			if rep.Impacts != 0 {
				t.Errorf("dt %.4g step %d: %d impacts of a cube at rest", dt, step, rep.Impacts)
			}
			if bodies[1].V[2] > sweepTol*gStd*dt {
				t.Errorf("dt %.4g step %d: the cube leaves the ground at %.3g m/s", dt, step, bodies[1].V[2])
			}
		}
	}
}

func TestBounceOnArrivalSpeed(t *testing.T) {
	// A ball arriving at a0 with e bounces off at e a0 (Newton's law of
	// restitution), whatever the step's gravity adds: the impact phase
	// measures the approach before the step's forces, and the ball leaves
	// the surface at e a0, then flies under gravity for the rest of the
	// step: e a0 - g dt at the step's end (the world integrates that flight
	// exactly). With e = 0 it stays on the surface.
	const dt, a0 = 1.0 / 60, 2.0
	for _, e := range []float64{0, 0.5, 1} {
		bodies := []Body{staticBody(vec{}), sphereBody(1, 0.02, vec{0, 0, 0.02})}
		bodies[1].V = vec{0, 0, -a0}
		pts := []Point{{A: 0, B: 1, Position: vec{}, Normal: vec{0, 0, 1}, Restitution: e, Friction: 0.3, Key: 1}}
		gravityStep(bodies, dt)
		s := NewSolver(DefaultSettings())
		if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
			t.Fatal(err)
		}
		want := max(e*a0-gStd*dt, 0)
		if got := bodies[1].V[2]; math.Abs(got-want) > 1e-12 {
			t.Errorf("e %g: %.12g m/s at the step's end, want %.12g", e, got, want)
		}
	}
}

func TestWarmStartSurvivesFeatureChange(t *testing.T) {
	// The corners of a cube resting on another may come back from the
	// narrow phase with other feature ids after a sway of a fraction of a
	// micrometre. The points carry the same loads; a steady load is carried
	// over exactly (Catto 2005), so after the change the step must report
	// the same impulses as with the ids kept, and no impact.
	const dt, sway = 1e-3, 3e-7
	run := func(change bool) []float64 {
		bodies, pts := stack(1, 3, 0.05, 0.5)
		for i := range pts {
			pts[i].Restitution = 1
		}
		set := DefaultSettings()
		set.MaxBlock = 0 // the sweeps, which rely on the warm start
		s := NewSolver(set)
		var out []float64
		for step := 0; step < 40; step++ {
			if change && step == 30 {
				for i := range pts {
					pts[i].Key ^= 0xabcdef << 40
					pts[i].Position[0] += sway
				}
			}
			gravityStep(bodies, dt)
			rep, err := s.Solve(dt, bodies, pts, nil)
			if err != nil {
				t.Fatal(err)
			}
			if rep.Impacts != 0 {
				t.Errorf("change %v step %d: %d impacts", change, step, rep.Impacts)
			}
			if step == 30 {
				for _, p := range pts {
					out = append(out, p.NormalImpulse)
				}
			}
		}
		return out
	}
	kept, changed := run(false), run(true)
	for i := range kept {
		if relErr(changed[i], kept[i]) > sweepTol {
			t.Errorf("point %d: %.8g N s after the id change, %.8g with the ids kept", i, changed[i], kept[i])
		}
	}
}
