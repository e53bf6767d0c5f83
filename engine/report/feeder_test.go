package report

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"clatter/engine"
)

// belt is a conveyor belt at speed v (mm/s) carrying n cubes of 10 mm,
// spaced s apart, the first one 30 mm before a gate at x = 0, the cubes
// already moving with the belt.
func belt(v, s float64, n int, duration float64) string { return beltStep(v, s, n, duration, 0.001) }

// beltStep is belt with a time step of dt seconds.
func beltStep(v, s float64, n int, duration, dt float64) string {
	b := fmt.Sprintf(`units = { length = "mm", mass = "g" }
[world]
step = %g
duration = %g
until_settled = false
[[body]]
name = "belt"
static = true
shape = { box = [4000, 100, 10] }
position = [0, 0, -5]
[[drive]]
body = "belt"
conveyor = [%g, 0, 0]
[[gate]]
name = "count"
at = [0, 0, 0]
normal = [1, 0, 0]
radius = 60
`, dt, duration, v)
	for i := 0; i < n; i++ {
		b += fmt.Sprintf("[[body]]\nname = \"p%d\"\nshape = { box = [10, 10, 10] }\ndensity = \"1 g/cm3\"\nposition = [%g, 0, 5]\nvelocity = [%g, 0, 0]\n",
			i, -30-s*float64(i), v)
	}
	return b
}

func TestGateCountsPartsOnABelt(t *testing.T) {
	// Parts spaced s apart on a belt at speed v pass a place at the rate
	// v / s (kinematics: each moves with the belt); over a time T a gate
	// counts v T / s of them, to within the one part that may be partly
	// through when the run ends (exact counting). Part i reaches the gate
	// at (30 + s i) / v; crossingTimeTol is two of the largest steps
	// tried: the crossing is interpolated within a step, and the parts
	// ride on the belt's friction with the solver's small creep. The
	// counts must not depend on the step (0.5, 1 and 2 ms).
	const crossingTimeTol = 0.004
	const v, s, n, T = 200.0, 40.0, 10, 1.5
	for _, dt := range []float64{0.0005, 0.001, 0.002} {
		t.Run(fmt.Sprint(dt), func(t *testing.T) { beltCounts(t, v, s, n, T, dt, crossingTimeTol) })
	}
}

func beltCounts(t *testing.T, v, s float64, n int, T, dt, crossingTimeTol float64) {
	dir := t.TempDir()
	sum, err := Run(context.Background(), parse(t, beltStep(v, s, n, T, dt)), Options{Dir: dir})
	if err != nil {
		t.Fatal(err)
	}
	if len(sum.Gates) != 1 {
		t.Fatalf("summary gates %+v", sum.Gates)
	}
	g := sum.Gates[0]
	want := 0
	for i := 0; i < n; i++ {
		if (30+s*float64(i))/v < T {
			want++
		}
	}
	if g.Count != int64(want) || math.Abs(float64(g.Count)-v*T/s) > 1 {
		t.Errorf("counted %d parts, want %d (v T / s = %g)", g.Count, want, v*T/s)
	}
	if wantRate := float64(want) / T * 60; math.Abs(g.Rate-wantRate) > 1e-9*wantRate {
		t.Errorf("rate %g per minute, want %g", g.Rate, wantRate)
	}
	if g.Faces["5"] != g.Count {
		t.Errorf("faces %v: every cube rides on its -z face (5)", g.Faces)
	}
	rows := readRows(t, filepath.Join(dir, GatesFile), GatesHeader)
	if len(rows) != want {
		t.Fatalf("gates.csv has %d rows, want %d", len(rows), want)
	}
	for i, r := range rows {
		tm, _ := strconv.ParseFloat(r[0], 64)
		if wantT := (30 + s*float64(i)) / v; math.Abs(tm-wantT) > crossingTimeTol || r[2] != fmt.Sprintf("p%d", i) || r[3] != "5" {
			t.Errorf("crossing %d: %v, want p%d at %.4f s on face 5", i, r, i, wantT)
		}
	}
}

