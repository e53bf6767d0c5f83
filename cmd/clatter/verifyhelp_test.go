package main

import (
	"fmt"
	"strings"
	"testing"

	"clatter/engine/verify"
)

// TestHelpVerifyListsEveryCase checks that `clatter help verify` names
// every case that `clatter verify` runs, numbered as its table numbers them.
func TestHelpVerifyListsEveryCase(t *testing.T) {
	out, errs, code := clatter(t, "help", "verify")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	cases := verify.Cases()
	if len(cases) == 0 {
		t.Fatal("no verify cases registered")
	}
	for i, c := range cases {
		if line := fmt.Sprintf("  %2d  %s\n", i+1, c.Name); !strings.Contains(out, line) {
			t.Errorf("help verify lacks case %d %q:\n%s", i+1, c.Name, out)
		}
	}
}
