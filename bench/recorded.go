package bench

// RecordedOn says when and how Recorded was measured.
const RecordedOn = "main at 92fd17a, 2026-12-05, medians of 3 by go run ./bench/cmd/benchtable -count 3 -benchtime 10x on 2 shared cores"

// A Figure is a recorded median per op: wall time, and the process's CPU
// time for benchmarks that report it (0 where not measured).
type Figure struct {
	NsPerOp, CPUNsPerOp float64
}

// Recorded holds figures measured on main before the speed work, by
// benchmark name; the table runner prints each benchmark's ratio to it.
// Update it (and RecordedOn) only when starting a new baseline.
var Recorded = map[string]Figure{}
