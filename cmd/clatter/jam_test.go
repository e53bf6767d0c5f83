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

// TestBowlSqueezeIsNoJam runs the bowl feeder example through its first
// 2.5 s, where one of its fifty blocks is squeezed 0.55 mm, ten of its
// slops, between the vibrating bowl and another block at 2.18 s and then
// goes on: a part that other moving parts hold against a drive can still
// give way, so that is no jam (the run must finish, exit 0), while the
// same depth against a fixed wall is one (TestJammedStudyExitsThree).
func TestBowlSqueezeIsNoJam(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "feeder", "bowl.toml"))
	if err != nil {
		t.Fatal(err)
	}
	const full = "duration = 10.0"
	if !strings.Contains(string(src), full) {
		t.Fatalf("bowl.toml no longer has %q", full)
	}
	dir := t.TempDir()
	stl, err := os.ReadFile(filepath.Join("..", "..", "testdata", "feeder", "bowl.stl"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "bowl.stl"), stl, 0o644); err != nil {
		t.Fatal(err)
	}
	scene := filepath.Join(dir, "bowl.toml")
	if err := os.WriteFile(scene, []byte(strings.Replace(string(src), full, "duration = 2.5", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	mustRun(t, scene)
}
