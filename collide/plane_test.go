package collide

import (
	"math/rand"
	"slices"
	"testing"

	"clatter/shapes"
)

// capTestHulls are hulls of many kinds for the cap walk: random clouds
// (vertices of varied degree), points on ellipsoids (every point a vertex),
// and prisms (merged polygon faces with many coplanar vertices).
func capTestHulls(t *testing.T, rng *rand.Rand) []*shapes.Hull {
	var hs []*shapes.Hull
	for _, n := range []int{6, 20, 40, 300} {
		hs = append(hs, ellipsoidHull(t, rng, n, vec3{0.015, 0.012, 0.008}))
		h, err := shapes.NewHull(randomCloud(rng, n, vec3{0.5, 0.2, 0.3}))
		if err != nil {
			t.Fatal(err)
		}
		hs = append(hs, h)
	}
	return append(hs, prismHull(t, 6, 0.02, 0.01), prismHull(t, 48, 0.3, 0.1))
}

// TestHullCapMatchesScan: the walk over the vertex graph finds the same
// vertices as testing every vertex (the brute-force reference), also with
// the cap's limit placed exactly on a vertex.
func TestHullCapMatchesScan(t *testing.T) {
	rng := rand.New(rand.NewSource(3))
	d := NewDetector()
	for hi, h := range capTestHulls(t, rng) {
		for trial := 0; trial < 200; trial++ {
			l, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
			top := h.SupportIndex(l)
			h0 := rng.NormFloat64() * 0.01
			// The limit: at a random vertex's height (a tie) or at random.
			lim := h0 - l.Dot(h.Vertices[rng.Intn(len(h.Vertices))])
			if trial%2 == 1 {
				lim = (h0 - l.Dot(h.Vertices[top])) + rng.Float64()*0.02
			}
			var want []int32
			for i, p := range h.Vertices {
				if !(h0-l.Dot(p) > lim) {
					want = append(want, int32(i))
				}
			}
			got := d.hullCap(h, l, top, h0, lim, 1e-4*h.Size())
			if !slices.Equal(got, want) {
				t.Fatalf("hull %d (%d vertices), trial %d: cap %v, scan %v", hi, len(h.Vertices), trial, got, want)
			}
		}
	}
}

// TestPlaneHullWalkMatchesScan: a hull on a plane gives the same manifold
// whether its vertices are found by the walk or, without vertex adjacency,
// by testing every one (the reference).
func TestPlaneHullWalkMatchesScan(t *testing.T) {
	rng := rand.New(rand.NewSource(4))
	d := NewDetector()
	floor := shapes.Plane{Normal: vec3{0, 0, 1}}
	for hi, h := range capTestHulls(t, rng) {
		scan := *h
		scan.Neighbors = nil
		for trial := 0; trial < 200; trial++ {
			pose := shapes.Pose{Orientation: randomRotation(rng)}
			low := pose.Apply(h.Vertices[h.SupportIndex(pose.RotateInv(vec3{0, 0, -1}))])
			pose.Position[2] = -low[2] + (rng.Float64()-0.7)*0.01
			margin := rng.Float64() * 0.01
			got := d.Collide(nil, floor, shapes.IdentityPose, h, pose, margin)
			want := d.Collide(nil, floor, shapes.IdentityPose, &scan, pose, margin)
			if !slices.Equal(got, want) {
				t.Fatalf("hull %d, trial %d: walk %+v, scan %+v", hi, trial, got, want)
			}
		}
	}
}
