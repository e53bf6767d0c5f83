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
