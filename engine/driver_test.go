package engine

import (
	"errors"
	"math"
	"strings"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// Drivers: kinematic bodies follow their prescribed poses, with the
// velocities that contacts must see; conveyor surfaces drag parts along.

// quatAngle is the angle (rad) of the rotation between unit quaternions.
func quatAngle(a, b shapes.Quat) float64 {
	return rotationVector(a.Mul(b.Conjugate()).Normalize()).Len()
}

func TestMotionFollowsPose(t *testing.T) {
	// After every step a driven body sits at its prescribed pose, computed
	// here in closed form (not through the motion's own Pose), and the
	// velocity it had during the step is the mean over the step, which
	// differs from the derivative at mid-step by at most |x'''| dt^2/24
	// (Taylor's theorem): for x = A sin(w t), A w^3 dt^2/24, plus 1 percent
	// for the higher terms of the series (twice that where two terms add).
	const dt = 1e-3
	const poseTol = 1e-12 // rounding: the pose is set, not integrated
	x, z := shapes.Vec3{1, 0, 0}, shapes.Vec3{0, 0, 1}
	base := shapes.Vec3{0.1, 0.2, 0.3}
	const amp, freq, rot = 0.002, 50.0, 0.01
	w0 := 2 * math.Pi * freq
	feeder := shapes.Vec3{math.Cos(0.35), 0, math.Sin(0.35)} // 20 degrees up from the track
	cases := []struct {
		name   string
		motion Motion
		// pose and mid-step velocity in closed form
		want    func(t float64) (shapes.Vec3, shapes.Quat)
		vel     func(t float64) (shapes.Vec3, shapes.Vec3)
		velTol  float64
		spinTol float64
	}{
		{"linear feeder vibration", &Vibration{Terms: []Oscillation{{Axis: feeder.Mul(3), Amplitude: amp, Frequency: freq}}},
			func(t float64) (shapes.Vec3, shapes.Quat) {
				return base.Add(feeder.Mul(amp * math.Sin(w0*t))), mgl64.QuatIdent()
			},
			func(t float64) (shapes.Vec3, shapes.Vec3) {
				return feeder.Mul(amp * w0 * math.Cos(w0*t)), shapes.Vec3{}
			},
			1.01 * amp * w0 * w0 * w0 * dt * dt / 24, 1e-12},
		{"bowl: vertical plus torsional, about the bowl's axis", &Vibration{Center: shapes.Vec3{0, 0, 0.3}, Terms: []Oscillation{
			{Axis: z, Amplitude: amp, Frequency: freq},
			{Rotary: true, Axis: z, Amplitude: rot, Frequency: freq},
		}},
			func(t float64) (shapes.Vec3, shapes.Quat) {
				s := math.Sin(w0 * t)
				q := mgl64.QuatRotate(rot*s, z)
				c := shapes.Vec3{0, 0, 0.3}
				return c.Add(q.Rotate(base.Sub(c))).Add(z.Mul(amp * s)), q
			},
			func(t float64) (shapes.Vec3, shapes.Vec3) {
				c := math.Cos(w0 * t)
				spin := z.Mul(rot * w0 * c)
				// Spin about the centre; the body's reference point is off
				// the axis by (0.1, 0.2), so it also moves sideways.
				return z.Mul(amp * w0 * c).Add(spin.Cross(base.Sub(shapes.Vec3{0, 0, 0.3}))), spin
			},
			(amp + 0.23*rot) * w0 * w0 * w0 * dt * dt / 24 * 2, rot * w0 * w0 * w0 * dt * dt / 24 * 2},
		{"tilt at a rate to a stop", &Tilt{Axis: x.Mul(2), Point: base, Rate: 0.5, Start: 0.01, Angle: 0.02},
			func(t float64) (shapes.Vec3, shapes.Quat) {
				a := math.Min(0.5*math.Max(t-0.01, 0), 0.02)
				return base, mgl64.QuatRotate(a, x)
			},
			func(t float64) (shapes.Vec3, shapes.Vec3) {
				if t > 0.01 && t < 0.05 {
					return shapes.Vec3{}, x.Mul(0.5)
				}
				return shapes.Vec3{}, shapes.Vec3{}
			},
			1e-12, 1e-9}, // it starts and stops on step boundaries
	}
	for _, c := range cases {
		w := newTestWorld(t, DefaultConfig())
		id := mustAdd(t, w, BodyDef{Name: "table", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.1, 0.1, 0.01}}, Position: base})
		if err := w.SetMotion(id, c.motion); err != nil {
			t.Fatal(err)
		}
		worstP, worstV, worstW := 0.0, 0.0, 0.0
		run(t, w, dt, 0.1, func() {
			p, q := c.want(w.Time())
			worstP = math.Max(worstP, math.Max(w.Position(id).Sub(p).Len(), quatAngle(w.Orientation(id), q)))
			v, s := c.vel(w.Time() - dt/2)
			worstV = math.Max(worstV, w.Velocity(id).Sub(v).Len())
			worstW = math.Max(worstW, w.Spin(id).Sub(s).Len())
		})
		if worstP > poseTol {
			t.Errorf("%s: pose off by up to %.3g", c.name, worstP)
		}
		if worstV > c.velTol || worstW > c.spinTol {
			t.Errorf("%s: velocity off the mid-step derivative by up to %.3g m/s (allowed %.3g) and spin by %.3g rad/s (allowed %.3g)",
				c.name, worstV, c.velTol, worstW, c.spinTol)
		}
	}
}

