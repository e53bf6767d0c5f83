package verify

import (
	"errors"
	"fmt"
	"math"

	"clatter/engine"
	"clatter/shapes"
	"clatter/shapes/mesh"
	"clatter/shapes/resting"

	"github.com/go-gl/mathgl/mgl64"
)

// g is standard gravity, 9.80665 m/s^2 (CGPM 1901).
const g = engine.StandardGravity

// dt is the step of the simulated cases; bounce and drop cases use a
// finer one where the check needs the contact moment resolved.
const dt = 1e-3

// Cases returns the analytic cases in the order `clatter verify` prints them.
func Cases() []Case {
	var cs []Case
	for _, group := range [][]Case{motionCases(), rigidBodyCases(), mechanismCases(), packagingCases(), feederCases(), twistCases()} {
		cs = append(cs, group...)
	}
	return cs
}

// motionCases are the cases of one body falling, sliding, bouncing and
// rolling.
func motionCases() []Case {
	return []Case{
		{
			Name: "free fall, 1 s from rest", Unit: "m",
			Reference: "drop d = g t^2 / 2", Source: "uniform acceleration (Galileo; any mechanics text)",
			Relative: true, Tolerance: 2e-3,
			Why: "semi-implicit Euler falls g t dt / 2 further than the exact curve: 1e-3 relative at a 1 ms step",
			Run: freeFall,
		},
		{
			Name: "block slides down a 30 deg incline, mu_k 0.2", Unit: "m/s2",
			Reference: "a = g (sin theta - mu_k cos theta)", Source: "Coulomb friction (any dynamics text, e.g. Halliday, Resnick and Walker)",
			Relative: true, Tolerance: 0.01,
			Why: "the integrator is exact for constant acceleration; the rest is the accuracy of the friction cone, about 0.1 percent",
			Run: inclineSlide,
		},
		{
			Name: "block stays on a 20 deg incline, mu_s 0.45 > tan 20", Unit: "m",
			Reference: "no sliding while tan theta <= mu_s", Source: "Coulomb's law of static friction (any dynamics text)",
			Tolerance: 0.5e-3,
			Why:       "creep over 1 s: contact slop and solver iterations let a sticking block drift by well under 0.5 mm",
			Run:       inclineStick,
		},
		{
			Name: "block slides to a stop from 2 m/s, mu_k 0.3", Unit: "m",
			Reference: "d = v0^2 / (2 mu_k g)", Source: "Coulomb friction (any dynamics text)",
			Relative: true, Tolerance: 0.02,
			Why: "the stopping step adds up to v0 dt (0.3 percent) and the first contact steps a little more",
			Run: slideToStop,
		},
		{
			Name: "block slides to a stop: stopping time", Unit: "s",
			Reference: "t = v0 / (mu_k g)", Source: "Coulomb friction (any dynamics text)",
			Relative: true, Tolerance: 0.02,
			Why: "the moment of stopping is resolved to one 1 ms step of 0.68 s, plus the first contact steps",
			Run: stopTime,
		},
		{
			Name: "ball bounces from 1 m, e = 0.8", Unit: "m",
			Reference: "first rebound height e^2 h", Source: "Newton's law of restitution (any dynamics text)",
			Relative: true, Tolerance: 0.03,
			Why: "at a 0.5 ms step the moment of contact is found within v dt of the surface, about 0.3 percent; apex sampling adds less",
			Run: bounce,
		},
		{
			Name: "sphere launched sliding at 3 m/s, mu_k 0.2", Unit: "m/s",
			Reference: "rolls without slipping at 5 v0 / 7", Source: "Halliday, Resnick and Walker, Fundamentals of Physics (rolling with friction)",
			Relative: true, Tolerance: 0.02,
			Why: "friction impulses per step and the moment slip ends are resolved to one step",
			Run: sphereRolls,
		},
		{
			Name: "cylinder rolls down a 20 deg incline", Unit: "m/s2",
			Reference: "a = (2/3) g sin theta", Source: "rolling without slipping, mu_s >= tan theta / 3 (any dynamics text)",
			Relative: true, Tolerance: 0.02,
			Why: "one contact line of an exact cylinder: sticking friction resolved by the iterative solver to about a percent",
			Run: cylinderRolls,
		},
	}
}

