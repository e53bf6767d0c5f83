package engine

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
	"gonum.org/v1/gonum/mathext"
)

// The scaling probe. Rigid-body dynamics under gravity has no length scale
// of its own: a case made s times larger, with its times (and its step)
// s^(1/2) times longer, is the same case, and each dimensionless result
// (a height over the drop height, a distance over the part's size, a time
// over sqrt(L/g), a face, an angle) is the same number (dynamic similarity;
// e.g. Barenblatt, "Scaling, Self-similarity, and Intermediate
// Asymptotics", 1996, ch. 1). Densities cancel out of every result here, as
// they do in the rigid-body equations with gravity as the only load. So
// each case runs at parts from 1 mm to 10 m (size factors 1e-3 to 10 on a
// 1 m case), at two densities, and its result is checked against the
// analytic value, and against the result at size factor 1.

// scaleFactors are the size factors of the probe: 1 mm to 10 m parts.
var scaleFactors = []float64{1e-3, 1e-2, 1, 10}

// scaleDensities: water and steel, and a foam; a density must not change
// any result of these cases.
var scaleDensities = []float64{1000, 30}

// scaleStep is the step at size factor 1 (1 m parts); it is scaled with
// the times.
const scaleStep = 1e-3

// scaleRun is one scaled case: its dimensionless result at size factor s,
// density rho and step dt.
type scaleRun func(t *testing.T, s, rho, dt float64) float64

type scaleCase struct {
	name string
	ref  string  // the analytic reference
	want float64 // the analytic value of the dimensionless result
	tol  float64 // against want
	// spread is how far the result may move between size factors and
	// densities; it is tighter than tol where the analytic value is only
	// approached (the discretisation error is the same at every scale).
	spread float64
	// ratio: no analytic value, only the spread over the scales.
	ratio bool
	run   scaleRun
}

// Tolerances of the probe, each against its analytic value.
const (
	// scaleApexTol: a rebound height against e^2 h, relative. The apex is
	// read at the first step with v <= 0 and the impact falls between
	// steps, under 1 percent at 1000 steps per fall; an impact within the
	// slop of its support bounces from there, up to 1 percent of a small
	// part's radius from the floor (contact/slop.go), 2 percent of the
	// second rebound of a ball dropped its diameter. 3 percent is the
	// validation suite's requirement (TestBounceHeights).
	scaleApexTol = 0.03
	// scaleSlideTol: a sliding distance against g t^2 (sin a - mu cos a)/2,
	// relative, with t^2 as the integrator takes it (inclineSlide); the
	// first step of contact and the friction cone's accuracy, 1 percent
	// (TestInclineSlides).
	scaleSlideTol = 0.01
	// scaleStopTol: a sliding distance to rest against v0^2/(2 mu g), less
	// the integrator's half step (slideToStop); the last step stops the
	// block anywhere within it, up to v0 dt/2 more, 3 percent for a 1 mm
	// part at 1 ms (17 steps to rest) and under 0.3 percent for the rest.
	// A part that keeps the static coefficient 0.5 for two steps instead
	// of 0.3 stops 17 percent short at 1 mm and 1 ms.
	scaleStopTol = 0.03
	// scaleRollTol: the speed a sliding ball rolls at against 5 v0/7; the
	// friction's last step overshoots by at most mu g dt, under 1 percent
	// of 5 v0/7 for every case here (TestSphereStartsRolling: 2 percent).
	scaleRollTol = 0.02
	// scaleRollOnTol: the speed of a ball rolling on a level floor against
	// its initial speed. A rigid ball rolling without slip feels no force
	// along the floor and keeps its speed. The narrow phase refreshes a
	// touching pair's points between full queries, and on a rolling ball
	// the refreshed point lags behind the true one by up to a tenth of the
	// pair's slop, where the normal force speeds the roll up (collide's
	// persistsize.go). With that slop at 1 percent of a small part's
	// radius (0.04 percent of a 1 m ball's 0.2 mm) a 1 mm and a 1 cm ball
	// gain 1.4 percent in a scaled second at a scaled step, and nothing at
	// 1 ms (measured); with the slop fixed at 0.2 mm they gained 10 and
	// 3.5 percent, and 25 percent at 1 mm and 1 ms.
	scaleRollOnTol = 0.02
	// scalePeriodTol: a pendulum's period against the elliptic integral;
	// a period of 2000 steps is found to within a step by its zero
	// crossings, 5e-4, and the joint's drift adds little.
	scalePeriodTol = 1e-3
	// scaleSinkTol: how deep a part at rest may sink into its support, as a
	// fraction of its size: the contact slop is 0.2 mm on a 2 cm part, one
	// percent, which is what the engine's defaults were chosen for.
	scaleSinkTol = 0.01
	// scaleDriftTol: how far a settled stack may move sideways, as a
	// fraction of a part's size; a stack set down straight has no reason to
	// move at all, 1e-3 is far below anything visible.
	scaleDriftTol = 1e-3
	// scaleRestTimeTol: the time a dropped part takes to come to rest, in
	// units of sqrt(L/g), against the time at size factor 1. The flight
	// times are similar to the step; what ends them is the bounce
	// threshold (1.5 g dt, similar too) and the rest test, which must
	// follow the size. Half of the reference time: a rest test that does
	// not follow the size misses by factors.
	scaleRestTimeTol = 0.5
	// scaleExact: a face or a tip, a yes or no, the same at every scale.
	scaleExact = 0
)

