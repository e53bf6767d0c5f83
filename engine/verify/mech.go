package verify

import (
	"math"

	"clatter/engine"
	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
	"gonum.org/v1/gonum/mathext"
)

// mechanismCases are the joint and motor cases.
func mechanismCases() []Case {
	return []Case{
		{
			Name: "pendulum let go at 60 deg: period", Unit: "s",
			Reference: "T = 4 sqrt(I / (m g L)) K(sin^2(theta0 / 2))", Source: "large-amplitude pendulum (any mechanics text); K from gonum mathext.CompleteK",
			Relative: true, Tolerance: 0.005,
			Why: "the hinge holds to rounding and a 1 ms step times a 2.15 s period to well under 0.1 percent",
			Run: pendulumPeriod,
		},
		{
			Name: "slider-crank at 10 rev/s: piston off the closed form", Unit: "of stroke",
			Reference: "x = r cos(theta) + sqrt(l^2 - r^2 sin^2(theta))", Source: "slider-crank kinematics (e.g. Norton, Design of Machinery, section 4.6)",
			Tolerance: 1e-3,
			Why:       "worst deviation over a run-up and two turns, as a fraction of the stroke 2r: joint errors are far smaller",
			Run:       sliderCrank,
		},
		{
			Name: "speed motor capped at 0.5 N m spins up a flywheel", Unit: "rad/s",
			Reference: "omega = (t_motor - t_friction) t / I until the target", Source: "Newton's second law for rotation (any dynamics text)",
			Relative: true, Tolerance: 1e-3,
			Why: "a step is exact for constant torque; what remains is the convergence of the two capped rows",
			Run: motorSpinUp,
		},
	}
}

func pendulumPeriod() (float64, float64, float64, error) {
	const L, r, theta0 = 1.0, 0.01, math.Pi / 3
	w, err := engine.NewWorld(engine.Config{Gravity: shapes.Vec3{0, 0, -g}, NoSleep: true})
	if err != nil {
		return 0, 0, 0, err
	}
	bob, err := w.AddBody(engine.BodyDef{Name: "bob", Shape: shapes.Sphere{Radius: r}, Density: 7800,
		Position: shapes.Vec3{L * math.Sin(theta0), 0, -L * math.Cos(theta0)}})
	if err != nil {
		return 0, 0, 0, err
	}
	if _, err := w.AddJoint(engine.JointDef{Kind: engine.Revolute, A: bob, B: engine.Ground, Axis: shapes.Vec3{0, 1, 0}}); err != nil {
		return 0, 0, 0, err
	}
	// Time two crossings of the bottom (x = 0) in the same direction,
	// interpolated within the step.
	var cross []float64
	prev := w.Position(bob)[0]
	err = steps(w, dt, seconds(4.5, dt), func() {
		x := w.Position(bob)[0]
		if prev > 0 && x <= 0 || prev < 0 && x >= 0 {
			cross = append(cross, w.Time()-dt*x/(x-prev))
		}
		prev = x
	})
	k := math.Sin(theta0 / 2)
	want := 4 * math.Sqrt((L*L+0.4*r*r)/(g*L)) * mathext.CompleteK(k*k)
	if len(cross) < 3 {
		return want, math.NaN(), math.NaN(), err
	}
	return want, cross[2] - cross[0], math.NaN(), err
}

// bar adds a thin steel bar from p to q (world points in the x-z plane).
func bar(w *engine.World, p, q shapes.Vec3) (engine.BodyID, error) {
	d := q.Sub(p)
	return w.AddBody(engine.BodyDef{Name: "bar", Shape: shapes.Box{Half: shapes.Vec3{d.Len() / 2, 0.005, 0.005}}, Density: 7800,
		Position: p.Add(d.Mul(0.5)), Orientation: mgl64.QuatRotate(math.Atan2(-d[2], d[0]), shapes.Vec3{0, 1, 0})})
}

func sliderCrank() (float64, float64, float64, error) {
	const r, l, rps = 0.05, 0.15, 10.0
	w, err := engine.NewWorld(engine.DefaultConfig())
	if err != nil {
		return 0, 0, 0, err
	}
	y := shapes.Vec3{0, 1, 0}
	pin, wrist := shapes.Vec3{r, 0, 0}, shapes.Vec3{r + l, 0, 0}
	crank, err1 := bar(w, shapes.Vec3{}, pin)
	rod, err2 := bar(w, pin, wrist)
	piston, err3 := w.AddBody(engine.BodyDef{Name: "piston", Shape: shapes.Box{Half: shapes.Vec3{0.02, 0.02, 0.02}}, Density: 7800, Position: wrist})
	drive, err4 := w.AddJoint(engine.JointDef{Kind: engine.Revolute, A: crank, B: engine.Ground, Axis: y,
		Motor: engine.Motor{Mode: engine.MotorSpeed, Speed: 2 * math.Pi * rps, MaxForce: 20}})
	_, err5 := w.AddJoint(engine.JointDef{Kind: engine.Revolute, A: rod, B: crank, Anchor: pin, Axis: y})
	_, err6 := w.AddJoint(engine.JointDef{Kind: engine.Revolute, A: piston, B: rod, Anchor: wrist, Axis: y})
	slide, err7 := w.AddJoint(engine.JointDef{Kind: engine.Prismatic, A: piston, B: engine.Ground, Anchor: wrist, Axis: shapes.Vec3{1, 0, 0}})
	for _, e := range []error{err1, err2, err3, err4, err5, err6, err7} {
		if e != nil {
			return 0, 0, 0, e
		}
	}
	worst := 0.0
	err = steps(w, dt, seconds(0.2+2/rps, dt), func() {
		th := w.JointPosition(drive)
		s := math.Sin(th)
		want := r*math.Cos(th) + math.Sqrt(l*l-r*r*s*s)
		got := r + l + w.JointPosition(slide)
		worst = math.Max(worst, math.Abs(got-want)/(2*r))
	})
	return 0, worst, math.NaN(), err
}

func motorSpinUp() (float64, float64, float64, error) {
	const r, tm, tf, target = 0.1, 0.5, 0.2, 20.0
	w, err := engine.NewWorld(engine.DefaultConfig())
	if err != nil {
		return 0, 0, 0, err
	}
	b, err := w.AddBody(engine.BodyDef{Name: "flywheel", Shape: shapes.Cylinder{Radius: r, HalfLength: 0.02}, Density: 7800})
	if err != nil {
		return 0, 0, 0, err
	}
	j, err := w.AddJoint(engine.JointDef{Kind: engine.Revolute, A: b, B: engine.Ground, Axis: shapes.Vec3{0, 0, 1}, Friction: tf,
		Motor: engine.Motor{Mode: engine.MotorSpeed, Speed: target, MaxForce: tm}})
	if err != nil {
		return 0, 0, 0, err
	}
	alpha := (tm - tf) / (w.MassOf(b) * r * r / 2)
	n := seconds(target/alpha/2, dt) // half-way to the target
	err = steps(w, dt, n, nil)
	return alpha * float64(n) * dt, w.JointSpeed(j), math.NaN(), err
}
