package collide

import (
	"math"
	"testing"
)

// persistSlopExact: a pair's slop is a minimum of products of two given
// numbers, exact to an ulp.
const persistSlopExact = 1e-18

func TestPersistSlopFollowsSize(t *testing.T) {
	// The slop that bounds a pair's refresh is the contact slop, capped at
	// the size fraction times the bound radius of its smaller shape
	// (persistsize.go); without a fraction it is the slop.
	for _, c := range []struct {
		name            string
		slop, frac, rho float64
		want            float64
	}{
		{"1 m ball, 0.2 mm slop", 2e-4, 0.002, 0.5, 2e-4},
		{"1 mm ball, 0.2 mm slop", 2e-4, 0.002, 0.5e-3, 1e-6},
		{"no fraction", 2e-4, 0, 0.5e-3, 2e-4},
	} {
		var d Detector
		d.SetPersistence(c.slop)
		d.SetSlopSize(c.frac)
		e := persistEntry{rho: c.rho}
		if got := d.persist.pairSlop(&e); math.Abs(got-c.want) > persistSlopExact {
			t.Errorf("%s: slop %g m, want %g m", c.name, got, c.want)
		}
	}
	// SetPersistence starts over without a cap; a fraction out of (0, 1]
	// is none.
	var d Detector
	d.SetPersistence(2e-4)
	d.SetSlopSize(0.002)
	d.SetPersistence(2e-4)
	if d.persist.size != 0 {
		t.Errorf("SetPersistence kept the size fraction %g", d.persist.size)
	}
	d.SetSlopSize(math.NaN())
	if d.persist.size != 0 {
		t.Errorf("a NaN fraction was kept: %g", d.persist.size)
	}
}
