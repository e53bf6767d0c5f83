package collide

import (
	"math"
	"math/rand"
	"testing"
)

// TestHullTopMatchesScan: the climb to a hull's lowest vertex from where
// the last climb ended finds the greatest height along l that testing
// every vertex finds (the brute-force reference), whether the direction
// turns a little from step to step, as a resting part's does, or jumps,
// and when the memory holds another hull's vertex.
func TestHullTopMatchesScan(t *testing.T) {
	// The heights of two vertices of a tie differ by the rounding of a dot
	// product of lengths of a few centimetres: 1e-15 of the hull's size is
	// ten times that.
	const tieTol = 1e-15
	rng := rand.New(rand.NewSource(5))
	var top hullTop
	hulls := capTestHulls(t, rng)
	for trial := 0; trial < 4000; trial++ {
		h := hulls[(trial/50)%len(hulls)]
		if trial%7 == 3 {
			h = hulls[rng.Intn(len(hulls))]
		}
		l, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
		if trial%2 == 1 && top.h == h {
			// A small turn from the last direction.
			l, _ = unit(h.Vertices[top.i].Add(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(1e-3 * h.Size())))
		}
		best := math.Inf(-1)
		for _, p := range h.Vertices {
			best = math.Max(best, p.Dot(l))
		}
		i := top.lowest(h, l)
		if got := h.Vertices[i].Dot(l); got < best-tieTol*h.Size() {
			t.Fatalf("trial %d (%d vertices): vertex %d at %v, the highest is at %v", trial, len(h.Vertices), i, got, best)
		}
		if top.h != h || top.i != i {
			t.Fatalf("trial %d: the memory holds %p vertex %d, want %p vertex %d", trial, top.h, top.i, h, i)
		}
	}
}
