package engine

import (
	"errors"
	"math"
	"strings"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
	"gonum.org/v1/gonum/mathext"
)

// Joint tests: pendulums against their closed-form periods, reactions
// against statics, limits, motors and servos, and drift.

// periodTol is the requirement for pendulum periods: 0.5 percent. The
// semi-implicit step with 1 ms steps shifts a 2 s period by about
// (omega dt)^2 / 24 ~ 4e-7 and the zero-crossing interpolation errs by
// less than (omega dt)^2 of a step, so the margin is for the solver.
const periodTol = 0.005

// swingAngle returns the angle of the line from pivot to p from the
// downward vertical, about +y (positive toward +x).
func swingAngle(p, pivot shapes.Vec3) float64 {
	d := p.Sub(pivot)
	return math.Atan2(d[0], -d[2])
}

// measurePeriod steps until it has seen n+1 crossings of angle zero from
// positive to negative and returns the mean time between them.
func measurePeriod(t *testing.T, w *World, dt float64, n int, angle func() float64) float64 {
	t.Helper()
	var crossings []float64
	prev := angle()
	for step := 0; len(crossings) <= n; step++ {
		if step > 200000 {
			t.Fatalf("no period found after %d steps", step)
		}
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		a := angle()
		if prev > 0 && a <= 0 {
			// Linear interpolation of the crossing within the step.
			crossings = append(crossings, w.Time()-dt+dt*prev/(prev-a))
		}
		prev = a
	}
	return (crossings[n] - crossings[0]) / float64(n)
}

// largeAmplitudePeriod is the period of a pendulum of equivalent length l
// released at rest from theta0: T = 4 sqrt(l/g) K(sin^2(theta0/2))
// (any mechanics text, e.g. Landau and Lifshitz, Mechanics, section 11,
// problem 1), with K the complete elliptic integral of the first kind of
// parameter m (gonum mathext.CompleteK).
func largeAmplitudePeriod(l, theta0 float64) float64 {
	s := math.Sin(theta0 / 2)
	return 4 * math.Sqrt(l/g0) * mathext.CompleteK(s*s)
}

func TestSimplePendulumPeriod(t *testing.T) {
	// A small ball on a massless rod of length L from a fixed pivot. With a
	// distance joint from the ground to the ball's centre the ball does not
	// turn: a point-mass pendulum, equivalent length L. With a spherical
	// joint at the pivot the ball turns with the rod: a physical pendulum of
	// equivalent length I_pivot/(m L), I_pivot = m L^2 + 2 m r^2/5.
	const dt, L, r = 1e-3, 1.0, 0.01
	for _, kind := range []JointKind{Distance, Spherical} {
		for _, deg := range []float64{5, 60, 120, 170} {
			th := mgl64.DegToRad(deg)
			w := newTestWorld(t, DefaultConfig())
			pos := shapes.Vec3{L * math.Sin(th), 0, -L * math.Cos(th)}
			ball := mustAdd(t, w, BodyDef{Name: "bob", Shape: shapes.Sphere{Radius: r}, Density: 7800, Position: pos})
			def := JointDef{Name: "rod", Kind: kind, A: ball, B: Ground, Anchor: pos, AnchorB: shapes.Vec3{}}
			leq := L
			if kind == Spherical {
				def.Anchor = shapes.Vec3{}
				leq = L + 0.4*r*r/L
			}
			if _, err := w.AddJoint(def); err != nil {
				t.Fatal(err)
			}
			want := largeAmplitudePeriod(leq, th)
			got := measurePeriod(t, w, dt, 1, func() float64 { return swingAngle(w.Position(ball), shapes.Vec3{}) })
			e := relErr(got, want)
			if e > periodTol {
				t.Errorf("%s, %g deg: period %.5f s, want %.5f s (error %.2g)", kind, deg, got, want, e)
			}
			t.Logf("%s, %g deg: period %.5f s, want %.5f s (error %.2g)", kind, deg, got, want, e)
		}
	}
}

