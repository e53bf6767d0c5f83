package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"
)

// randomPair draws two random convex point clouds of 4-20 points placed so
// that about half of the pairs overlap.
func randomPair(rng *rand.Rand) (la, lb []vec3, pa, pb shapes.Pose) {
	size := func() vec3 { return vec3{0.3 + rng.Float64(), 0.3 + rng.Float64(), 0.3 + rng.Float64()} }
	la = randomCloud(rng, 4+rng.Intn(17), size())
	lb = randomCloud(rng, 4+rng.Intn(17), size())
	pa = shapes.Pose{Position: vec3{rng.Float64(), rng.Float64(), rng.Float64()}, Orientation: randomRotation(rng)}
	dir, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
	pb = shapes.Pose{Position: pa.Position.Add(dir.Mul(2.4 * rng.Float64())), Orientation: randomRotation(rng)}
	return
}

// TestDistanceRandomHulls checks GJK distances and EPA depths of thousands
// of random polytope pairs against brute force over all feature pairs
// (distance) and over all candidate separating axes (depth).
func TestDistanceRandomHulls(t *testing.T) {
	pairs := 2000
	if testing.Short() {
		pairs = 300
	}
	const (
		// relTol: GJK stops when its lower and upper bounds agree to 1e-13
		// relative; signed volumes keep the sub-simplex step near machine
		// precision, so 1e-9 relative (the task's requirement) leaves room
		// for rounding on nearly degenerate simplices.
		relTol = 1e-9
		// sizeTol: points returned as closest must lie in their hull within
		// rounding of coordinates of size about 2.
		sizeTol = 1e-12
		// ambiguous: pairs whose brute-force gap is this close to zero are
		// touching within rounding and checked only for sanity.
		ambiguous = 1e-9
	)
	rng := rand.New(rand.NewSource(1))
	d := NewDetector()
	var maxDist, maxDepth, maxNormal float64
	nDist, nPen := 0, 0
	for i := 0; i < pairs; i++ {
		la, lb, pa, pb := randomPair(rng)
		wa, wb := place(la, pa), place(lb, pb)
		ra, rb := bruteHull(wa), bruteHull(wb)
		gap, _ := refGap(ra, rb)
		ha, err := shapes.NewHull(la)
		if err != nil {
			t.Fatal(err)
		}
		hb, err := shapes.NewHull(lb)
		if err != nil {
			t.Fatal(err)
		}
		for _, sh := range [][2]shapes.Convex{{cloud{la}, cloud{lb}}, {ha, hb}} {
			res := d.Distance(sh[0], pa, sh[1], pb)
			pen := d.Penetration(sh[0], pa, sh[1], pb)
			for _, v := range []float64{res.Distance, pen.Depth, pen.Normal[0], pen.Normal[1], pen.Normal[2]} {
				if math.IsNaN(v) {
					t.Fatalf("pair %d: NaN in result %+v %+v", i, res, pen)
				}
			}
			switch {
			case gap > ambiguous:
				nDist++
				ref := refDistance(ra, rb)
				if math.Abs(gap-ref) > 1e-9*ref && gap > ref {
					t.Fatalf("pair %d: reference inconsistent: gap %g > distance %g", i, gap, ref)
				}
				if res.Overlap {
					t.Fatalf("pair %d: GJK reports overlap, reference distance %.17g", i, ref)
				}
				e := math.Abs(res.Distance-ref) / ref
				maxDist = math.Max(maxDist, e)
				if e > relTol {
					t.Errorf("pair %d: distance %.17g, brute force %.17g (rel error %.3g > %g)", i, res.Distance, ref, e, relTol)
				}
				if !insidePoly(ra, res.PointA, sizeTol) || !insidePoly(rb, res.PointB, sizeTol) {
					t.Errorf("pair %d: closest points not on their shapes", i)
				}
				if dd := res.PointB.Sub(res.PointA).Len(); math.Abs(dd-res.Distance) > relTol*ref {
					t.Errorf("pair %d: |PointB-PointA| = %g, Distance %g", i, dd, res.Distance)
				}
				// The separating direction: the shapes' projections on it are
				// apart by the distance itself.
				if g := gapAlong(wa, wb, res.Normal); math.Abs(g-ref) > relTol*ref {
					t.Errorf("pair %d: gap along the normal %g, distance %g", i, g, ref)
				}
			case gap < -ambiguous:
				nPen++
				depth := -gap
				if !res.Overlap || !pen.Overlap {
					t.Fatalf("pair %d: overlap by %g not detected (%+v)", i, depth, res)
				}
				e := math.Abs(pen.Depth-depth) / depth
				maxDepth = math.Max(maxDepth, e)
				if e > relTol {
					t.Errorf("pair %d: depth %.17g, brute force %.17g (rel error %.3g)", i, pen.Depth, depth, e)
				}
				// The normal is a least-translation direction: the overlap of
				// the projections along it equals the depth.
				g := -gapAlong(wa, wb, pen.Normal)
				en := math.Abs(g-depth) / depth
				maxNormal = math.Max(maxNormal, en)
				if en > relTol {
					t.Errorf("pair %d: overlap along the EPA normal %g, depth %g", i, g, depth)
				}
			}
		}
	}
	t.Logf("%d distance and %d penetration checks: max rel error distance %.3g, depth %.3g, normal overlap %.3g; stats %+v",
		nDist, nPen, maxDist, maxDepth, maxNormal, d.Stats())
	if nDist < pairs/2 || nPen < pairs/2 {
		t.Errorf("unbalanced sample: %d apart, %d overlapping", nDist, nPen)
	}
}
