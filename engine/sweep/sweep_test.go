package sweep

import (
	"bytes"
	"context"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"clatter/engine/scene"
	"clatter/shapes"
	"clatter/shapes/resting"

	"gonum.org/v1/gonum/stat/distuv"
)

func newStudy(t *testing.T, src string) *Study {
	t.Helper()
	st, err := New([]byte(src), "study.toml", scene.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return st
}

// runAll runs a study into a new folder and finishes it.
func runAll(t *testing.T, st *Study, opt Options) (*Result, string) {
	t.Helper()
	if opt.Dir == "" {
		opt.Dir = t.TempDir()
	}
	if opt.Version == "" {
		opt.Version = "test"
	}
	if _, err := st.Run(context.Background(), opt); err != nil {
		t.Fatal(err)
	}
	res, err := Finish(opt.Dir)
	if err != nil {
		t.Fatal(err)
	}
	return res, opt.Dir
}

// sameFolders fails unless two folders hold the same files, byte for byte.
func sameFolders(t *testing.T, what, a, b string) {
	t.Helper()
	list := func(d string) []string {
		ents, err := os.ReadDir(d)
		if err != nil {
			t.Fatal(err)
		}
		var n []string
		for _, e := range ents {
			n = append(n, e.Name())
		}
		return n
	}
	na, nb := list(a), list(b)
	if strings.Join(na, " ") != strings.Join(nb, " ") {
		t.Fatalf("%s: files %v and %v", what, na, nb)
	}
	for _, n := range na {
		x, _ := os.ReadFile(filepath.Join(a, n))
		y, _ := os.ReadFile(filepath.Join(b, n))
		if !bytes.Equal(x, y) {
			t.Errorf("%s: %s differs (%d and %d bytes)", what, n, len(x), len(y))
		}
	}
}

// cubeDrop is a 20 mm cube dropped at uniformly random orientations onto a
// floor, from heights of 40 to 80 mm, with position jitter and spin.
const cubeDrop = `units = { length = "mm", mass = "g" }
[world]
step = 0.001
duration = 3.0
[material.abs]
friction = 0.4
restitution = 0.3
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "abs"
[[body]]
name = "cube"
shape = { box = [20, 20, 20] }
material = "abs"
density = "1.05 g/cm3"
position = [0, 0, 60]
[sweep]
trials = 240
seed = 11
[sweep.randomize]
orientation = ["cube"]
position = { cube = [5, 5, 0] }
height = { cube = [40, 80] }
spin = { cube = [0, 5] }
`

func TestCubeRestsOnEachFaceEqually(t *testing.T) {
	// By symmetry a cube dropped at a uniformly random orientation rests
	// on each face with probability 1/6 (symmetry). Pearson's
	// chi-square test of the six counts against 1/6 each, 5 degrees of
	// freedom, at the 0.1 percent level (gonum's chi-square quantile); and
	// every trial settles on a face.
	const level = 0.001
	res, _ := runAll(t, newStudy(t, cubeDrop), Options{})
	var counts []float64
	var n int64
	for _, r := range res.Rows {
		if r.Face < 0 {
			t.Errorf("%d trials ended on no face", r.Count)
			continue
		}
		counts = append(counts, float64(r.Count))
		n = r.Trials
	}
	if len(counts) != 6 || res.Settled != n {
		t.Fatalf("rows %+v, %d of %d settled", res.Rows, res.Settled, n)
	}
	chi2 := 0.0
	for _, k := range counts {
		e := float64(n) / 6
		chi2 += (k - e) * (k - e) / e
	}
	crit := distuv.ChiSquared{K: 5}.Quantile(1 - level)
	t.Logf("face counts %v of %d, chi-square %.2f (critical %.2f)", counts, n, chi2, crit)
	if chi2 > crit {
		t.Errorf("face counts %v of %d: chi-square %.2f above %.2f", counts, n, chi2, crit)
	}
	// Without varied keys the face plot is one chart of the faces.
	if strings.Join(res.Meta.Files, " ") != "trials.csv cases.csv face-down.csv faces-cube.png settle-times.png" {
		t.Errorf("files %v", res.Meta.Files)
	}
	// The quasi-static probability of each face is 1/6 too (solid angle
	// of a face seen from the centre: 4 pi / 6).
	for _, r := range res.Rows {
		if math.Abs(r.QuasiStatic-1.0/6) > 1e-9 {
			t.Errorf("face %d: quasi-static %g, want 1/6", r.Face, r.QuasiStatic)
		}
	}
}

// longBox is a 10 x 20 x 40 mm box let go just above a floor (its centre
// 24 mm up, 1 mm more than half its diagonal) at random orientations; the
// floor's restitution and friction are varied.
const longBox = `units = { length = "mm", mass = "g" }
[world]
step = 0.001
duration = 3.0
rest_time = 0.1
[material.floor]
friction = 0.5
restitution = 0.3
[material.part]
friction = 0.5
restitution = 0.3
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "floor"
[[body]]
name = "bar"
shape = { box = [10, 20, 40] }
material = "part"
density = "1 g/cm3"
position = [0, 0, 24]
[sweep]
trials = 400
seed = 3
group_faces = true
[[sweep.vary]]
key = "material.floor.restitution"
values = [0.8, 0.0]
[[sweep.vary]]
key = "material.floor.friction"
values = [0.05, 1.0]
[sweep.randomize]
orientation = ["bar"]
`

func TestLongBoxTowardQuasiStatic(t *testing.T) {
	// The quasi-static probabilities (Wiegley, Rao and Goldberg 1992, as
	// clatter inspect computes them) describe a part let go at rest on its
	// support that pivots onto a face without bouncing or sliding. A real
	// drop differs: the part arrives with kinetic energy that carries it
	// over the edges of the narrow faces onto the broad ones (the lowest
	// centre of mass), restitution adds bounces, and low friction lets it
	// slide instead of pivot. So as restitution falls and friction rises
	// the fractions must move toward the quasi-static ones: the total
	// variation distance of the dead, grippy case is below the bouncy,
	// slippery one's by at least minGain, and the dead, grippy case agrees
	// with the quasi-static probabilities by Pearson's chi-square test at
	// the 1 percent level (2 degrees of freedom: three groups of opposite
	// faces).
	const (
		level   = 0.01
		minGain = 0.03 // the bouncy case's excess is about 0.07; a distance over 400 trials has a noise of about 0.02
	)
	res, _ := runAll(t, newStudy(t, longBox), Options{})
	tv := map[[2]float64]float64{}
	chi := map[[2]float64]float64{}
	for _, r := range res.Rows {
		key := [2]float64{r.Values[0], r.Values[1]}
		if r.Face < 0 {
			tv[key] += r.Fraction / 2
			continue
		}
		tv[key] += math.Abs(r.Fraction-r.QuasiStatic) / 2
		e := float64(r.Trials) * r.QuasiStatic
		chi[key] += (float64(r.Count) - e) * (float64(r.Count) - e) / e
	}
	for k, d := range tv {
		t.Logf("restitution %g friction %g: distance to quasi-static %.3f, chi-square %.2f", k[0], k[1], d, chi[k])
	}
	// Faces grouped: +x with -x (0), +y with -y (2), +z with -z (4).
	for _, r := range res.Rows {
		if r.Face != 0 && r.Face != 2 && r.Face != 4 && r.Face != -1 {
			t.Errorf("face %d listed: the faces of a box should be grouped as 0, 2 and 4", r.Face)
		}
	}
	bouncy, dead := [2]float64{0.8, 0.05}, [2]float64{0, 1}
	if !(tv[dead]+minGain < tv[bouncy]) {
		t.Errorf("distance to quasi-static %.3f for the dead, grippy floor, %.3f for the bouncy, slippery one: want it at least %.2f smaller", tv[dead], tv[bouncy], minGain)
	}
	if crit := (distuv.ChiSquared{K: 2}).Quantile(1 - level); chi[dead] > crit {
		t.Errorf("dead, grippy floor: chi-square %.2f against the quasi-static probabilities, above %.2f", chi[dead], crit)
	}
}

// small is a quick study of two cases: a box with a mesh-free shape,
// dropped with every kind of draw.
const small = `[world]
step = 0.001
duration = 1.5
[material.abs]
friction = 0.4
restitution = 0.4
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "abs"
[[body]]
name = "part, \"A\""
shape = { box = [0.02, 0.015, 0.01] }
material = "abs"
density = 1050
position = [0, 0, 0.05]
[sweep]
trials = 9
seed = 5
[[sweep.vary]]
key = "material.abs.friction"
from = 0.1
to = 0.8
count = 2
log = true
[sweep.randomize]
orientation = ["part, \"A\""]
position = { "part, \"A\"" = [0.005, 0.005, 0] }
height = { "part, \"A\"" = [0.03, 0.06] }
velocity = { "part, \"A\"" = [0.1, 0.1, 0] }
spin = { "part, \"A\"" = 4 }
`

func TestSameResultsHoweverRun(t *testing.T) {
	// One worker, two workers, three shards merged, and a run interrupted
	// then resumed, with a torn last row: the same folder, byte for byte.
	st := newStudy(t, small)
	_, one := runAll(t, st, Options{Workers: 1})
	_, two := runAll(t, st, Options{Workers: 2})
	sameFolders(t, "-j 1 and -j 2", one, two)

	var shards []string
	for k := 1; k <= 3; k++ {
		_, d := runAll(t, st, Options{Workers: 2, Shard: Shard{Index: k, Count: 3}})
		shards = append(shards, d)
	}
	merged := t.TempDir()
	if _, err := Merge([]string{shards[2], shards[0], shards[1]}, merged); err != nil {
		t.Fatal(err)
	}
	sameFolders(t, "one run and 3 shards merged", one, merged)

	dir := t.TempDir()
	ctx, cancel := context.WithCancel(context.Background())
	_, err := st.Run(ctx, Options{Dir: dir, Workers: 2, Version: "test", Progress: func(done, total int64) {
		if done == 5 {
			cancel()
		}
	}})
	cancel()
	if !errors.Is(err, ErrInterrupted) {
		t.Fatalf("interrupted run: %v", err)
	}
	f, err := os.OpenFile(filepath.Join(dir, TrialsFile), os.O_APPEND|os.O_WRONLY, 0)
	if err != nil {
		t.Fatal(err)
	}
	f.WriteString("1,8,123,0.8,\"part, \"\"A\"\"\",3,tr") // a row cut off mid-write
	f.Close()
	if _, err := st.Run(context.Background(), Options{Dir: dir, Workers: 2, Version: "test"}); err == nil || !strings.Contains(err.Error(), "--resume") {
		t.Errorf("a second run into the folder without Resume: %v, want a refusal", err)
	}
	info, err := st.Run(context.Background(), Options{Dir: dir, Workers: 1, Version: "test", Resume: true})
	if err != nil {
		t.Fatal(err)
	}
	if !info.Torn || info.Skipped < 5 || info.Skipped+info.Ran != 18 {
		t.Errorf("resume: %+v, want the torn row dropped, at least 5 trials kept and the rest run", info)
	}
	if _, err := Finish(dir); err != nil {
		t.Fatal(err)
	}
	sameFolders(t, "one run and an interrupted, resumed run", one, dir)
	// Finishing again, and resuming a finished folder, change nothing.
	if info, err := st.Run(context.Background(), Options{Dir: dir, Version: "test", Resume: true}); err != nil || info.Ran != 0 {
		t.Errorf("resuming a finished sweep: %+v, %v", info, err)
	}
	if _, err := Finish(dir); err != nil {
		t.Fatal(err)
	}
	sameFolders(t, "a finished folder finished again", one, dir)

	b, _ := os.ReadFile(filepath.Join(one, TrialsFile))
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	if lines[0] != "case,trial,seed,material.abs.friction,body,resting_face,settled,settled_at,x,y,z,qw,qx,qy,qz,max_impact_speed,face_down" || len(lines) != 19 {
		t.Errorf("trials.csv: header %q and %d rows, want the documented header and 18 rows", lines[0], len(lines)-1)
	}
	if !strings.HasPrefix(lines[1], "0,0,") || !strings.Contains(lines[1], `,"part, ""A""",`) || !strings.HasPrefix(lines[18], "1,8,") {
		t.Errorf("rows not in case and trial order, or the body's name not quoted: %q ... %q", lines[1], lines[18])
	}
	c, _ := os.ReadFile(filepath.Join(one, CasesFile))
	if !strings.HasPrefix(string(c), "case,material.abs.friction,body,resting_face,count,trials,fraction,low,high\n") {
		t.Errorf("cases.csv header: %q", strings.SplitN(string(c), "\n", 2)[0])
	}
}

func TestFoldersOfOtherStudiesRefused(t *testing.T) {
	st := newStudy(t, small)
	var shards []string
	for k := 1; k <= 2; k++ {
		_, d := runAll(t, st, Options{Shard: Shard{Index: k, Count: 2}})
		shards = append(shards, d)
	}
	// The same scene but another seed, another friction, another version.
	otherSeed := newStudy(t, strings.Replace(small, "seed = 5", "seed = 6", 1))
	otherScene := newStudy(t, strings.Replace(small, "friction = 0.4", "friction = 0.41", 1))
	_, seedDir := runAll(t, otherSeed, Options{Shard: Shard{Index: 2, Count: 2}})
	_, sceneDir := runAll(t, otherScene, Options{Shard: Shard{Index: 2, Count: 2}})
	_, versionDir := runAll(t, st, Options{Shard: Shard{Index: 2, Count: 2}, Version: "other"})
	_, threeDir := runAll(t, st, Options{Shard: Shard{Index: 2, Count: 3}})
	partial := t.TempDir()
	ctx, cancel := context.WithCancel(context.Background())
	st.Run(ctx, Options{Dir: partial, Version: "test", Workers: 1, Shard: Shard{Index: 2, Count: 2}, Progress: func(done, _ int64) {
		if done == 2 {
			cancel()
		}
	}})
	cancel()
	for _, c := range []struct {
		name string
		dirs []string
		want string
	}{
		{"another seed", []string{shards[0], seedDir}, "its seed is 6, not 5"},
		{"another scene", []string{shards[0], sceneDir}, "its scene study.toml has SHA-256"},
		{"another version", []string{shards[0], versionDir}, `version "other", not "test"`},
		{"another shard count", []string{shards[0], threeDir}, "is shard 2 of 3"},
		{"a shard twice", []string{shards[0], shards[0]}, "shard 1/2 is given twice"},
		{"a shard missing", []string{shards[1]}, "shards [1] of 2 are missing"},
		{"an unfinished shard", []string{shards[0], partial}, "finish it with clatter sweep --resume"},
		{"merging into a shard", []string{shards[0], shards[1]}, "is one of the shards"},
	} {
		out := t.TempDir()
		if c.name == "merging into a shard" {
			out = shards[1]
		}
		_, err := Merge(c.dirs, out)
		if !errors.Is(err, ErrBadInput) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want a refusal with %q", c.name, err, c.want)
		}
	}
	// Resuming a folder with another study is refused too.
	_, err := otherScene.Run(context.Background(), Options{Dir: shards[0], Version: "test", Shard: Shard{Index: 1, Count: 2}, Resume: true})
	if !errors.Is(err, ErrBadInput) || !strings.Contains(err.Error(), "cannot resume") {
		t.Errorf("resuming with another scene: %v", err)
	}
	_, err = st.Run(context.Background(), Options{Dir: shards[0], Version: "test", Shard: Shard{Index: 2, Count: 2}, Resume: true})
	if !errors.Is(err, ErrBadInput) || !strings.Contains(err.Error(), "give each shard its own folder") {
		t.Errorf("resuming shard 1's folder as shard 2: %v", err)
	}
}

