package main

import (
	"fmt"
	"strings"

	"clatter/engine/verify"
)

// verifyHelp is the body of `clatter help verify`. Its list of cases comes
// from the registry that verify runs, so that it names every case.
func verifyHelp() string {
	var b strings.Builder
	b.WriteString(`
Runs the analytic validation cases built into clatter through the engine.
Each prints its reference and source, the expected and the measured value,
the error (relative where marked %) and its tolerance, and pass or FAIL.

The cases:
`)
	for i, c := range verify.Cases() {
		fmt.Fprintf(&b, "  %2d  %s\n", i+1, c.Name)
	}
	b.WriteString(`
Exit codes: 0 every case passed, 1 a case failed.

Options:
  --json           print the results as a JSON array
  --quiet, -q      no informational messages`)
	return b.String()
}