func TestPoseTable(t *testing.T) {
	// Interpolation between rows: positions linearly, orientations along
	// the great arc (the half-way orientation between the identity and a
	// quarter turn about z is an eighth turn about z).
	const tol = 1e-12
	csv := "# a push and a quarter turn\ntime, x, y, z, qw, qx, qy, qz\n0, 0, 0, 0, 1, 0, 0, 0\n1, 100, 0, 50, 0.7071067811865476, 0, 0, 0.7071067811865476\n"
	p, err := ReadPoseTable(strings.NewReader(csv), "push.csv", 0.001)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		t     float64
		pos   shapes.Vec3
		angle float64
	}{
		{-1, shapes.Vec3{}, 0},
		{0.5, shapes.Vec3{0.05, 0, 0.025}, math.Pi / 4},
		{0.25, shapes.Vec3{0.025, 0, 0.0125}, math.Pi / 8},
		{2, shapes.Vec3{0.1, 0, 0.05}, math.Pi / 2},
	} {
		got := p.Pose(c.t, shapes.IdentityPose)
		if e := got.Position.Sub(c.pos).Len(); e > tol {
			t.Errorf("t = %g: position %v, want %v", c.t, got.Position, c.pos)
		}
		if e := quatAngle(got.Orientation, mgl64.QuatRotate(c.angle, shapes.Vec3{0, 0, 1})); e > tol {
			t.Errorf("t = %g: orientation %v off by %.3g rad", c.t, got.Orientation, e)
		}
	}
	rep := &PoseTable{Times: p.Times, Poses: p.Poses, Repeat: true}
	if a, b := rep.Pose(0.25, shapes.IdentityPose), p.Pose(0.25, shapes.IdentityPose); a.Position.Sub(b.Position).Len() > tol {
		t.Errorf("repeat: first period differs")
	}
	if a, b := rep.Pose(3.25, shapes.IdentityPose), p.Pose(0.25, shapes.IdentityPose); a.Position.Sub(b.Position).Len() > tol {
		t.Errorf("repeat: t = 3.25 is %v, want the pose at 0.25, %v", a.Position, b.Position)
	}
	// Relative: the half-way move (50, 0, 25) mm and an eighth turn about
	// z, applied to a base at (1, 2, 3) m turned a quarter about x.
	rel := &PoseTable{Times: p.Times, Poses: p.Poses, Relative: true}
	base := shapes.Pose{Position: shapes.Vec3{1, 2, 3}, Orientation: mgl64.QuatRotate(math.Pi/2, shapes.Vec3{1, 0, 0})}
	got := rel.Pose(0.5, base)
	if e := got.Position.Sub(shapes.Vec3{1.05, 2, 3.025}).Len(); e > tol {
		t.Errorf("relative: position %v", got.Position)
	}
	want := mgl64.QuatRotate(math.Pi/4, shapes.Vec3{0, 0, 1}).Mul(base.Orientation)
	if e := quatAngle(got.Orientation, want); e > tol {
		t.Errorf("relative: orientation off by %.3g rad", e)
	}
	if got := rel.Pose(-1, base); got.Position.Sub(base.Position).Len() > tol || quatAngle(got.Orientation, base.Orientation) > tol {
		t.Errorf("relative: a zero first row moves the body to %v", got)
	}
}