func scaleCases() []scaleCase {
	return []scaleCase{
		{name: "ball rebound 1, e = 0.7", ref: "e^2 (Newton's law of restitution; Meriam and Kraige, Dynamics, ch. 3)",
			want: 0.49, tol: scaleApexTol, spread: scaleApexTol, run: func(t *testing.T, s, rho, dt float64) float64 {
				return ballApex(t, s, rho, dt, 0.7, 1)
			}},
		{name: "ball rebound 2, e = 0.7", ref: "e^4 (Newton's law of restitution; Meriam and Kraige, Dynamics, ch. 3)",
			want: math.Pow(0.7, 4), tol: scaleApexTol, spread: scaleApexTol, run: func(t *testing.T, s, rho, dt float64) float64 {
				return ballApex(t, s, rho, dt, 0.7, 2)
			}},
		{name: "cube rebound 1, e = 0.5", ref: "e^2 (Newton's law of restitution, a face landing flat)",
			want: 0.25, tol: scaleApexTol, spread: scaleApexTol, run: func(t *testing.T, s, rho, dt float64) float64 {
				return cubeApex(t, s, rho, dt, 0.5)
			}},
		{name: "incline slide, 30 deg, mu 0.2", ref: "s = g t^2 (sin a - mu cos a)/2 (Coulomb friction; any dynamics text)",
			want: 1, tol: scaleSlideTol, spread: scaleSlideTol, run: inclineSlide},
		{name: "slide to stop from 0.5 sqrt(gL), mu 0.3", ref: "d = v0^2/(2 mu g) (Coulomb friction; any dynamics text)",
			want: 1, tol: scaleStopTol, spread: scaleStopTol, run: slideToStop},
		{name: "ball launched sliding at 0.5 sqrt(gL): rolling speed", ref: "5 v0/7 (Halliday, Resnick and Walker; any dynamics text)",
			want: 1, tol: scaleRollTol, spread: scaleRollTol, run: rollingSpeed},
		{name: "ball rolling on a level floor at 0.04 sqrt(gL): speed after sqrt(L) s", ref: "Newton's first law: rolling without slip on a level floor, no force along it",
			want: 1, tol: scaleRollOnTol, spread: scaleRollOnTol, run: rollingOn},
		{name: "cylinder rolling down 20 deg: distance", ref: "a = (2/3) g sin(a) (any dynamics text)",
			want: 1, tol: scaleSlideTol, spread: scaleSlideTol, run: cylinderRolls},
		{name: "pendulum period, 40 deg", ref: "T = 4 sqrt(I/(m g d)) K(sin^2(a/2)) (Landau and Lifshitz, Mechanics, sec. 11; gonum mathext.CompleteK)",
			want: 1, tol: scalePeriodTol, spread: scalePeriodTol, run: pendulumPeriod},
		{name: "box tilted 45 deg, e = 0: back on its face 3", ref: "statics: tips over its edge beyond atan(0.3/0.2) = 56.3 deg",
			want: 0, tol: scaleExact, spread: scaleExact, run: atAngle(boxFaceAfterTilt, 45)},
		{name: "box tilted 65 deg, e = 0: onto its side", ref: "statics: tips over its edge beyond atan(0.3/0.2) = 56.3 deg",
			want: 1, tol: scaleExact, spread: scaleExact, run: atAngle(boxFaceAfterTilt, 65)},
		{name: "cylinder tilted 20 deg: stands", ref: "statics: tips beyond atan(r/(l/2)) = 31.0 deg",
			want: 0, tol: scaleExact, spread: scaleExact, run: atAngle(cylinderAfterTilt, 20)},
		{name: "cylinder tilted 45 deg: lies down", ref: "statics: tips beyond atan(r/(l/2)) = 31.0 deg",
			want: 1, tol: scaleExact, spread: scaleExact, run: atAngle(cylinderAfterTilt, 45)},
		{name: "block b/h = 0.5 on a 24 deg incline: stands", ref: "statics: tips at atan(b/h) = 26.6 deg",
			want: 0, tol: scaleExact, spread: scaleExact, run: atAngle(blockTipsOnIncline, 24)},
		{name: "block b/h = 0.5 on a 29 deg incline: tips", ref: "statics: tips at atan(b/h) = 26.6 deg",
			want: 1, tol: scaleExact, spread: scaleExact, run: atAngle(blockTipsOnIncline, 29)},
		{name: "cube at rest: sink / size", ref: "statics: a rigid cube rests on its face, sunk 0",
			want: 0, tol: scaleSinkTol, spread: scaleSinkTol, run: cubeSink},
		{name: "stack of 4: sideways drift / size", ref: "statics: a straight stack stays straight",
			want: 0, tol: scaleDriftTol, spread: scaleDriftTol, run: stackDrift},
		{name: "stack of 4: sink of the top / size", ref: "statics: rigid cubes stacked, top at 3.5 sizes",
			want: 0, tol: 4 * scaleSinkTol, spread: 4 * scaleSinkTol, run: stackSink},
	}
}

