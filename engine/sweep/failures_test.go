package sweep

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestFailedTrialsFinishTheStudy(t *testing.T) {
	// A trial whose simulation fails is a finished trial: the study ends
	// complete with it counted in sweep.json and explained in
	// failures.csv (the command then exits 3, not 1, so that a scheduler
	// does not run it again), and a resume has nothing left to run. The
	// reader refuses speeds that could diverge, so the test sets the draw
	// after reading: a velocity jitter of 1e300 m/s, whose energy is not
	// finite after one step.
	st := newStudy(t, small)
	for i := range st.draws {
		if !st.Scene.Bodies[i].Static {
			st.draws[i].velocity = [3]float64{1e300, 0, 0}
		}
	}
	res, dir := runAll(t, st, Options{Workers: 2})
	m := res.Meta
	if !m.Complete || m.TrialsFailed != m.TrialsTotal || m.TrialsDone != m.TrialsTotal {
		t.Fatalf("meta %+v: want a complete study with every trial failed", m)
	}
	b, err := os.ReadFile(filepath.Join(dir, FailuresFile))
	if err != nil || !strings.Contains(string(b), "diverged") || !strings.Contains(string(b), "on body") {
		t.Errorf("failures.csv: %v\n%s", err, b)
	}
	info, err := st.Run(context.Background(), Options{Dir: dir, Version: "test", Resume: true})
	if err != nil || info.Ran != 0 {
		t.Errorf("resuming a study with failed trials: %+v, %v; want nothing to run", info, err)
	}
}
