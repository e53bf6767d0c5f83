package main

import (
	"fmt"
	"io"
	"runtime/debug"
	"strings"
)

// Exit codes. Schedulers and scripts act on them: a cluster's failure
// policy retries an interrupted shard (1) and keeps a finished study with
// failed trials (3), and nothing retries bad input (2).
const (
	exitOK     = 0
	exitFailed = 1 // the simulation failed (run), or a study was interrupted
	exitBad    = 2 // bad input: a scene, flag, file or folder to fix
	// exitTrials: a study finished, but some of its trials failed
	// (failures.csv says which and why).
	exitTrials = 3
	// exitInternal is an error in clatter itself, a panic caught at the top
	// of the command: the sysexits.h value EX_SOFTWARE (BSD, 4.4BSD-Lite).
	exitInternal = 70
)

// exitCodesHelp is the table of exit codes that help prints.
const exitCodesHelp = `Exit codes:
  0   ok
  1   the simulation failed (run), or a study was interrupted (resume it)
  2   bad input: a scene, flag, file or folder to fix; also a body that starts
      overlapping another, a file that is not a regular file, and an input
      beyond the size and nesting limits
  3   a study finished, but some trials failed (failures.csv says why)
  70  an internal error in clatter; please report it`

// reportHint says where internal errors are to be reported.
const reportHint = "please report it with the command, its input files and this message"

// recovered turns a panic in a command into exit code 70 with a request
// to report it; the stack goes to stderr for the report.
func recovered(e *env, code *int) {
	p := recover()
	if p == nil {
		return
	}
	*code = exitInternal
	stack := string(debug.Stack())
	fmt.Fprintf(e.stderr, "clatter: internal error: %v\n%s\n", p, reportHint)
	writeIndented(e.stderr, stack)
}

func writeIndented(w io.Writer, s string) {
	for _, l := range strings.Split(strings.TrimRight(s, "\n"), "\n") {
		fmt.Fprintln(w, "    "+l)
	}
}
