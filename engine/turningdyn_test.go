package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// freeTableMaxDrift is how far a block that friction holds on a free
// turntable (a dynamic table on a revolute joint) may leave the table's
// material point it started on in 5 s, m: a tenth of a millimetre, as for
// a kinematic table (turntableMaxDrift). The tangent-line error this test
// guards against, r (w dt)^2 / 2 a step, moves it millimetres at 1 ms and
// a tenth of a metre at 1/60 s.
const freeTableMaxDrift = 1e-4

// freeTableMomentumTol is the relative change allowed in the angular
// momentum of table and block about the table's axis, which no torque
// acts on: the contact impulses between them are equal and opposite and
// the joint acts through the axis, so the change is the joint's position
// pass and rounding (below 3e-5 measured, 1e-13 while the block is held);
// a thousandth.
const freeTableMomentumTol = 1e-3

func TestFreeTurntableHoldsBlock(t *testing.T) {
	// A block at radius r on a table turning freely at w about a vertical
	// axis turns with it while static friction supplies the centripetal
	// force, m r w^2 <= mu m g, and slides outward when it cannot (Meriam
	// and Kraige, Engineering Mechanics: Dynamics, particle kinetics in
	// normal and tangential coordinates). With no torque about the axis the
	// angular momentum of table and block about it is conserved (Meriam and
	// Kraige, conservation of angular momentum of a system).
	const seconds, h = 5.0, 0.02
	for _, c := range []struct {
		name     string
		r, w, mu float64
		density  float64 // the table's: 1000 (inertia 3000 times the block's m r^2) or 0.4 (comparable)
		motor    bool    // a speed motor keeps the table turning at w
		dt       float64
		held     bool
	}{
		{"heavy held 1/60 s", 0.3, 3, 0.8, 1000, false, 1.0 / 60, true},
		{"heavy held 1/240 s", 0.3, 3, 0.8, 1000, false, 1.0 / 240, true},
		{"heavy held 1 ms", 0.3, 3, 0.8, 1000, false, 1e-3, true},
		{"light held 1/60 s", 0.3, 3, 0.8, 0.4, false, 1.0 / 60, true},
		{"light held 1/240 s", 0.25, 4, 0.9, 0.4, false, 1.0 / 240, true},
		{"light held 1 ms", 0.3, 3, 0.8, 0.4, false, 1e-3, true},
		{"motor held 1/60 s", 0.15, 5, 0.9, 0.4, true, 1.0 / 60, true},
		{"motor held 1 ms", 0.15, 5, 0.9, 0.4, true, 1e-3, true},
		{"heavy slides 1/60 s", 0.3, 6, 0.5, 1000, false, 1.0 / 60, false}, // r w^2 = 10.8 m/s^2 > 4.9
		{"heavy slides 1 ms", 0.3, 6, 0.5, 1000, false, 1e-3, false},
		{"light slides 1/240 s", 0.3, 6, 0.2, 0.4, false, 1.0 / 240, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			if c.held != (c.r*c.w*c.w <= c.mu*g0) {
				t.Fatal("case inconsistent with the friction condition")
			}
			w := newTestWorld(t, DefaultConfig())
			mat, err := w.AddMaterial(Material{Friction: c.mu})
			if err != nil {
				t.Fatal(err)
			}
			tab := mustAdd(t, w, BodyDef{Name: "table", Shape: shapes.Box{Half: shapes.Vec3{0.5, 0.5, 0.05}}, Density: c.density,
				Material: mat, Position: shapes.Vec3{0, 0, -0.05}, Spin: shapes.Vec3{0, 0, c.w}})
			j, err := w.AddJoint(JointDef{Name: "axle", Kind: Revolute, A: tab, B: Ground, Axis: shapes.Vec3{0, 0, 1}})
			if err != nil {
				t.Fatal(err)
			}
			if c.motor {
				if err := w.SetMotor(j, Motor{Mode: MotorSpeed, Speed: c.w, MaxForce: math.Inf(1)}); err != nil {
					t.Fatal(err)
				}
			}
			blk := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{h, h, h}}, Density: 1000, Material: mat,
				Position: shapes.Vec3{c.r, 0, h}, Velocity: shapes.Vec3{0, c.w * c.r, 0}, Spin: shapes.Vec3{0, 0, c.w}})
			l0 := w.AngularMomentum(shapes.Vec3{})[2]
			run(t, w, c.dt, seconds, nil)
			p := w.Position(blk)
			rNow := math.Hypot(p[0], p[1])
			if !c.held {
				if rNow-c.r < turntableMinSlide {
					t.Errorf("r w^2 = %.3g > mu g = %.3g, but the block moved out only %.3g m", c.r*c.w*c.w, c.mu*g0, rNow-c.r)
				}
			} else {
				want := w.Orientation(tab).Rotate(shapes.Vec3{c.r, 0, 0})
				d := math.Hypot(p[0]-want[0], p[1]-want[1])
				if d > freeTableMaxDrift {
					t.Errorf("block %.3g m from the table point it started on (radius %.6f, started %.3f), want below %g",
						d, rNow, c.r, freeTableMaxDrift)
				}
			}
			if c.motor {
				return // the motor's torque changes the angular momentum
			}
			l1 := w.AngularMomentum(shapes.Vec3{})[2]
			if math.Abs(l1-l0) > freeTableMomentumTol*math.Abs(l0) {
				t.Errorf("angular momentum about the axis %.6g N m s, started %.6g (relative change %.2g, want below %g)",
					l1, l0, (l1-l0)/l0, freeTableMomentumTol)
			}
		})
	}
}
