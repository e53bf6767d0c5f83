// Package scratch keeps buffers from one use to the next: a world reused
// for another trial hands its slices on instead of making new ones.
package scratch