// rigidBodyCases are the cases of impacts in a row, tipping and sliding on
// a tilt table, torque-free rotation, mass properties, resting faces, and
// a scene file read in other units.
func rigidBodyCases() []Case {
	return []Case{
		{
			Name: "Newton's cradle, 1 of 5 balls strikes, e = 1", Unit: "m/s",
			Reference: "the last ball leaves at the striking speed, the rest at rest", Source: "momentum and energy conservation; impacts in sequence (Guendelman, Bridson and Fedkiw 2003)",
			Tolerance: 0.02,
			Why:       "worst velocity of any ball: pairwise impact processing is exact up to the solver's iteration count, 2 percent of the striking speed",
			Run:       cradle,
		},
		{
			Name: "tilt table tips a block of b/h = 0.5, mu_s 0.8", Unit: "deg",
			Reference: "tips at atan(b/h) = 26.57 deg (mu_s > b/h)", Source: "statics of a rigid block on an incline",
			Tolerance: 0.5,
			Why:       "tilting at 2 deg/s, the turn that marks the tip is reached within a few hundredths of a degree past the threshold",
			Run:       tiltTip,
		},
		{
			Name: "tilt table slides a block of b/h = 0.5, mu_s 0.3", Unit: "deg",
			Reference: "slides at atan(mu_s) = 16.70 deg (mu_s < b/h)", Source: "statics of a rigid block on an incline; Coulomb friction",
			Tolerance: 0.5,
			Why:       "tilting at 2 deg/s, the 0.1 mm of travel that marks sliding is reached within a few hundredths of a degree past the threshold",
			Run:       tiltSlide,
		},
		{
			Name: "spinning box without torque", Unit: "kg m2/s",
			Reference: "angular momentum constant", Source: "Euler's equations of a torque-free body (Landau and Lifshitz, Mechanics, section 37)",
			Relative: true, Tolerance: 1e-6,
			Why: "the free-rotation splitting conserves the angular momentum vector up to rounding; 1e-6 over 2 s is far above it",
			Run: torqueFree,
		},
		{
			Name: "mass properties of a box mesh 0.1 x 0.2 x 0.3 m", Unit: "kg m2",
			Reference: "I_x = m (b^2 + c^2) / 12", Source: "solid rectangular block (any dynamics or strength-of-materials handbook)",
			Relative: true, Tolerance: 1e-9,
			Why: "the polyhedral integrals are exact for a box; only rounding remains",
			Run: boxInertia,
		},
		{
			Name: "cube rests on each face with probability 1/6", Unit: "",
			Reference: "solid angle of a face seen from the centre / 4 pi = 1/6", Source: "capture regions of Wiegley, Rao and Goldberg (1992); symmetry",
			Tolerance: 1e-9,
			Why:       "worst face; the solid angles are exact, only rounding remains",
			Run:       cubeProbability,
		},
		{
			Name: "cube tips over an edge at 45 deg", Unit: "deg",
			Reference: "tip angle atan(b/h) = 45 deg", Source: "statics of a rigid block",
			Tolerance: 1e-9,
			Why:       "exact geometry; only rounding remains",
			Run:       cubeTip,
		},
		{
			Name: "scene file in mm and g: slide to a stop", Unit: "mm",
			Reference: "d = v0^2 / (2 mu_k g) = 679.8 mm", Source: "Coulomb friction (any dynamics text); through the scene reader and summary writer",
			Relative: true, Tolerance: 0.02,
			Why: "as the SI case: the stopping step and first contact; unit conversion adds only rounding",
			Run: sceneSlide,
		},
	}
}