func TestGateCountsOncePerPassage(t *testing.T) {
	// A cube thrown along a floor at 0.5 m/s through a gate slides on
	// and stops past it: counted once along the gate's normal, not at all
	// against it (the gate counts one direction).
	for _, c := range []struct {
		name   string
		normal string
		want   int64
	}{{"along", "[1, 0, 0]", 1}, {"against", "[-1, 0, 0]", 0}} {
		src := `units = { length = "mm", mass = "g" }
[world]
duration = 1
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[gate]]
name = "g"
at = [0, 0, 0]
normal = ` + c.normal + `
[[body]]
name = "cube"
shape = { box = [10, 10, 10] }
density = "1 g/cm3"
position = [-20, 0, 5]
velocity = [500, 0, 0]
`
		sum, err := Run(context.Background(), parse(t, src), Options{})
		if err != nil {
			t.Fatal(err)
		}
		if sum.Gates[0].Count != c.want {
			t.Errorf("%s: counted %d, want %d", c.name, sum.Gates[0].Count, c.want)
		}
	}
}

func TestFaceDownIsRestingFace(t *testing.T) {
	// Whenever a part has settled on a face, face_down names that face:
	// both are the face whose normal is closest to gravity. Bracket drops
	// from the examples, several seeds; and a part in flight has a
	// face_down but no resting face.
	for seed := 1; seed <= 6; seed++ {
		src, err := os.ReadFile("../../testdata/scenes/drop.toml")
		if err != nil {
			t.Fatal(err)
		}
		text := strings.Replace(string(src), "seed = 3", fmt.Sprintf("seed = %d", seed), 1)
		text = strings.Replace(text, "../parts/", "../../testdata/parts/", 1)
		sum, err := Run(context.Background(), parse(t, text), Options{})
		if err != nil {
			t.Fatal(err)
		}
		b := sum.Bodies[0]
		t.Logf("seed %d: resting face %s, face_down %s", seed, show(b.RestingFace), show(b.FaceDown))
		if b.RestingFace == nil || b.FaceDown == nil || *b.FaceDown != *b.RestingFace {
			t.Errorf("seed %d: resting face %v, face_down %v", seed, show(b.RestingFace), show(b.FaceDown))
		}
	}
	flying := strings.Replace(belt(0, 40, 1, 0.01), "position = [-30, 0, 5]", "position = [-30, 0, 500]", 1)
	sum, err := Run(context.Background(), parse(t, flying), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if b := sum.Bodies[0]; b.RestingFace != nil || b.FaceDown == nil || *b.FaceDown != 5 {
		t.Errorf("a falling cube: resting face %v, face_down %v; want none and 5", show(b.RestingFace), show(b.FaceDown))
	}
}

// readRows reads a CSV file with the given header.
func readRows(t *testing.T, path, header string) [][]string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSuffix(string(b), "\n"), "\n")
	if lines[0] != header {
		t.Fatalf("%s: header %q, want %q", path, lines[0], header)
	}
	var rows [][]string
	for _, l := range lines[1:] {
		rows = append(rows, strings.Split(l, ","))
	}
	return rows
}

func show(p *int) string {
	if p == nil {
		return "null"
	}
	return strconv.Itoa(*p)
}

