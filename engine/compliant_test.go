package engine

import (
	"math"
	"testing"

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
			// The stored velocity drove the last step: it is the velocity
			// half a step back (kick then drift), so move it to the step's
			// end; free flight is then exact: v_sep^2 = v^2 + 2 g gap.
			g := -w.Config().Gravity[2]
			v := w.Velocity(id)[2] - g*dt/2
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
