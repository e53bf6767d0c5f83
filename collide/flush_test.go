package collide

import (
	"math/rand"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// TestFlushCornersKeepIDs: an upper box resting flush on an equal lower one
// has its corners on the side planes of the lower box's top face. A
// resting stack sways by a fraction of a micrometre from step to step
// (position correction, rounding); the four corner contacts stay the same
// features, so their ids must not change, or the solver loses the
// warm-start memory that carries their load (Catto, "Iterative dynamics
// with temporal coherence", 2005).
func TestFlushCornersKeepIDs(t *testing.T) {
	// swayRel: 6e-6 of the box's edge, 0.3 um for 50 mm boxes, the size of
	// a resting stack's motion between steps (measured: below 0.1 um at 1 ms).
	const swayRel = 6e-6
	rng := rand.New(rand.NewSource(12))
	for _, half := range []float64{0.005, 0.025, 0.2} {
		box := shapes.Box{Half: vec3{half, half, half}}
		base := shapes.Pose{Position: vec3{0, 0, half}, Orientation: mgl64.QuatIdent()}
		top := shapes.Pose{Position: vec3{0, 0, 3 * half}, Orientation: mgl64.QuatIdent()}
		sway := swayRel * 2 * half
		d := NewDetector()
		ref := d.Collide(nil, box, base, box, top, 1e-3)
		if n := len(idSet(ref)); n != 4 {
			t.Fatalf("half %g: %d points, want the 4 corners", half, n)
		}
		want := idSet(ref)
		for k := 0; k < 100; k++ {
			got := idSet(d.Collide(nil, box, base, box, jitter(top, rng, sway), 1e-3))
			if !sameIDs(got, want) {
				t.Fatalf("half %g: ids %x after a sway of %g m, want %x", half, got, sway, want)
			}
		}
	}
}