// track is a linear feeder's track at 3 degrees vibrating at 50 Hz along
// a line 20 degrees above it, at throw number throw, with one small steel
// part on it.
func track(throw float64, duration float64) string {
	alpha, psi := 3*math.Pi/180, 20*math.Pi/180
	w := 2 * math.Pi * 50
	amp := throw * engine.StandardGravity * math.Cos(alpha) / (w * w * math.Sin(psi)) * 1000 // mm
	dir := [3]float64{math.Cos(alpha + psi), 0, math.Sin(alpha + psi)}
	return fmt.Sprintf(`units = { length = "mm", mass = "g" }
[world]
step = "0.1 ms"
duration = %g
until_settled = false
[material.steel]
friction = 0.5
[[body]]
name = "track"
driven = true
shape = { box = [1000, 100, 10] }
material = "steel"
orientation = { axis = [0, 1, 0], angle = -3 }
[[drive]]
body = "track"
vibration = [{ along = [%.12g, 0, %.12g], amplitude = %.12g, frequency = "50 Hz" }]
[[body]]
name = "part"
shape = { box = [10, 10, 4] }
material = "steel"
density = "7.8 g/cm3"
position = [0, 0, 7]
orientation = { axis = [0, 1, 0], angle = -3 }
`, duration, dir[0], dir[2], amp)
}

func TestDriveFigures(t *testing.T) {
	// The throw number of a track vibrating along a line at psi above it
	// is A W^2 sin(psi) / (g cos(alpha)) (feeder-design practice; see
	// engine.ThrowNumber): the scene is built for a given throw, which
	// summary.json must give back to rounding (throwTol: the amplitude is
	// written with 12 digits). The conveying speed measured over the run
	// after its first second agrees with the particle model of the sliding
	// and hopping regimes (Redford and Boothroyd 1967, as
	// engine.ConveyingSpeedModel steps it) at a throw in each regime and at
	// the boundary region, within convTol of the track's peak speed along
	// itself: the tolerance of the engine's own check against the model
	// (the part is a box that rocks as it lands, not a particle).
	const throwTol, convTol = 1e-9, 0.03
	alpha, psi, w := 3*math.Pi/180, 20*math.Pi/180, 2*math.Pi*50
	for _, throw := range []float64{0.7, 1.2, 1.6} {
		sum, err := Run(context.Background(), parse(t, track(throw, 1.3)), Options{})
		if err != nil {
			t.Fatal(err)
		}
		if len(sum.Drives) != 1 || sum.Drives[0].ThrowNumber == nil || sum.Drives[0].ConveyingSpeed == nil {
			t.Fatalf("drives %+v", sum.Drives)
		}
		d := sum.Drives[0]
		if math.Abs(*d.ThrowNumber-throw) > throwTol*throw {
			t.Errorf("throw number %g, want %g", *d.ThrowNumber, throw)
		}
		amp := throw * engine.StandardGravity * math.Cos(alpha) / (w * w * math.Sin(psi))
		model := engine.ConveyingSpeedModel(alpha, psi, 0.5, 50, amp, engine.StandardGravity, 50, 15) * 1000
		peak := amp * w * math.Cos(psi) * 1000
		t.Logf("throw %.2f: conveying speed %.2f mm/s, model %.2f mm/s (track peak %.1f mm/s)", throw, *d.ConveyingSpeed, model, peak)
		if math.Abs(*d.ConveyingSpeed-model) > convTol*peak {
			t.Errorf("throw %.2f: conveying speed %.3f mm/s, model %.3f mm/s", throw, *d.ConveyingSpeed, model)
		}
	}
}

func TestSampleAliases(t *testing.T) {
	// Sampling a 50 Hz drive every 0.01 s gives two samples per period
	// (the Nyquist limit, so no faithful picture); every 0.002 s ten.
	s := parse(t, track(1.2, 0.1))
	if w := SampleAliases(s, 0.01); len(w) != 1 || !strings.Contains(w[0], "--sample 0.002") {
		t.Errorf("0.01 s: %q", w)
	}
	if w := SampleAliases(s, 0.002); len(w) != 0 {
		t.Errorf("0.002 s: %q", w)
	}
}

