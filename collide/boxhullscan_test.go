package collide

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
)

// TestBoxFacesScan compares the one-pass gaps of a hull beyond a box's six
// faces with a brute-force reference (the least of n.v - d over all
// vertices, written out here) and with the climbs of boxFaceAt, at random
// poses of a box against random hulls of 12 to 64 vertices.
func TestBoxFacesScan(t *testing.T) {
	// climbTol, relative to the hull's reach: the climb returns a vertex
	// whose value is the largest to the rounding of a dot product when
	// vertices tie (shapes.Hull.SupportFrom), a few ulps of the reach.
	const climbTol = 1e-14
	rng := rand.New(rand.NewPCG(5, 0x5ca7))
	for _, nv := range []int{12, 40, 64} {
		pts := make([]vec3, nv)
		for i := range pts {
			d := vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
			pts[i] = vec3{d[0] * 0.015, d[1] * 0.012, d[2] * 0.008}
		}
		h, err := shapes.NewHull(pts)
		if err != nil {
			t.Fatal(err)
		}
		reach := 0.0
		for _, v := range h.Vertices {
			reach = math.Max(reach, v.Len())
		}
		for i := 0; i < 500; i++ {
			var bv view
			bv.setConvex(shapes.Box{Half: vec3{0.015, 0.01, 0.008}}, shapes.RotationMatrix(randomTurn(rng)),
				vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(0.02))
			var p polytope
			p.init()
			p.set(&bv)
			var bh boxHullAxes
			bh.init(&p, h, &bv)
			var fv [6]int
			var fg [6]float64
			bh.boxFacesScan(&fv, &fg)
			for f := 0; f < 6; f++ {
				pl := p.planes[f]
				ref := math.Inf(1)
				for _, v := range h.Vertices {
					ref = math.Min(ref, pl.n.Dot(v)-pl.d)
				}
				if fg[f] != ref {
					t.Errorf("%d vertices, pose %d, face %d: gap %.17g, brute force %.17g", nv, i, f, fg[f], ref)
				}
				if got := pl.n.Dot(h.Vertices[fv[f]]) - pl.d; got != fg[f] {
					t.Errorf("%d vertices, pose %d, face %d: vertex %d gives %.17g, not the gap %.17g", nv, i, f, fv[f], got, fg[f])
				}
				if _, g := bh.boxFaceAt(f); math.Abs(g-ref) > climbTol*reach {
					t.Errorf("%d vertices, pose %d, face %d: climb %.17g, brute force %.17g", nv, i, f, g, ref)
				}
			}
		}
	}
}

// TestCrossingAxes checks the sign filter of the box-hull edge loop
// against the rule it stands in for, a negative product of the two faces'
// cosines (crossedBoxEdge): every axis with a negative product must be in
// the set, and only axes of strictly opposite signs may be. Cosines are
// drawn from negatives, zeros (both signs) and positives, tiny ones
// included, on all 3^3 x 3^3 sign patterns and at random.
func TestCrossingAxes(t *testing.T) {
	vals := []float64{-1, -1e-300, math.Copysign(0, -1), 0, 1e-300, 0.5}
	rng := rand.New(rand.NewPCG(3, 0x5195))
	for k := 0; k < 20000; k++ {
		var ca, cb vec3
		for i := 0; i < 3; i++ {
			ca[i], cb[i] = vals[rng.IntN(len(vals))], vals[rng.IntN(len(vals))]
			if k%2 == 1 {
				ca[i], cb[i] = rng.NormFloat64(), rng.NormFloat64()
			}
		}
		m := crossingAxes(cosSigns(&ca), cosSigns(&cb))
		for i := 0; i < 3; i++ {
			in := m&(1<<i) != 0
			if ca[i]*cb[i] < 0 && !in {
				t.Errorf("cosines %v and %v: axis %d has a negative product but is not in %03b", ca, cb, i, m)
			}
			if in && !(ca[i] < 0 && cb[i] > 0 || ca[i] > 0 && cb[i] < 0) {
				t.Errorf("cosines %v and %v: axis %d is in %03b without opposite signs", ca, cb, i, m)
			}
		}
	}
}

