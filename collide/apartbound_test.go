package collide

import (
	"math/rand"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// TestApartBoundSameResults: a pair that creeps toward contact in small
// steps is proved apart by the bound of conservative advancement (Mirtich
// 1996, ch. 2: a gap closes no faster than the relative motion of the
// shapes' points) for most of its approach, and CollidePair still returns
// exactly what Collide returns at every step, including the first step in
// contact. Each case closes the gap by a different motion, so that leaving
// one out of the bound (the translation, the turn of the moving shape, the
// turn of the face's owner) makes the bound prove apart a pair in contact.
func TestApartBoundSameResults(t *testing.T) {
	rng := rand.New(rand.NewSource(41))
	ss := cacheShapes(t, rng)
	// A gap of 5 mm closed in about 200 steps: 25 um a step, a tenth of the
	// margin below, as a part settling in a pile moves.
	const steps, margin = 400, 2.5e-4
	cases := []struct {
		name         string
		spinA, spinB float64 // turn of A and of B a step (rad)
	}{
		{"B slides toward A", 0, 0},
		{"and turns", 0, 4e-4},
		{"and A turns", 4e-4, 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			for i, a := range ss {
				for j, b := range ss {
					cached, plain := NewDetector(), NewDetector()
					cached.warm.off = true // the warm start changes results within GJK's tolerance (TestWarmGJKMatchesCold)
					var r1, r2 []Manifold
					apart, touched := 0, false
					// B starts on A's +x side, 5 mm apart, and slides in
					// at 25 um a step while the shapes turn.
					x0 := 0.2
					if d := plain.Distance(a.(shapes.Convex), shapes.Pose{Orientation: mgl64.QuatIdent()}, b.(shapes.Convex), shapes.Pose{Position: vec3{x0, 0.003, -0.002}, Orientation: mgl64.QuatIdent()}); d.Distance > 0 {
						x0 -= d.Distance - 0.005
					}
					for s := 0; s < steps; s++ {
						f := float64(s)
						pa := shapes.Pose{Orientation: mgl64.QuatRotate(tc.spinA*f, vec3{0.1, -0.3, 1}.Normalize())}
						pb := shapes.Pose{Position: vec3{x0 - 2.5e-5*f, 0.003, -0.002}, Orientation: mgl64.QuatRotate(tc.spinB*f, vec3{0.2, 0.3, 1}.Normalize())}
						r1 = cached.CollidePair(r1[:0], 1, a, pa, b, pb, margin)
						r2 = plain.Collide(r2[:0], a, pa, b, pb, margin)
						if !sameManifolds(r1, r2) {
							t.Fatalf("%T on %T, step %d: with the bound %+v, without %+v", a, b, s, r1, r2)
						}
						if len(r2) == 0 {
							apart++
						} else {
							touched = true
						}
						cached.NextStep()
					}
					st := cached.Stats()
					if !touched {
						t.Errorf("%d, %d (%T, %T): never touched: the case does not test the end of the bound", i, j, a, b)
					}
					// Most steps that the remembered axis proves apart are
					// proved by the bound, without measuring the axis.
					if st.Bounded < st.Remembered/2 || apart > 100 && st.Remembered > 0 && st.Bounded == 0 {
						t.Errorf("%T on %T: %d steps apart, %d proved by the axis, %d of them by the bound", a, b, apart, st.Remembered, st.Bounded)
					}
				}
			}
		})
	}
}