// scaleRatios are cases whose analytic value is not known in closed form
// (how long a part takes to come to rest); only their spread over the
// scales is checked, against the result at size factor 1.
func scaleRatios() []scaleCase {
	return []scaleCase{
		{name: "ball e = 0.5 dropped 1 size: time to rest / sqrt(L/g)", ref: "similarity: the same at every size", ratio: true,
			spread: scaleRestTimeTol, run: func(t *testing.T, s, rho, dt float64) float64 {
				return ballRestTime(t, s, rho, dt, 0.5)
			}},
		{name: "cube e = 0 dropped tilted: time to rest / sqrt(L/g)", ref: "similarity: the same at every size", ratio: true,
			spread: scaleRestTimeTol, run: cubeRestTime},
	}
}

// scaleWorld is a world with a floor of a material with friction mu and
// restitution e, gravity tilted by theta about y.
func scaleWorld(t *testing.T, theta, mu, e float64) (*World, int) {
	t.Helper()
	return floorWorld(t, Config{}, theta, Material{Friction: mu, Restitution: e})
}

// ballApex drops a ball of radius s/2 from s (gap) and returns its n-th
// rebound height over the drop height.
func ballApex(t *testing.T, s, rho, dt, e float64, n int) float64 {
	w, mat := scaleWorld(t, 0, 0.3, e)
	r, h := 0.5*s, s
	id := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: rho, Material: mat, Position: shapes.Vec3{0, 0, r + h}})
	return nthApex(t, w, id, dt, r, h, e, n)
}

func nthApex(t *testing.T, w *World, id BodyID, dt, z0, h, e float64, n int) float64 {
	fall := math.Sqrt(2 * h / g0)
	var apex []float64
	prevV := 0.0
	end := fall * (1 + 2*e + 2*e*e + 2*e*e*e)
	for i := 0; float64(i)*dt < end && len(apex) < n; i++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		v := w.Velocity(id)[2]
		if prevV > 0 && v <= 0 {
			apex = append(apex, w.Position(id)[2]-z0)
		}
		prevV = v
	}
	if len(apex) < n {
		return math.NaN()
	}
	return apex[n-1] / h
}

