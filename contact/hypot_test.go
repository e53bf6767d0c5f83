package contact

import (
	"math"
	"math/rand/v2"
	"testing"
)

func TestHypotAbove(t *testing.T) {
	// hypotAbove must answer exactly as math.Hypot(x, y) > b (the Go
	// standard library, the reference), near the boundary too, where its
	// shortcut must not decide.
	rng := rand.New(rand.NewPCG(1, 2))
	edge := []float64{0, math.Copysign(0, -1), 1e-320, 1e-160, 1e-145, 1, 3, 4, 5, 1e145, 1e160, math.MaxFloat64, math.Inf(1)}
	check := func(x, y, b float64) {
		if got, want := hypotAbove(x, y, b), math.Hypot(x, y) > b; got != want {
			t.Fatalf("hypotAbove(%g, %g, %g) = %v, math.Hypot says %v", x, y, b, got, want)
		}
	}
	for _, x := range edge {
		for _, y := range edge {
			for _, b := range edge {
				check(x, y, b)
				check(-x, y, -b)
			}
		}
	}
	for i := 0; i < 200000; i++ {
		x, y := rng.NormFloat64()*math.Pow(10, rng.Float64()*40-20), rng.NormFloat64()
		h := math.Hypot(x, y)
		// b at, just below and just above the hypotenuse, and far off.
		for _, b := range []float64{h, math.Nextafter(h, 0), math.Nextafter(h, math.Inf(1)), h * (1 + 1e-13), h * (1 - 1e-13), h * 2, h / 2} {
			check(x, y, b)
		}
	}
}
