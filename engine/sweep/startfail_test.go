package sweep

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// crowded has two 20 mm cubes side by side, 24 mm apart centre to centre,
// and jitters the second by up to 10 mm along x: a draw below -4 mm puts
// it inside the first (a draw of x uniform in [-10, 10] mm does so in
// 3 of 10 trials on average).
const crowded = `[world]
step = 0.001
duration = 0.05
[material.abs]
friction = 0.4
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "abs"
[[body]]
name = "left"
shape = { box = [0.02, 0.02, 0.02] }
material = "abs"
density = 1050
position = [0, 0, 0.0101]
[[body]]
name = "right"
shape = { box = [0.02, 0.02, 0.02] }
material = "abs"
density = 1050
position = [0.024, 0, 0.0101]
[sweep]
trials = 20
seed = 3
[sweep.randomize]
position = { right = [0.01, 0, 0] }
`

func TestOverlappingDrawFailsOnlyItsTrial(t *testing.T) {
	// A random start that puts one body inside another is that trial's
	// failure, explained in failures.csv; the other trials run and the
	// study ends complete (the command then exits 3).
	st := newStudy(t, crowded)
	res, dir := runAll(t, st, Options{Workers: 2})
	m := res.Meta
	if !m.Complete || m.TrialsDone != m.TrialsTotal {
		t.Fatalf("meta %+v: want a complete study", m)
	}
	if m.TrialsFailed == 0 || m.TrialsFailed == m.TrialsTotal {
		t.Fatalf("%d of %d trials failed; want some (the overlapping draws), not all", m.TrialsFailed, m.TrialsTotal)
	}
	b, err := os.ReadFile(filepath.Join(dir, FailuresFile))
	if err != nil || int64(strings.Count(string(b), "inside body")) != m.TrialsFailed {
		t.Errorf("failures.csv: %v\n%s", err, b)
	}
	f, err := os.Open(filepath.Join(dir, "trials.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("trials.csv is not CSV: %v", err)
	}
	unsettled := int64(0)
	for _, r := range rows[1:] {
		if r[5] == "false" {
			unsettled++
		}
	}
	// Each failed trial has both moving bodies unsettled.
	if unsettled < 2*m.TrialsFailed {
		t.Errorf("%d unsettled rows for %d failed trials", unsettled, m.TrialsFailed)
	}
}