// floorWorld returns a world with a static floor z = 0 of material m, and
// gravity tilted by theta about y so that the floor is an incline falling
// toward +x.
func floorWorld(cfg engine.Config, theta float64, m engine.Material) (*engine.World, int, error) {
	cfg.Gravity = shapes.Vec3{g * math.Sin(theta), 0, -g * math.Cos(theta)}
	w, err := engine.NewWorld(cfg)
	if err != nil {
		return nil, 0, err
	}
	mat, err := w.AddMaterial(m)
	if err != nil {
		return nil, 0, err
	}
	_, err = w.AddBody(engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat})
	return w, mat, err
}

// steps advances w by n steps of h, calling each after every step.
func steps(w *engine.World, h float64, n int, each func()) error {
	for i := 0; i < n; i++ {
		if err := w.Step(h); err != nil {
			return err
		}
		if each != nil {
			each()
		}
	}
	return nil
}

func seconds(t, h float64) int { return int(math.Round(t / h)) }

func freeFall() (float64, float64, float64, error) {
	w, err := engine.NewWorld(engine.DefaultConfig())
	if err != nil {
		return 0, 0, 0, err
	}
	z0 := 10.0
	id, err := w.AddBody(engine.BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000, Position: shapes.Vec3{0, 0, z0}})
	if err != nil {
		return 0, 0, 0, err
	}
	err = steps(w, dt, seconds(1, dt), nil)
	return g / 2, z0 - w.Position(id)[2], math.NaN(), err
}

// block returns a world with a 0.1 m cube of water's density resting on
// the floor of floorWorld(DefaultConfig(), theta, m), moving at v.
func block(theta float64, m engine.Material, v shapes.Vec3) (*engine.World, engine.BodyID, error) {
	w, mat, err := floorWorld(engine.DefaultConfig(), theta, m)
	if err != nil {
		return nil, 0, err
	}
	half := shapes.Vec3{0.05, 0.05, 0.05}
	id, err := w.AddBody(engine.BodyDef{Name: "block", Shape: shapes.Box{Half: half}, Density: 1000, Material: mat,
		Position: shapes.Vec3{0, 0, half[2]}, Velocity: v})
	return w, id, err
}

func inclineSlide() (float64, float64, float64, error) {
	th, mu := mgl64.DegToRad(30), 0.2
	w, id, err := block(th, engine.Material{Friction: mu}, shapes.Vec3{})
	if err != nil {
		return 0, 0, 0, err
	}
	if err := steps(w, dt, seconds(0.2, dt), nil); err != nil { // let the contact form
		return 0, 0, 0, err
	}
	v0 := w.Velocity(id)[0]
	err = steps(w, dt, seconds(1, dt), nil)
	return g * (math.Sin(th) - mu*math.Cos(th)), w.Velocity(id)[0] - v0, math.NaN(), err
}

func inclineStick() (float64, float64, float64, error) {
	th := mgl64.DegToRad(20)
	w, id, err := block(th, engine.Material{Friction: 0.3, StaticFriction: 0.45}, shapes.Vec3{})
	if err != nil {
		return 0, 0, 0, err
	}
	x0 := w.Position(id)[0]
	err = steps(w, dt, seconds(1, dt), nil)
	return 0, math.Abs(w.Position(id)[0] - x0), math.NaN(), err
}

func slideToStop() (float64, float64, float64, error) {
	v0, mu := 2.0, 0.3
	w, id, err := block(0, engine.Material{Friction: mu}, shapes.Vec3{v0, 0, 0})
	if err != nil {
		return 0, 0, 0, err
	}
	err = steps(w, dt, seconds(v0/(mu*g)+0.3, dt), nil)
	return v0 * v0 / (2 * mu * g), w.Position(id)[0], math.NaN(), err
}