// TestBoxFaceContact checks that the box-hull test's contact on a box face,
// whose incident hull face is read off the cosines the test measured
// (boxFaceContact), is polyContact's on the same result bit for bit: the
// same normal and the same candidate points, at random poses of a box
// overlapping or near random hulls. It fails unless both signs of a box
// face were seen.
func TestBoxFaceContact(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 0xfacec))
	seen := [2]int{}
	for _, nv := range []int{12, 40, 64} {
		h := ellipsoidHull(t, rng, nv, vec3{0.015, 0.012, 0.008})
		d := NewDetector()
		for i := 0; i < 2000; i++ {
			var bv, hv view
			bv.setConvex(shapes.Box{Half: vec3{0.015, 0.01, 0.008}}, shapes.RotationMatrix(randomTurn(rng)),
				vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(0.012))
			hv.setConvex(h, identity3, vec3{})
			p := &d.polyP
			p.set(&bv)
			var r satResult
			if !d.satBoxHull(p, h, &bv, bv.size+hv.size, 0.002, pairHint{}, &r, nil, d.hullSlack(h)) ||
				r.kind != satFaceP || len(d.faceCos) != len(h.Faces) {
				continue
			}
			seen[r.face%2]++
			q := &d.polyQ
			q.set(&hv)
			nRef := d.polyContact(p, q, r, 0.002)
			ref := append([]candPoint(nil), d.cand...)
			q.setIndexed(&hv, d.hullSlack(h))
			n := d.boxFaceContact(p, q, r, 0.002)
			if n != nRef || len(d.cand) != len(ref) {
				t.Fatalf("%d vertices, pose %d: normal %v and %d points, polyContact %v and %d", nv, i, n, len(d.cand), nRef, len(ref))
			}
			for k := range ref {
				if d.cand[k] != ref[k] {
					t.Errorf("%d vertices, pose %d, point %d: %+v, polyContact %+v", nv, i, k, d.cand[k], ref[k])
				}
			}
		}
	}
	if seen[0] == 0 || seen[1] == 0 {
		t.Errorf("box faces chosen: %d positive, %d negative; want both", seen[0], seen[1])
	}
	t.Logf("box faces chosen: %d positive, %d negative", seen[0], seen[1])
}

// edgeGapVectors is edgeGap written with the vector methods, as it was
// before it was written out on scalars: the reference of
// TestEdgeGapScalars.
func (x *boxEdgeFrame) edgeGapVectors(q0, dq *vec3) (s float64, ax vec3, ok bool) {
	ax = x.dp.Cross(*dq)
	l2 := ax.Dot(ax)
	if l2 <= satParallel*satParallel*x.dd*dq.Dot(*dq) || l2 == 0 {
		return 0, ax, false
	}
	ax = ax.Mul(1 / math.Sqrt(l2))
	if ax.Dot(x.out) < 0 {
		ax = ax.Mul(-1)
	}
	return ax.Dot(q0.Sub(x.p0)), ax, true
}

// TestEdgeGapScalars checks that edgeGap on scalars gives the vector
// form's gap, axis and verdict bit for bit, on random box edges and hull
// edges in general position, nearly and exactly parallel, of zero length,
// and with the outward direction on either side.
func TestEdgeGapScalars(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 0xed6e))
	rv := func() vec3 { return vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(0.01) }
	bits := func(v vec3) [3]uint64 {
		return [3]uint64{math.Float64bits(v[0]), math.Float64bits(v[1]), math.Float64bits(v[2])}
	}
	parallel := 0
	for i := 0; i < 200000; i++ {
		x := boxEdgeFrame{p0: rv(), dp: rv(), out: rv()}
		x.dd = x.dp.Dot(x.dp)
		q0, dq := rv(), rv()
		switch i % 5 {
		case 1:
			dq = x.dp.Mul(rng.NormFloat64()) // parallel
		case 2:
			dq = x.dp.Add(rv().Mul(1e-7)) // nearly parallel
		case 3:
			dq = vec3{}
		}
		s, ax, ok := x.edgeGap(&q0, &dq)
		rs, rax, rok := x.edgeGapVectors(&q0, &dq)
		if !rok {
			parallel++
		}
		if ok != rok || math.Float64bits(s) != math.Float64bits(rs) || bits(ax) != bits(rax) {
			t.Fatalf("case %d: gap %.17g, axis %v, ok %v; vector form %.17g, %v, %v", i, s, ax, ok, rs, rax, rok)
		}
	}
	if parallel == 0 {
		t.Error("no parallel pair was tried")
	}
}