func TestDraws(t *testing.T) {
	// Every draw stays in its range: position within +- the jitter, the
	// height in [low, high] (here z, against gravity), velocity within
	// +- its jitter, spin of size in [low, high]; and the spin axis is
	// uniform on the sphere, so its mean over many trials is near zero
	// (within 4 standard errors: each component has variance 1/3).
	st := newStudy(t, small)
	const n = 4000
	sc := *st.Scene
	base := st.Scene.Bodies[1]
	var axisSum shapes.Vec3
	for i := 0; i < n; i++ {
		sc.Bodies = append([]scene.Body(nil), st.Scene.Bodies...)
		st.drawStart(trialRand(TrialSeed(5, 0, int64(i))), &sc)
		b := sc.Bodies[1]
		d := b.Position.Sub(base.Position)
		if math.Abs(d[0]) > 0.005 || math.Abs(d[1]) > 0.005 || b.Position[2] < 0.03 || b.Position[2] > 0.06 {
			t.Fatalf("position %v outside the draw's ranges", b.Position)
		}
		if v := b.Velocity; math.Abs(v[0]) > 0.1 || math.Abs(v[1]) > 0.1 || v[2] != 0 {
			t.Fatalf("velocity %v outside +- 0.1 m/s", v)
		}
		if s := b.Spin.Len(); s > 4 {
			t.Fatalf("spin %g rad/s above 4", s)
		}
		if s := b.Spin.Len(); s > 0 {
			axisSum = axisSum.Add(b.Spin.Mul(1 / s))
		}
		if math.Abs(b.Orientation.Len()-1) > 1e-12 {
			t.Fatalf("orientation %v not a unit quaternion", b.Orientation)
		}
	}
	if m := axisSum.Mul(1.0 / n); m.Len() > 4*math.Sqrt(1.0/3/n)*math.Sqrt(3) {
		t.Errorf("mean spin axis %v, want near zero", m)
	}
	if st.Scene.Bodies[1].Position != base.Position {
		t.Error("the draws changed the study's scene")
	}
}

