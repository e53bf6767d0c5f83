package engine

import (
	"math"
	"strings"
	"testing"

	"github.com/go-gl/mathgl/mgl64"

	"clatter/shapes"
)

// cushionDrop is a box landing flat on a floor whose material has a
// stiffness. It returns the world and the box.
type cushionDrop struct {
	k, e, m     float64 // linear stiffness N/m, restitution, mass kg
	hertz       *Stiffness
	gravity     float64 // m/s^2 downward (0: none)
	gap, v0     float64 // start gap m and downward speed m/s
	shape       shapes.Shape
	bottom      float64 // centre of mass above the lowest point
	orientation shapes.Quat
}

func (c cushionDrop) world(t *testing.T) (*World, BodyID) {
	t.Helper()
	w, err := NewWorld(Config{Gravity: shapes.Vec3{0, 0, -c.gravity}, NoSleep: true})
	if err != nil {
		t.Fatal(err)
	}
	st := Stiffness{Linear: c.k}
	if c.hertz != nil {
		st = *c.hertz
	}
	mat, err := w.AddMaterial(Material{Name: "cushion", Friction: 0.5, Restitution: c.e, Stiffness: st})
	if err != nil {
		t.Fatal(err)
	}
	// The load is of a rigid material; the pair's restitution is the case's.
	load, err := w.AddMaterial(Material{Name: "load", Friction: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	if err := w.SetPair(mat, load, PairCoefficients{Friction: 0.5, Restitution: c.e}); err != nil {
		t.Fatal(err)
	}
	if _, err := w.AddBody(BodyDef{Name: "floor", Kind: Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat}); err != nil {
		t.Fatal(err)
	}
	shape, bottom := c.shape, c.bottom
	if shape == nil {
		// Thick enough that the indentations of the cases below stay well
		// within it, as a cushion's do.
		shape, bottom = shapes.Box{Half: shapes.Vec3{0.2, 0.15, 0.15}}, 0.15
	}
	// The load is of the default, rigid material: the cushion's stiffness
	// alone acts (two cushions would be springs in series).
	id, err := w.AddBody(BodyDef{Name: "load", Kind: Dynamic, Shape: shape, Mass: c.m, Material: load,
		Position: shapes.Vec3{0, 0, bottom + c.gap}, Orientation: c.orientation, Velocity: shapes.Vec3{0, 0, -c.v0}})
	if err != nil {
		t.Fatal(err)
	}
	return w, id
}

// firstImpact steps until the first compliant impact event and returns it
// with the body's upward speed at the moment it leaves the floor.
func firstImpact(t *testing.T, w *World, id BodyID, dt, bottom float64) (Event, float64) {
	t.Helper()
	var hit *Event
	for i := 0; i < 200000; i++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		for _, e := range w.Events() {
			if e.Kind == Impact && hit == nil {
				e := e
				hit = &e
			}
		}
		if hit != nil && w.Velocity(id)[2] > 0 && w.Position(id)[2] > bottom && !w.softActive() {
			// After a step of free flight the velocity is the step end's
			// (flight.go); after a step the cushion pushed, it drove the
			// step and is half a step back (kick then drift), so move it to
			// the step's end. Free flight is then exact:
			// v_sep^2 = v^2 + 2 g gap.
			g := -w.Config().Gravity[2]
			v := w.Velocity(id)[2]
			if !w.inFlight(int(id)) {
				v -= g * dt / 2
			}
			gap := w.Position(id)[2] - bottom
			return *hit, math.Sqrt(v*v + 2*g*gap)
		}
	}
	t.Fatal("no impact")
	return Event{}, 0
}

// mindlinTol: the undamped peak is found at sub-steps of 1/100 of the
// natural period; the integrator's error in the peak is about 0.02 percent
// and reading it at sub-step instants about 0.05 percent (compliant.go), so
// 1 percent, the tolerance, leaves room for the start of contact
// falling between sub-steps.
const mindlinTol = 0.01

// TestMindlinUndampedPeak checks the peak acceleration of a mass dropped
// from h onto an undamped linear cushion: G = 1 + sqrt(1 + 2 k h / (m g))
// (R. D. Mindlin, "Dynamics of package cushioning", Bell System Technical
// Journal 24, 1945, eq. for the linear spring), in units of g, at several
// heights, stiffnesses, masses and coarse and fine steps.
func TestMindlinUndampedPeak(t *testing.T) {
	for _, c := range []struct{ k, m, h, dt float64 }{
		{40e3, 10, 0.76, 1e-3},
		{40e3, 10, 0.3, 1e-3},
		{200e3, 5, 0.5, 4e-3},
		{30e3, 20, 0.3, 1e-2},
		{1e6, 0.5, 0.1, 1e-3},
	} {
		d := cushionDrop{k: c.k, e: 1, m: c.m, gravity: StandardGravity, gap: c.h}
		w, id := d.world(t)
		ev, _ := firstImpact(t, w, id, c.dt, 0.15)
		want := 1 + math.Sqrt(1+2*c.k*c.h/(c.m*StandardGravity))
		t.Logf("k %g, m %g, h %g, step %g: peak %+.3f%%", c.k, c.m, c.h, c.dt, 100*(ev.PeakAcceleration[1]/want-1))
		for name, got := range map[string]float64{"event": ev.PeakAcceleration[1], "summary": w.PeakAcceleration(id)} {
			if math.Abs(got/want-1) > mindlinTol {
				t.Errorf("k %g N/m, m %g kg, h %g m, step %g s: %s peak %.5g g, Mindlin 1945 %.5g g", c.k, c.m, c.h, c.dt, name, got, want)
			}
		}
		if !ev.Compliant || ev.PeakForce <= 0 || ev.Duration <= 0 {
			t.Errorf("event %+v lacks its compliant figures", ev)
		}
	}
}

// dampedOscillator is the closed-form landing of a mass on a linear
// spring-dashpot under gravity: m d” = m g - k d - c d', d(0) = 0,
// d'(0) = v0 (any vibrations text, e.g. Thomson, "Theory of vibration
// with applications", ch. 2). It returns the peak of k d + c d' and the
// rebound speed when d returns to 0.
func dampedOscillator(m, k, zeta, g, v0 float64) (peak, rebound float64) {
	wn := math.Sqrt(k / m)
	wd := wn * math.Sqrt(1-zeta*zeta)
	c := 2 * zeta * math.Sqrt(k*m)
	ds := m * g / k
	a, b := -ds, (v0-zeta*wn*ds)/wd
	d := func(t float64) float64 {
		return ds + math.Exp(-zeta*wn*t)*(a*math.Cos(wd*t)+b*math.Sin(wd*t))
	}
	dd := func(t float64) float64 {
		e := math.Exp(-zeta * wn * t)
		return e * ((b*wd-zeta*wn*a)*math.Cos(wd*t) - (a*wd+zeta*wn*b)*math.Sin(wd*t))
	}
	const n = 200000
	end := 0.0
	for i := 1; i <= n; i++ { // the first return to d = 0, then bisection
		t := float64(i) / n * 2 * math.Pi / wd
		peak = math.Max(peak, k*d(t)+c*dd(t))
		if d(t) < 0 {
			lo, hi := t-2*math.Pi/wd/n, t
			for j := 0; j < 60; j++ {
				if mid := (lo + hi) / 2; d(mid) > 0 {
					lo = mid
				} else {
					hi = mid
				}
			}
			end = lo
			break
		}
	}
	return peak, -dd(end)
}

// dampedTol: as mindlinTol; the dashpot adds what is left of its force's
// jumps at the ends of the contact (compliant.go, linearImpulse), measured
// below 0.6 percent at zeta = 0.69; the issue asks for 1 percent.
const dampedTol = 0.01

// TestDampedCushion checks the peak and the rebound speed of a landing on
// a damped linear cushion against the closed-form damped oscillator, and,
// without gravity, that the rebound recovers the restitution the damping
// was chosen from: zeta = -ln e / sqrt(pi^2 + ln^2 e).
func TestDampedCushion(t *testing.T) {
	for _, c := range []struct{ k, m, h, e, g, dt float64 }{
		{40e3, 10, 0.76, 0.3, StandardGravity, 1e-3},
		{100e3, 2, 0.2, 0.6, StandardGravity, 2e-3},
		{40e3, 10, 0, 0.3, 0, 1e-3},
		{5e5, 1, 0, 0.8, 0, 1e-3},
		{2e3, 30, 0, 0.05, 0, 1e-2},
	} {
		v0 := 3.0
		if c.g > 0 {
			v0 = math.Sqrt(2 * c.g * c.h)
		}
		d := cushionDrop{k: c.k, e: c.e, m: c.m, gravity: c.g, gap: 0.001, v0: v0}
		if c.g > 0 {
			d.gap, d.v0 = c.h, 0
		}
		w, id := d.world(t)
		ev, rebound := firstImpact(t, w, id, c.dt, 0.15)
		peak, want := dampedOscillator(c.m, c.k, dampingRatio(c.e), c.g, v0)
		t.Logf("%+v: peak %+.3f%%, rebound %+.3f%%", c, 100*(ev.PeakForce/peak-1), 100*(rebound/want-1))
		if got := ev.PeakForce; math.Abs(got/peak-1) > dampedTol {
			t.Errorf("%+v: peak force %.5g N, closed form %.5g N", c, got, peak)
		}
		if math.Abs(rebound/want-1) > dampedTol {
			t.Errorf("%+v: rebound %.5g m/s, closed form %.5g m/s", c, rebound, want)
		}
		if c.g == 0 && math.Abs(rebound/v0/c.e-1) > dampedTol {
			t.Errorf("%+v: restitution recovered %.5g, given %g", c, rebound/v0, c.e)
		}
	}
}

// hertzTol: the 3 percent. The duration is read from sub-steps of
// about 1/50 of it, with the start and end found by interpolating the
// indentation to zero; the peak at sub-steps as for mindlinTol.
const hertzTol = 0.03

// TestHertzSteelSphere drops a steel sphere on a steel plate, without
// damping or gravity during the impact, and checks the contact duration
// t = 2.87 (m^2 / (R E*^2 v))^(1/5) and the peak force 4/3 E* sqrt(R)
// d_max^(3/2), d_max = (15 m v^2 / (16 E* sqrt(R)))^(2/5) (Johnson,
// "Contact Mechanics", 1985, section 11.4, eqs. 11.23-11.24; Goldsmith,
// "Impact", 1960). Steel: E = 210 GPa, nu = 0.3 (handbook values).
func TestHertzSteelSphere(t *testing.T) {
	steel := Stiffness{Modulus: 210e9, Poisson: 0.3}
	for _, c := range []struct{ r, v, dt float64 }{
		{0.01, 1, 1e-3},
		{0.025, 0.3, 1e-2},
		{0.005, 3, 1e-4},
	} {
		w, err := NewWorld(Config{NoSleep: true})
		if err != nil {
			t.Fatal(err)
		}
		mat, err := w.AddMaterial(Material{Name: "steel", Restitution: 1, Stiffness: steel})
		if err != nil {
			t.Fatal(err)
		}
		if _, err := w.AddBody(BodyDef{Name: "plate", Kind: Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat}); err != nil {
			t.Fatal(err)
		}
		id, err := w.AddBody(BodyDef{Name: "ball", Kind: Dynamic, Shape: shapes.Sphere{Radius: c.r}, Density: 7850, Material: mat,
			Position: shapes.Vec3{0, 0, c.r * 1.01}, Velocity: shapes.Vec3{0, 0, -c.v}})
		if err != nil {
			t.Fatal(err)
		}
		ev, _ := firstImpact(t, w, id, c.dt, c.r)
		m := w.MassOf(id)
		eStar := 1 / (2 * (1 - 0.09) / 210e9) // two steel bodies (Johnson eq. 4.22)
		dur := 2.87 * math.Pow(m*m/(c.r*eStar*eStar*c.v), 0.2)
		dMax := math.Pow(15*m*c.v*c.v/(16*eStar*math.Sqrt(c.r)), 0.4)
		fMax := 4.0 / 3 * eStar * math.Sqrt(c.r) * math.Pow(dMax, 1.5)
		t.Logf("R %g m, v %g m/s: duration %+.2f%%, peak force %+.3f%%", c.r, c.v, 100*(ev.Duration/dur-1), 100*(ev.PeakForce/fMax-1))
		if math.Abs(ev.Duration/dur-1) > hertzTol {
			t.Errorf("R %g m, v %g m/s: duration %.4g s, Johnson 1985 %.4g s", c.r, c.v, ev.Duration, dur)
		}
		if math.Abs(ev.PeakForce/fMax-1) > hertzTol {
			t.Errorf("R %g m, v %g m/s: peak force %.5g N, Johnson 1985 %.5g N", c.r, c.v, ev.PeakForce, fMax)
		}
	}
}

// TestStiffCushionMatchesRigid drops the same box flat on a rigid floor
// and on a very stiff cushion (k = 1e8 N/m, contact about 0.6 ms) with the
// same restitution: the rebound speeds and the final poses must agree.
func TestStiffCushionMatchesRigid(t *testing.T) {
	// reboundTol: the rigid impact happens at a step boundary and meets
	// gravity over that step (g dt / v = 0.3 percent at 1 ms and 3 m/s); the
	// cushion's contact lasts about 0.6 ms, over which gravity changes the
	// rebound by g t / v = 0.2 percent; 1 percent covers both.
	const reboundTol = 0.01
	// poseTol, m: the rigid contact leaves up to the slop (0.2 mm,
	// Config.Slop) of penetration; the cushion sinks by m g / k = 0.1 um.
	const poseTol = 2.5e-4
	run := func(k float64) (rebound float64, final shapes.Vec3, turn float64) {
		d := cushionDrop{k: k, e: 0.5, m: 1, gravity: StandardGravity, gap: 0.46}
		w, id := d.world(t)
		if k == 0 {
			// The same scene with the floor rigid.
			w2, err := NewWorld(Config{Gravity: shapes.Vec3{0, 0, -StandardGravity}, NoSleep: true})
			if err != nil {
				t.Fatal(err)
			}
			mat, _ := w2.AddMaterial(Material{Name: "floor", Friction: 0.5, Restitution: 0.5})
			load, _ := w2.AddMaterial(Material{Name: "load", Friction: 0.5})
			if err := w2.SetPair(mat, load, PairCoefficients{Friction: 0.5, Restitution: 0.5}); err != nil {
				t.Fatal(err)
			}
			mustAdd(t, w2, BodyDef{Name: "floor", Kind: Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat})
			id = mustAdd(t, w2, BodyDef{Name: "load", Kind: Dynamic, Shape: shapes.Box{Half: shapes.Vec3{0.2, 0.15, 0.15}}, Mass: 1, Material: load,
				Position: shapes.Vec3{0, 0, 0.15 + 0.46}})
			w = w2
		}
		vmax := 0.0
		for i := 0; i < 1500; i++ {
			if err := w.Step(1e-3); err != nil {
				t.Fatal(err)
			}
			if i < 400 {
				vmax = math.Max(vmax, w.Velocity(id)[2])
			}
		}
		q := w.Orientation(id)
		return vmax, w.Position(id), 2 * math.Acos(math.Min(1, math.Abs(q.W)))
	}
	rv, rp, rt := run(0)
	sv, sp, st := run(1e8)
	t.Logf("rebound rigid %.5g m/s, stiff cushion %.5g m/s (%+.2f%%); final heights %.6g, %.6g m", rv, sv, 100*(sv/rv-1), rp[2], sp[2])
	if math.Abs(sv/rv-1) > reboundTol {
		t.Errorf("rebound: rigid %.5g m/s, stiff cushion %.5g m/s", rv, sv)
	}
	if rp.Sub(sp).Len() > poseTol || math.Abs(rt-st) > 1e-3 {
		t.Errorf("final pose: rigid %v (turned %.3g rad), stiff cushion %v (turned %.3g rad)", rp, rt, sp, st)
	}
}

// TestEdgeStrikeEffectiveMass strikes a tilted box on one edge against a
// linear cushion (no gravity, no friction, no damping). Impulse and
// momentum at a point: the contact meets the effective mass
// m_eff = 1 / (1/m + r^2 / I), r the lever arm of the normal about the
// centre of mass, and a short undamped contact's peak force is
// v sqrt(k m_eff) (any dynamics text on impact at a point, e.g. Goldsmith
// 1960, ch. 2; the spring-mass peak from energy, 1/2 m_eff v^2 = 1/2 k d^2).
func TestEdgeStrikeEffectiveMass(t *testing.T) {
	// edgeTol: the formula holds the lever arm fixed; the box turns by
	// about 0.3 degrees during the 0.5 ms contact at k = 1e7 N/m, which
	// changes r and so m_eff by under 1 percent; 2 percent.
	const edgeTol = 0.02
	for _, c := range []struct{ tilt, k, m, v float64 }{
		{30, 1e7, 2, 2},
		{15, 4e6, 5, 1},
		{50, 1e7, 1, 3},
	} {
		box := shapes.Box{Half: shapes.Vec3{0.2, 0.15, 0.1}}
		th := c.tilt * math.Pi / 180
		q := mgl64.QuatRotate(th, shapes.Vec3{1, 0, 0})
		// The lowest edge, along x, at (y, z) = (-0.15, -0.1) in the box.
		y := -0.15*math.Cos(th) + 0.1*math.Sin(th)
		z := -0.15*math.Sin(th) - 0.1*math.Cos(th)
		d := cushionDrop{k: c.k, e: 1, m: c.m, gap: 0.0005, v0: c.v, shape: box, bottom: -z, orientation: q}
		w, id := d.world(t)
		if err := w.SetPair(1, 2, PairCoefficients{Restitution: 1}); err != nil { // no friction
			t.Fatal(err)
		}
		ev, _ := firstImpact(t, w, id, 1e-3, -z)
		ix := c.m * (0.3*0.3 + 0.2*0.2) / 12 // solid box about x (any handbook)
		mEff := 1 / (1/c.m + y*y/ix)
		want := c.v * math.Sqrt(c.k*mEff)
		t.Logf("tilt %g: peak %+.2f%% (m_eff %.4g kg of %g)", c.tilt, 100*(ev.PeakForce/want-1), mEff, c.m)
		if math.Abs(ev.PeakForce/want-1) > edgeTol {
			t.Errorf("tilt %g deg: peak force %.5g N, v sqrt(k m_eff) %.5g N", c.tilt, ev.PeakForce, want)
		}
	}
}

// TestCompliantRefusals: what the engine cannot resolve stops the run with
// a message naming the bodies and what to do.
func TestCompliantRefusals(t *testing.T) {
	steel := Stiffness{Modulus: 210e9, Poisson: 0.3}
	for _, c := range []struct {
		name  string
		shape shapes.Shape
		v, dt float64
		want  string
	}{
		// Hertz contact needs a round surface: two flat bodies have none.
		{"flat", shapes.Box{Half: shapes.Vec3{0.01, 0.01, 0.01}}, 1, 1e-3, `bodies "plate" and "part": Hertz contact`},
		// A 1 mm steel ball at 10 m/s touches for about 7 us: a 50 ms step
		// would need some 700 000 sub-steps.
		{"coarse", shapes.Sphere{Radius: 0.001}, 10, 0.05, "use a smaller step"},
	} {
		w, err := NewWorld(Config{NoSleep: true})
		if err != nil {
			t.Fatal(err)
		}
		mat, _ := w.AddMaterial(Material{Name: "steel", Restitution: 0.9, Stiffness: steel})
		mustAdd(t, w, BodyDef{Name: "plate", Kind: Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat})
		mustAdd(t, w, BodyDef{Name: "part", Shape: c.shape, Density: 7850, Material: mat, Position: shapes.Vec3{0, 0, 0.0105}, Velocity: shapes.Vec3{0, 0, -c.v}})
		var err2 error
		for i := 0; i < 100 && err2 == nil; i++ {
			err2 = w.Step(c.dt)
		}
		if err2 == nil || !strings.Contains(err2.Error(), c.want) {
			t.Errorf("%s: got %v, want an error with %q", c.name, err2, c.want)
		}
	}
	if _, err := (&World{}).AddMaterial(Material{Name: "x", Stiffness: Stiffness{Linear: 1, Modulus: 1, Poisson: 0.3}}); err == nil {
		t.Error("a material with both a linear stiffness and a modulus was accepted")
	}
}

// TestCushionStaticDeflection lets a box come to rest on a cushion over a
// long run: it must sink by m g / k (Hooke's law) and settle, at a coarse
// and a fine step.
func TestCushionStaticDeflection(t *testing.T) {
	// deflectionTol: at rest the indentation is read from the contact
	// points, exact; what is left is the rest thresholds' motion (5 mm/s
	// over a period of 0.1 s moves under 0.1 mm); 2 percent of 2.45 mm.
	const deflectionTol = 0.02
	for _, dt := range []float64{1e-3, 1e-2} {
		d := cushionDrop{k: 40e3, e: 0.3, m: 10, gravity: StandardGravity, gap: 0.05}
		w, id := d.world(t)
		for i := 0; i < int(4/dt); i++ {
			if err := w.Step(dt); err != nil {
				t.Fatal(err)
			}
		}
		want := 10 * StandardGravity / 40e3
		got := 0.15 - w.Position(id)[2]
		if math.Abs(got/want-1) > deflectionTol {
			t.Errorf("step %g s: sank %.5g m, m g / k = %.5g m", dt, got, want)
		}
		if w.Velocity(id).Len() > 5e-3 {
			t.Errorf("step %g s: still moving at %v after 4 s", dt, w.Velocity(id))
		}
	}
}

// TestGentleCompliantContactSettles: a part set down on a compliant
// surface with restitution 1 settles, as on a rigid one (no restitution
// below the bounce threshold), for a cushion and for Hertz contact.
func TestGentleCompliantContactSettles(t *testing.T) {
	steel := Stiffness{Modulus: 210e9, Poisson: 0.3}
	for _, c := range []cushionDrop{
		{k: 40e3, e: 1, m: 10, gravity: StandardGravity},
		{hertz: &steel, e: 1, m: 0.5, gravity: StandardGravity, shape: shapes.Sphere{Radius: 0.025}, bottom: 0.025},
	} {
		w, id := c.world(t)
		for i := 0; i < 1000; i++ {
			if err := w.Step(1e-3); err != nil {
				t.Fatal(err)
			}
		}
		if v := w.Velocity(id).Len(); v > w.Config().RestSpeed {
			t.Errorf("%+v: still moving at %g m/s after 1 s", c, v)
		}
	}
}
