package collide

import (
	"math/rand"
	"testing"

	"clatter/shapes"
)

// TestGJKStop checks gjkUntil's early answer against brute force over all
// feature pairs of random polytope pairs (ref_test.go): it may say apart
// only when the distance exceeds the stop, its distance is then a lower
// bound, and it must say apart whenever the distance is clearly above the
// stop (the last iterations' lower bound reaches the distance).
func TestGJKStop(t *testing.T) {
	pairs := 1000
	if testing.Short() {
		pairs = 200
	}
	const (
		// boundTol: the lower bound is a dot product and a square root of
		// lengths about 1, rounded to a few ulps.
		boundTol = 1e-12
		// below: a stop this fraction of the distance or less must be
		// reported apart; GJK's bounds agree to 1e-13 relative at the end,
		// and gjkStopBand asks for 1e-9 more.
		below = 1 - 1e-6
		// ambiguous: pairs whose brute-force gap is this close to zero are
		// touching within rounding (as in TestDistanceRandomHulls).
		ambiguous = 1e-9
	)
	rng := rand.New(rand.NewSource(7))
	d := NewDetector()
	nApart, nEarly := 0, 0
	for i := 0; i < pairs; i++ {
		la, lb, pa, pb := randomPair(rng)
		wa, wb := place(la, pa), place(lb, pb)
		ra, rb := bruteHull(wa), bruteHull(wb)
		if gap, _ := refGap(ra, rb); gap <= ambiguous {
			continue
		}
		ref := refDistance(ra, rb) // brute force: the distance of the placed hulls
		ha, err := shapes.NewHull(la)
		if err != nil {
			t.Fatal(err)
		}
		hb, err := shapes.NewHull(lb)
		if err != nil {
			t.Fatal(err)
		}
		fa, fb := poseFrame(pa), poseFrame(pb)
		var va, vb view
		rot, pos := fa.relative(fb)
		va.setConvex(ha, identity3, vec3{})
		vb.setConvex(hb, rot, pos)
		for _, stop := range []float64{0, ref * rng.Float64() * below, ref * below, ref, ref * (1 + rng.Float64())} {
			g := d.gjkUntil(&va, &vb, false, stop)
			if g.apart {
				nEarly++
				if !(ref > stop) {
					t.Errorf("pair %d: apart beyond stop %.17g, brute-force distance %.17g", i, stop, ref)
				}
				if g.dist > ref*(1+boundTol) || g.dist <= stop {
					t.Errorf("pair %d: lower bound %.17g, stop %.17g, brute-force distance %.17g", i, g.dist, stop, ref)
				}
			} else if stop <= ref*below {
				t.Errorf("pair %d: not proved apart beyond stop %.17g, brute-force distance %.17g (GJK %.17g after %d iterations)", i, stop, ref, g.dist, g.iters)
			}
		}
		nApart++
	}
	if nApart < pairs/4 || nEarly < 2*nApart {
		t.Fatalf("only %d pairs apart and %d early answers of %d pairs", nApart, nEarly, pairs)
	}
}