func stopTime() (float64, float64, float64, error) {
	v0, mu := 2.0, 0.3
	w, id, err := block(0, engine.Material{Friction: mu}, shapes.Vec3{v0, 0, 0})
	if err != nil {
		return 0, 0, 0, err
	}
	stop := math.NaN()
	err = steps(w, dt, seconds(v0/(mu*g)+0.3, dt), func() {
		if math.IsNaN(stop) && w.Velocity(id)[0] < 1e-3 {
			stop = w.Time()
		}
	})
	return v0 / (mu * g), stop, math.NaN(), err
}

func bounce() (float64, float64, float64, error) {
	const h, e, r, fine = 1.0, 0.8, 0.02, 5e-4
	w, mat, err := floorWorld(engine.DefaultConfig(), 0, engine.Material{Friction: 0.3, Restitution: e})
	if err != nil {
		return 0, 0, 0, err
	}
	id, err := w.AddBody(engine.BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: 1000, Material: mat, Position: shapes.Vec3{0, 0, r + h}})
	if err != nil {
		return 0, 0, 0, err
	}
	apex := math.NaN()
	prev := 0.0
	err = steps(w, fine, seconds(1.3, fine), func() {
		v := w.Velocity(id)[2]
		if prev > 0 && v <= 0 && math.IsNaN(apex) {
			apex = w.Position(id)[2] - r
		}
		prev = v
	})
	if err == nil && math.IsNaN(apex) {
		err = errors.New("the ball did not rebound")
	}
	return e * e * h, apex, math.NaN(), err
}

func sphereRolls() (float64, float64, float64, error) {
	v0, mu, r := 3.0, 0.2, 0.03
	w, mat, err := floorWorld(engine.DefaultConfig(), 0, engine.Material{Friction: mu})
	if err != nil {
		return 0, 0, 0, err
	}
	id, err := w.AddBody(engine.BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: 1000, Material: mat,
		Position: shapes.Vec3{0, 0, r}, Velocity: shapes.Vec3{v0, 0, 0}})
	if err != nil {
		return 0, 0, 0, err
	}
	// Slipping ends at 2 v0 / (7 mu g) = 0.44 s; run past it.
	err = steps(w, dt, seconds(0.8, dt), nil)
	return 5 * v0 / 7, w.Velocity(id)[0], math.NaN(), err
}

func cylinderRolls() (float64, float64, float64, error) {
	th, r := mgl64.DegToRad(20), 0.03
	w, mat, err := floorWorld(engine.DefaultConfig(), th, engine.Material{Friction: 0.5})
	if err != nil {
		return 0, 0, 0, err
	}
	q := mgl64.QuatRotate(math.Pi/2, shapes.Vec3{1, 0, 0}) // axis along y
	id, err := w.AddBody(engine.BodyDef{Name: "roller", Shape: shapes.Cylinder{Radius: r, HalfLength: 0.04}, Density: 1000, Material: mat,
		Position: shapes.Vec3{0, 0, r}, Orientation: q})
	if err != nil {
		return 0, 0, 0, err
	}
	if err := steps(w, dt, seconds(0.1, dt), nil); err != nil {
		return 0, 0, 0, err
	}
	v0 := w.Velocity(id)[0]
	err = steps(w, dt, seconds(1, dt), nil)
	return 2.0 / 3 * g * math.Sin(th), w.Velocity(id)[0] - v0, math.NaN(), err
}

