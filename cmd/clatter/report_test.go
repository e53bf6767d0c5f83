package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"clatter/engine/view/viewtest"
)

// TestRunAnimationAndReport runs a scene as the README shows, with its
// animation and pictures, checks the animation with the Khronos glTF
// validator, and writes the report page of the folder.
func TestRunAnimationAndReport(t *testing.T) {
	dir := t.TempDir()
	out, errs, code := clatter(t, "run", "../../testdata/scenes/fixture.toml", "-o", dir, "--animation", "--pictures")
	if code != exitOK {
		t.Fatalf("run: exit %d\n%s", code, errs)
	}
	if !strings.Contains(out, "animation.glb, start.png, end.png") {
		t.Errorf("the table does not list the animation and pictures:\n%s", out)
	}
	if is := viewtest.Validate(t, filepath.Join(dir, "animation.glb")); is.NumErrors != 0 {
		t.Errorf("the glTF validator found %s", is)
	}
	if _, errs, code := clatter(t, "report", dir); code != exitOK {
		t.Fatalf("report: exit %d\n%s", code, errs)
	}
	page, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Simulation informs design", `id="motion"`, "start.png", "end.png", "summary.json: bodies"} {
		if !strings.Contains(string(page), want) {
			t.Errorf("report.html lacks %q", want)
		}
	}
}

// TestReportBadInput checks that a folder without results, a missing one
// and extra arguments are refused as bad input.
func TestReportBadInput(t *testing.T) {
	for _, args := range [][]string{{"report", t.TempDir()}, {"report", filepath.Join(t.TempDir(), "none")}, {"report"}, {"report", "a", "b"}} {
		if _, errs, code := clatter(t, args...); code != exitBad {
			t.Errorf("%v: exit %d, want %d\n%s", args, code, exitBad, errs)
		}
	}
}
