package engine

import (
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// Four example mechanisms built through the engine API, each checked
// against what it must do: a vibrating track conveying parts, a tilt-table
// test of a carton, a cam pushing a follower by contact, and a hinged flap
// knocking parts off a conveyor.

func TestExampleVibratingTrack(t *testing.T) {
	// Five parts on a 3 degree track vibrating at 50 Hz, 20 degrees to the
	// track, throw number 1.2 (TestFeederConveyingSpeed: about 25 mm/s,
	// hopping). Over 0.5 s every part climbs the track at between half and
	// one and a half times the particle model's speed (parts of different
	// shapes, side by side, knock each other), and none leaves the track.
	f := feederTrack{alpha: mgl64.DegToRad(3), psi: mgl64.DegToRad(20), mu: 0.5, freq: 50}
	amp := f.throwAmplitude(1.2)
	model := f.modelSpeed(amp, 5, 10)
	w := newTestWorld(t, Config{Gravity: shapes.Vec3{0, 0, -g0}, NoSleep: true})
	mat, _ := w.AddMaterial(Material{Name: "steel", Friction: f.mu})
	q := mgl64.QuatRotate(-f.alpha, shapes.Vec3{0, 1, 0})
	along, normal, side := q.Rotate(shapes.Vec3{1, 0, 0}), q.Rotate(shapes.Vec3{0, 0, 1}), shapes.Vec3{0, 1, 0}
	track := mustAdd(t, w, BodyDef{Name: "track", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.3, 0.03, 0.005}}, Material: mat, Orientation: q})
	dir := along.Mul(math.Cos(f.psi)).Add(normal.Mul(math.Sin(f.psi)))
	if err := w.SetMotion(track, &Vibration{Terms: []Oscillation{{Axis: dir, Amplitude: amp, Frequency: f.freq}}}); err != nil {
		t.Fatal(err)
	}
	shapesOf := []shapes.Shape{
		shapes.Box{Half: shapes.Vec3{0.005, 0.005, 0.002}},
		shapes.Cylinder{Radius: 0.006, HalfLength: 0.002},
		shapes.Box{Half: shapes.Vec3{0.008, 0.004, 0.003}},
		shapes.Cylinder{Radius: 0.004, HalfLength: 0.003},
		shapes.Box{Half: shapes.Vec3{0.004, 0.004, 0.004}},
	}
	var parts []BodyID
	for i, s := range shapesOf {
		hz := s.Bounds().Max[2]
		p := along.Mul(-0.1 + 0.03*float64(i)).Add(normal.Mul(0.005 + hz + 1e-4)).Add(side.Mul(0.01 * float64(i%3-1)))
		parts = append(parts, mustAdd(t, w, BodyDef{Name: "part", Shape: s, Density: 7800, Material: mat, Position: p, Orientation: q}))
	}
	start := make([]float64, len(parts))
	run(t, w, 1e-4, 0.1, nil)
	for i, id := range parts {
		start[i] = w.Position(id).Dot(along)
	}
	run(t, w, 1e-4, 0.5, nil)
	for i, id := range parts {
		v := (w.Position(id).Dot(along) - start[i]) / 0.5
		if v < 0.5*model || v > 1.5*model {
			t.Errorf("part %d climbs at %.1f mm/s, model %.1f mm/s", i, v*1e3, model*1e3)
		}
		if p := w.Position(id); math.Abs(p[1]) > 0.03 || p.Dot(normal) < 0 {
			t.Errorf("part %d left the track: %v", i, p)
		}
	}
}

