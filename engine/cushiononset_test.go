package engine

import (
	"math"
	"testing"
)

// onsetTol: with heavy damping the peak is the dashpot's force c v0 at
// the instant the contact begins, now read within 0.01 percent (measured,
// e = 0.01); near zeta = 0.6 to 0.75 the sub-steps' own forces just after
// the onset read up to 0.3 percent above it (measured; the scheme's
// dashpot error that dampedTol allows for). 0.5 percent holds both and is
// below the 0.8 to 2 percent that reading the onset at sub-step instants
// lost, differently at each step.
const onsetTol = 0.005

// TestHeavilyDampedCushionPeak drops masses onto linear cushions damped
// beyond zeta = 1/2 (restitution below about 0.16), where the contact
// force is largest the instant the contact begins, and checks the peak
// acceleration against the closed-form damped oscillator (Thomson, "Theory
// of vibration with applications", ch. 2; dampedOscillator) at coarse and
// fine steps: the answer must not depend on the step.
func TestHeavilyDampedCushionPeak(t *testing.T) {
	for _, c := range []struct{ k, m, h, e, dt float64 }{
		{20e3, 3, 0.76, 0.01, 2e-2},
		{20e3, 3, 0.76, 0.01, 5e-3},
		{20e3, 3, 0.76, 0.01, 1e-3},
		{20e3, 3, 0.76, 0.01, 2e-4},
		{20e3, 3, 0.76, 0.1, 5e-3},
		{150e3, 0.7, 0.3, 0.05, 1e-3},
		{150e3, 0.7, 0.3, 0.05, 3e-4},
		{4e3, 25, 1.1, 0.03, 1e-2},
	} {
		d := cushionDrop{k: c.k, e: c.e, m: c.m, gravity: StandardGravity, gap: c.h}
		w, id := d.world(t)
		var ev *Event
		for w.Time() < 3 && ev == nil {
			if err := w.Step(c.dt); err != nil {
				t.Fatal(err)
			}
			for _, e := range w.Events() {
				if e.Kind == Impact && ev == nil {
					e := e
					ev = &e
				}
			}
		}
		if ev == nil {
			t.Fatalf("%+v: no impact", c)
		}
		peak, _ := dampedOscillator(c.m, c.k, dampingRatio(c.e), StandardGravity, math.Sqrt(2*StandardGravity*c.h))
		want := peak / (c.m * StandardGravity)
		t.Logf("%+v: peak %+.3f%%", c, 100*(ev.PeakAcceleration[1]/want-1))
		for name, got := range map[string]float64{"event": ev.PeakAcceleration[1], "summary": w.PeakAcceleration(id)} {
			if math.Abs(got/want-1) > onsetTol {
				t.Errorf("%+v: %s peak %.5g g, damped oscillator %.5g g (%+.2f%%)", c, name, got, want, 100*(got/want-1))
			}
		}
	}
}
