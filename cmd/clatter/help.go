package main

import (
	"fmt"
	"io"
	"strings"

	"clatter/engine/scene"
)

func suggest(s string, names []string) string { return scene.Suggest(s, names) }

func nearestName(s string, names []string) (string, bool) { return scene.Nearest(s, names) }

var cmdHelp = &command{
	name:    "help",
	summary: "explain a command",
	usage:   "clatter help [COMMAND]",
	help:    "Prints how to use clatter, or one of its commands.",
	run: func(e *env, args []string) int {
		switch {
		case len(args) == 0:
			writeMainHelp(e.stdout)
			return exitOK
		case len(args) > 1:
			e.errorf("help: name one command")
			return exitBad
		}
		if args[0] == "-h" || args[0] == "--help" {
			writeHelp(e.stdout, findCommand("help"))
			return exitOK
		}
		c := findCommand(args[0])
		if c == nil {
			e.errorf("help: unknown command %q%s", args[0], suggest(args[0], commandNames()))
			return exitBad
		}
		writeHelp(e.stdout, c)
		return exitOK
	},
}

func writeMainHelp(w io.Writer) {
	fmt.Fprintln(w, "clatter simulates rigid parts tumbling, sliding, bouncing and coming to rest.")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Usage: clatter [--quiet] COMMAND [ARGUMENTS]")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Commands:")
	for _, c := range commands {
		fmt.Fprintf(w, "  %-8s %s\n", c.name, c.summary)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Start with `clatter demo`. `clatter help COMMAND` or `clatter COMMAND --help` explains one.")
	fmt.Fprintln(w, "Results go to stdout, messages to stderr; --quiet turns off the progress bar and informational messages.")
	fmt.Fprintln(w)
	fmt.Fprintln(w, exitCodesHelp)
}

func writeHelp(w io.Writer, c *command) {
	fmt.Fprintf(w, "Usage: %s\n\n%s\n", c.usage, strings.TrimSpace(c.help))
}