func TestExampleCartonTiltTest(t *testing.T) {
	// A carton of 300 x 200 x 250 mm and 2 kg on a tilt table (a kinematic
	// slab, hinged along its lower edge, tilting at 2 degrees/s to a stop
	// at 35 degrees) with board-on-steel friction mu_s 0.45, mu_k 0.35. Its
	// base is longer than its height times mu_s (0.30 > 0.25 x 0.45), so it
	// slides before it tips: at atan(0.45) = 24.2 degrees within 0.5 (the
	// tilt-table requirement), and it ends off the table.
	const dt, rate = 1e-3, 2.0
	w := newTestWorld(t, DefaultConfig())
	board, _ := w.AddMaterial(Material{Name: "board", Friction: 0.35, StaticFriction: 0.45})
	y := shapes.Vec3{0, 1, 0}
	hinge := shapes.Vec3{0.4, 0, 0} // the table's lower edge, toward +x
	table := mustAdd(t, w, BodyDef{Name: "table", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.4, 0.3, 0.01}}, Material: board,
		Position: shapes.Vec3{0, 0, -0.01}})
	carton := mustAdd(t, w, BodyDef{Name: "carton", Shape: shapes.Box{Half: shapes.Vec3{0.15, 0.1, 0.125}}, Mass: 2, Material: board,
		Position: shapes.Vec3{0, 0, 0.125}})
	run(t, w, dt, 0.2, nil)
	if err := w.SetMotion(table, &Tilt{Axis: y, Point: hinge, Rate: mgl64.DegToRad(rate), Start: w.Time(), Angle: mgl64.DegToRad(35)}); err != nil {
		t.Fatal(err)
	}
	t0 := w.Time()
	x0 := w.Orientation(table).Conjugate().Rotate(w.Position(carton).Sub(w.Position(table)))[0]
	slidAt := math.NaN()
	run(t, w, dt, 20, func() {
		rel := w.Orientation(table).Conjugate().Rotate(w.Position(carton).Sub(w.Position(table)))
		if math.IsNaN(slidAt) && rel[0]-x0 > 1e-4 {
			slidAt = rate * (w.Time() - t0)
		}
	})
	want := mgl64.RadToDeg(math.Atan(0.45))
	if math.Abs(slidAt-want) > tiltAngleTol {
		t.Errorf("carton slid at %.2f degrees, want %.2f", slidAt, want)
	}
	if p := w.Position(carton); p[0] < hinge[0] {
		t.Errorf("carton still on the table at %v", p)
	}
	t.Logf("carton slid at %.2f degrees (want %.2f)", slidAt, want)
}

func TestExampleCamAndFollower(t *testing.T) {
	// A circular cam of radius R turned by a motor about a pin offset e from
	// its centre lifts a flat-faced follower that gravity holds on it; the
	// follower slides in a vertical guide. Flat-faced follower on an
	// eccentric circle (cam kinematics, e.g. Norton, Design of Machinery,
	// chapter 8): the follower's face is at R + e sin(theta) above the pin
	// for the cam turned by theta from the offset pointing along +x
	// (toward -z for positive theta about +y, hence the sign). The follower
	// accelerates at most e w^2 = 0.4 m/s^2, below g, so it never leaves
	// the cam. Within 0.3 mm over a turn: the contact sits up to the slop
	// (0.2 mm) inside the cam, and that depth changes with the load.
	const R, e, tol = 0.03, 0.01, 3e-4
	w := newTestWorld(t, DefaultConfig())
	mat, _ := w.AddMaterial(Material{Name: "steel", Friction: 0.1})
	y := shapes.Vec3{0, 1, 0}
	axle := mgl64.QuatRotate(math.Pi/2, shapes.Vec3{1, 0, 0}) // cylinder's axis onto y
	cam := mustAdd(t, w, BodyDef{Name: "cam", Shape: shapes.Cylinder{Radius: R, HalfLength: 0.01}, Density: 7800, Material: mat,
		Position: shapes.Vec3{e, 0, 0}, Orientation: axle})
	follower := mustAdd(t, w, BodyDef{Name: "follower", Shape: shapes.Box{Half: shapes.Vec3{0.04, 0.02, 0.01}}, Density: 2700, Material: mat,
		Position: shapes.Vec3{0, 0, R + 0.01}})
	drive := mustJoint(t, w, JointDef{Name: "camshaft", Kind: Revolute, A: cam, B: Ground, Axis: y,
		Motor: Motor{Mode: MotorSpeed, Speed: -2 * math.Pi, MaxForce: math.Inf(1)}})
	mustJoint(t, w, JointDef{Name: "guide", Kind: Prismatic, A: follower, B: Ground, Anchor: shapes.Vec3{0, 0, R + 0.01}, Axis: shapes.Vec3{0, 0, 1}})
	run(t, w, 1e-3, 0.05, nil)
	worst, lo, hi := 0.0, math.Inf(1), math.Inf(-1)
	run(t, w, 1e-3, 1, func() {
		th := w.JointPosition(drive)
		want := R + e*math.Sin(-th) // the offset turns from +x toward +z
		got := w.Position(follower)[2] - 0.01
		worst = math.Max(worst, math.Abs(got-want))
		lo, hi = math.Min(lo, got), math.Max(hi, got)
	})
	if worst > tol {
		t.Errorf("follower off the cam's lift by up to %.3g m", worst)
	}
	if stroke := hi - lo; math.Abs(stroke-2*e) > tol {
		t.Errorf("follower's stroke %.4g m, want 2e = %g", stroke, 2*e)
	}
	t.Logf("follower off the cam's lift by up to %.3g m over a turn", worst)
}