func TestWiperPassesPartsBelowItsGap(t *testing.T) {
	// A wiper blade (a static bar across a belt, turned 30 degrees in
	// plan) with its underside a gap g above the belt passes exactly the
	// parts lower than g and pushes the taller ones along its face and
	// off the belt (geometry: a part fits under the bar or meets its
	// face). Heights clear the gap by heightMargin either way: the
	// contact slop (0.2 mm) lets a part touch a surface that close
	// without meeting it.
	const gap, heightMargin = 8.0, 0.4
	src := `units = { length = "mm", mass = "g" }
[world]
duration = 2.5
until_settled = false
[material.belt]
friction = 0.5
[material.steel]
friction = 0.1
[[body]]
name = "belt"
static = true
shape = { box = [1000, 30, 10] }
position = [200, 0, -5]
material = "belt"
[[drive]]
body = "belt"
conveyor = [200, 0, 0]
[[body]]
name = "wiper"
static = true
shape = { box = [120, 6, 20] }
material = "steel"
position = [100, 0, ` + strconv.FormatFloat(gap+10, 'g', -1, 64) + `]
orientation = { axis = [0, 0, 1], angle = 30 }
[[gate]]
name = "passed"
at = [250, 0, 0]
normal = [1, 0, 0]
radius = 30
[[gate]]
name = "rejected"
at = [100, 13, 0]
normal = [0, 1, 0]
`
	heights := []float64{3, 6, gap - heightMargin, gap + heightMargin, 10, 14}
	for i, h := range heights {
		src += fmt.Sprintf("[[body]]\nname = \"h%d\"\nshape = { box = [10, 10, %g] }\nmaterial = \"belt\"\ndensity = \"1 g/cm3\"\nposition = [%d, 0, %g]\nvelocity = [200, 0, 0]\n",
			i, h, -40*i, h/2)
	}
	dir := t.TempDir()
	if _, err := Run(context.Background(), parse(t, src), Options{Dir: dir}); err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, r := range readRows(t, filepath.Join(dir, GatesFile), GatesHeader) {
		if got[r[2]] != "" {
			t.Errorf("%s counted at %s and at %s", r[2], got[r[2]], r[1])
		}
		got[r[2]] = r[1]
	}
	for i, h := range heights {
		want := "passed"
		if h > gap {
			want = "rejected"
		}
		if name := fmt.Sprintf("h%d", i); got[name] != want {
			t.Errorf("part %g mm high under a %g mm gap: %q, want %q", h, gap, got[name], want)
		}
	}
}

func TestBalanced(t *testing.T) {
	// A 20 mm cube stood on an edge (turned 45 degrees about y, its
	// centre 10 sqrt 2 mm up) or on a corner (its body diagonal vertical:
	// turned acos(1/sqrt 3) about [1, -1, 0], centre 10 sqrt 3 mm up) with
	// its centre of mass exactly above the support stays there for a
	// while: an unstable equilibrium (statics), which balanced names. On a
	// face it is not balanced. The runs are short (0.2 s), before rounding
	// errors, growing as e^(t sqrt(g / L)), can tip the cube.
	for _, c := range []struct {
		name, orient string
		z            float64
		want         string
	}{
		{"edge", "{ axis = [0, 1, 0], angle = 45 }", 10 * math.Sqrt2, "edge"},
		{"corner", fmt.Sprintf("{ axis = [1, -1, 0], angle = %.12g }", math.Acos(1/math.Sqrt(3))*180/math.Pi), 10 * math.Sqrt(3), "corner"},
		{"face", "{ axis = [0, 0, 1], angle = 0 }", 10, ""},
	} {
		src := fmt.Sprintf(`units = { length = "mm", mass = "g" }
[world]
duration = 0.2
until_settled = false
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "cube"
shape = { box = [20, 20, 20] }
density = "1 g/cm3"
position = [0, 0, %.12g]
orientation = %s
`, c.z, c.orient)
		sum, err := Run(context.Background(), parse(t, src), Options{})
		if err != nil {
			t.Fatal(err)
		}
		b := sum.Bodies[0]
		got := ""
		if b.Balanced != nil {
			got = *b.Balanced
		}
		if got != c.want || (c.want != "") != (b.RestingFace == nil) {
			t.Errorf("%s: balanced %q, resting face %s; want %q", c.name, got, show(b.RestingFace), c.want)
		}
	}
}
