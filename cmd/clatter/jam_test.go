package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestJammedStudyExitsThree runs, through the command, a study whose every
// trial jams a carton between a driven pusher and a fixed wall: the study
// finishes, writes each trial's cause to failures.csv and exits 3 (a
// finished study with failed trials); run on the same scene exits 1 and
// names the jammed body and both bodies that jam it.
func TestJammedStudyExitsThree(t *testing.T) {
	scene := filepath.Join("testdata", "jam", "jam.toml")
	dir := filepath.Join(t.TempDir(), "study")
	_, stderr, code := clatter(t, "sweep", scene, "-o", dir, "-q")
	if code != exitTrials {
		t.Fatalf("sweep exit %d, want %d (trials failed); stderr:\n%s", code, exitTrials, stderr)
	}
	b, err := os.ReadFile(filepath.Join(dir, "failures.csv"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	if len(lines) != 3 { // header and the two trials
		t.Fatalf("failures.csv has %d lines, want a header and 2 rows:\n%s", len(lines), b)
	}
	for _, l := range lines[1:] {
		if !strings.Contains(l, `""carton"" is jammed`) || !strings.Contains(l, `""pusher""`) || !strings.Contains(l, `""wall""`) {
			t.Errorf("failure row does not name the jammed carton, the pusher and the wall: %s", l)
		}
	}
	_, stderr, code = clatter(t, "run", scene, "-o", filepath.Join(t.TempDir(), "run"), "-q")
	if code != exitFailed || !strings.Contains(stderr, `"carton" is jammed`) {
		t.Errorf("run exit %d, want %d with the jam named; stderr:\n%s", code, exitFailed, stderr)
	}
}