// hingedBox returns a world with a box of half sizes h hanging from a
// hinge about y at height d above its centre, released at theta0.
func hingedBox(t *testing.T, h shapes.Vec3, d, theta0 float64) (*World, BodyID) {
	t.Helper()
	w := newTestWorld(t, DefaultConfig())
	q := mgl64.QuatRotate(theta0, shapes.Vec3{0, 1, 0})
	// Pivot at the origin; the centre hangs at distance d along the box's -z.
	c := q.Rotate(shapes.Vec3{0, 0, -d})
	id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: h}, Density: 2700, Position: c, Orientation: q})
	if _, err := w.AddJoint(JointDef{Name: "pin", Kind: Revolute, A: id, B: Ground, Axis: shapes.Vec3{0, 1, 0}}); err != nil {
		t.Fatal(err)
	}
	return w, id
}

func TestPhysicalPendulumPeriod(t *testing.T) {
	// A box on a hinge: T = 2 pi sqrt(I_pivot / (m g d)) at small amplitude,
	// and 4 sqrt(I_pivot/(m g d)) K(sin^2(theta0/2)) at any amplitude, with
	// I_pivot = m (a^2 + c^2)/12 + m d^2 (box about an axis through its
	// centre, then the parallel-axis theorem; any dynamics handbook).
	const dt = 1e-3
	h := shapes.Vec3{0.03, 0.01, 0.15}
	for _, c := range []struct {
		name         string
		d, deg       float64
		smallFormula bool
	}{
		{"small amplitude, pin near the end", 0.13, 2, true},
		{"small amplitude, pin near the centre", 0.03, 2, true},
		{"40 degrees", 0.13, 40, false},
		{"150 degrees", 0.08, 150, false},
	} {
		th := mgl64.DegToRad(c.deg)
		w, id := hingedBox(t, h, c.d, th)
		lx, lz := 2*h[0], 2*h[2]
		ip := (lx*lx+lz*lz)/12 + c.d*c.d // per unit mass
		leq := ip / c.d
		want := largeAmplitudePeriod(leq, th)
		if c.smallFormula {
			want = 2 * math.Pi * math.Sqrt(leq/g0)
		}
		got := measurePeriod(t, w, dt, 2, func() float64 { return swingAngle(w.Position(id), shapes.Vec3{}) })
		e := relErr(got, want)
		if e > periodTol {
			t.Errorf("%s: period %.5f s, want %.5f s (error %.2g)", c.name, got, want, e)
		}
		t.Logf("%s: period %.5f s, want %.5f s (error %.2g)", c.name, got, want, e)
	}
}

// maxJointDrift is the requirement: every joint within 1e-4 of the link
// length of what it holds, over 10,000 steps.
const maxJointDrift = 1e-4

// rod adds a thin box of length l from p along the planar angle phi (in
// the x-z plane, turning about +y: phi = 0 along +x, pi/2 along -z).
func rod(t *testing.T, w *World, name string, p shapes.Vec3, l, phi float64) (BodyID, shapes.Vec3) {
	t.Helper()
	q := mgl64.QuatRotate(phi, shapes.Vec3{0, 1, 0})
	dir := q.Rotate(shapes.Vec3{1, 0, 0})
	id := mustAdd(t, w, BodyDef{Name: name, Shape: shapes.Box{Half: shapes.Vec3{l / 2, 0.01, 0.01}}, Density: 2700,
		Position: p.Add(dir.Mul(l / 2)), Orientation: q})
	return id, p.Add(dir.Mul(l))
}

func mustJoint(t testing.TB, w *World, def JointDef) JointID {
	t.Helper()
	j, err := w.AddJoint(def)
	if err != nil {
		t.Fatal(err)
	}
	return j
}

