package engine

import (
	"errors"
	"math"
	"testing"

	"clatter/shapes"
)

func TestScheduledMotor(t *testing.T) {
	// A flywheel (solid disc, I = m r^2/2) on a vertical hinge, its speed
	// motor held at 0 until t1, then told to run at 20 rad/s with a 0.5 N m
	// cap, then at t2 switched to -5 rad/s. Newton's second law for
	// rotation: from t1 it speeds up at tm/I; from t2 it slows at tm/I to
	// -5 rad/s. The change lands in the step that ends after its time, so
	// the speeds below are exact to the solver's convergence (1e-3).
	const dt, r, tm, t1, t2 = 1e-3, 0.1, 0.5, 0.2, 0.5
	w := newTestWorld(t, DefaultConfig())
	b := mustAdd(t, w, BodyDef{Name: "flywheel", Shape: shapes.Cylinder{Radius: r, HalfLength: 0.02}, Density: 7800})
	j := mustJoint(t, w, JointDef{Kind: Revolute, A: b, B: Ground, Axis: shapes.Vec3{0, 0, 1},
		Motor: Motor{Mode: MotorSpeed, Speed: 0, MaxForce: tm}})
	for _, c := range []struct {
		t float64
		m Motor
	}{{t2, Motor{Mode: MotorSpeed, Speed: -5, MaxForce: tm}}, {t1, Motor{Mode: MotorSpeed, Speed: 20, MaxForce: tm}}} {
		if err := w.ScheduleMotor(j, c.t, c.m); err != nil {
			t.Fatal(err)
		}
	}
	alpha := tm / (w.MassOf(b) * r * r / 2)
	run(t, w, dt, t1, nil)
	if s := w.JointSpeed(j); math.Abs(s) > 1e-9 {
		t.Fatalf("speed %g rad/s before the first change, want 0", s)
	}
	run(t, w, dt, t2-t1, nil)
	if want := alpha * (t2 - t1); relErr(w.JointSpeed(j), want) > 1e-3 {
		t.Errorf("speed %.6g rad/s at t2, want %.6g", w.JointSpeed(j), want)
	}
	run(t, w, dt, 0.05, nil)
	if want := alpha*(t2-t1) - alpha*0.05; relErr(w.JointSpeed(j), want) > 1e-3 {
		t.Errorf("speed %.6g rad/s after the reversal, want %.6g", w.JointSpeed(j), want)
	}
	run(t, w, dt, 1, nil)
	if s := w.JointSpeed(j); math.Abs(s+5) > 5e-3 {
		t.Errorf("speed %.6g rad/s at the end, want -5", s)
	}
}

func TestScheduleMotorRefusesBadInput(t *testing.T) {
	w := newTestWorld(t, DefaultConfig())
	b := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000})
	ball := mustJoint(t, w, JointDef{Kind: Spherical, A: b, B: Ground})
	hinge := mustJoint(t, w, JointDef{Kind: Revolute, A: b, B: Ground, Axis: shapes.Vec3{0, 0, 1}})
	for _, c := range []struct {
		j  JointID
		at float64
		m  Motor
	}{
		{ball, 1, Motor{Mode: MotorSpeed, Speed: 1, MaxForce: 1}},
		{hinge, math.NaN(), Motor{Mode: MotorSpeed, Speed: 1, MaxForce: 1}},
		{hinge, 1, Motor{Mode: MotorSpeed, Speed: 1}},
		{7, 1, Motor{}},
	} {
		if err := w.ScheduleMotor(c.j, c.at, c.m); !errors.Is(err, ErrBadJoint) {
			t.Errorf("joint %d at %g: got %v, want an ErrBadJoint", c.j, c.at, err)
		}
	}
}

func TestNotSettledWhileSomethingIsToCome(t *testing.T) {
	// A box at rest on a table is not settled while a kick, a motor change
	// or the table's tilt is still to come: a run that stops once settled
	// would otherwise end before they happen.
	const dt = 1e-3
	for _, c := range []struct {
		name  string
		setup func(w *World, table, box BodyID)
		after float64 // the world may settle only after this time
	}{
		{"a kick at 1 s", func(w *World, _, box BodyID) {
			if err := w.Kick(box, 1, shapes.Vec3{0.5, 0, 0}, shapes.Vec3{}, true); err != nil {
				t.Fatal(err)
			}
		}, 1},
		{"a tilt from 1 s to 3 degrees at 1 deg/s", func(w *World, table, _ BodyID) {
			if err := w.SetMotion(table, &Tilt{Axis: shapes.Vec3{0, 1, 0}, Rate: math.Pi / 180, Start: 1, Angle: 3 * math.Pi / 180}); err != nil {
				t.Fatal(err)
			}
		}, 4},
		{"a vibration, which never ends", func(w *World, table, _ BodyID) {
			if err := w.SetMotion(table, &Vibration{Terms: []Oscillation{{Axis: shapes.Vec3{0, 0, 1}, Amplitude: 1e-6, Frequency: 5}}}); err != nil {
				t.Fatal(err)
			}
		}, math.Inf(1)},
	} {
		w := newTestWorld(t, DefaultConfig())
		table := mustAdd(t, w, BodyDef{Name: "table", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.5, 0.5, 0.01}}, Position: shapes.Vec3{0, 0, -0.01}})
		box := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.05, 0.05}}, Density: 500, Position: shapes.Vec3{0, 0, 0.05}})
		c.setup(w, table, box)
		run(t, w, dt, 6, nil)
		ok, at := w.Settled()
		switch {
		case math.IsInf(c.after, 1) && ok:
			t.Errorf("%s: settled at %g s", c.name, at)
		case !math.IsInf(c.after, 1) && !ok:
			t.Errorf("%s: never settled in 6 s", c.name)
		case ok && at < c.after:
			t.Errorf("%s: settled at %g s, before %g s", c.name, at, c.after)
		}
	}
}
