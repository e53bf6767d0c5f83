package main

import (
	"context"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"clatter/engine/verify"
)

// g is standard gravity, 9.80665 m/s^2 (CGPM 1901).
const g = 9.80665

func parseFloat(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("not a number: %q", s)
	}
	return v
}

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

func TestRunSlideStopDistance(t *testing.T) {
	// testdata/scenes/slide.toml: a 50 mm steel block sliding at 2 m/s on
	// a floor with mu_k 0.3, in mm and g. It stops after
	// d = v0^2 / (2 mu_k g) = 679.8 mm (Coulomb friction; any dynamics text).
	// 2 percent: the requirement; the stopping step adds up to v0 dt.
	const tol = 0.02
	dir := mustRun(t, "../../testdata/scenes/slide.toml")
	s := readSummary(t, dir)
	if s.Units["length"] != "mm" || s.Units["mass"] != "g" {
		t.Fatalf("units %v, want mm and g", s.Units)
	}
	if len(s.Bodies) != 1 || s.Bodies[0].Name != "block" {
		t.Fatalf("bodies %+v, want the block only (the floor is static)", s.Bodies)
	}
	b := s.Bodies[0]
	want := 2000.0 * 2000 / (2 * 0.3 * g * 1000)
	if e := relErr(b.Position[0], want); e > tol {
		t.Errorf("slid %.2f mm, want %.2f mm (error %.3g)", b.Position[0], want, e)
	}
	// Resting on its -z face: a box's faces are listed +x, -x, +y, -y,
	// +z, -z (the documented order), so index 5.
	if b.RestingFace == nil || *b.RestingFace != 5 {
		t.Errorf("resting face %v, want 5 (-z)", b.RestingFace)
	}
	if !s.Settled || s.SettledAt == nil {
		t.Fatalf("not settled: %+v", s)
	}
	// Settled once at rest for rest_time 0.25 s after stopping at
	// v0/(mu g) = 0.680 s; within 0.05 s (the stopping step and creep).
	if wantAt := 2/(0.3*g) + 0.25; math.Abs(*s.SettledAt-wantAt) > 0.05 {
		t.Errorf("settled at %.3f s, want about %.3f s", *s.SettledAt, wantAt)
	}
	// Linear momentum at the start: m v0 with m = 7.8 g/cm3 x 125 cm3 =
	// 975 g, in g mm/s; rounding only (1e-9).
	if p := s.Momentum.Linear.Initial[0]; relErr(p, 975*2000) > 1e-9 {
		t.Errorf("initial momentum %g g mm/s, want %g", p, 975.0*2000)
	}
	// Energy: kinetic m v0^2/2 plus potential m g z (z = 25 mm) in J.
	if e0 := 0.975*4/2 + 0.975*g*0.025; relErr(s.Energy.Initial, e0) > 1e-9 {
		t.Errorf("initial energy %g J, want %g", s.Energy.Initial, e0)
	}
}

func TestRunTrajectoryRows(t *testing.T) {
	dir := mustRun(t, "../../testdata/scenes/slide.toml")
	s := readSummary(t, dir)
	header, rows := readTrajectory(t, dir)
	if header != "time,body,x,y,z,qw,qx,qy,qz,vx,vy,vz,wx,wy,wz" {
		t.Fatalf("header %q", header)
	}
	if rows[0].t != 0 || rows[0].v[0] != 0 || rows[0].v[2] != 25 || rows[0].v[7] != 2000 {
		t.Errorf("first row %+v, want t 0 at (0, 0, 25) mm moving at 2000 mm/s", rows[0])
	}
	last := rows[len(rows)-1]
	if last.t != s.Time || last.v[0] != s.Bodies[0].Position[0] {
		t.Errorf("last row at t %g x %g, want the final state t %g x %g", last.t, last.v[0], s.Time, s.Bodies[0].Position[0])
	}
	// Default sample 0.01 s: rows at 0, 0.01, ... and the final time.
	for i := 1; i < len(rows)-1; i++ {
		if d := rows[i].t - rows[i-1].t; math.Abs(d-0.01) > 1e-9 {
			t.Fatalf("rows %d and %d are %g s apart, want 0.01", i-1, i, d)
		}
	}
	if n, want := len(rows), int(math.Floor(s.Time/0.01+1e-9))+2; n != want {
		t.Errorf("%d rows, want %d", n, want)
	}
}