func TestJointDrift(t *testing.T) {
	// Mechanisms that move fast and chaotically for 10,000 steps of 1 ms,
	// from rest in a horizontal pose: the largest error of every joint over
	// the run, against the link length L = 0.5 m (the requirement; linear
	// errors in m over L, angular errors in rad).
	const dt, L, steps = 1e-3, 0.5, 10000
	y := shapes.Vec3{0, 1, 0}
	cases := []struct {
		name  string
		build func(w *World) []JointID
	}{
		{"double pendulum on skew hinges", func(w *World) []JointID {
			a, end := rod(t, w, "upper", shapes.Vec3{}, L, 0)
			b, _ := rod(t, w, "lower", end, L, 0)
			return []JointID{
				mustJoint(t, w, JointDef{Kind: Revolute, A: a, B: Ground, Axis: y}),
				mustJoint(t, w, JointDef{Kind: Revolute, A: b, B: a, Anchor: end, Axis: shapes.Vec3{0, 1, 1}}),
			}
		}},
		{"spherical double pendulum thrown sideways", func(w *World) []JointID {
			a, end := rod(t, w, "upper", shapes.Vec3{}, L, 0)
			b, _ := rod(t, w, "lower", end, L, -0.5)
			w.SetVelocity(b, shapes.Vec3{0, 2, 0}, shapes.Vec3{0, 0, 3})
			return []JointID{
				mustJoint(t, w, JointDef{Kind: Spherical, A: a, B: Ground}),
				mustJoint(t, w, JointDef{Kind: Spherical, A: b, B: a, Anchor: end}),
			}
		}},
		{"three balls on distance links", func(w *World) []JointID {
			var ids []JointID
			prev, at := Ground, shapes.Vec3{}
			for i := 1; i <= 3; i++ {
				p := shapes.Vec3{L * float64(i), 0, 0.1 * float64(i-1)}
				b := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.02}, Density: 7800, Position: p})
				ids = append(ids, mustJoint(t, w, JointDef{Kind: Distance, A: b, B: prev, Anchor: p, AnchorB: at}))
				prev, at = b, p
			}
			return ids
		}},
		{"pendulum on a sliding cart", func(w *World) []JointID {
			cart := mustAdd(t, w, BodyDef{Name: "cart", Shape: shapes.Box{Half: shapes.Vec3{0.1, 0.05, 0.03}}, Density: 1000})
			p, _ := rod(t, w, "pole", shapes.Vec3{}, L, 0)
			return []JointID{
				mustJoint(t, w, JointDef{Kind: Prismatic, A: cart, B: Ground, Axis: shapes.Vec3{1, 0, 0}}),
				mustJoint(t, w, JointDef{Kind: Revolute, A: p, B: cart, Axis: shapes.Vec3{0, 1, 0.5}}),
			}
		}},
		{"welded L swinging on a hinge", func(w *World) []JointID {
			a, end := rod(t, w, "arm", shapes.Vec3{}, L, 0)
			b, _ := rod(t, w, "leg", end, L, math.Pi/2)
			return []JointID{
				mustJoint(t, w, JointDef{Kind: Revolute, A: a, B: Ground, Axis: y}),
				mustJoint(t, w, JointDef{Kind: Fixed, A: b, B: a, Anchor: end}),
			}
		}},
	}
	for _, c := range cases {
		w := newTestWorld(t, DefaultConfig())
		js := c.build(w)
		var worstLin, worstAng float64
		run(t, w, dt, steps*dt, func() {
			for _, j := range js {
				l, a := w.JointError(j)
				worstLin, worstAng = math.Max(worstLin, l/L), math.Max(worstAng, a)
			}
		})
		if worstLin > maxJointDrift || worstAng > maxJointDrift {
			t.Errorf("%s: largest error %.3g of the link length and %.3g rad, want under %g", c.name, worstLin, worstAng, maxJointDrift)
		}
		t.Logf("%s: largest error %.3g of the link length and %.3g rad over %d steps", c.name, worstLin, worstAng, steps)
	}
}

// reactionTol is for reactions of joints at rest against statics: the
// exact joint solve leaves them at rounding level, 1e-6 leaves room for
// the regularisation of the solve (1e-10 of the rows' scale) times the
// conditioning of a long lever.
const reactionTol = 1e-6

