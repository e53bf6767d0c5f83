package report

import (
	"bufio"
	"context"
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"clatter/engine"
	"clatter/engine/scene"
)

// rolling is a ball launched sliding along a floor: smooth, not chaotic,
// so the same scene in other units gives the same motion to rounding.
func rolling(units string, scale string) string {
	return units + `
[world]
duration = 0.6
until_settled = false
[material.rubber]
friction = 0.4
restitution = 0.5
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "rubber"
[[body]]
name = "ball"
shape = { sphere = "20 mm" }
density = "1.1 g/cm3"
material = "rubber"
position = ["0 mm", "0 mm", "20 mm"]
velocity = ["1.5 m/s", "0 m/s", "0 m/s"]
` + scale
}

func parse(t *testing.T, src string) *scene.Scene {
	t.Helper()
	s, err := scene.Parse([]byte(src), "test.toml", scene.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestUnitsOut(t *testing.T) {
	// The same scene in m and kg, and in mm and g, is the same motion; the
	// outputs differ by the units' factors: lengths and speeds 1000, momentum
	// 1e6 (g mm/s per kg m/s), angular momentum 1e9, spin and energy 1 (rad/s
	// and J whatever the units). 1e-9: the inputs differ by the rounding of
	// 1e-3 x, which a smooth motion keeps near 1e-15.
	const tol = 1e-9
	si, err := Run(context.Background(), parse(t, rolling("", "")), Options{})
	if err != nil {
		t.Fatal(err)
	}
	mm, err := Run(context.Background(), parse(t, rolling(`units = { length = "mm", mass = "g" }`, "")), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if mm.Units.Length != "mm" || mm.Units.Mass != "g" || si.Units.Length != "m" {
		t.Fatalf("units %+v %+v", si.Units, mm.Units)
	}
	check := func(what string, a, b, factor float64) {
		t.Helper()
		if math.Abs(b-a*factor) > tol*math.Max(math.Abs(a*factor), 1e-3*factor) {
			t.Errorf("%s: %g in SI, %g in mm and g, want factor %g", what, a, b, factor)
		}
	}
	sb, mb := si.Bodies[0], mm.Bodies[0]
	for i := 0; i < 3; i++ {
		check("position", sb.Position[i], mb.Position[i], 1e3)
		check("velocity", sb.Velocity[i], mb.Velocity[i], 1e3)
		check("spin", sb.Spin[i], mb.Spin[i], 1)
		check("linear momentum", si.Momentum.Linear.Initial[i], mm.Momentum.Linear.Initial[i], 1e6)
		check("angular momentum", si.Momentum.Angular.Final[i], mm.Momentum.Angular.Final[i], 1e9)
	}
	check("energy", si.Energy.Final, mm.Energy.Final, 1)
	// The ball rolls without slipping at 5 v0 / 7 (Halliday, Resnick and
	// Walker): 1.0714 m/s; 2 percent, the validation suite's requirement.
	if v := sb.Velocity[0]; math.Abs(v-1.5*5/7) > 0.02*1.5*5/7 {
		t.Errorf("rolling at %g m/s, want %g", v, 1.5*5/7)
	}
	// Spin about y at v / r when rolling.
	if w := sb.Spin[1]; math.Abs(w-sb.Velocity[0]/0.02) > 0.02*math.Abs(w) {
		t.Errorf("spin %g rad/s, want v / r = %g", w, sb.Velocity[0]/0.02)
	}
}

func readLines(t *testing.T, path string) []string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var out []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		out = append(out, sc.Text())
	}
	return out
}

func TestFiles(t *testing.T) {
	dir := t.TempDir()
	s := parse(t, rolling("", ""))
	sum, err := Run(context.Background(), s, Options{Dir: dir, Sample: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	rows := readLines(t, filepath.Join(dir, TrajectoryFile))
	if rows[0] != "time,body,x,y,z,qw,qx,qy,qz,vx,vy,vz,wx,wy,wz" {
		t.Fatalf("header %q", rows[0])
	}
	// Samples at 0, 0.05, ..., 0.6 s: 13 rows for the one moving body.
	if len(rows) != 1+13 {
		t.Errorf("%d rows, want 13", len(rows)-1)
	}
	for i, r := range rows[1:] {
		f := strings.Split(r, ",")
		if len(f) != 15 || f[1] != "ball" {
			t.Fatalf("row %q", r)
		}
		if tm, _ := strconv.ParseFloat(f[0], 64); math.Abs(tm-0.05*float64(i)) > 1e-9 {
			t.Errorf("row %d at t %g", i, tm)
		}
	}
	var file Summary
	b, err := os.ReadFile(filepath.Join(dir, SummaryFile))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &file); err != nil {
		t.Fatal(err)
	}
	if file.Time != sum.Time || file.Bodies[0].Position != sum.Bodies[0].Position {
		t.Errorf("summary.json %+v differs from the returned summary %+v", file, sum)
	}
	if sum.Settled || sum.SettledAt != nil || string(b[:1]) != "{" || !strings.Contains(string(b), `"settled_at": null`) {
		t.Errorf("a rolling ball has not settled: %s", b)
	}
	for _, l := range readLines(t, filepath.Join(dir, EventsFile)) {
		var e map[string]any
		if err := json.Unmarshal([]byte(l), &e); err != nil {
			t.Fatalf("events line %q: %v", l, err)
		}
		if _, ok := e["time"]; !ok || e["event"] == nil {
			t.Errorf("event %q lacks time or event", l)
		}
	}
}

func TestInterruptedRunKeepsResults(t *testing.T) {
	dir := t.TempDir()
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	s := parse(t, rolling("", ""))
	sum, err := Run(ctx, s, Options{Dir: dir, Progress: func(f float64) {
		if f > 0.3 {
			cancel()
		}
	}})
	var se *SimulationError
	if !errors.As(err, &se) || !errors.Is(err, context.Canceled) {
		t.Fatalf("error %v, want a SimulationError for the interruption", err)
	}
	if sum == nil || !strings.Contains(sum.Error, "interrupted") || !(sum.Time > 0.18 && sum.Time < 0.6) {
		t.Fatalf("summary %+v", sum)
	}
	rows := readLines(t, filepath.Join(dir, TrajectoryFile))
	last := strings.Split(rows[len(rows)-1], ",")
	if tm, _ := strconv.ParseFloat(last[0], 64); tm != sum.Time {
		t.Errorf("last row at %g, summary at %g", tm, sum.Time)
	}
	ev := readLines(t, filepath.Join(dir, EventsFile))
	if len(ev) == 0 || !strings.Contains(ev[len(ev)-1], `"event":"error"`) {
		t.Errorf("events %q, want an error last", ev)
	}
	if _, err := os.Stat(filepath.Join(dir, SummaryFile)); err != nil {
		t.Error(err)
	}
}

func TestDivergedRunKeepsResults(t *testing.T) {
	// A ball thrown at 1e300 m/s: its kinetic energy is infinite after one
	// step, which the world reports as a divergence naming the body. The
	// scene reader would refuse such a scene for its step; the test sets the
	// speed after reading, to reach the failure path.
	dir := t.TempDir()
	s := parse(t, rolling("", ""))
	s.Bodies[1].Velocity = [3]float64{1e300, 0, 0}
	sum, err := Run(context.Background(), s, Options{Dir: dir})
	var se *SimulationError
	var de *engine.DivergenceError
	if !errors.As(err, &se) || !errors.As(err, &de) || de.Name != "ball" {
		t.Fatalf("error %v, want a divergence of the ball", err)
	}
	if sum.Error == "" || sum.Time != 0 || sum.Bodies[0].Position[2] != 0.02 {
		t.Errorf("summary %+v, want the last good state (the start) and the error", sum)
	}
	b, err := os.ReadFile(filepath.Join(dir, SummaryFile))
	if err != nil || !json.Valid(b) {
		t.Fatalf("summary.json not valid JSON: %v\n%s", err, b)
	}
	ev := readLines(t, filepath.Join(dir, EventsFile))
	if len(ev) == 0 || !strings.Contains(ev[len(ev)-1], `"event":"error","body":"ball"`) {
		t.Errorf("events %q", ev)
	}
}

func TestMarshalIndent(t *testing.T) {
	b, err := MarshalIndent(map[string]any{"a": []float64{1, -2.5e-7, 3}, "b": []any{nil, 1}, "c": []string{"x"}})
	if err != nil {
		t.Fatal(err)
	}
	want := "{\n  \"a\": [1, -2.5e-7, 3],\n  \"b\": [null, 1],\n  \"c\": [\n    \"x\"\n  ]\n}\n"
	if string(b) != want {
		t.Errorf("got\n%s\nwant\n%s", b, want)
	}
}

func TestTidy(t *testing.T) {
	for _, c := range []struct{ in, want float64 }{
		{0.1 + 0.2, 0.3}, {math.NaN(), 0}, {math.Inf(1), 0}, {123456789012345, 123456789012000}, {-1e-300, -1e-300},
	} {
		if got := Tidy(c.in); got != c.want {
			t.Errorf("Tidy(%g) = %g, want %g", c.in, got, c.want)
		}
	}
}
