package engine

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestSincosMatchesMath: sincos gives math.Sincos's results bit for bit
// (the reference is the standard library itself) for angles just below and
// above tinyTurn, tiny and subnormal ones, zeros of both signs, angles
// at and across the edge of the first octant (sincosOctant), and ordinary
// angles.
func TestSincosMatchesMath(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	xs := []float64{0, math.Copysign(0, -1), tinyTurn, -tinyTurn, math.Nextafter(tinyTurn, 0), -math.Nextafter(tinyTurn, 0),
		2 * tinyTurn, 4 * tinyTurn, 5e-324, -5e-324, 1e-300, 0.5, -3, 1e6,
		// The edge of the first octant (sincosOctant), infinities and NaN.
		math.Pi / 4, -math.Pi / 4, math.Nextafter(math.Pi/4, 0), math.Nextafter(math.Pi/4, 1),
		math.Nextafter(-math.Pi/4, 0), math.Inf(1), math.Inf(-1), math.NaN()}
	for i := 0; i < 100000; i++ {
		// Uniform in the first octant and a little beyond (sincosOctant).
		xs = append(xs, (rng.Float64()-0.5)*2.2)
	}
	for i := 0; i < 100000; i++ {
		// Log-uniform magnitudes from 1e-20 to 1e-6, around tinyTurn (3.7e-9).
		x := math.Pow(10, -20+14*rng.Float64())
		if rng.IntN(2) == 0 {
			x = -x
		}
		xs = append(xs, x)
	}
	for _, x := range xs {
		s, c := sincos(x)
		ws, wc := math.Sincos(x)
		if math.IsNaN(x) && math.IsNaN(s) && math.IsNaN(c) {
			continue
		}
		if math.Float64bits(s) != math.Float64bits(ws) || math.Float64bits(c) != math.Float64bits(wc) {
			t.Fatalf("sincos(%g) = %v, %v; math.Sincos gives %v, %v", x, s, c, ws, wc)
		}
	}
}