func TestPoseTableErrors(t *testing.T) {
	// Bad tables are errors that name the file and line, never panics.
	for _, c := range []struct{ name, csv, want string }{
		{"empty", "", "empty file"},
		{"header only", "time,x,y,z\n", "no rows"},
		{"unknown column", "time,x,y,z,speed\n0,0,0,0,1\n", `t.csv:1: unknown column "speed"`},
		{"missing column", "time,x,y\n0,0,0\n", `missing column "z"`},
		{"part of a quaternion", "time,x,y,z,qw\n0,0,0,0,1\n", "qw, qx, qy, qz or none"},
		{"not a number", "time,x,y,z\n0,0,0,0\n1,a,0,0\n", "t.csv:3: x: want a finite number"},
		{"time going back", "time,x,y,z\n0,0,0,0\n1,0,0,0\n0.5,0,0,0\n", "t.csv:4: time 0.5 does not follow 1"},
		{"zero quaternion", "time,x,y,z,qw,qx,qy,qz\n0,0,0,0,0,0,0,0\n", "t.csv:2: the orientation quaternion is zero"},
		{"short row", "time,x,y,z\n0,0,0\n", "t.csv:2"},
		{"infinite", "time,x,y,z\n0,0,inf,0\n", "t.csv:2: y"},
	} {
		_, err := ReadPoseTable(strings.NewReader(c.csv), "t.csv", 1)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.want)
		}
	}
}

func TestBadMotionsAndConveyors(t *testing.T) {
	w := newTestWorld(t, DefaultConfig())
	dyn := mustAdd(t, w, BodyDef{Name: "part", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000})
	kin := mustAdd(t, w, BodyDef{Name: "tray", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.1, 0.1, 0.01}}})
	nan := math.NaN()
	for _, c := range []struct {
		name string
		err  error
	}{
		{"motion on a dynamic body", w.SetMotion(dyn, &Tilt{Axis: shapes.Vec3{1, 0, 0}, Rate: 1})},
		{"no such body", w.SetMotion(99, &Tilt{Axis: shapes.Vec3{1, 0, 0}, Rate: 1})},
		{"zero vibration axis", w.SetMotion(kin, &Vibration{Terms: []Oscillation{{Amplitude: 1, Frequency: 1}}})},
		{"negative frequency", w.SetMotion(kin, &Vibration{Terms: []Oscillation{{Axis: shapes.Vec3{0, 0, 1}, Amplitude: 1, Frequency: -1}}})},
		{"tilt without a rate", w.SetMotion(kin, &Tilt{Axis: shapes.Vec3{1, 0, 0}})},
		{"tilt with NaN", w.SetMotion(kin, &Tilt{Axis: shapes.Vec3{1, 0, 0}, Rate: nan})},
		{"empty pose table", w.SetMotion(kin, &PoseTable{})},
		{"conveyor on a dynamic body", w.SetConveyor(dyn, shapes.Vec3{1, 0, 0})},
		{"infinite conveyor", w.SetConveyor(kin, shapes.Vec3{math.Inf(1), 0, 0})},
	} {
		if !errors.Is(c.err, ErrBadMotion) {
			t.Errorf("%s: error %v, want ErrBadMotion", c.name, c.err)
		}
	}
	if w.mechanismDriven() {
		t.Error("failed settings left the world driven")
	}
}