func TestMetaRecordsTheStudy(t *testing.T) {
	st := newStudy(t, small)
	res, dir := runAll(t, st, Options{Shard: Shard{Index: 2, Count: 2}})
	m, err := ReadMeta(dir)
	if err != nil {
		t.Fatal(err)
	}
	if m.Seed != 5 || m.Cases != 2 || m.Trials != 9 || m.Version != "test" || !m.Complete ||
		m.Shard == nil || m.Shard.From != 9 || m.Shard.To != 18 || m.TrialsDone != 9 || len(m.Vary) != 1 || !m.Vary[0].Log {
		t.Errorf("sweep.json %+v", m)
	}
	if len(m.Scene.SHA256) != 64 || m.Scene.File != "study.toml" {
		t.Errorf("scene digest %+v", m.Scene)
	}
	// A geometric series from 0.1 to 0.8 in 2 values.
	if v := m.Vary[0].Values; len(v) != 2 || v[0] != 0.1 || v[1] != 0.8 {
		t.Errorf("values %v", v)
	}
	// The box's faces as inspect lists them: +x, -x, +y, -y, +z, -z, the
	// quasi-static probabilities summing to 1.
	b := m.Bodies[0]
	sum := 0.0
	for _, f := range b.Faces {
		sum += f.Probability
	}
	if b.Name != `part, "A"` || len(b.Faces) != 6 || *b.Faces[0].Normal != [3]float64{1, 0, 0} || *b.Faces[5].Normal != [3]float64{0, 0, -1} || math.Abs(sum-1) > 1e-9 {
		t.Errorf("body %+v", b)
	}
	for _, f := range m.Files {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("listed file %s: %v", f, err)
		}
	}
	if len(res.Rows) == 0 || res.Rows[0].Case != 1 {
		t.Errorf("shard 2 of 2 holds case 1 only: %+v", res.Rows)
	}
}