func TestRunJSONMatchesSummary(t *testing.T) {
	dir := t.TempDir()
	out, _, code := clatter(t, "run", "../../testdata/scenes/slide.toml", "--json", "-o", dir, "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d", code)
	}
	file, err := os.ReadFile(filepath.Join(dir, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	if out != string(file) {
		t.Errorf("--json printed\n%s\nbut summary.json holds\n%s", out, file)
	}
}

func TestRunBounce(t *testing.T) {
	// testdata/scenes/bounce.toml: a ball dropped from h = 1 m with e = 0.8
	// (SI units). It strikes at sqrt(2 g h) and rebounds to e^2 h (Newton's
	// law of restitution; any dynamics text); the second strike is e times
	// the first.
	const (
		speedTol = 0.01 // the 0.5 ms step finds contact within g dt of the exact speed: 0.1 percent
		apexTol  = 0.03 // the requirement of the validation suite
	)
	dir := mustRun(t, "../../testdata/scenes/bounce.toml", "--sample", "0.001")
	s := readSummary(t, dir)
	v1 := math.Sqrt(2 * g * 1.0)
	if e := relErr(s.Bodies[0].MaxImpactSpeed, v1); e > speedTol {
		t.Errorf("largest impact %.4f m/s, want %.4f", s.Bodies[0].MaxImpactSpeed, v1)
	}
	var impacts []eventDoc
	for _, e := range readEvents(t, dir) {
		if e.Event == "impact" {
			impacts = append(impacts, e)
		}
	}
	if len(impacts) < 2 {
		t.Fatalf("%d impacts, want at least 2", len(impacts))
	}
	if b := impacts[0].Bodies; len(b) != 2 || !(b[0] == "ball" || b[1] == "ball") {
		t.Errorf("impact bodies %v", b)
	}
	if e := relErr(impacts[0].NormalSpeed, v1); e > speedTol {
		t.Errorf("first impact %.4f m/s, want %.4f", impacts[0].NormalSpeed, v1)
	}
	if e := relErr(impacts[1].NormalSpeed, 0.8*impacts[0].NormalSpeed); e > apexTol {
		t.Errorf("second impact %.4f m/s, want e times the first, %.4f", impacts[1].NormalSpeed, 0.8*impacts[0].NormalSpeed)
	}
	_, rows := readTrajectory(t, dir)
	apex := 0.0
	for _, r := range rows {
		if r.t > impacts[0].Time && r.t < impacts[1].Time {
			apex = math.Max(apex, r.v[2]-0.02) // bottom of the ball: radius 0.02 m
		}
	}
	if e := relErr(apex, 0.64); e > apexTol {
		t.Errorf("rebound to %.4f m, want e^2 h = 0.64 m", apex)
	}
}

func TestRunInclineInches(t *testing.T) {
	// testdata/scenes/incline.toml: a box on a 30 degree incline with mu_k
	// 0.2, in inches and pounds. a = g (sin 30 - mu_k cos 30) = 3.2048 m/s2
	// = 126.17 in/s2 (Coulomb friction; any dynamics text; the inch is
	// 0.0254 m exactly). 1 percent: the requirement of the validation suite.
	const tol = 0.01
	dir := mustRun(t, "../../testdata/scenes/incline.toml")
	s := readSummary(t, dir)
	if s.Units["length"] != "in" || s.Units["mass"] != "lb" {
		t.Fatalf("units %v, want in and lb", s.Units)
	}
	th := 30 * math.Pi / 180
	want := g * (math.Sin(th) - 0.2*math.Cos(th)) / 0.0254
	_, rows := readTrajectory(t, dir)
	speed := func(at float64) float64 {
		for _, r := range rows {
			if math.Abs(r.t-at) < 1e-9 {
				return math.Sqrt(r.v[7]*r.v[7] + r.v[8]*r.v[8] + r.v[9]*r.v[9])
			}
		}
		t.Fatalf("no row at t = %g", at)
		return 0
	}
	// After 0.2 s of settling into contact, over 1 s.
	if a := speed(1.2) - speed(0.2); relErr(a, want) > tol {
		t.Errorf("a = %.3f in/s2, want %.3f", a, want)
	}
	// The body's speed in the summary is that of the last row, in in/s.
	v := s.Bodies[0].Velocity
	if got := math.Sqrt(v[0]*v[0] + v[1]*v[1] + v[2]*v[2]); math.Abs(got-speed(1.2)) > 1e-6 {
		t.Errorf("final speed %g in/s, last row %g", got, speed(1.2))
	}
}

// inspectDoc is the part of inspect --json that the tests read.
type inspectDoc struct {
	Units        map[string]string `json:"units"`
	Closed       bool              `json:"closed"`
	Volume       float64           `json:"volume"`
	Mass         float64           `json:"mass"`
	CenterOfMass [3]float64        `json:"center_of_mass"`
	Inertia      [3][3]float64     `json:"inertia"`
	Faces        []struct {
		Normal      [3]float64 `json:"normal"`
		Area        float64    `json:"area"`
		Stable      bool       `json:"stable"`
		TipAngle    float64    `json:"tip_angle"`
		Probability float64    `json:"probability"`
		Height      float64    `json:"height"`
	} `json:"faces"`
}

func inspectJSONOf(t *testing.T, args ...string) inspectDoc {
	t.Helper()
	out, errs, code := clatter(t, append([]string{"inspect", "--json", "--quiet"}, args...)...)
	if code != exitOK {
		t.Fatalf("inspect %v: exit %d: %s", args, code, errs)
	}
	var d inspectDoc
	if err := json.Unmarshal([]byte(out), &d); err != nil {
		t.Fatalf("inspect --json: %v\n%s", err, out)
	}
	return d
}

func TestRunDropRestsOnAStableFace(t *testing.T) {
	// testdata/scenes/drop.toml: the bracket dropped onto a floor comes to
	// rest on one of the faces inspect lists, standing on it: its centre of
	// mass is then that face's height above the floor (geometry of the
	// part). 0.5 mm: the solver's contact slop (0.2 mm) plus the tilt it
	// leaves across the face.
	const tol = 0.5
	dir := mustRun(t, "../../testdata/scenes/drop.toml")
	s := readSummary(t, dir)
	if !s.Settled {
		t.Fatal("the bracket did not settle")
	}
	b := s.Bodies[0]
	if b.RestingFace == nil {
		t.Fatal("no resting face")
	}
	part := inspectJSONOf(t, "../../testdata/parts/bracket.stl", "--units", "mm", "--density", "1.05 g/cm3")
	f := part.Faces[*b.RestingFace]
	if !f.Stable {
		t.Errorf("rests on face %d, which inspect says is unstable", *b.RestingFace)
	}
	if math.Abs(b.Position[2]-f.Height) > tol {
		t.Errorf("centre of mass %.3f mm above the floor, face %d puts it at %.3f mm", b.Position[2], *b.RestingFace, f.Height)
	}
	if b.MaxImpactSpeed <= 0 {
		t.Error("no impact recorded")
	}
}

func TestInspectCube(t *testing.T) {
	// testdata/parts/cube.stl: a 20 mm cube. At the default 1000 kg/m3 its
	// mass is 8 g, its inertia m a^2 / 6 = 0.5333 kg mm^2 about each axis
	// (solid box, any dynamics handbook), and it rests on each face with
	// probability 1/6, tipping at 45 degrees (symmetry and statics). The
	// corners are whole millimetres, exact in float32: rounding only.
	const tol = 1e-9
	d := inspectJSONOf(t, "../../testdata/parts/cube.stl", "--units", "mm")
	if d.Units["length"] != "mm" || d.Units["mass"] != "kg" || !d.Closed {
		t.Fatalf("units %v closed %v", d.Units, d.Closed)
	}
	checks := []struct {
		what      string
		got, want float64
	}{
		{"volume mm3", d.Volume, 8000},
		{"mass kg", d.Mass, 0.008},
		{"centre x mm", d.CenterOfMass[0], 10},
		{"Ixx kg mm2", d.Inertia[0][0], 0.008 * 400 / 6},
		{"Izz kg mm2", d.Inertia[2][2], 0.008 * 400 / 6},
	}
	for _, c := range checks {
		if relErr(c.got, c.want) > tol {
			t.Errorf("%s = %.12g, want %.12g", c.what, c.got, c.want)
		}
	}
	if len(d.Faces) != 6 {
		t.Fatalf("%d faces, want 6", len(d.Faces))
	}
	for i, f := range d.Faces {
		if math.Abs(f.Probability-1.0/6) > tol || math.Abs(f.TipAngle-45) > tol || !f.Stable || math.Abs(f.Area-400) > tol {
			t.Errorf("face %d: %+v, want probability 1/6, tip 45 deg, area 400 mm2", i, f)
		}
	}
	// Faces in the order +x, -x, +y, -y, +z, -z.
	if d.Faces[0].Normal != [3]float64{1, 0, 0} || d.Faces[5].Normal != [3]float64{0, 0, -1} {
		t.Errorf("face order: first %v last %v", d.Faces[0].Normal, d.Faces[5].Normal)
	}
}

func TestInspectUnits(t *testing.T) {
	// testdata/parts/box_in.stl is the 40 x 20 x 10 mm box written in
	// inches. In --units in its volume is 8000 mm3 / 25.4^3 in3 (the inch
	// is 25.4 mm exactly); the coordinates went through float32, so 1e-6.
	const tol = 1e-6
	d := inspectJSONOf(t, "../../testdata/parts/box_in.stl", "--units", "in", "--density", "1.2 g/cm3")
	if want := 8000 / math.Pow(25.4, 3); relErr(d.Volume, want) > tol {
		t.Errorf("volume %g in3, want %g", d.Volume, want)
	}
	if want := 8e-6 * 1200; relErr(d.Mass, want) > tol {
		t.Errorf("mass %g kg, want %g", d.Mass, want)
	}
	// Ixx = m (b^2 + c^2) / 12 in kg in^2, b = 20 mm, c = 10 mm.
	if want := 8e-6 * 1200 * (400 + 100) / 12 / (25.4 * 25.4); relErr(d.Inertia[0][0], want) > tol {
		t.Errorf("Ixx %g kg in2, want %g", d.Inertia[0][0], want)
	}
}

func TestInspectTable(t *testing.T) {
	out, errs, code := clatter(t, "inspect", "../../testdata/parts/bracket.stl", "--density", "1.05 g/cm3")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	// The bracket's volume: base 40 x 20 x 5 plus upright 5 x 20 x 30 mm.
	for _, want := range []string{"volume            7000 mm3", "mass              0.00735 kg", "centre of mass    12.5, 10, 10 mm", "tip angle", "probability", "qualified engineer"} {
		if !strings.Contains(out, want) {
			t.Errorf("inspect table lacks %q:\n%s", want, out)
		}
	}
}

func TestRunInterruptedKeepsResults(t *testing.T) {
	// A run stopped from outside (Ctrl-C) is a failed simulation: exit 1,
	// and its files hold the state it reached and the error.
	dir := t.TempDir()
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	var o, e strings.Builder
	code := run(ctx, []string{"run", "../../testdata/scenes/slide.toml", "-o", dir, "--quiet"}, &o, &e)
	if code != exitFailed {
		t.Fatalf("exit %d, want %d; stderr %s", code, exitFailed, e.String())
	}
	s := readSummary(t, dir)
	if !strings.Contains(s.Error, "interrupted") || s.Bodies[0].Position[2] != 25 {
		t.Errorf("summary %+v, want the starting state and the error", s)
	}
	evs := readEvents(t, dir)
	if len(evs) == 0 || evs[len(evs)-1].Event != "error" {
		t.Errorf("events %+v, want an error event", evs)
	}
	if _, rows := readTrajectory(t, dir); len(rows) != 1 || rows[0].t != 0 {
		t.Errorf("trajectory %+v, want the starting row", rows)
	}
}

func TestDemo(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "demo")
	out, errs, code := clatter(t, "demo", "-o", dir, "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"tray friction", "resting face", "settled after", "qualified engineer"} {
		if !strings.Contains(out, want) {
			t.Errorf("demo output lacks %q", want)
		}
	}
	recs := readCSV(t, filepath.Join(dir, "results.csv"))
	if len(recs) != 1+3*8 {
		t.Fatalf("%d rows in results.csv, want a header and 24 runs", len(recs))
	}
	for _, r := range recs[1:] {
		if r[2] == "" || r[3] != "true" {
			t.Errorf("run %v: the part did not come to rest on a face", r)
		}
	}
	// The scene it wrote runs as it is.
	mustRun(t, filepath.Join(dir, "chute.toml"))
}

