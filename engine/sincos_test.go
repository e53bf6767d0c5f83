package engine

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestSincosMatchesStdlib checks sincos against the reference it stands in
// for, the Go standard library's math.Sincos, bit for bit: on the small
// angles of the free rotation (where its own polynomials run), at and
// around the octant boundary pi/4, and on the values it hands on.
func TestSincosMatchesStdlib(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 1))
	xs := []float64{0, math.Copysign(0, -1), 5e-324, -5e-324, 1e-300, 1e-9, 0.5, -0.5,
		math.Pi / 4, -math.Pi / 4, math.Nextafter(math.Pi/4, 0), math.Nextafter(math.Pi/4, 1),
		1, 3, -100, 1e30, math.Inf(1), math.Inf(-1), math.NaN()}
	for i := 0; i < 100000; i++ {
		// Magnitudes from 1e-12 to 10, both signs: a resting part's turn in
		// one step up to several octants.
		x := math.Pow(10, -12+13*rng.Float64())
		if rng.IntN(2) == 0 {
			x = -x
		}
		xs = append(xs, x)
	}
	same := func(a, b float64) bool {
		return math.Float64bits(a) == math.Float64bits(b) || math.IsNaN(a) && math.IsNaN(b)
	}
	for _, x := range xs {
		s, c := sincos(x)
		ws, wc := math.Sincos(x)
		if !same(s, ws) || !same(c, wc) {
			t.Fatalf("sincos(%v) = %v, %v; math.Sincos gives %v, %v", x, s, c, ws, wc)
		}
	}
}
