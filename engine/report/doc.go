// Package report runs one simulation of a scene and writes its results:
// summary.json (the final state of every moving body, its resting face and
// largest impact, energy and momentum at the start and end),
// trajectory.csv (every moving body's state at each sample) and
// events.jsonl (impacts, rest_begin and rest_end, settling and errors),
// all in the scene's own units.
//
// Results are written as the run goes: a run that fails (the simulation
// diverges) or is interrupted keeps every sample and event it reached, and
// still writes a summary of its last good state with the error.
package report
