package engine

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// Rolling cylinders: a round body's surface must not be linearised along
// the step (collide/rolllines.go), and its spin about its own axis must
// stay on that axis (symtop.go), at any spin per step.

// rollLagTol is the allowance beyond the semi-implicit Euler lag dt/t: the
// integrator moves each step with the step's end velocity, so under a
// constant acceleration its displacement is a dt^2 n(n+1)/2 = s (1 + dt/t)
// exactly (trade practice for symplectic Euler); 0.2% more covers the
// start, where the pin settles its slop, and rounding.
const rollLagTol = 2e-3

// TestRollingPinOnChute rolls a steel pin, 2 mm across and 4 mm long, down
// a 20 degree chute with mu = 0.8 (above tan(20)/3, so it rolls without
// slipping): a solid cylinder then accelerates at a = (2/3) g sin(theta)
// (Meriam and Kraige, "Engineering Mechanics: Dynamics", rolling of a
// uniform cylinder on an incline) and covers s = a t^2 / 2 in t. It ends
// turning 2.2 rad per step at 1 ms; at 1/120 s it is followed for 0.15 s,
// to 2.8 rad per step (beyond some 3 rad per step a pin this short starts
// to wobble at that step: its nutation, a third of its spin, then turns
// more than a radian between two contact solves).
func TestRollingPinOnChute(t *testing.T) {
	const r, half = 1e-3, 2e-3
	th := mgl64.DegToRad(20)
	a := 2.0 / 3 * g0 * math.Sin(th)
	for _, c := range []struct{ dt, dur float64 }{{1.0 / 120, 0.15}, {1e-3, 1}, {1e-4, 1}} {
		dt, dur := c.dt, c.dur
		t.Run(fmt.Sprintf("dt=%g", dt), func(t *testing.T) {
			w, mat := floorWorld(t, Config{NoSleep: true}, th, Material{Friction: 0.8})
			q := mgl64.QuatRotate(math.Pi/2, shapes.Vec3{1, 0, 0}) // axis along y
			id := mustAdd(t, w, BodyDef{Name: "pin", Shape: shapes.Cylinder{Radius: r, HalfLength: half},
				Density: 7800, Material: mat, Position: shapes.Vec3{0, 0, r}, Orientation: q})
			hop := 0.0
			run(t, w, dt, dur, func() { hop = math.Max(hop, math.Abs(w.Position(id)[2]-r)) })
			want := 0.5 * a * dur * dur
			got := w.Position(id)[0]
			tol := dt/dur + rollLagTol
			if e := relErr(got, want); e > tol {
				t.Errorf("pin rolled %.5g m in %g s, want %.5g m (a = 2/3 g sin 20): error %.3g > %.3g", got, dur, want, e, tol)
			}
			if hop > DefaultSlop {
				t.Errorf("pin left the chute by %.3g m (more than the slop %g m)", hop, DefaultSlop)
			}
		})
	}
}

// rollEnergyTol bounds the relative change of the kinetic energy of a
// cylinder rolling on a level floor in 1 s: rolling without slip does no
// work (Meriam and Kraige, as above), so only rounding over up to 1000
// steps may change it.
const rollEnergyTol = 1e-6

// TestRollingCylinderKeepsEnergy sets a 10 mm cylinder rolling on its side
// on a level floor at 1.5 and 3 rad per step; it must keep rolling at the
// same speed with the same energy and stay on the floor.
func TestRollingCylinderKeepsEnergy(t *testing.T) {
	const r = 0.01
	q := mgl64.QuatRotate(math.Pi/2, shapes.Vec3{1, 0, 0})
	for _, dt := range []float64{1.0 / 120, 1e-3} {
		for _, turn := range []float64{1.5, 3} {
			t.Run(fmt.Sprintf("dt=%g/turn=%g", dt, turn), func(t *testing.T) {
				w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.8})
				om := turn / dt
				id := mustAdd(t, w, BodyDef{Name: "roller", Shape: shapes.Cylinder{Radius: r, HalfLength: r},
					Density: 1000, Material: mat, Orientation: q, Position: shapes.Vec3{0, 0, r},
					Velocity: shapes.Vec3{om * r, 0, 0}, Spin: shapes.Vec3{0, om, 0}})
				k0 := w.KineticEnergy()
				hop := 0.0
				run(t, w, dt, 1, func() { hop = math.Max(hop, math.Abs(w.Position(id)[2]-r)) })
				if e := relErr(w.KineticEnergy(), k0); e > rollEnergyTol {
					t.Errorf("kinetic energy changed by %.3g of itself (> %g): %.6g J -> %.6g J", e, rollEnergyTol, k0, w.KineticEnergy())
				}
				if hop > DefaultSlop {
					t.Errorf("cylinder left the floor by %.3g m (more than the slop %g m)", hop, DefaultSlop)
				}
			})
		}
	}
}
