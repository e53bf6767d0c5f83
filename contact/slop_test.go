package contact

import (
	"math"
	"testing"
)

// slopExact: a slop is a minimum of products of two given numbers, exact
// to an ulp.
const slopExact = 1e-18

func TestPointSlop(t *testing.T) {
	// The slop of a point is the settings' slop, capped at SlopSize times
	// the radius of the smaller moving body it joins; a body that does not
	// move (size 0) sets no cap (slop.go).
	set := DefaultSettings()
	set.Slop = 2e-4
	for _, c := range []struct {
		name         string
		sizeA, sizeB float64
		want         float64
	}{
		{"static and a 10 cm part", 0, 0.05, 2e-4},
		{"static and a 2 cm part at the cap", 0, 0.02, 2e-4},
		{"static and a 1 mm ball", 0, 0.5e-3, 5e-6},
		{"a 1 mm ball on a 10 cm part", 0.05, 0.5e-3, 5e-6},
		{"a 10 cm part on a 1 mm ball", 0.5e-3, 0.05, 5e-6},
		{"two static bodies", 0, 0, 2e-4},
	} {
		if got := PointSlop(&set, c.sizeA, c.sizeB); math.Abs(got-c.want) > slopExact {
			t.Errorf("%s: slop %g m, want %g m", c.name, got, c.want)
		}
	}
	set.SlopSize = 0
	if got := PointSlop(&set, 0, 0.5e-3); got != set.Slop {
		t.Errorf("SlopSize 0: slop %g m, want the settings' %g m", got, set.Slop)
	}
	set.SlopSize = -1
	if set.Validate() == nil {
		t.Error("a negative SlopSize was accepted")
	}
}
