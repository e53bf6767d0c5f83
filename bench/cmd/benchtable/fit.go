package main

import (
	"fmt"
	"math"
	"strings"

	"clatter/bench"
)

// vsRecorded is the recorded figure of the benchmark over ns, as "1.23x",
// or "" when none is recorded.
func vsRecorded(name string, ns float64) string {
	rec, ok := bench.Recorded[name]
	if !ok || ns <= 0 {
		return ""
	}
	return fmt.Sprintf("%.3gx", rec/ns)
}

// cpuSpeedup describes b against its baseline from both wall time and the
// CPU time per op (a metric whose unit begins with "cpu-ns/"): on a shared
// machine the wall time depends on the load, while the CPU time per op
// shows what running on more workers costs. It returns "" when either
// lacks the metric.
func cpuSpeedup(b, base bench.Benchmark, extra, baseExtra map[string]float64, ns, baseNs float64) string {
	for unit, cpu := range extra {
		baseCPU, ok := baseExtra[unit]
		if !strings.HasPrefix(unit, "cpu-ns/") || !ok || cpu <= 0 {
			continue
		}
		workers, baseWorkers := max(b.Workers, 1), max(base.Workers, 1)
		return fmt.Sprintf("%s over %s: wall time %.3gx, CPU per op %.3gx; speed-up from CPU time on %d workers (with a core each) %.3gx",
			b.Name, base.Name, baseNs/ns, baseCPU/cpu, workers, float64(workers)/float64(baseWorkers)*baseCPU/cpu)
	}
	return ""
}

// seriesFits fits, for each series of benchmarks with two or more sizes
// measured, the exponent p of ns/op = c * size^p by least squares on the
// logarithms, and describes it.
func seriesFits(results []result) []string {
	var order []string
	pts := map[string][][2]float64{}
	for _, r := range results {
		if r.b.Series == "" || r.failed || r.ns <= 0 || r.b.Size <= 0 {
			continue
		}
		if pts[r.b.Series] == nil {
			order = append(order, r.b.Series)
		}
		pts[r.b.Series] = append(pts[r.b.Series], [2]float64{float64(r.b.Size), r.ns})
	}
	var lines []string
	for _, name := range order {
		p := pts[name]
		if len(p) < 2 {
			continue
		}
		slope, ok := logLogSlope(p)
		if !ok {
			continue
		}
		lo, hi := p[0][0], p[0][0]
		for _, q := range p {
			lo, hi = min(lo, q[0]), max(hi, q[0])
		}
		lines = append(lines, fmt.Sprintf("%s scaling: ns/op grows as size^%.3f (least squares on logarithms, %d sizes from %.0f to %.0f)", name, slope, len(p), lo, hi))
	}
	return lines
}

// logLogSlope is the least-squares slope of log(y) against log(x) for the
// points (x, y); ok is false when the x values are all equal.
func logLogSlope(pts [][2]float64) (slope float64, ok bool) {
	n := float64(len(pts))
	var sx, sy, sxx, sxy float64
	for _, p := range pts {
		x, y := math.Log(p[0]), math.Log(p[1])
		sx, sy, sxx, sxy = sx+x, sy+y, sxx+x*x, sxy+x*y
	}
	d := n*sxx - sx*sx
	if d <= 1e-12*n*sxx {
		return 0, false
	}
	return (n*sxy - sx*sy) / d, true
}
