package collide

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
)

// TestCylinderEdgeAcrossSide puts a box's edge across a cylinder's side, at
// random skew angles, heights and turns of the whole pair, at a chosen
// separation s from -2 mm to +2 mm along the side's outward normal n, the
// box on the far side of the edge. Apart, the distance is s exactly and n
// the normal: every point of the box is at least r + s from the axis, and
// the edge's point on the common perpendicular is r + s from it (geometry
// of the construction). Overlapping, the depth is the general path's (EPA).
// Every pose must be proved by the separating axes and their witnesses
// (no fallback to GJK/EPA), with the sign of the separation right.
func TestCylinderEdgeAcrossSide(t *testing.T) {
	const (
		r, h = 0.01, 0.012 // the pour benchmark's cylinder (bench/bin.go)
		// exactTol (m): the construction's and the axes' rounding on
		// lengths of a few centimetres, far below cylCertTol's 1e-9 of
		// the sizes (3e-11 m).
		exactTol = 1e-13
		// normTol (radians, as the length of the difference of the unit
		// normals): the normal of an edge apart from the side is the
		// construction's n to rounding.
		normTol = 1e-12
		// epaTol, relative to the sizes: the reference's own error, as in
		// TestCylinderAxesMatchGJKEPA (EPA stops at 1e-7 of the size on
		// curved shapes; twice that).
		epaTol = 2e-7
		margin = 0.005 // above the largest separation tried
	)
	half := vec3{0.015, 0.01, 0.008}
	rng := rand.New(rand.NewPCG(13, 0x51de))
	d := NewDetector()
	var worstApart, worstOver float64
	for i := 0; i < 3000; i++ {
		s := -0.002 + 0.004*rng.Float64()
		phi := (rng.Float64()*2 - 1) * math.Pi / 3 // skew of the edge from square to the axis
		alpha := (10 + 70*rng.Float64()) * math.Pi / 180
		z0 := (rng.Float64()*2 - 1) * 0.8 * h
		xoff := (rng.Float64()*2 - 1) * 0.8 * half[0]
		n := vec3{1, 0, 0}
		e := vec3{0, math.Cos(phi), math.Sin(phi)}
		w := e.Cross(n)
		// Box axes: X along the edge, Y and Z into the box, both leaning
		// away from the cylinder (positive along n); X x Y = Z.
		ax := [3]vec3{e, n.Mul(math.Cos(alpha)).Sub(w.Mul(math.Sin(alpha))), n.Mul(math.Sin(alpha)).Add(w.Mul(math.Cos(alpha)))}
		edgePt := vec3{r + s, 0, z0}
		centre := edgePt.Add(ax[0].Mul(-xoff)).Add(ax[1].Mul(half[1])).Add(ax[2].Mul(half[2]))
		var brot mat3
		for k := 0; k < 3; k++ {
			brot[3*k], brot[3*k+1], brot[3*k+2] = ax[k][0], ax[k][1], ax[k][2]
		}
		// The whole pair turned at random.
		g := shapes.RotationMatrix(randomTurn(rng))
		var cv, bv view
		cv.setConvex(shapes.Cylinder{Radius: r, HalfLength: h}, g, vec3{})
		bv.setConvex(shapes.Box{Half: half}, mulMM(g, brot), mul(g, centre))
		nw := mul(g, n)
		got, ok, done := d.cylPoly(&cv, &bv, margin)
		if !done || !ok {
			t.Errorf("pose %d (s %.3g mm): handled %v, within margin %v; want proved by the axes", i, s*1e3, done, ok)
			continue
		}
		if (got.sep > 0) != (s > 0) {
			t.Errorf("pose %d: separation %.6g, want the sign of %.6g", i, got.sep, s)
		}
		if s > 0 {
			err := math.Abs(got.sep - s)
			worstApart = math.Max(worstApart, err)
			if err > exactTol {
				t.Errorf("pose %d: separation %.15g, want %.15g", i, got.sep, s)
			}
			if ang := got.n.Sub(nw).Len(); ang > normTol {
				t.Errorf("pose %d: normal %v, want %v (%.3g rad)", i, got.n, nw, ang)
			}
			// The witness points: one on each shape, s apart along n.
			if gap := got.pb.Sub(got.pa); math.Abs(gap.Len()-s) > exactTol {
				t.Errorf("pose %d: points %v and %v are %.15g apart, want %.15g", i, got.pa, got.pb, gap.Len(), s)
			}
			continue
		}
		ref, okRef := d.distance(&cv, &bv, math.Inf(1))
		if !okRef || ref.failed {
			t.Fatalf("pose %d: the reference failed", i)
		}
		err := math.Abs(got.sep-ref.sep) / (cv.size + bv.size)
		worstOver = math.Max(worstOver, err)
		if err > epaTol {
			t.Errorf("pose %d: depth %.9g by axes, %.9g by EPA", i, -got.sep, -ref.sep)
		}
	}
	t.Logf("worst separation error apart %.2g m, overlapping %.2g of the sizes", worstApart, worstOver)
}
