package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestWiperExample(t *testing.T) {
	// The wiper example as a user runs it, with fewer trials: the study
	// prints its gates with rates, shares, intervals and quasi-static
	// probabilities and the orienting efficiency, and writes the gate
	// files and plots; run prints the drive's throw number (1.5, as the
	// scene's amplitude is chosen to give) and warns that the default
	// sample interval aliases the 50 Hz stroke.
	src, err := os.ReadFile("../../testdata/feeder/wiper.toml")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	scenePath := filepath.Join(dir, "wiper.toml")
	if err := os.WriteFile(scenePath, []byte(strings.Replace(string(src), "trials = 60", "trials = 6", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errs, code := clatter(t, "sweep", scenePath, "-o", filepath.Join(dir, "study"), "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d\n%s\n%s", code, out, errs)
	}
	for _, want := range []string{"gate      body   face down  count  per minute  fraction  95% interval  quasi-static", "orienting efficiency at gate passed: ", "of 6 parts fed crossed it with face down 4 or 5", "face down at the end of the trials"} {
		if !strings.Contains(out, want) {
			t.Errorf("sweep output lacks %q:\n%s", want, out)
		}
	}
	for _, f := range []string{"crossings.csv", "gate-cases.csv", "face-down.csv", "gate-passed.png"} {
		if st, err := os.Stat(filepath.Join(dir, "study", f)); err != nil || st.Size() == 0 {
			t.Errorf("%s: %v", f, err)
		}
	}
	out, errs, code = clatter(t, "run", scenePath, "-o", filepath.Join(dir, "run"))
	if code != exitOK {
		t.Fatalf("exit %d\n%s\n%s", code, out, errs)
	}
	if !strings.Contains(out, "drive    track: throw number 1.5, conveying speed") || !strings.Contains(out, "gate     passed: ") {
		t.Errorf("run output lacks the drive and gates:\n%s", out)
	}
	if !strings.Contains(errs, `warning: drive of "track": a sample interval of 0.01 s`) {
		t.Errorf("no aliasing warning:\n%s", errs)
	}
}