func cubeApex(t *testing.T, s, rho, dt, e float64) float64 {
	w, mat := scaleWorld(t, 0, 0.3, e)
	hh, h := 0.5*s, s
	id := mustAdd(t, w, BodyDef{Name: "cube", Shape: shapes.Box{Half: shapes.Vec3{hh, hh, hh}}, Density: rho, Material: mat, Position: shapes.Vec3{0, 0, hh + h}})
	return nthApex(t, w, id, dt, hh, h, e, 1)
}

// inclineSlide: a cube of size s/2 sliding from rest down a 30 degree
// incline with mu 0.2 for sqrt(s) seconds; its travel over the analytic.
func inclineSlide(t *testing.T, s, rho, dt float64) float64 {
	th, mu := mgl64.DegToRad(30), 0.2
	w, mat := scaleWorld(t, th, mu, 0)
	hh := 0.25 * s
	id := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{hh, hh, hh}}, Density: rho, Material: mat, Position: shapes.Vec3{0, 0, hh}})
	T := math.Sqrt(s)
	n := int(math.Round(T / dt))
	for i := 0; i < n; i++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
	}
	// Semi-implicit Euler, which the engine integrates with, moves a body
	// under a constant acceleration by a dt^2 n(n+1)/2 in n steps, one step
	// ahead of a t^2/2 (Hairer, Lubich and Wanner, "Geometric Numerical
	// Integration", 2006, symplectic Euler): the time in steps is taken as
	// t (t + dt), which is a t^2/2 as the step shrinks.
	tt := float64(n) * dt
	return w.Position(id)[0] / (g0 * tt * (tt + dt) * (math.Sin(th) - mu*math.Cos(th)) / 2)
}

// slideToStop: a cube of size s on a level floor, launched at
// 0.5 sqrt(g s) with mu 0.3 (static 0.5); its travel to rest over
// v0^2/(2 mu g), less the integrator's half step.
func slideToStop(t *testing.T, s, rho, dt float64) float64 {
	w, mat := floorWorld(t, Config{}, 0, Material{Friction: 0.3, StaticFriction: 0.5})
	hh, v0 := 0.5*s, 0.5*math.Sqrt(g0*s)
	id := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{hh, hh, hh}}, Density: rho, Material: mat,
		Position: shapes.Vec3{0, 0, hh}, Velocity: shapes.Vec3{v0, 0, 0}})
	run(t, w, dt, 2*v0/(0.3*g0), nil)
	// Semi-implicit Euler moves each step at the step's end velocity, so
	// under a constant deceleration a body stops v0 dt/2 short of
	// v0^2/(2a) (the sum of the integrator's steps; Hairer, Lubich and
	// Wanner, "Geometric Numerical Integration", 2006, symplectic Euler).
	return w.Position(id)[0] / (v0*v0/(2*0.3*g0) - v0*dt/2)
}

// rollingSpeed: a ball of radius s/2 launched sliding without spin at
// 0.5 sqrt(g s), mu 0.2; its speed once rolling over 5 v0/7.
func rollingSpeed(t *testing.T, s, rho, dt float64) float64 {
	w, mat := scaleWorld(t, 0, 0.2, 0)
	r, v0 := 0.5*s, 0.5*math.Sqrt(g0*s)
	id := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: rho, Material: mat,
		Position: shapes.Vec3{0, 0, r}, Velocity: shapes.Vec3{v0, 0, 0}})
	run(t, w, dt, 2*2*v0/(7*0.2*g0), nil)
	return w.Velocity(id)[0] / (5 * v0 / 7)
}

// rollingOn: a ball of radius s/2 rolling without slip on a level floor
// (mu 0.5) at 0.04 sqrt(g s) for sqrt(s) s (1 s at size 1, scaled as the
// times); its speed then over its initial speed.
func rollingOn(t *testing.T, s, rho, dt float64) float64 {
	w, mat := scaleWorld(t, 0, 0.5, 0)
	r, v := 0.5*s, 0.04*math.Sqrt(g0*s)
	id := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: rho, Material: mat,
		Position: shapes.Vec3{0, 0, r}, Velocity: shapes.Vec3{v, 0, 0}, Spin: shapes.Vec3{0, v / r, 0}})
	run(t, w, dt, math.Sqrt(s), nil)
	return w.Velocity(id)[0] / v
}

