package bench

import (
	"testing"
	"time"
)

// A cpuClock adds up the process's CPU time over the timed parts of a
// benchmark, to report it per op as the metric cpu-ns/op. On a machine
// shared with other work the wall time of an op depends on the load; its
// CPU time much less.
type cpuClock struct {
	total time.Duration
	since time.Duration
	ok    bool
}

// start marks the start of a timed part.
func (c *cpuClock) start() { c.since, c.ok = processCPU() }

// stop adds the CPU time since start.
func (c *cpuClock) stop() {
	if now, ok := processCPU(); ok && c.ok {
		c.total += now - c.since
	}
}

// report reports the CPU time per op, if it could be measured.
func (c *cpuClock) report(b *testing.B) {
	if c.ok && b.N > 0 {
		b.ReportMetric(float64(c.total.Nanoseconds())/float64(b.N), "cpu-ns/op")
	}
}
