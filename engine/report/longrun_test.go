package report

import (
	"context"
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"
)

// TestLongRunClock runs a ball resting on a floor for 600 s at 1 ms steps and
// checks the time bookkeeping against exact arithmetic: the run ends at
// 600 s after 600000 steps, and every trajectory row lies on the sample grid
// k x 0.01 s (the trajectory format: a row every --sample seconds). A plain
// running sum of the 1 ms step ended at 599.999999993 s, and from 43 s on
// each sample was taken one step late (43.211 s for 43.21 s).
func TestLongRunClock(t *testing.T) {
	const (
		duration, step, sample = 600.0, 1e-3, 0.01
		// endTol: a few rounding errors of 600 s (ulp 1.1e-13); the drift it
		// catches was 7e-9 s.
		endTol = 1e-12
		// gridTol: far below a step (1e-3 s), far above the rounding of a
		// compensated sum; the trajectory prints 12 significant digits.
		gridTol = 1e-9
	)
	src := `
[world]
step = 0.001
duration = 600
until_settled = false
[material.m]
friction = 0.5
restitution = 0.9
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "m"
[[body]]
name = "ball"
shape = { sphere = 0.05 }
material = "m"
density = 1000
position = [0, 0, 0.05]
`
	dir := t.TempDir()
	sum, err := Run(context.Background(), parse(t, src), Options{Dir: dir, Sample: sample})
	if err != nil {
		t.Fatal(err)
	}
	if want := int(math.Round(duration / step)); sum.Steps != want || math.Abs(sum.Time-duration) > endTol {
		t.Errorf("ended at %.15g s after %d steps, want %g s after %d", sum.Time, sum.Steps, duration, want)
	}
	f, err := os.Open(filepath.Join(dir, TrajectoryFile))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if want := int(math.Round(duration/sample)) + 2; len(rows) != want { // header and t = 0
		t.Errorf("%d trajectory lines, want %d", len(rows), want)
	}
	off := 0
	for _, r := range rows[1:] {
		tt, err := strconv.ParseFloat(r[0], 64)
		if err != nil {
			t.Fatal(err)
		}
		if d := math.Abs(tt - math.Round(tt/sample)*sample); d > gridTol {
			if off++; off <= 3 {
				t.Errorf("sample at %.12g s is %.3g s off the %g s grid", tt, d, sample)
			}
		}
	}
	if off > 3 {
		t.Errorf("%d samples off the grid in all", off)
	}
}

// TestDurationInWholeSteps runs scenes whose step is written to a few
// digits: a run takes the duration over the step rounded up (it covers
// the duration), but a duration that passes a whole number of steps only
// by the rounding of the written step ends at that number: 10 s at
// 0.0333333 s (1/30 s to six digits) is 300 steps, not 301 ending at
// 10.033 s. Reference: the arithmetic of the step count.
func TestDurationInWholeSteps(t *testing.T) {
	cases := []struct {
		step, duration string
		steps          int
	}{
		{"0.0333333", "10", 300},  // 300.0003 steps
		{"0.0166667", "60", 3600}, // 3599.99 steps: rounded up
		{"0.016666666666666666", "600", 36000},
		{"0.001", "0.0105", 11}, // 10.5 steps: rounded up
		{"0.0001", "1", 10000},
	}
	for _, c := range cases {
		src := `
[world]
step = ` + c.step + `
duration = ` + c.duration + `
until_settled = false
gravity = [0, 0, 0]
[[body]]
name = "ball"
shape = { sphere = 0.05 }
density = 1000
velocity = [1, 0, 0]
`
		sum, err := Run(context.Background(), parse(t, src), Options{})
		if err != nil {
			t.Fatal(err)
		}
		if sum.Steps != c.steps {
			t.Errorf("step %s s, duration %s s: %d steps ending at %.9g s, want %d", c.step, c.duration, sum.Steps, sum.Time, c.steps)
		}
	}
}
