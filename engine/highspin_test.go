package engine

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"
)

// The free rotation at any angle per step. For torque-free motion the
// kinetic energy and the angular momentum are constant, and spin about the
// axis of greatest or least inertia is stable (Goldstein, Classical
// Mechanics, 3rd ed., ch. 5); for a symmetric top the angle between its
// axis and L is constant too (ibid., sec. 5.6).

// highSpinEnergyTol: the splitting's energy error is bounded and of second
// order in the sub-step angle (at most maxSubTurn); for these near-axial
// spins it measures below 1e-5. 1e-3 is well above that and far below the
// half the energy the unbounded error of too long a step added.
const highSpinEnergyTol = 1e-3

// coneTol bounds, in radians, the change of the angle between the body's
// symmetry axis and L, which the exact motion keeps constant: it is the
// size of the wobble the cases start with; the splitting's bounded error
// moves it by 1.2e-4 rad at most here (measured), while an instability
// turns the axis over by an angle of order one.
const coneTol = 1e-3

func TestHighSpinFree(t *testing.T) {
	cases := []struct {
		name  string
		shape shapes.Shape
		axis  shapes.Vec3 // spin axis, body frame (of greatest inertia)
		wob   shapes.Vec3 // wobble direction, body frame
	}{
		// A disc 100 mm across, 50 mm thick: I_axis = m R^2/2 exceeds
		// I_diameter = m (3 R^2 + t^2)/12 (Meriam and Kraige, Dynamics, app. B).
		{"disc", shapes.Cylinder{Radius: 0.05, HalfLength: 0.025}, shapes.Vec3{0, 0, 1}, shapes.Vec3{1, 0, 0}},
		// A pin 10 mm across, 100 mm long, tumbling end over end: a slender
		// body, whose sub-flow about its long axis is the fastest.
		{"pin", shapes.Cylinder{Radius: 0.005, HalfLength: 0.05}, shapes.Vec3{1, 0, 0}, shapes.Vec3{0, 0, 1}},
	}
	for _, c := range cases {
		for _, dt := range []float64{1.0 / 120, 1e-3} {
			for _, turn := range []float64{0.3, 3, 8} { // rad per step
				t.Run(fmt.Sprintf("%s/dt=%g/turn=%g", c.name, dt, turn), func(t *testing.T) {
					w := newTestWorld(t, Config{NoSleep: true})
					w0 := turn / dt
					// 0.1% wobble off the axis.
					spin := c.axis.Mul(w0).Add(c.wob.Mul(1e-3 * w0))
					id := mustAdd(t, w, BodyDef{Name: c.name, Shape: c.shape, Density: 1000, Spin: spin})
					k0 := w.KineticEnergy()
					l0 := w.AngularMomentum(shapes.Vec3{})
					cone := func() float64 {
						a := w.Orientation(id).Rotate(shapes.Vec3{0, 0, 1})
						return math.Acos(min(1, a.Dot(l0)/l0.Len()))
					}
					c0 := cone()
					dK, dL, cMax := 0.0, 0.0, 0.0
					run(t, w, dt, 200*dt, func() {
						dK = math.Max(dK, math.Abs(w.KineticEnergy()-k0)/k0)
						dL = math.Max(dL, w.AngularMomentum(shapes.Vec3{}).Sub(l0).Len()/l0.Len())
						cMax = math.Max(cMax, math.Abs(cone()-c0))
					})
					t.Logf("dK/K %.3g, d|L|/|L| %.3g, axis to L %.3g rad, changed by up to %.3g", dK, dL, c0, cMax)
					if dK > highSpinEnergyTol {
						t.Errorf("kinetic energy changed by %.3g of itself, want below %g", dK, highSpinEnergyTol)
					}
					if dL > angMomTol {
						t.Errorf("angular momentum changed by %.3g of itself, want below %g", dL, angMomTol)
					}
					if cMax > coneTol {
						t.Errorf("axis left its stable spin: its angle to L changed by %.3g rad, started %.3g", cMax, c0)
					}
				})
			}
		}
	}
}

// spinDownTol: the spin-down of the flat disc is checked on the spin lost,
// alpha t. The contact's face friction gives the uniform-pressure torque
// and the spin lost matched it to 3e-12 (measured); 1e-3 leaves room for
// the solver's convergence tolerance, and the unbounded splitting error
// the test guards against is of order one.
const spinDownTol = 1e-3

// liftTol bounds how far the disc's centre may rise off the floor, m: a
// contact slop's worth (the solver lets parts sink or rise by about that),
// while the old splitting threw it metres up.
const liftTol = 1e-3

func TestHighSpinOnFloor(t *testing.T) {
	// A disc spinning flat on a floor: the friction of a uniformly loaded
	// face gives the torque 2/3 mu m g R, so with I = m R^2/2 the spin falls
	// linearly at alpha = 4 mu g / (3 R) (Meriam and Kraige, Dynamics,
	// disc-friction torque).
	const mu, r, hl = 0.3, 0.05, 0.025
	for _, dt := range []float64{1.0 / 120, 1e-3} {
		for _, turn := range []float64{3, 8} {
			t.Run(fmt.Sprintf("dt=%g/turn=%g", dt, turn), func(t *testing.T) {
				w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: mu})
				w0 := turn / dt
				id := mustAdd(t, w, BodyDef{Name: "disc", Shape: shapes.Cylinder{Radius: r, HalfLength: hl}, Density: 1000, Material: mat, Position: shapes.Vec3{0, 0, hl}, Spin: shapes.Vec3{0, 0, w0}})
				alpha := 4 * mu * g0 / (3 * r)
				const secs = 0.5
				lift := 0.0
				run(t, w, dt, secs, func() { lift = math.Max(lift, w.Position(id)[2]-hl) })
				lost := w0 - w.Spin(id)[2]
				t.Logf("spin lost %.5g rad/s, want %.5g (err %.3g); lift %.3g m", lost, alpha*secs, relErr(lost, alpha*secs), lift)
				if e := relErr(lost, alpha*secs); e > spinDownTol {
					t.Errorf("spin lost %.5g rad/s in %g s, want %.5g (error %.3g)", lost, secs, alpha*secs, e)
				}
				if lift > liftTol {
					t.Errorf("disc rose %.3g m off the floor", lift)
				}
			})
		}
	}
}
