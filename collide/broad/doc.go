// Package broad is the broad phase: from the world bounds of every body it
// finds the candidate pairs whose boxes overlap, for the narrow phase to
// examine.
//
// The method is sweep and prune (Baraff, "Dynamic simulation of
// non-penetrating rigid bodies", PhD thesis, Cornell 1992; Cohen, Lin,
// Manocha and Ponamgi, "I-COLLIDE: an interactive and exact collision
// detection system for large-scale environments", 1995): the boxes are kept
// sorted by their lower endpoint along one axis, and a sweep along that axis
// tests each box only against the boxes whose intervals it overlaps there.
// Bodies move little from one step to the next, so the order changes little
// and an insertion sort restores it in close to linear time. The sweep axis is
// the one along which the box centres are most spread out, re-chosen with
// hysteresis as the scene changes. Static and sleeping boxes do not move:
// they are kept apart in a list sorted once when it changes, never swept
// against each other, and each awake box finds those it meets by a binary
// search (still.go), so a world at rest costs what its awake bodies cost.
//
// Bodies are addressed by the caller's own small integer ids (the world's body
// index). Pairs come back sorted by (smaller id, larger id), smaller id first,
// appended to a slice the caller owns, so a step allocates nothing once the
// buffers have grown.
//
// A pair is reported when the boxes overlap (touching counts), at least one
// of the two bodies is dynamic and awake, and the collision filters of both
// admit the other. AllPairs is the brute-force reference with the same rule.
package broad