func TestJointReactionsAtRest(t *testing.T) {
	// Statics (any statics text): a weight hanging from a pin needs a force
	// m g up at the pin; a horizontal beam welded at one end needs m g up
	// and a moment m g d about the weld, d the distance to its centre of
	// mass; a hinged arm held level by its limit needs the moment m g d
	// about the hinge axis from the limit.
	y := shapes.Vec3{0, 1, 0}
	cases := []struct {
		name         string
		build        func(w *World) (JointID, BodyID, float64) // joint, body, lever d
		wantTorqueAx shapes.Vec3                               // direction of the expected moment, times m g d
	}{
		{"weight on a pin", func(w *World) (JointID, BodyID, float64) {
			b := mustAdd(t, w, BodyDef{Name: "weight", Shape: shapes.Sphere{Radius: 0.05}, Density: 7800, Position: shapes.Vec3{0, 0, -0.3}})
			return mustJoint(t, w, JointDef{Kind: Spherical, A: b, B: Ground}), b, 0
		}, shapes.Vec3{}},
		{"welded cantilever", func(w *World) (JointID, BodyID, float64) {
			b := mustAdd(t, w, BodyDef{Name: "beam", Shape: shapes.Box{Half: shapes.Vec3{0.2, 0.02, 0.01}}, Density: 2700, Position: shapes.Vec3{0.2, 0, 0}})
			return mustJoint(t, w, JointDef{Kind: Fixed, A: b, B: Ground}), b, 0.2
		}, shapes.Vec3{0, -1, 0}},
		{"arm resting on its limit", func(w *World) (JointID, BodyID, float64) {
			b := mustAdd(t, w, BodyDef{Name: "arm", Shape: shapes.Box{Half: shapes.Vec3{0.15, 0.02, 0.01}}, Density: 2700, Position: shapes.Vec3{0.15, 0, 0}})
			// Gravity turns the arm positively about +y (x toward -z); the
			// upper limit at 0 holds it level.
			return mustJoint(t, w, JointDef{Kind: Revolute, A: b, B: Ground, Axis: y, Limited: true, Lower: -1, Upper: 0}), b, 0.15
		}, shapes.Vec3{0, -1, 0}},
	}
	for _, c := range cases {
		w := newTestWorld(t, Config{Gravity: shapes.Vec3{0, 0, -g0}, NoSleep: true})
		j, b, d := c.build(w)
		run(t, w, 1e-3, 0.2, nil)
		f, tq := w.JointReaction(j)
		mg := w.MassOf(b) * g0
		if e := f.Sub(shapes.Vec3{0, 0, mg}).Len() / mg; e > reactionTol {
			t.Errorf("%s: force %v N, want (0, 0, %.6g) (error %.2g)", c.name, f, mg, e)
		}
		if e := tq.Sub(c.wantTorqueAx.Mul(mg*d)).Len() / mg / 0.1; e > reactionTol {
			t.Errorf("%s: torque %v N m, want %v (error %.2g)", c.name, tq, c.wantTorqueAx.Mul(mg*d), e)
		}
		if c.name == "arm resting on its limit" {
			if q := w.JointPosition(j); math.Abs(q) > 1e-9 {
				t.Errorf("%s: angle %.3g rad, want 0 at the limit", c.name, q)
			}
		}
	}
}

func TestPendulumTensionAtBottom(t *testing.T) {
	// A point mass released from the horizontal on a rod of length L swings
	// through the bottom at v^2 = 2 g L (energy), where the rod pulls
	// m g + m v^2/L = 3 m g (Newton's second law in the radial direction).
	// The reaction is the mean over a step at the bottom; the semi-implicit
	// step leaves the energy off by about (omega dt)^2/2 ~ 1e-5 here, and
	// the step straddles the bottom, where the tension peaks as 1 - (omega
	// t)^2 3/2: 1e-4.
	const dt, L, tol = 1e-3, 0.5, 1e-4
	w := newTestWorld(t, DefaultConfig())
	p := shapes.Vec3{L, 0, 0}
	b := mustAdd(t, w, BodyDef{Name: "bob", Shape: shapes.Sphere{Radius: 0.005}, Density: 7800, Position: p})
	j := mustJoint(t, w, JointDef{Kind: Distance, A: b, B: Ground, Anchor: p})
	prev := swingAngle(w.Position(b), shapes.Vec3{})
	for i := 0; i < 2000; i++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		a := swingAngle(w.Position(b), shapes.Vec3{})
		if prev > 0 && a <= 0 {
			f, _ := w.JointReaction(j)
			want := 3 * w.MassOf(b) * g0
			// The rod pulls the bob toward the pivot: up at the bottom.
			e := relErr(f.Len(), want)
			if e > tol || f[2] <= 0 {
				t.Errorf("tension at the bottom %v N, want %.6g N up (error %.2g)", f, want, e)
			}
			t.Logf("tension at the bottom %.6g N, want %.6g N (error %.2g)", f.Len(), want, e)
			return
		}
		prev = a
	}
	t.Fatal("the pendulum never reached the bottom")
}

