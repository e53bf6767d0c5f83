package report

import (
	"context"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
)

// dropped is a ball let go 5 cm above a floor: it strikes the floor at
// t = sqrt(2 h / g) = 0.101 s (free fall, g = 9.80665 m/s2) and bounces
// (e = 0.5) for a second.
const dropped = `[world]
duration = 1
until_settled = false
[material.rubber]
friction = 0.4
restitution = 0.5
[[body]]
name = "floor"
static = true
shape = { plane = [0, 0, 1] }
material = "rubber"
[[body]]
name = "ball"
shape = { sphere = 0.01 }
material = "rubber"
density = 1000
position = [0, 0, 0.06]
`

// lastTime returns the time of the last line of a trajectory or events
// file on disk, and whether that line is complete.
func lastTime(t *testing.T, path string, events bool) (float64, bool) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	text := string(b)
	whole := strings.HasSuffix(text, "\n")
	lines := strings.Split(strings.TrimSpace(text), "\n")
	last := lines[len(lines)-1]
	if events {
		last = strings.TrimPrefix(last, `{"time":`)
	}
	tm, err := strconv.ParseFloat(strings.FieldsFunc(last, func(r rune) bool { return r == ',' })[0], 64)
	if err != nil {
		return -1, whole
	}
	return tm, whole
}

func TestEventsOnDiskWithTheTrajectory(t *testing.T) {
	// Halfway through the run, before any file is closed (what a kill -9
	// would leave), events.jsonl on disk holds the impact at 0.101 s and
	// trajectory.csv ends in a complete row past it.
	dir := t.TempDir()
	checked := false
	_, err := Run(context.Background(), parse(t, dropped), Options{Dir: dir, Progress: func(f float64) {
		if f < 0.5 || checked {
			return
		}
		checked = true
		b, _ := os.ReadFile(filepath.Join(dir, EventsFile))
		first := strings.SplitN(string(b), "\n", 2)[0]
		ev, evWhole := lastTime(t, filepath.Join(dir, EventsFile), true)
		tr, trWhole := lastTime(t, filepath.Join(dir, TrajectoryFile), false)
		if !strings.HasPrefix(first, `{"time":0.1`) || !strings.Contains(first, `"event":"impact"`) || !evWhole || !trWhole || !(tr >= ev) {
			t.Errorf("on disk at half time: first event %q, last at %g (complete %v), last row at %g (complete %v); want the impact near 0.101 s first and a row after the last event", first, ev, evWhole, tr, trWhole)
		}
	}})
	if err != nil || !checked {
		t.Fatalf("run: %v (checked %v)", err, checked)
	}
}

// printedTimeTol: trajectory times are printed to 12 significant digits
// (sigDigits), so a time read back differs from the simulated one by
// rounding at that digit.
const printedTimeTol = 1e-11

func TestWriteErrorSaysWhatIsKept(t *testing.T) {
	// events.jsonl on a full disk (/dev/full refuses every write with
	// ENOSPC): the run stops at the first event, says so, and keeps the
	// trajectory up to the last sample before it, with no torn row.
	if _, err := os.Stat("/dev/full"); err != nil {
		t.Skip("no /dev/full here")
	}
	dir := t.TempDir()
	if err := os.Symlink("/dev/full", filepath.Join(dir, EventsFile)); err != nil {
		t.Fatal(err)
	}
	sum, err := Run(context.Background(), parse(t, dropped), Options{Dir: dir})
	var we *WriteError
	if !errors.As(err, &we) || !errors.Is(err, syscall.ENOSPC) || we.File != EventsFile {
		t.Fatalf("error %v, want a WriteError of events.jsonl with ENOSPC", err)
	}
	if !(we.Kept > 0.08 && we.Kept < 0.12) || !we.Summary || sum.Time < we.Kept || sum.Error != "stopped: cannot write events.jsonl: no space left on device" {
		t.Errorf("%+v: want the samples kept up to the impact near 0.101 s and the summary written", we)
	}
	tr, whole := lastTime(t, filepath.Join(dir, TrajectoryFile), false)
	if math.Abs(tr-we.Kept) > printedTimeTol || !whole {
		t.Errorf("trajectory.csv ends at %g (complete %v), the error says %g", tr, whole, we.Kept)
	}
	msg := err.Error()
	for _, want := range []string{"cannot write " + filepath.Join(dir, EventsFile) + ": no space left on device",
		"Kept in " + dir + ": trajectory.csv and events.jsonl up to t = " + strconv.FormatFloat(we.Kept, 'g', 6, 64),
		"summary.json holds the state at t = "} {
		if !strings.Contains(msg, want) {
			t.Errorf("message %q lacks %q", msg, want)
		}
	}
}

func TestInterruptedSaysInterrupted(t *testing.T) {
	// Ctrl-C is reported in the user's words, not the context's.
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	sum, err := Run(ctx, parse(t, dropped), Options{Dir: t.TempDir()})
	if err == nil || err.Error() != "interrupted at t = 0 s" || strings.Contains(sum.Error, "context") || !errors.Is(err, context.Canceled) {
		t.Errorf("error %q, summary error %q; want \"interrupted at t = 0 s\" wrapping context.Canceled", err, sum.Error)
	}
}
