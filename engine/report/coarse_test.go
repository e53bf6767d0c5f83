package report

import (
	"context"
	"math"
	"strings"
	"testing"

	"clatter/engine"
)

func TestCoarseStepsWarns(t *testing.T) {
	// The track of track() strokes along a line 20 degrees above it, so
	// its speed along itself changes by at most A W^2 cos(20 deg) dt in a
	// step (closed form; stepTol: rounding). At 0.5 ms a step that is
	// over half the speed one part is conveyed at (27.6 mm/s there, 25.0
	// at 0.1 ms and 25.5 at 0.05 ms, measured), and CoarseSteps warns; at
	// 0.1 ms it is 13 percent, below coarseStepShare, and it does not.
	const stepTol = 1e-9
	alpha, psi, w := 3*math.Pi/180, 20*math.Pi/180, 2*math.Pi*50
	amp := 1.2 * engine.StandardGravity * math.Cos(alpha) / (w * w * math.Sin(psi)) * 1000 // mm
	for _, c := range []struct {
		step string
		dt   float64
		warn bool
	}{{"0.5 ms", 5e-4, true}, {"0.1 ms", 1e-4, false}} {
		s := parse(t, strings.Replace(track(1.2, 1.3), `step = "0.1 ms"`, `step = "`+c.step+`"`, 1))
		sum, err := Run(context.Background(), s, Options{})
		if err != nil {
			t.Fatal(err)
		}
		d := sum.Drives[0]
		if d.StepSpeed == nil || d.ConveyingSpeed == nil {
			t.Fatalf("%s: drive %+v", c.step, d)
		}
		want := amp * w * w * math.Cos(psi) * c.dt
		if math.Abs(*d.StepSpeed-want) > stepTol*want {
			t.Errorf("%s: the track's speed changes by %g mm/s a step, want %g", c.step, *d.StepSpeed, want)
		}
		ws := CoarseSteps(s, sum)
		t.Logf("%s: conveying speed %.2f mm/s, step change %.2f mm/s: %q", c.step, *d.ConveyingSpeed, *d.StepSpeed, ws)
		if got := len(ws) == 1 && strings.Contains(ws[0], "half the step"); got != c.warn || len(ws) > 1 {
			t.Errorf("%s: warnings %q, want a warning %v", c.step, ws, c.warn)
		}
	}
}