func TestLimitsHold(t *testing.T) {
	// A joint driven into its limit by gravity stops at it and rests there
	// (the limit is a one-sided constraint: it holds without passing, and
	// lets go when pulled away). 1e-6 m or rad: the speculative limit rows
	// let a joint close its gap within the step but not pass it, and the
	// position pass removes what the linearisation misses within a step or
	// two (that is the only overshoot, second order in the step).
	const tol = 1e-6
	cases := []struct {
		name  string
		build func(w *World) (JointID, float64) // joint, the limit it must rest at
	}{
		{"arm falling onto a hinge stop", func(w *World) (JointID, float64) {
			b := mustAdd(t, w, BodyDef{Name: "arm", Shape: shapes.Box{Half: shapes.Vec3{0.15, 0.02, 0.01}}, Density: 2700, Position: shapes.Vec3{0.15, 0, 0}})
			return mustJoint(t, w, JointDef{Kind: Revolute, A: b, B: Ground, Axis: shapes.Vec3{0, 1, 0}, Limited: true, Lower: -1, Upper: 0.5}), 0.5
		}},
		{"block dropping onto a slider stop", func(w *World) (JointID, float64) {
			b := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{0.02, 0.02, 0.02}}, Density: 7800})
			return mustJoint(t, w, JointDef{Kind: Prismatic, A: b, B: Ground, Axis: shapes.Vec3{0, 0, 1}, Limited: true, Lower: -0.1, Upper: 0.1}), -0.1
		}},
		{"ball caught by a rope", func(w *World) (JointID, float64) {
			p := shapes.Vec3{0.1, 0, 0.2}
			b := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.01}, Density: 7800, Position: p})
			return mustJoint(t, w, JointDef{Kind: Distance, A: b, B: Ground, Anchor: p, MaxLength: 0.5}), 0.5
		}},
	}
	for _, c := range cases {
		w := newTestWorld(t, Config{Gravity: shapes.Vec3{0, 0, -g0}, NoSleep: true})
		j, lim := c.build(w)
		over := 0.0
		run(t, w, 1e-3, 3, func() {
			q := w.JointPosition(j)
			if lim < 0 {
				over = math.Max(over, lim-q)
			} else {
				over = math.Max(over, q-lim)
			}
		})
		if over > tol {
			t.Errorf("%s: went %.3g past the limit", c.name, over)
		}
		if q := w.JointPosition(j); math.Abs(q-lim) > tol || math.Abs(w.JointSpeed(j)) > tol {
			t.Errorf("%s: ends at %.9g moving at %.3g, want at rest at the limit %g", c.name, q, w.JointSpeed(j), lim)
		}
	}
}

func TestSpeedMotorUnderLoad(t *testing.T) {
	// A flywheel (solid disc, I = m r^2/2) on a vertical hinge with a
	// Coulomb friction torque tf as its load and a speed motor of capped
	// torque tm (Newton's second law for rotation). With tm > tf it speeds
	// up at (tm - tf)/I to the target and then holds it with the motor
	// giving tf; with tf > tm, spinning, it slows at (tf - tm)/I and stalls,
	// the motor then straining at its cap. 1e-3: a step is exact for a
	// constant torque, and the two bounded rows (motor and friction)
	// saturate within the sweeps; what is left is their convergence.
	const dt, r, tol = 1e-3, 0.1, 1e-3
	for _, c := range []struct {
		name                 string
		tm, tf, target, spin float64
	}{
		{"motor above its load", 0.5, 0.2, 20, 0},
		{"load above the motor's cap", 0.5, 0.8, 40, 30},
	} {
		w := newTestWorld(t, DefaultConfig())
		b := mustAdd(t, w, BodyDef{Name: "flywheel", Shape: shapes.Cylinder{Radius: r, HalfLength: 0.02}, Density: 7800,
			Spin: shapes.Vec3{0, 0, c.spin}})
		j := mustJoint(t, w, JointDef{Kind: Revolute, A: b, B: Ground, Axis: shapes.Vec3{0, 0, 1}, Friction: c.tf,
			Motor: Motor{Mode: MotorSpeed, Speed: c.target, MaxForce: c.tm}})
		inertia := w.MassOf(b) * r * r / 2
		alpha := (c.tm - c.tf) / inertia
		// Half-way to the target (or to the stall), then well past it.
		end := c.target
		if alpha < 0 {
			end = 0
		}
		tHalf := (end - c.spin) / alpha / 2
		run(t, w, dt, math.Round(tHalf/dt)*dt, nil)
		wantHalf := c.spin + alpha*math.Round(tHalf/dt)*dt
		if e := relErr(w.JointSpeed(j), wantHalf); e > tol {
			t.Errorf("%s: speed %.6g rad/s after %.3g s, want %.6g (error %.2g)", c.name, w.JointSpeed(j), tHalf, wantHalf, e)
		}
		run(t, w, dt, 2*tHalf+0.5, nil)
		wantEffort := c.tf
		if alpha < 0 {
			wantEffort = c.tm
		}
		if s := w.JointSpeed(j); math.Abs(s-end) > tol*math.Max(end, 1) {
			t.Errorf("%s: ends at %.6g rad/s, want %g", c.name, s, end)
		}
		if e := relErr(w.MotorEffort(j), wantEffort); e > tol {
			t.Errorf("%s: motor torque %.6g N m, want %g (error %.2g)", c.name, w.MotorEffort(j), wantEffort, e)
		}
	}
}

