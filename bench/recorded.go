package bench

// RecordedOn says when and how Recorded was measured.
const RecordedOn = "main at 92fd17a on 2026-12-05, 05:15 to 06:28 UTC, by go run ./bench/cmd/benchtable " +
	"-benchtime 10x (SweepDrop: 200x), medians of 3 runs (SweepDrop: 5; Pile1000 and Pour: 1), " +
	"on 2 cores shared with a load average of 25 to 48: wall times about 8x and CPU times about 1.3x to 1.8x those of an idle machine"

// A Figure is a recorded median per op: wall time, and the process's CPU
// time for benchmarks that report it (0 where not measured).
type Figure struct {
	NsPerOp, CPUNsPerOp float64
}

// Recorded holds figures measured on main before the speed work, by
// benchmark name; the table runner prints each benchmark's ratio to it
// (of CPU time where both have it). Update it (and RecordedOn) only when
// starting a new baseline.
//
// Pile1000 and Pile200 were recorded on piles built by the engine of the
// day; they have since timed the stored piles of pilefile.go. On one engine
// (5159a49), measured side by side (CPU time, alternating runs on a shared
// machine), a step of the stored pile cost 1.27x (Pile1000, median of 5
// rounds; 1.14x Pile200, 3 rounds) a step of the built one, so their ratio
// to these figures fell by that much without any change to the step.
var Recorded = map[string]Figure{
	"Pile1000":      {132.05e6, 40.28e6},
	"DropTrial":     {37.34e6, 3.931e6},
	"DropTrialMesh": {652.6e6, 59.27e6},
	"Pour1000":      {175.6e6, 21.02e6},
	"Pour2000":      {405.6e6, 47.57e6},
	"Pour4000":      {943.8e6, 104.4e6},
	"Pour8000":      {1406e6, 196.7e6},
	"SweepDrop1":    {3.099e6, 2.601e6},
	"SweepDrop2":    {13.26e6, 2.996e6},
}
