package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"strings"
	"syscall"
)

// safetyNote is printed beside every simulated or computed result.
const safetyNote = "Note: simulation informs design; it does not replace the physical tests that packaging and stability\n" +
	"standards and local codes require. Results that protect people or goods need review by a qualified engineer."

func main() {
	// Ctrl-C, and the SIGTERM with which cluster schedulers stop a job,
	// end a run or sweep cleanly with its results so far.
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	code := run(ctx, os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

// env is what every subcommand gets: where to write, and the global flags.
type env struct {
	ctx    context.Context
	stdout io.Writer
	stderr io.Writer
	quiet  bool
}

func (e *env) errorf(format string, args ...any) {
	fmt.Fprintf(e.stderr, "clatter: "+format+"\n", args...)
}

func (e *env) infof(format string, args ...any) {
	if !e.quiet {
		fmt.Fprintf(e.stderr, format+"\n", args...)
	}
}

// warn prints warnings on stderr, one a line; --quiet keeps them.
func (e *env) warn(ws []string) {
	for _, w := range ws {
		fmt.Fprintln(e.stderr, "warning: "+w)
	}
}

type command struct {
	name    string
	summary string
	usage   string // the synopsis line
	help    string // the body of `clatter help NAME`
	run     func(e *env, args []string) int
}

var commands []*command

func init() {
	// The run functions refer to their commands (for help and flags), so
	// they are joined here rather than in the declarations.
	cmdDemo.run, cmdRun.run, cmdInspect.run, cmdVerify.run = runDemo, runScene, inspectPart, verifyCases
	commands = []*command{cmdDemo, cmdRun, cmdSweep, cmdMerge, cmdInspect, cmdVerify, cmdReport, cmdHelp}
}

func findCommand(name string) *command {
	for _, c := range commands {
		if c.name == name {
			return c
		}
	}
	return nil
}

func commandNames() []string {
	var n []string
	for _, c := range commands {
		n = append(n, c.name)
	}
	return n
}

// run is the whole command: it parses args and returns the exit code.
func run(ctx context.Context, args []string, stdout, stderr io.Writer) (code int) {
	e := &env{ctx: ctx, stdout: stdout, stderr: stderr}
	defer recovered(e, &code)
	for len(args) > 0 && strings.HasPrefix(args[0], "-") {
		switch args[0] {
		case "-q", "--quiet", "-quiet":
			e.quiet = true
			args = args[1:]
		case "-h", "--help", "-help":
			writeMainHelp(stdout)
			return exitOK
		default:
			e.errorf("unknown option %q before the command; see clatter help", args[0])
			return exitBad
		}
	}
	if len(args) == 0 {
		writeMainHelp(stderr)
		return exitBad
	}
	c := findCommand(args[0])
	if c == nil {
		e.errorf("unknown command %q%s (see clatter help)", args[0], suggest(args[0], commandNames()))
		return exitBad
	}
	return c.run(e, args[1:])
}

// newFlags returns a flag set for a subcommand that writes its errors to
// stderr and knows --quiet.
func newFlags(e *env, c *command) *flag.FlagSet {
	fs := flag.NewFlagSet(c.name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.BoolVar(&e.quiet, "quiet", e.quiet, "no progress bar or informational messages")
	fs.BoolVar(&e.quiet, "q", e.quiet, "same as --quiet")
	return fs
}

// parse parses flags that may come before, between or after the
// positional arguments. It returns the positional arguments and an exit
// code (-1 to go on).
func parse(e *env, c *command, fs *flag.FlagSet, args []string) ([]string, int) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				writeHelp(e.stdout, c)
				return nil, exitOK
			}
			e.errorf("%s: %v%s (see clatter help %s)", c.name, err, flagSuggestion(fs, err), c.name)
			return nil, exitBad
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return pos, -1
		}
		if rest[0] == "--" {
			return append(pos, rest[1:]...), -1
		}
		pos = append(pos, rest[0])
		args = rest[1:]
	}
}

// flagSuggestion names the nearest flag for an unknown one.
func flagSuggestion(fs *flag.FlagSet, err error) string {
	msg := err.Error()
	const p = "flag provided but not defined: -"
	if !strings.HasPrefix(msg, p) {
		return ""
	}
	bad := strings.TrimLeft(strings.TrimPrefix(msg, p), "-")
	var names []string
	fs.VisitAll(func(f *flag.Flag) { names = append(names, f.Name) })
	if n, ok := nearestName(bad, names); ok {
		return fmt.Sprintf(" (did you mean --%s?)", n)
	}
	return ""
}