func TestServo(t *testing.T) {
	// A flywheel on a hinge with a servo of stiffness k and damping c
	// toward a target angle: a damped oscillator, I q'' + c q' + k q =
	// k q*, from rest at 0 (any vibrations text): q = q* (1 - e^(-z w t)
	// (cos(wd t) + z w / wd sin(wd t))), w = sqrt(k/I), z = c/(2 sqrt(k I)),
	// wd = w sqrt(1 - z^2). The servo is stepped implicitly (backward
	// Euler), which damps by about w dt/2 more: at w dt = 2e-3 that is 1e-3
	// of critical, and over the second that the test runs the response
	// stays within 1 percent of the target of the closed form. With a
	// torque cap below k q*, it first turns at the cap's constant
	// acceleration, q = (cap/I) t^2/2, to within the same 1 percent.
	const dt, tol = 2e-4, 0.01
	for _, capped := range []bool{false, true} {
		w := newTestWorld(t, Config{NoSleep: true}) // no gravity
		b := mustAdd(t, w, BodyDef{Name: "flywheel", Shape: shapes.Cylinder{Radius: 0.1, HalfLength: 0.02}, Density: 7800})
		inertia := w.MassOf(b) * 0.1 * 0.1 / 2
		const target, omega, zeta = 1.0, 10.0, 0.2
		k := omega * omega * inertia
		m := Motor{Mode: MotorServo, Target: target, Stiffness: k, Damping: 2 * zeta * math.Sqrt(k*inertia), MaxForce: math.Inf(1)}
		if capped {
			m.MaxForce = 0.1 * k * target
		}
		j := mustJoint(t, w, JointDef{Kind: Revolute, A: b, B: Ground, Axis: shapes.Vec3{0, 0, 1}, Motor: m})
		wd := omega * math.Sqrt(1-zeta*zeta)
		worst := 0.0
		run(t, w, dt, 1, func() {
			tt := w.Time()
			want := target * (1 - math.Exp(-zeta*omega*tt)*(math.Cos(wd*tt)+zeta*omega/wd*math.Sin(wd*tt)))
			if capped {
				if tt > 0.1 {
					return // the closed form holds while the cap is reached
				}
				want = m.MaxForce / inertia * tt * tt / 2
			}
			worst = math.Max(worst, math.Abs(w.JointPosition(j)-want)/target)
		})
		if worst > tol {
			t.Errorf("capped %v: off the closed form by up to %.3g of the target", capped, worst)
		}
		t.Logf("capped %v: off the closed form by up to %.3g of the target", capped, worst)
	}
}

