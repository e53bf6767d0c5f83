// Package engine is the world: bodies, materials, the step loop, joints and
// drivers, islands and sleeping, events and diagnostics. It puts packages
// shapes, collide and contact together.
//
// The layers above the world live in its sub-packages: scene (scene files
// to a world), report (the result files of one run), sweep (studies of
// many trials, their statistics and plots), verify (the analytic cases
// that `clatter verify` runs) and demo (the built-in example study).
package engine