func TestMeshDigest(t *testing.T) {
	// A mesh part's file is part of the study's identity.
	dir := t.TempDir()
	stl, err := os.ReadFile("../../testdata/parts/bracket.stl")
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(dir, "part.stl"), stl, 0o644)
	src := strings.Replace(small, `shape = { box = [0.02, 0.015, 0.01] }`, `shape = { mesh = "part.stl", units = "mm" }`, 1)
	os.WriteFile(filepath.Join(dir, "s.toml"), []byte(src), 0o644)
	st, err := Open(filepath.Join(dir, "s.toml"))
	if err != nil {
		t.Fatal(err)
	}
	m := st.Meta()
	if len(m.Inputs) != 1 || m.Inputs[0].File != "part.stl" || m.Inputs[0].SHA256 != digest(stl) {
		t.Errorf("inputs %+v", m.Inputs)
	}
	faces, err := resting.OfHull(st.Scene.Bodies[1].Part.Hull, st.Scene.Bodies[1].Props.Center)
	if err != nil || len(m.Bodies[0].Faces) != len(faces) {
		t.Errorf("%d faces recorded, inspect lists %d (%v)", len(m.Bodies[0].Faces), len(faces), err)
	}
}

func TestExampleStudiesRead(t *testing.T) {
	// The shipped example studies read without errors or warnings.
	files, err := filepath.Glob("../../testdata/sweeps/*.toml")
	if err != nil || len(files) < 2 {
		t.Fatalf("examples %v, %v", files, err)
	}
	for _, f := range files {
		st, err := Open(f)
		if err != nil {
			t.Errorf("%s: %v", f, err)
			continue
		}
		if len(st.Warnings) > 0 {
			t.Errorf("%s: warnings %q", f, st.Warnings)
		}
	}
}