func TestBadJoints(t *testing.T) {
	// Bad definitions are errors that name the joint and say what to do;
	// none panics, and none is added.
	w := newTestWorld(t, DefaultConfig())
	a := mustAdd(t, w, BodyDef{Name: "a", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000})
	st := mustAdd(t, w, BodyDef{Name: "frame", Kind: Static, Shape: shapes.Box{Half: shapes.Vec3{0.1, 0.1, 0.1}}})
	nan := math.NaN()
	z := shapes.Vec3{0, 0, 1}
	for _, c := range []struct {
		def  JointDef
		want string
	}{
		{JointDef{Name: "k", Kind: 9, A: a, B: Ground}, "unknown kind"},
		{JointDef{Name: "a", Kind: Spherical, A: 7, B: Ground}, "no body 7"},
		{JointDef{Name: "b", Kind: Spherical, A: a, B: 8}, "use Ground"},
		{JointDef{Name: "self", Kind: Fixed, A: a, B: a}, "to itself"},
		{JointDef{Name: "still", Kind: Fixed, A: st, B: Ground}, "neither is dynamic"},
		{JointDef{Name: "axis", Kind: Revolute, A: a, B: Ground}, "needs an axis"},
		{JointDef{Name: "nan", Kind: Spherical, A: a, B: Ground, Anchor: shapes.Vec3{nan, 0, 0}}, "finite"},
		{JointDef{Name: "lim", Kind: Revolute, A: a, B: Ground, Axis: z, Limited: true, Lower: 1, Upper: 0}, "lower <= upper"},
		{JointDef{Name: "ball lim", Kind: Spherical, A: a, B: Ground, Limited: true}, "no angle or travel"},
		{JointDef{Name: "fric", Kind: Revolute, A: a, B: Ground, Axis: z, Friction: -1}, "friction"},
		{JointDef{Name: "ball motor", Kind: Spherical, A: a, B: Ground, Motor: Motor{Mode: MotorSpeed, MaxForce: 1}}, "no motor"},
		{JointDef{Name: "cap", Kind: Revolute, A: a, B: Ground, Axis: z, Motor: Motor{Mode: MotorSpeed, Speed: 1}}, "cap must be positive"},
		{JointDef{Name: "servo", Kind: Revolute, A: a, B: Ground, Axis: z, Motor: Motor{Mode: MotorServo, MaxForce: 1}}, "stiffness or a damping"},
		{JointDef{Name: "mode", Kind: Prismatic, A: a, B: Ground, Axis: z, Motor: Motor{Mode: 7, MaxForce: 1}}, "unknown motor mode"},
		{JointDef{Name: "rope", Kind: Distance, A: a, B: Ground, MinLength: 2, MaxLength: 1}, "min <= max"},
		{JointDef{Name: "point", Kind: Distance, A: a, B: Ground}, "anchors coincide"},
	} {
		_, err := w.AddJoint(c.def)
		if !errors.Is(err, ErrBadJoint) || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), `"`+c.def.Name+`"`) {
			t.Errorf("joint %q: error %v, want one naming it and saying %q", c.def.Name, err, c.want)
		}
	}
	if w.NumJoints() != 0 {
		t.Errorf("%d bad joints were added", w.NumJoints())
	}
	if err := w.SetMotor(3, Motor{}); !errors.Is(err, ErrBadJoint) {
		t.Errorf("SetMotor on no joint: %v", err)
	}
}

func TestJointedBodiesShareIslands(t *testing.T) {
	// Two boxes hinged together, resting on a floor, fall asleep together;
	// a kick to one wakes both. Jointed bodies pass through each other
	// unless the joint says they collide.
	w, _ := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.5})
	h := shapes.Vec3{0.05, 0.05, 0.05}
	a := mustAdd(t, w, BodyDef{Name: "a", Shape: shapes.Box{Half: h}, Density: 500, Position: shapes.Vec3{0, 0, 0.05}})
	b := mustAdd(t, w, BodyDef{Name: "b", Shape: shapes.Box{Half: h}, Density: 500, Position: shapes.Vec3{0.09, 0, 0.05}}) // overlaps a by 1 cm
	mustJoint(t, w, JointDef{Kind: Revolute, A: b, B: a, Anchor: shapes.Vec3{0.045, 0, 0.1}, Axis: shapes.Vec3{0, 1, 0}})
	run(t, w, 1e-3, 1.5, nil)
	if w.Awake(a) || w.Awake(b) {
		t.Fatalf("hinged pair still awake after 1.5 s at rest: %v %v", w.Awake(a), w.Awake(b))
	}
	if d := w.Position(b).Sub(shapes.Vec3{0.09, 0, 0.05}).Len(); d > 1e-3 {
		t.Errorf("the overlapping hinged boxes pushed apart by %.3g m", d)
	}
	if err := w.Kick(a, w.Time(), shapes.Vec3{0.01, 0, 0}, shapes.Vec3{}, true); err != nil {
		t.Fatal(err)
	}
	run(t, w, 1e-3, 0.01, nil)
	if !w.Awake(a) || !w.Awake(b) {
		t.Errorf("a kick to one box woke a %v, b %v; want both", w.Awake(a), w.Awake(b))
	}
}