func TestVerifyCommand(t *testing.T) {
	out, errs, code := clatter(t, "verify")
	if code != exitOK {
		t.Fatalf("exit %d: %s\n%s", code, errs, out)
	}
	n := len(verify.Cases())
	if want := strconv.Itoa(n) + " of " + strconv.Itoa(n) + " cases passed"; !strings.Contains(out, want) || strings.Contains(out, "FAIL") {
		t.Errorf("verify output lacks %q:\n%s", want, out)
	}
	out, _, code = clatter(t, "verify", "--json")
	var rs []verify.Result
	if err := json.Unmarshal([]byte(out), &rs); err != nil || code != exitOK || len(rs) != n {
		t.Fatalf("verify --json: exit %d, %v, %d results", code, err, len(rs))
	}
}

func TestHelp(t *testing.T) {
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"help"}, exitOK, "Commands:"},
		{[]string{"--help"}, exitOK, "Commands:"},
		{[]string{"help", "run"}, exitOK, "Usage: clatter run SCENE.toml"},
		{[]string{"run", "--help"}, exitOK, "trajectory.csv"},
		{[]string{"inspect", "-h"}, exitOK, "--density VALUE"},
		{[]string{"verify", "--help"}, exitOK, "Usage: clatter verify"},
		{[]string{"demo", "--help"}, exitOK, "clatter-demo"},
		{[]string{"sweep", "--help"}, exitOK, "Usage: clatter sweep"},
	} {
		out, errs, code := clatter(t, c.args...)
		if code != c.code || !strings.Contains(out, c.want) {
			t.Errorf("clatter %v: exit %d, stdout lacks %q:\n%s\n%s", c.args, code, c.want, out, errs)
		}
	}
}

