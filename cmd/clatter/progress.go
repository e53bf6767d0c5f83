package main

import (
	"fmt"
	"io"
	"os"
	"time"

	"github.com/schollz/progressbar/v3"
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

// isTerminal reports whether w is a character device (a terminal).
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
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