// cylinderRolls: a cylinder of radius 0.3 s rolling from rest down a 20
// degree incline (mu 0.5) for sqrt(s) s; its travel over the analytic,
// with t^2 as the integrator takes it (inclineSlide).
func cylinderRolls(t *testing.T, s, rho, dt float64) float64 {
	th := mgl64.DegToRad(20)
	w, mat := scaleWorld(t, th, 0.5, 0)
	r := 0.3 * s
	id := mustAdd(t, w, BodyDef{Name: "roller", Shape: shapes.Cylinder{Radius: r, HalfLength: 0.4 * s}, Density: rho, Material: mat,
		Position: shapes.Vec3{0, 0, r}, Orientation: mgl64.QuatRotate(math.Pi/2, shapes.Vec3{1, 0, 0})})
	n := int(math.Round(math.Sqrt(s) / dt))
	run(t, w, dt, float64(n)*dt, nil)
	tt := float64(n) * dt
	return w.Position(id)[0] / (2.0 / 3 * g0 * math.Sin(th) * tt * (tt + dt) / 2)
}

// pendulumPeriod: a ball of radius s/10 on a revolute joint at 1 s from
// its centre, let go at 40 degrees; its period over the analytic one.
func pendulumPeriod(t *testing.T, s, rho, dt float64) float64 {
	w := newTestWorld(t, DefaultConfig())
	r, d, a := 0.1*s, s, mgl64.DegToRad(40)
	id := mustAdd(t, w, BodyDef{Name: "bob", Shape: shapes.Sphere{Radius: r}, Density: rho, Position: shapes.Vec3{d * math.Sin(a), 0, -d * math.Cos(a)}})
	if _, err := w.AddJoint(JointDef{Name: "pin", Kind: Revolute, A: id, B: Ground, Axis: shapes.Vec3{0, 1, 0}}); err != nil {
		t.Fatal(err)
	}
	// I about the pin: 2/5 m r^2 + m d^2 (parallel axes); T0 = 2 pi sqrt(I/(m g d)).
	T0 := 2 * math.Pi * math.Sqrt((0.4*r*r+d*d)/(g0*d))
	want := 2 / math.Pi * T0 * mathext.CompleteK(math.Pow(math.Sin(a/2), 2))
	var cross []float64
	prevX := w.Position(id)[0]
	for i := 0; float64(i)*dt < 2.2*want; i++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		x := w.Position(id)[0]
		if prevX > 0 && x <= 0 || prevX < 0 && x >= 0 {
			// Linear interpolation of the zero crossing.
			cross = append(cross, w.Time()-dt*x/(x-prevX))
		}
		prevX = x
	}
	if len(cross) < 3 {
		return math.NaN()
	}
	return (cross[2] - cross[0]) / want
}

// atAngle is the scaling case run of f at the angle deg (degrees).
func atAngle(f func(t *testing.T, s, rho, dt, deg float64) float64, deg float64) func(t *testing.T, s, rho, dt float64) float64 {
	return func(t *testing.T, s, rho, dt float64) float64 { return f(t, s, rho, dt, deg) }
}

// boxFaceAfterTilt stands a box of 1 x 0.6 x 0.4 sizes turned by deg about
// x on its lowest edge, e = 0, and returns 0 if it comes back to rest on
// its face -z, 1 on a face +-y, 2 otherwise.
func boxFaceAfterTilt(t *testing.T, s, rho, dt, deg float64) float64 {
	w, mat := scaleWorld(t, 0, 0.8, 0)
	half := shapes.Vec3{0.5 * s, 0.3 * s, 0.2 * s}
	a := mgl64.DegToRad(deg)
	q := mgl64.QuatRotate(a, shapes.Vec3{1, 0, 0})
	// Lowest point: the corner at (y, z) = (-0.3, -0.2) turned by a; z of a
	// point (y, z) turned about x is y sin a + z cos a.
	low := math.Min(-half[1]*math.Sin(a)-half[2]*math.Cos(a), half[1]*math.Sin(a)-half[2]*math.Cos(a))
	id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: half}, Density: rho, Material: mat, Orientation: q, Position: shapes.Vec3{0, 0, -low + 1e-3*s}})
	settle(t, w, dt, 6*math.Sqrt(s)+2*DefaultRestTime)
	down := w.Orientation(id).Conjugate().Rotate(shapes.Vec3{0, 0, -1})
	switch {
	case down[2] < -0.999:
		return 0
	case math.Abs(down[1]) > 0.999:
		return 1
	}
	return 2
}

