// Package engine is the world: bodies, materials, the step loop, islands and
// sleeping, events and diagnostics. It puts packages shapes, collide and
// contact together; the layers above it (scene files, sweeps, result files)
// live in its sub-packages.
package engine