func TestConveyor(t *testing.T) {
	// A block set on a belt moving at u is dragged at mu_k g until it moves
	// with the belt (t = u/(mu_k g)), then rides at u (Coulomb friction
	// against the moving surface). The belt's velocity is in its body's own
	// axes: a belt body turned a quarter turn about z carries along y. 1
	// percent: the requirement for friction-driven speeds in the suite.
	const dt, u, mu, tol = 1e-3, 0.3, 0.4, 0.01
	for _, turned := range []bool{false, true} {
		w := newTestWorld(t, DefaultConfig())
		mat, _ := w.AddMaterial(Material{Name: "belt", Friction: mu})
		var q shapes.Quat
		dir := shapes.Vec3{1, 0, 0}
		if turned {
			q = mgl64.QuatRotate(math.Pi/2, shapes.Vec3{0, 0, 1})
			dir = shapes.Vec3{0, 1, 0}
		}
		belt := mustAdd(t, w, BodyDef{Name: "belt", Kind: Static, Shape: shapes.Box{Half: shapes.Vec3{1, 1, 0.01}}, Material: mat,
			Position: shapes.Vec3{0, 0, -0.01}, Orientation: q})
		if err := w.SetConveyor(belt, shapes.Vec3{u, 0, 0}); err != nil {
			t.Fatal(err)
		}
		box := mustAdd(t, w, BodyDef{Name: "carton", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.05, 0.05}}, Density: 200, Material: mat,
			Position: shapes.Vec3{0, 0, 0.05}})
		tCatch := u / (mu * g0)
		run(t, w, dt, math.Round(tCatch/2/dt)*dt, nil)
		if v, want := w.Velocity(box).Dot(dir), mu*g0*w.Time(); relErr(v, want) > tol {
			t.Errorf("turned %v: speed %.5f m/s at t = %.3f s, want mu g t = %.5f", turned, v, w.Time(), want)
		}
		run(t, w, dt, tCatch, nil)
		if v := w.Velocity(box); v.Sub(dir.Mul(u)).Len() > tol*u {
			t.Errorf("turned %v: rides at %v, want %v", turned, v, dir.Mul(u))
		}
	}
}

func TestPartHingedToDrivenBody(t *testing.T) {
	// A part welded to a kinematic arm that turns at a constant rate about
	// a horizontal axis moves rigidly with it: its pose relative to the arm
	// stays what it was (the weld's error stays below 1e-9 m and rad), and
	// the weld carries the part's weight plus the centripetal force m w^2 r
	// toward the axis (Newton's second law), which at 2 rad/s and r = 0.2 m
	// is 0.8 m; 1e-3 of m g: the mean over a step of a force that turns
	// with the arm by w dt = 2e-3 rad.
	const dt, rate, r = 1e-3, 2.0, 0.2
	w := newTestWorld(t, DefaultConfig())
	arm := mustAdd(t, w, BodyDef{Name: "arm", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.15, 0.01, 0.01}}, Position: shapes.Vec3{0.1, 0, 0}})
	// Started moving with the arm, so no start-up impulse.
	part := mustAdd(t, w, BodyDef{Name: "part", Shape: shapes.Sphere{Radius: 0.02}, Density: 1000, Position: shapes.Vec3{r, 0, 0},
		Velocity: shapes.Vec3{0, 0, -rate * r}, Spin: shapes.Vec3{0, rate, 0}})
	j := mustJoint(t, w, JointDef{Kind: Fixed, A: part, B: arm, Anchor: shapes.Vec3{r, 0, 0}})
	if err := w.SetMotion(arm, &Tilt{Axis: shapes.Vec3{0, 1, 0}, Rate: rate}); err != nil {
		t.Fatal(err)
	}
	mg := w.MassOf(part) * g0
	worst, worstF := 0.0, 0.0
	run(t, w, dt, 1, func() {
		l, a := w.JointError(j)
		worst = math.Max(worst, math.Max(l, a))
		q := w.Orientation(arm)
		radial := q.Rotate(shapes.Vec3{1, 0, 0}) // from the axis to the part
		want := shapes.Vec3{0, 0, mg}.Sub(radial.Mul(w.MassOf(part) * rate * rate * r))
		f, _ := w.JointReaction(j)
		if w.Steps() > 1 {
			// The first step turns the given velocity (the tangent at t = 0)
			// by half a step's angle only, into the chord of the step.
			worstF = math.Max(worstF, f.Sub(want).Len()/mg)
		}
	})
	if worst > 1e-9 {
		t.Errorf("weld to the driven arm off by up to %.3g", worst)
	}
	if worstF > 1e-3 {
		t.Errorf("weld force off weight plus centripetal force by up to %.3g of m g", worstF)
	}
}
