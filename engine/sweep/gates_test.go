package sweep

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"clatter/engine/scene"

	"gonum.org/v1/gonum/stat/distuv"
)

// cubeOnBelt drops a 20 mm cube at uniformly random orientations onto a
// conveyor belt running at 300 mm/s, which carries it through a gate.
const cubeOnBelt = `units = { length = "mm", mass = "g" }
[world]
step = 0.001
duration = 1.2
until_settled = false
[material.abs]
friction = 0.4
restitution = 0.3
[[body]]
name = "belt"
static = true
shape = { box = [2000, 300, 10] }
position = [0, 0, -5]
material = "abs"
[[drive]]
body = "belt"
conveyor = [300, 0, 0]
[[gate]]
name = "end"
at = [100, 0, 0]
normal = [1, 0, 0]
wanted = [4, 5]
[[body]]
name = "cube"
shape = { box = [20, 20, 20] }
material = "abs"
density = "1.05 g/cm3"
position = [-60, 0, 60]
[sweep]
trials = 240
seed = 5
[sweep.randomize]
orientation = ["cube"]
position = { cube = [5, 5, 0] }
height = { cube = [40, 80] }
spin = { cube = [0, 5] }
`

func TestCubeOnABeltCountedOnEachFace(t *testing.T) {
	// A cube dropped at a uniformly random orientation lands on each face
	// with probability 1/6 by symmetry, so a gate past the drop counts
	// each face_down about a sixth of the time: Pearson's chi-square test
	// of the six counts, 5 degrees of freedom, at the 0.1 percent level
	// (gonum's chi-square quantile), as for the cube dropped on a floor.
	// Every trial's cube passes the gate exactly once, and the orienting
	// efficiency for the faces 4 and 5 counts those rows.
	const level = 0.001
	res, dir := runAll(t, newStudy(t, cubeOnBelt), Options{})
	var counts []float64
	var total, wanted int64
	for _, r := range res.GateRows {
		if r.Gate != "end" || r.Body != "cube" || r.FaceDown < 0 || r.Trials != 240 {
			t.Fatalf("row %+v", r)
		}
		counts = append(counts, float64(r.Count))
		total += r.Count
		if r.FaceDown >= 4 {
			wanted += r.Count
		}
		if math.Abs(r.QuasiStatic-1.0/6) > 1e-9 || !(r.Low <= r.Fraction && r.Fraction <= r.High) {
			t.Errorf("row %+v: quasi-static 1/6 and the fraction within its interval", r)
		}
		if wantRate := float64(r.Count) / (240 * 1.2 / 60); math.Abs(r.Rate-wantRate) > 1e-9*wantRate {
			t.Errorf("face %d: rate %g per minute, want %g", r.FaceDown, r.Rate, wantRate)
		}
	}
	if len(counts) != 6 || total != 240 {
		t.Fatalf("face_down counts %v, %d crossings; want 6 faces and 240", counts, total)
	}
	chi2 := 0.0
	for _, k := range counts {
		e := float64(total) / 6
		chi2 += (k - e) * (k - e) / e
	}
	crit := distuv.ChiSquared{K: 5}.Quantile(1 - level)
	t.Logf("face_down counts %v of %d, chi-square %.2f (critical %.2f)", counts, total, chi2, crit)
	if chi2 > crit {
		t.Errorf("face_down counts %v: chi-square %.2f above %.2f", counts, chi2, crit)
	}
	if len(res.Efficiencies) != 1 || res.Efficiencies[0].Count != wanted || res.Efficiencies[0].Fed != 240 {
		t.Errorf("efficiencies %+v, want %d of 240", res.Efficiencies, wanted)
	}
	b, err := os.ReadFile(filepath.Join(dir, CrossingsFile))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	if lines[0] != crossingsHeader || len(lines) != 241 || !strings.HasPrefix(lines[1], "0,0,end,cube,") || !strings.HasPrefix(lines[240], "0,239,end,cube,") {
		t.Errorf("crossings.csv: %d lines, %q ... %q", len(lines), lines[0], lines[len(lines)-1])
	}
}

func TestGateStudySameHoweverRun(t *testing.T) {
	// The crossings and gate counts are the same bytes on one worker or
	// three.
	src := strings.Replace(cubeOnBelt, "trials = 240", "trials = 12", 1)
	_, one := runAll(t, newStudy(t, src), Options{Workers: 1})
	_, three := runAll(t, newStudy(t, src), Options{Workers: 3})
	sameFolders(t, "one worker and three", one, three)
}

func TestFeederExamplesRead(t *testing.T) {
	// The feeder examples read without errors or warnings: the wiper
	// study opens as a study with its gates and wanted faces, the bowl
	// (a single run) as a scene.
	st, err := Open("../../testdata/feeder/wiper.toml")
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Warnings) > 0 || len(st.meta.Gates) != 2 || len(st.meta.Gates[0].Wanted) != 2 {
		t.Errorf("wiper: warnings %q, gates %+v", st.Warnings, st.meta.Gates)
	}
	s, err := scene.Load("../../testdata/feeder/bowl.toml")
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Warnings) > 0 || len(s.Gates) != 1 || len(s.Bodies) != 52 || !s.Bodies[1].Triangles || !s.Bodies[1].Driven {
		t.Errorf("bowl: warnings %q, %d gates, %d bodies", s.Warnings, len(s.Gates), len(s.Bodies))
	}
}

func TestGateStudyResumedAfterACrash(t *testing.T) {
	// A crash can leave a trial's crossings written, in whole or in part,
	// without its rows in trials.csv. Resumed, the folder finishes to the
	// same bytes as a study never interrupted.
	src := strings.Replace(cubeOnBelt, "trials = 240", "trials = 6", 1)
	_, clean := runAll(t, newStudy(t, src), Options{Workers: 1})
	dir := t.TempDir()
	st := newStudy(t, src)
	if _, err := st.Run(context.Background(), Options{Dir: dir, Version: "test", Workers: 1}); err != nil {
		t.Fatal(err)
	}
	// Drop the last two trials from trials.csv, and leave in
	// crossings.csv the start of another group of crossings of the last,
	// as a crash in the middle of writing it would.
	tp := filepath.Join(dir, TrialsFile)
	b, _ := os.ReadFile(tp)
	lines := strings.SplitAfter(string(b), "\n")
	if err := os.WriteFile(tp, []byte(strings.Join(lines[:len(lines)-3], "")), 0o644); err != nil {
		t.Fatal(err)
	}
	cp := filepath.Join(dir, CrossingsFile)
	c, _ := os.ReadFile(cp)
	if err := os.WriteFile(cp, append(c, "0,5,end,cube,0.5,3\n0,5,en"...), 0o644); err != nil {
		t.Fatal(err)
	}
	if info, err := st.Run(context.Background(), Options{Dir: dir, Version: "test", Workers: 1, Resume: true}); err != nil || info.Ran != 2 {
		t.Fatalf("resumed: %+v, %v", info, err)
	}
	if _, err := Finish(dir); err != nil {
		t.Fatal(err)
	}
	sameFolders(t, "resumed and clean", clean, dir)
}

func TestWantedFaceMustExist(t *testing.T) {
	// A cube has faces 0 to 5; a gate that wants face 9 is refused before
	// any trial runs, with the faces it has.
	src := strings.Replace(cubeOnBelt, "wanted = [4, 5]", "wanted = [4, 9]", 1)
	_, err := New([]byte(src), "study.toml", scene.Options{})
	if err == nil || !strings.Contains(err.Error(), `gate "end": wanted face 9 does not exist on body "cube", which has faces 0 to 5`) {
		t.Errorf("error %v", err)
	}
}