// cylinderAfterTilt stands a cylinder of radius 0.3 s and length s turned
// by deg on its rim; 0 if it comes back onto its end, 1 if it lies on its
// side, 2 otherwise.
func cylinderAfterTilt(t *testing.T, s, rho, dt, deg float64) float64 {
	w, mat := scaleWorld(t, 0, 0.8, 0)
	r, hl := 0.3*s, 0.5*s
	a := mgl64.DegToRad(deg)
	q := mgl64.QuatRotate(a, shapes.Vec3{1, 0, 0})
	low := -r*math.Sin(a) - hl*math.Cos(a)
	id := mustAdd(t, w, BodyDef{Name: "can", Shape: shapes.Cylinder{Radius: r, HalfLength: hl}, Density: rho, Material: mat, Orientation: q, Position: shapes.Vec3{0, 0, -low + 1e-3*s}})
	settle(t, w, dt, 6*math.Sqrt(s)+2*DefaultRestTime)
	axis := w.Orientation(id).Rotate(shapes.Vec3{0, 0, 1})
	switch {
	case math.Abs(axis[2]) > 0.999:
		return 0
	case math.Abs(axis[2]) < 0.001:
		return 1
	}
	return 2
}

// blockTipsOnIncline sets a block of base 0.5 s and height s down on an
// incline of deg with friction 1.5 (it cannot slide below 56 deg) and
// returns 1 if it tipped over (turned more than 10 degrees), else 0.
func blockTipsOnIncline(t *testing.T, s, rho, dt, deg float64) float64 {
	th := mgl64.DegToRad(deg)
	w, mat := scaleWorld(t, th, 1.5, 0)
	half := shapes.Vec3{0.25 * s, 0.25 * s, 0.5 * s}
	id := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: half}, Density: rho, Material: mat, Position: shapes.Vec3{0, 0, half[2]}})
	run(t, w, dt, 3*math.Sqrt(s), nil)
	up := w.Orientation(id).Rotate(shapes.Vec3{0, 0, 1})
	if up[2] < math.Cos(mgl64.DegToRad(10)) {
		return 1
	}
	return 0
}

// settle steps until the world has settled or the time is up.
func settle(t *testing.T, w *World, dt, seconds float64) {
	t.Helper()
	for i := 0; float64(i)*dt < seconds; i++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		if ok, _ := w.Settled(); ok {
			return
		}
	}
}

// cubeSink drops a cube of size s from 0.1 s and returns how deep it rests
// in the floor over its size.
func cubeSink(t *testing.T, s, rho, dt float64) float64 {
	w, mat := scaleWorld(t, 0, 0.5, 0)
	hh := 0.5 * s
	id := mustAdd(t, w, BodyDef{Name: "cube", Shape: shapes.Box{Half: shapes.Vec3{hh, hh, hh}}, Density: rho, Material: mat, Position: shapes.Vec3{0, 0, hh + 0.1*s}})
	settle(t, w, dt, 3*math.Sqrt(s)+2*DefaultRestTime)
	if ok, _ := w.Settled(); !ok {
		t.Logf("s %g rho %g: cube not settled", s, rho)
	}
	return (hh - w.Position(id)[2]) / s
}

// stack sets 4 cubes of size s on each other, 1 percent apart, and lets
// them settle; it returns the world and the ids bottom first.
func stack(t *testing.T, s, rho, dt float64) (*World, []BodyID) {
	w, mat := scaleWorld(t, 0, 0.5, 0)
	hh := 0.5 * s
	var ids []BodyID
	for i := 0; i < 4; i++ {
		ids = append(ids, mustAdd(t, w, BodyDef{Name: fmt.Sprint("cube", i), Shape: shapes.Box{Half: shapes.Vec3{hh, hh, hh}}, Density: rho, Material: mat,
			Position: shapes.Vec3{0, 0, hh + float64(i)*1.01*s}}))
	}
	settle(t, w, dt, 5*math.Sqrt(s)+2*DefaultRestTime)
	if ok, _ := w.Settled(); !ok {
		t.Logf("s %g rho %g: stack not settled", s, rho)
	}
	return w, ids
}