func cradle() (float64, float64, float64, error) {
	const v, r = 1.0, 0.02
	w, err := engine.NewWorld(engine.Config{NoSleep: true})
	if err != nil {
		return 0, 0, 0, err
	}
	mat, err := w.AddMaterial(engine.Material{Restitution: 1})
	if err != nil {
		return 0, 0, 0, err
	}
	ids := make([]engine.BodyID, 5)
	for i := range ids {
		var vel shapes.Vec3
		if i == 0 {
			vel[0] = v
		}
		ids[i], err = w.AddBody(engine.BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: 7800, Material: mat,
			Position: shapes.Vec3{2 * r * float64(i), 0, 0}, Velocity: vel})
		if err != nil {
			return 0, 0, 0, err
		}
	}
	if err := steps(w, dt, seconds(0.02, dt), nil); err != nil {
		return 0, 0, 0, err
	}
	dev := 0.0
	for i, id := range ids {
		want := 0.0
		if i == len(ids)-1 {
			want = v
		}
		dev = math.Max(dev, w.Velocity(id).Sub(shapes.Vec3{want, 0, 0}).Len())
	}
	return v, w.Velocity(ids[4])[0], dev, nil
}

// tiltTable tilts gravity about y under a block of base width b (along x)
// and height h at 2 deg/s and returns the tilt in degrees at which it first
// tips (turns by more than tipTurn) or slides (moves more than slideDist
// along the support), and which.
func tiltTable(b, h, mu float64) (float64, string, error) {
	const (
		tipTurn   = 1e-3 // rad of turn: clearly tipping
		slideDist = 1e-4 // m of travel along the support: clearly sliding
		rate      = 2.0  // deg/s of tilt
	)
	w, mat, err := floorWorld(engine.Config{NoSleep: true}, 0, engine.Material{Friction: mu})
	if err != nil {
		return 0, "", err
	}
	id, err := w.AddBody(engine.BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{b / 2, 0.05, h / 2}}, Density: 500, Material: mat,
		Position: shapes.Vec3{0, 0, h / 2}})
	if err != nil {
		return 0, "", err
	}
	if err := steps(w, dt, seconds(0.2, dt), nil); err != nil {
		return 0, "", err
	}
	x0 := w.Position(id)
	tilt := 0.0
	for n := 0; n < seconds(60/rate, dt); n++ {
		tilt += mgl64.DegToRad(rate) * dt
		if err := w.SetGravity(shapes.Vec3{g * math.Sin(tilt), 0, -g * math.Cos(tilt)}); err != nil {
			return 0, "", err
		}
		if err := w.Step(dt); err != nil {
			return 0, "", err
		}
		q := w.Orientation(id)
		turn := 2 * math.Asin(math.Min(1, q.V.Len()))
		if turn > tipTurn {
			return mgl64.RadToDeg(tilt), "tip", nil
		}
		if d := w.Position(id).Sub(x0); math.Abs(d[0]) > slideDist && turn < tipTurn/10 {
			return mgl64.RadToDeg(tilt), "slide", nil
		}
	}
	return 0, "", errors.New("the block neither tipped nor slid up to 60 degrees")
}

func tiltTip() (float64, float64, float64, error) {
	const b, h, mu = 0.1, 0.2, 0.8
	want := mgl64.RadToDeg(math.Atan(b / h))
	got, how, err := tiltTable(b, h, mu)
	if err == nil && how != "tip" {
		err = fmt.Errorf("the block slid at %.2f deg instead of tipping", got)
	}
	return want, got, math.NaN(), err
}

func tiltSlide() (float64, float64, float64, error) {
	const b, h, mu = 0.1, 0.2, 0.3
	want := mgl64.RadToDeg(math.Atan(mu))
	got, how, err := tiltTable(b, h, mu)
	if err == nil && how != "slide" {
		err = fmt.Errorf("the block tipped at %.2f deg instead of sliding", got)
	}
	return want, got, math.NaN(), err
}

func torqueFree() (float64, float64, float64, error) {
	w, err := engine.NewWorld(engine.Config{NoSleep: true})
	if err != nil {
		return 0, 0, 0, err
	}
	id, err := w.AddBody(engine.BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.03, 0.01}}, Density: 1000,
		Spin: shapes.Vec3{0.1, 20, 0.3}})
	if err != nil {
		return 0, 0, 0, err
	}
	_ = id
	l0 := w.AngularMomentum(shapes.Vec3{})
	if err := steps(w, dt, seconds(2, dt), nil); err != nil {
		return 0, 0, 0, err
	}
	l1 := w.AngularMomentum(shapes.Vec3{})
	return l0.Len(), l1.Len(), l1.Sub(l0).Len() / l0.Len(), nil
}

