package main

import (
	"fmt"
	"math"
	"strings"

	"clatter/bench"
)

// vsRecorded is the figure recorded for the benchmark over this run's, as
// "1.23x": CPU time per op where both have it ("1.23x cpu"), else wall
// time; "" when none is recorded.
func vsRecorded(r result) string {
	rec, ok := bench.Recorded[r.b.Name]
	if !ok {
		return ""
	}
	if cpu, ok := cpuPerOp(r.extra); ok && rec.CPUNsPerOp > 0 {
		return fmt.Sprintf("%.3gx cpu", rec.CPUNsPerOp/cpu)
	}
	if rec.NsPerOp > 0 && r.ns > 0 {
		return fmt.Sprintf("%.3gx", rec.NsPerOp/r.ns)
	}
	return ""
}

// cpuPerOp returns a benchmark's CPU time per op: its metric whose unit
// begins with "cpu-ns/".
func cpuPerOp(extra map[string]float64) (float64, bool) {
	for unit, v := range extra {
		if strings.HasPrefix(unit, "cpu-ns/") && v > 0 {
			return v, true
		}
	}
	return 0, false
}

// cpuSpeedup describes b against its baseline from both wall time and the
// CPU time per op (a metric whose unit begins with "cpu-ns/"): on a shared
// machine the wall time depends on the load, while the CPU time per op
// shows what running on more workers costs. It returns "" when either
// lacks the metric.
func cpuSpeedup(b, base bench.Benchmark, extra, baseExtra map[string]float64, ns, baseNs float64) string {
	cpu, ok := cpuPerOp(extra)
	baseCPU, baseOK := cpuPerOp(baseExtra)
	if !ok || !baseOK || b.Workers == base.Workers {
		return ""
	}
	workers, baseWorkers := max(b.Workers, 1), max(base.Workers, 1)
	return fmt.Sprintf("%s over %s: wall time %.3gx, CPU per op %.3gx; speed-up from CPU time on %d workers (with a core each) %.3gx",
		b.Name, base.Name, baseNs/ns, baseCPU/cpu, workers, float64(workers)/float64(baseWorkers)*baseCPU/cpu)
}

// seriesFits fits, for each series of benchmarks with two or more sizes
// measured, the exponent p of time per op = c * size^p by least squares on
// the logarithms (CPU time per op where every size has it, else wall
// time), and describes it.
func seriesFits(results []result) []string {
	var order []string
	members := map[string][]result{}
	for _, r := range results {
		if r.b.Series == "" || r.failed || r.ns <= 0 || r.b.Size <= 0 {
			continue
		}
		if members[r.b.Series] == nil {
			order = append(order, r.b.Series)
		}
		members[r.b.Series] = append(members[r.b.Series], r)
	}
	var lines []string
	for _, name := range order {
		rs := members[name]
		if len(rs) < 2 {
			continue
		}
		cpuPts, wallPts := make([][2]float64, 0, len(rs)), make([][2]float64, len(rs))
		lo, hi := rs[0].b.Size, rs[0].b.Size
		for i, r := range rs {
			wallPts[i] = [2]float64{float64(r.b.Size), r.ns}
			if cpu, ok := cpuPerOp(r.extra); ok {
				cpuPts = append(cpuPts, [2]float64{float64(r.b.Size), cpu})
			}
			lo, hi = min(lo, r.b.Size), max(hi, r.b.Size)
		}
		pts, what := wallPts, "wall time"
		if len(cpuPts) == len(rs) {
			pts, what = cpuPts, "CPU time"
		}
		slope, ok := logLogSlope(pts)
		if !ok {
			continue
		}
		lines = append(lines, fmt.Sprintf("%s scaling: %s per op grows as size^%.3f (least squares on logarithms, %d sizes from %d to %d)", name, what, slope, len(rs), lo, hi))
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
