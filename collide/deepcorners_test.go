package collide

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// TestDeepCornersKept checks, for boxes sunk tilted into a floor plane,
// that the manifold keeps every corner whose depth (computed directly: the
// corner's height below the plane) is within reach of the deepest's, in
// order of depth: the two deepest corners at least. A manifold that left a
// deep corner out for shallower ones let a cube rest sunk on that corner
// for ever (engine TestSmallPartsAtCoarseSteps).
func TestDeepCornersKept(t *testing.T) {
	const half = 0.001
	const posTol = 1e-12 // rounding of a millimetre corner's position
	// margin: speculative points up to 0.5 mm apart are kept too, as the
	// world asks for a part moving 0.3 m/s at 1/60 s, plus the slop.
	const margin = 5e-4
	rng := rand.New(rand.NewPCG(5, 6))
	d := NewDetector()
	floor := shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}
	box := shapes.Box{Half: shapes.Vec3{half, half, half}}
	checked := 0
	for trial := 0; trial < 500; trial++ {
		axis := shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
		q := mgl64.QuatRotate(rng.Float64()*math.Pi, axis)
		var corners []shapes.Vec3
		lowest := math.Inf(1)
		for k := 0; k < 8; k++ {
			c := q.Rotate(shapes.Vec3{half * float64(1-2*(k&1)), half * float64(1-2*(k>>1&1)), half * float64(1-2*(k>>2&1))})
			corners = append(corners, c)
			lowest = math.Min(lowest, c[2])
		}
		// Sink the deepest corner 0.1 to 1.4 mm into the floor.
		pos := shapes.Vec3{0, 0, -lowest - (1e-4 + 1.3e-3*rng.Float64())}
		ms := d.Collide(nil, floor, shapes.Pose{Orientation: mgl64.QuatIdent()}, box, shapes.Pose{Position: pos, Orientation: q}, margin)
		if len(ms) != 1 {
			t.Fatalf("trial %d: %d manifolds, want 1", trial, len(ms))
		}
		m := ms[0]
		world := make([]shapes.Vec3, 8)
		for k := range corners {
			world[k] = pos.Add(corners[k])
		}
		slices.SortFunc(world, func(a, b shapes.Vec3) int { return cmpFloat(a[2], b[2]) })
		for _, c := range world[:2] {
			if c[2] >= 0 {
				continue // not penetrating
			}
			checked++
			found := false
			for k := 0; k < m.Count; k++ {
				// Points lie midway between the surfaces: compare in the plane
				// and the separation with the corner's depth.
				p := m.Points[k]
				if math.Abs(p.Position[0]-c[0]) < posTol && math.Abs(p.Position[1]-c[1]) < posTol && math.Abs(p.Separation-c[2]) < posTol {
					found = true
				}
			}
			if !found {
				t.Errorf("trial %d: corner at depth %.3g mm missing from the manifold %+v", trial, -c[2]*1000, m.Points[:m.Count])
			}
		}
	}
	if checked < 500 {
		t.Fatalf("only %d deep corners checked", checked)
	}
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}
