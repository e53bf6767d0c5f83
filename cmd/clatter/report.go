package main

import (
	"clatter/engine/view/page"
)

var cmdReport = &command{
	name:    "report",
	summary: "write one self-contained HTML page of a run or study folder",
	usage:   "clatter report DIR [--quiet]",
	help: `
Writes DIR/report.html: one page, for a colleague or a design review, of
what a run (clatter run) or a study (clatter sweep) wrote into DIR: its
tables (the first 200 rows of each CSV file), its plots and pictures, its
summary, the safety caution, and, where DIR holds animation.glb (--animation),
the motion, played in the page. Everything is inside the file: it opens
offline, in any current browser, and can be sent as it is.

Options:
  --quiet, -q   no informational messages`,
}

func init() {
	cmdReport.run = writeReport
}

func writeReport(e *env, args []string) int {
	fs := newFlags(e, cmdReport)
	pos, code := parse(e, cmdReport, fs, args)
	if code >= 0 {
		return code
	}
	if len(pos) != 1 {
		e.errorf("report: give one folder of results, e.g. clatter report clatter-out (got %d arguments)", len(pos))
		return exitBad
	}
	out, err := page.Write(pos[0])
	if err != nil {
		e.errorf("report: %v", err)
		return exitBad
	}
	e.infof("wrote %s", out)
	return exitOK
}
