package sweep

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// posed is a study whose scene reads a pose table: a plate driven along
// the table's path, away from the part.
const posed = `[world]
step = 0.001
duration = 0.2
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "plate"
driven = true
shape = { box = [0.01, 0.05, 0.02] }
position = [0.3, 0, 0.01]
[[drive]]
body = "plate"
path = "moves/plate.csv"
[[body]]
name = "part"
shape = { box = [0.02, 0.015, 0.01] }
density = 1050
position = [0, 0, 0.05]
[sweep]
trials = 2
seed = 5
[sweep.randomize]
orientation = ["part"]
`

const plateMoves = "time,x,y,z\n0,0,0,0\n0.1,0.01,0,0\n"

// posedStudy writes the study and its pose table into a folder and opens it.
func posedStudy(t *testing.T, moves string) (*Study, string) {
	t.Helper()
	dir := t.TempDir()
	os.MkdirAll(filepath.Join(dir, "moves"), 0o755)
	os.WriteFile(filepath.Join(dir, "moves", "plate.csv"), []byte(moves), 0o644)
	os.WriteFile(filepath.Join(dir, "study.toml"), []byte(posed), 0o644)
	st, err := Open(filepath.Join(dir, "study.toml"))
	if err != nil {
		t.Fatal(err)
	}
	return st, dir
}

func TestIdentityHoldsEveryInput(t *testing.T) {
	// sweep.json records the digest of the pose table (a file the scene
	// reads, not a mesh) and the build, GOARCH included.
	st, _ := posedStudy(t, plateMoves)
	m := st.Meta()
	if len(m.Inputs) != 1 || m.Inputs[0].File != "moves/plate.csv" || m.Inputs[0].SHA256 != digest([]byte(plateMoves)) {
		t.Errorf("inputs %+v, want the pose table moves/plate.csv and its SHA-256", m.Inputs)
	}
	if m.Build.Arch != runtime.GOARCH || m.Build.Go != runtime.Version() || m.Build.Module == "" {
		t.Errorf("build %+v, want %s, %s and the module version", m.Build, runtime.GOARCH, runtime.Version())
	}
}

func TestResumeAndMergeRefuseOtherInputs(t *testing.T) {
	// A changed pose table and another architecture are named when a
	// folder is resumed or shards are merged.
	st, _ := posedStudy(t, plateMoves)
	changed, _ := posedStudy(t, strings.Replace(plateMoves, "0.01,0,0", "0.02,0,0", 1))
	var shards []string
	for k := 1; k <= 2; k++ {
		_, d := runAll(t, st, Options{Shard: Shard{Index: k, Count: 2}})
		shards = append(shards, d)
	}
	_, err := changed.Run(context.Background(), Options{Dir: shards[0], Version: "test", Shard: Shard{Index: 1, Count: 2}, Resume: true})
	if !errors.Is(err, ErrBadInput) || !strings.Contains(err.Error(), "its file moves/plate.csv has SHA-256") {
		t.Errorf("resuming with a changed pose table: %v", err)
	}
	_, changedDir := runAll(t, changed, Options{Shard: Shard{Index: 2, Count: 2}})
	if _, err := Merge([]string{shards[0], changedDir}, t.TempDir()); !errors.Is(err, ErrBadInput) || !strings.Contains(err.Error(), "moves/plate.csv") {
		t.Errorf("merging shards of two pose tables: %v", err)
	}

	// The second shard as if run on another architecture.
	other := "arm64"
	if runtime.GOARCH == other {
		other = "amd64"
	}
	p := filepath.Join(shards[1], MetaFile)
	b, _ := os.ReadFile(p)
	os.WriteFile(p, []byte(strings.Replace(string(b), `"arch": "`+runtime.GOARCH+`"`, `"arch": "`+other+`"`, 1)), 0o644)
	want := "it was run on " + other + ", not " + runtime.GOARCH
	if _, err := Merge(shards, t.TempDir()); !errors.Is(err, ErrBadInput) || !strings.Contains(err.Error(), want) {
		t.Errorf("merging shards of two architectures: %v, want %q", err, want)
	}
	_, err = st.Run(context.Background(), Options{Dir: shards[1], Version: "test", Shard: Shard{Index: 2, Count: 2}, Resume: true})
	if !errors.Is(err, ErrBadInput) || !strings.Contains(err.Error(), want) {
		t.Errorf("resuming another architecture's folder: %v, want %q", err, want)
	}
}