// boxMesh is a closed box of full edges e, triangles facing outward.
func boxMesh(e shapes.Vec3) (*mesh.Mesh, error) {
	var v []shapes.Vec3
	for i := 0; i < 8; i++ {
		v = append(v, shapes.Vec3{float64(i&1) * e[0], float64(i>>1&1) * e[1], float64(i>>2&1) * e[2]})
	}
	quads := [][4]int32{{0, 2, 3, 1}, {4, 5, 7, 6}, {0, 1, 5, 4}, {2, 6, 7, 3}, {0, 4, 6, 2}, {1, 3, 7, 5}}
	var tris [][3]int32
	for _, q := range quads {
		tris = append(tris, [3]int32{q[0], q[1], q[2]}, [3]int32{q[0], q[2], q[3]})
	}
	return mesh.FromIndexed("box", v, tris)
}

func boxInertia() (float64, float64, float64, error) {
	e := shapes.Vec3{0.1, 0.2, 0.3}
	m, err := boxMesh(e)
	if err != nil {
		return 0, 0, 0, err
	}
	part, err := mesh.NewPart(m)
	if err != nil {
		return 0, 0, 0, err
	}
	if !part.Solid {
		return 0, 0, 0, errors.New("the box mesh was not taken as a solid")
	}
	mp := part.Mass(1000)
	mass := 1000 * e[0] * e[1] * e[2]
	return mass * (e[1]*e[1] + e[2]*e[2]) / 12, mp.Inertia.At(0, 0), math.NaN(), nil
}

func cubeProbability() (float64, float64, float64, error) {
	return cubeWorst(1.0/6, func(f resting.Face) float64 { return f.Probability })
}

func cubeTip() (float64, float64, float64, error) {
	return cubeWorst(45, func(f resting.Face) float64 { return mgl64.RadToDeg(f.TipAngleRad) })
}

// cubeWorst returns want and the value of the cube's resting face farthest
// from it, with its deviation.
func cubeWorst(want float64, value func(resting.Face) float64) (float64, float64, float64, error) {
	faces, err := resting.OfShape(shapes.Box{Half: shapes.Vec3{1, 1, 1}}, shapes.Vec3{})
	if err != nil {
		return 0, 0, 0, err
	}
	if len(faces) != 6 {
		return 0, 0, 0, errors.New("a cube should have 6 faces")
	}
	dev, worst := 0.0, 0.0
	for _, f := range faces {
		v := value(f)
		if d := math.Abs(v - want); d >= dev {
			dev, worst = d, v
		}
	}
	return want, worst, dev, nil
}

// slideScene is the scene-file case: a steel block of 50 mm sliding on a
// floor at 2 m/s, given in mm and g with quantities in other units too.
const slideScene = `units = { length = "mm", mass = "g" }
[world]
step = 0.001
duration = 1.5
[material.steel]
friction = 0.3
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "steel"
[[body]]
name = "block"
shape = { box = ["5 cm", 50, 50] }
material = "steel"
density = "7800 kg/m3"
position = [0, 0, 25]
velocity = ["2 m/s", 0, 0]
`

func sceneSlide() (float64, float64, float64, error) {
	sum, err := runScene(slideScene, "verify-slide.toml")
	if err != nil {
		return 0, 0, 0, err
	}
	const v0, mu = 2000.0, 0.3 // mm/s
	gmm := g * 1000            // mm/s^2
	return v0 * v0 / (2 * mu * gmm), sum.Bodies[0].Position[0], math.NaN(), nil
}
