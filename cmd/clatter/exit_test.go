package main

import (
	"strings"
	"testing"

	"clatter/engine/sweep"
)

func TestPanicExitsInternal(t *testing.T) {
	// A panic inside a command is caught at the top: exit 70 (EX_SOFTWARE
	// of BSD's sysexits.h) with a request to report it, never a crash with
	// the Go runtime's exit status 2, which would read as bad input.
	boom := &command{name: "boom", run: func(*env, []string) int { panic("index out of range") }}
	commands = append(commands, boom)
	defer func() { commands = commands[:len(commands)-1] }()
	_, errs, code := clatter(t, "boom")
	if code != exitInternal || !strings.Contains(errs, "internal error: index out of range") || !strings.Contains(errs, "please report it") {
		t.Fatalf("exit %d, stderr %q; want %d and a request to report it", code, errs, exitInternal)
	}
}

func TestSweepOutcomeCodes(t *testing.T) {
	// The codes a study ends with (the README's table): 3 for a finished
	// study with failed trials, so that a scheduler does not rerun it; 1 for
	// one that is not finished, which --resume completes; 0 otherwise.
	cases := []struct {
		name string
		meta sweep.Meta
		want int
	}{
		{"finished", sweep.Meta{TrialsTotal: 4, TrialsDone: 4, Complete: true}, exitOK},
		{"failed trials", sweep.Meta{TrialsTotal: 4, TrialsDone: 4, TrialsFailed: 1, Complete: true}, exitTrials},
		{"unfinished", sweep.Meta{TrialsTotal: 4, TrialsDone: 2}, exitFailed},
	}
	for _, c := range cases {
		var errs strings.Builder
		e := &env{stderr: &errs, stdout: &errs}
		if got := sweepOutcome(e, &sweep.Result{Meta: &c.meta, Dir: "out"}); got != c.want {
			t.Errorf("%s: exit %d, want %d (%s)", c.name, got, c.want, errs.String())
		}
	}
}

func TestHelpListsExitCodes(t *testing.T) {
	out, _, code := clatter(t, "help")
	for _, want := range []string{"0   ok", "1   the simulation failed", "2   bad input", "3   a study finished, but some trials failed", "70  an internal error"} {
		if code != exitOK || !strings.Contains(out, want) {
			t.Errorf("clatter help lacks %q (exit %d)", want, code)
		}
	}
}