func TestRunTableShowsResults(t *testing.T) {
	dir := t.TempDir()
	out, _, code := clatter(t, "run", "../../testdata/scenes/slide.toml", "-o", dir, "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d", code)
	}
	for _, want := range []string{"block", "position (mm)", "resting face", "largest impact (mm/s)", "qualified engineer"} {
		if !strings.Contains(out, want) {
			t.Errorf("run table lacks %q:\n%s", want, out)
		}
	}
}

func TestRunOnTriangleFixture(t *testing.T) {
	// testdata/scenes/fixture.toml: a 10 mm block dropped from a centre
	// height of 40 mm onto the top of a 10 mm high fixture kept as
	// triangles. It rests with its centre at 10 + 5 = 15 mm (geometry),
	// after striking at sqrt(2 g h) with h = 25 mm, 700.2 mm/s (free fall).
	const (
		restTol  = 0.5  // mm: contact slop (0.2 mm) with margin
		speedTol = 0.02 // the impact is found within a step of free fall (g dt = 9.8 mm/s)
	)
	dir := mustRun(t, "../../testdata/scenes/fixture.toml")
	s := readSummary(t, dir)
	b := s.Bodies[0]
	if b.Name != "block" || len(s.Bodies) != 1 {
		t.Fatalf("bodies %+v", s.Bodies)
	}
	if math.Abs(b.Position[2]-15) > restTol || math.Abs(b.Position[0]-20) > restTol {
		t.Errorf("rests at %v mm, want (20, 10, 15)", b.Position)
	}
	if want := math.Sqrt(2 * g * 1000 * 25); relErr(b.MaxImpactSpeed, want) > speedTol {
		t.Errorf("impact %.1f mm/s, want %.1f", b.MaxImpactSpeed, want)
	}
	if b.RestingFace == nil || *b.RestingFace != 5 {
		t.Errorf("resting face %v, want 5 (-z)", b.RestingFace)
	}
	hitFixture := false
	for _, e := range readEvents(t, dir) {
		if e.Event == "impact" && (e.Bodies[0] == "fixture" || e.Bodies[1] == "fixture") {
			hitFixture = true
		}
	}
	if !hitFixture {
		t.Error("no impact on the fixture")
	}
}

func TestInspectRepairedMeshes(t *testing.T) {
	// An open box (no top) gets its convex hull's mass properties, the full
	// 40 x 20 x 10 mm box: 8000 mm3; an inward-facing cube is turned
	// outward: 8000 mm3 (20 mm cube). Both say so on stderr.
	for _, c := range []struct {
		file   string
		closed bool
		warn   string
	}{
		{"open.stl", false, "mass properties taken from its convex hull"},
		{"inward.stl", true, "turned them outward"},
	} {
		out, errs, code := clatter(t, "inspect", "../../testdata/broken/"+c.file, "--json")
		if code != exitOK {
			t.Fatalf("%s: exit %d: %s", c.file, code, errs)
		}
		var d inspectDoc
		if err := json.Unmarshal([]byte(out), &d); err != nil {
			t.Fatal(err)
		}
		if d.Closed != c.closed || math.Abs(d.Volume-8000) > 1e-6 || !strings.Contains(errs, c.warn) {
			t.Errorf("%s: closed %v volume %g, stderr %q", c.file, d.Closed, d.Volume, errs)
		}
	}
}