func stackDrift(t *testing.T, s, rho, dt float64) float64 {
	w, ids := stack(t, s, rho, dt)
	d := 0.0
	for _, id := range ids {
		p := w.Position(id)
		d = math.Max(d, math.Hypot(p[0], p[1]))
	}
	return d / s
}

func stackSink(t *testing.T, s, rho, dt float64) float64 {
	w, ids := stack(t, s, rho, dt)
	return (3.5*s - w.Position(ids[3])[2]) / s
}

// ballRestTime drops a ball of radius s/2 from s and returns when the
// world settled, less the rest time it waited, over sqrt(s/g).
func ballRestTime(t *testing.T, s, rho, dt, e float64) float64 {
	w, mat := scaleWorld(t, 0, 0.3, e)
	r := 0.5 * s
	mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: rho, Material: mat, Position: shapes.Vec3{0, 0, r + s}})
	return restTime(t, w, s, dt)
}

func restTime(t *testing.T, w *World, s, dt float64) float64 {
	settle(t, w, dt, 20*math.Sqrt(s)+2*DefaultRestTime)
	ok, at := w.Settled()
	if !ok {
		return math.Inf(1)
	}
	return (at - w.Config().RestTime) / math.Sqrt(s/g0)
}

func cubeRestTime(t *testing.T, s, rho, dt float64) float64 {
	w, mat := scaleWorld(t, 0, 0.5, 0)
	hh := 0.5 * s
	mustAdd(t, w, BodyDef{Name: "cube", Shape: shapes.Box{Half: shapes.Vec3{hh, hh, hh}}, Density: rho, Material: mat,
		Position: shapes.Vec3{0, 0, 2 * s}, Orientation: mgl64.QuatRotate(0.7, shapes.Vec3{1, 2, 0}.Normalize())})
	return restTime(t, w, s, dt)
}

// scaleModes are the two ways the probe picks the step: scaled with the
// times, where the scaled case is the same case exactly and every result
// must match the one at size factor 1; and the scene's default of 1 ms at
// every size, as a user would run it, where only the analytic values are
// checked (a 1 mm part's fall then lasts a few dozen steps).
var scaleModes = []struct {
	name   string
	step   func(s float64) float64
	spread bool
}{
	{"step scaled", func(s float64) float64 { return scaleStep * math.Sqrt(s) }, true},
	{"step 1 ms", func(float64) float64 { return 1e-3 }, false},
}

// TestScaleProbe runs every case at every size factor and density, in
// both step modes, and checks each result against its analytic value and,
// with the step scaled, against the result at size factor 1.
func TestScaleProbe(t *testing.T) {
	if testing.Short() {
		t.Skip("the scaling probe runs some 500 simulations")
	}
	for _, m := range scaleModes {
		for _, c := range append(scaleCases(), scaleRatios()...) {
			t.Run(m.name+"/"+c.name, func(t *testing.T) {
				ref := c.run(t, 1, scaleDensities[0], scaleStep)
				for _, s := range scaleFactors {
					dt := m.step(s)
					for _, rho := range scaleDensities {
						got := c.run(t, s, rho, dt)
						t.Logf("size %-6g density %-5g: %.6g (at size 1: %.6g)", s, rho, got, ref)
						if !c.ratio && !(scaleErr(got, c.want) <= c.tol) {
							t.Errorf("size %g, density %g, step %.3g s: %.6g, want %.6g within %g (%s)", s, rho, dt, got, c.want, c.tol, c.ref)
						}
						if m.spread && !(c.spreadErr(got, ref) <= c.spread) {
							t.Errorf("size %g, density %g, step %.3g s: %.6g, at size 1 %.6g: differs by more than %g", s, rho, dt, got, ref, c.spread)
						}
					}
				}
			})
		}
	}
}

// spreadErr is how far got is from ref, the result at size factor 1:
// relative, or absolute for a result whose analytic value is 0.
func (c scaleCase) spreadErr(got, ref float64) float64 {
	if c.want == 0 && !c.ratio {
		return math.Abs(got - ref)
	}
	return scaleErr(got, ref)
}

// scaleErr is the relative error of got against want, or the absolute one
// for a want of 0 (a face index, a sink, a drift).
func scaleErr(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}
