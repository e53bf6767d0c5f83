package main

import (
	"fmt"
	"io"
	"os"
	"time"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"
)

// progressDelay is how long a run goes before a bar appears: short runs
// finish before a bar would be worth reading.
const progressDelay = 700 * time.Millisecond

// progress shows a bar on stderr for long runs, when stderr is a terminal
// and --quiet is not given.
type progress struct {
	w       io.Writer
	label   string
	enabled bool
	start   time.Time
	bar     *progressbar.ProgressBar
}

func newProgress(e *env, label string) *progress {
	return &progress{w: e.stderr, label: label, enabled: !e.quiet && isTerminal(e.stderr), start: time.Now()}
}

// isTerminal reports whether w is a terminal. A character device is not
// enough: /dev/null is one too.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && term.IsTerminal(int(f.Fd()))
}

// update shows the fraction done.
func (p *progress) update(f float64) {
	if !p.enabled {
		return
	}
	if p.bar == nil {
		if time.Since(p.start) < progressDelay || f >= 1 {
			return
		}
		p.bar = progressbar.NewOptions(1000,
			progressbar.OptionSetWriter(p.w),
			progressbar.OptionSetDescription(p.label),
			progressbar.OptionSetWidth(30),
			progressbar.OptionThrottle(100*time.Millisecond),
			progressbar.OptionShowElapsedTimeOnFinish(),
			progressbar.OptionClearOnFinish(),
		)
	}
	_ = p.bar.Set(int(f * 1000))
}

// done removes the bar.
func (p *progress) done() {
	if p.bar != nil {
		_ = p.bar.Finish()
		fmt.Fprint(p.w, "\r")
		p.bar = nil
	}
}

// progressLineEvery is how often a sweep whose stderr is not a terminal
// (a cluster job's log) prints a line of progress.
const progressLineEvery = 30 * time.Second

// trialProgress shows a sweep's trials done, their rate and the time
// left: a bar on a terminal, a line now and then in a log.
type trialProgress struct {
	w        io.Writer
	term     bool
	quiet    bool
	start    time.Time
	lastLine time.Time
	bar      *progressbar.ProgressBar
}

func newTrialProgress(e *env) *trialProgress {
	now := time.Now()
	return &trialProgress{w: e.stderr, term: isTerminal(e.stderr), quiet: e.quiet, start: now, lastLine: now}
}

// update takes the trials done and to do in this run.
func (p *trialProgress) update(done, total int64) {
	if p.quiet || total <= 0 {
		return
	}
	if !p.term {
		if time.Since(p.lastLine) < progressLineEvery || done >= total {
			return
		}
		p.lastLine = time.Now()
		el := time.Since(p.start).Seconds()
		rate := float64(done) / el
		left := time.Duration(float64(total-done) / rate * float64(time.Second)).Round(time.Second)
		fmt.Fprintf(p.w, "sweep: %d of %d trials, %.4g trials/s, about %s left\n", done, total, rate, left)
		return
	}
	if p.bar == nil {
		if time.Since(p.start) < progressDelay || done >= total {
			return
		}
		p.bar = progressbar.NewOptions64(total,
			progressbar.OptionSetWriter(p.w),
			progressbar.OptionSetDescription("trials"),
			progressbar.OptionSetWidth(30),
			progressbar.OptionShowCount(),
			progressbar.OptionShowIts(),
			progressbar.OptionSetItsString("trials"),
			progressbar.OptionSetPredictTime(true),
			progressbar.OptionThrottle(100*time.Millisecond),
			progressbar.OptionClearOnFinish(),
		)
	}
	_ = p.bar.Set64(done)
}

// done removes the bar.
func (p *trialProgress) done() {
	if p.bar != nil {
		_ = p.bar.Finish()
		fmt.Fprint(p.w, "\r")
		p.bar = nil
	}
}