func TestExampleFlapKicker(t *testing.T) {
	// Parts ride a belt at 0.2 m/s; a flap beside the belt, hinged about a
	// vertical pin and driven by a servo, swings across the belt when the
	// first part reaches it and back before the second arrives. The first
	// part ends off the side of the belt, the second rides on past the flap.
	const dt, u = 1e-3, 0.2
	w := newTestWorld(t, DefaultConfig())
	mat, _ := w.AddMaterial(Material{Name: "rubber", Friction: 0.6})
	belt := mustAdd(t, w, BodyDef{Name: "belt", Kind: Static, Shape: shapes.Box{Half: shapes.Vec3{0.6, 0.05, 0.01}}, Material: mat,
		Position: shapes.Vec3{0, 0, -0.01}})
	if err := w.SetConveyor(belt, shapes.Vec3{u, 0, 0}); err != nil {
		t.Fatal(err)
	}
	first := mustAdd(t, w, BodyDef{Name: "first", Shape: shapes.Box{Half: shapes.Vec3{0.015, 0.015, 0.015}}, Density: 300, Material: mat,
		Position: shapes.Vec3{-0.3, 0, 0.015}})
	second := mustAdd(t, w, BodyDef{Name: "second", Shape: shapes.Box{Half: shapes.Vec3{0.015, 0.015, 0.015}}, Density: 300, Material: mat,
		Position: shapes.Vec3{-0.5, 0, 0.015}})
	// The flap lies along the belt's -y edge, from its pin at x = 0.1 back
	// toward -x; turning it about +z by -60 degrees sweeps it across.
	pin := shapes.Vec3{0.1, -0.06, 0.02}
	flap := mustAdd(t, w, BodyDef{Name: "flap", Shape: shapes.Box{Half: shapes.Vec3{0.06, 0.004, 0.015}}, Density: 2700, Material: mat,
		Position: pin.Add(shapes.Vec3{-0.06, 0, 0})})
	servo := Motor{Mode: MotorServo, Stiffness: 20, Damping: 1, MaxForce: 5}
	j := mustJoint(t, w, JointDef{Name: "kicker", Kind: Revolute, A: flap, B: Ground, Anchor: pin, Axis: shapes.Vec3{0, 0, 1},
		Limited: true, Lower: -mgl64.DegToRad(80), Upper: 0, Motor: servo})
	kicked, back := false, false
	run(t, w, dt, 4, func() {
		switch {
		case !kicked && w.Position(first)[0] > -0.02:
			servo.Target = -mgl64.DegToRad(70)
			kicked = true
		case kicked && !back && w.Position(first)[1] > 0.08:
			servo.Target = 0
			back = true
		default:
			return
		}
		if err := w.SetMotor(j, servo); err != nil {
			t.Fatal(err)
		}
	})
	if p := w.Position(first); p[1] < 0.05 {
		t.Errorf("first part not knocked off the belt: ends at %v", p)
	}
	if p := w.Position(second); math.Abs(p[1]) > 0.05 || p[0] < 0.2 || p[2] < 0 {
		t.Errorf("second part should ride on past the flap: ends at %v", p)
	}
	if !back {
		t.Error("the flap never swung back")
	}
}
