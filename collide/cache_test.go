package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// ellipsoidHull is the hull of n random points on an ellipsoid of half
// axes s (every point a vertex: about 2n faces and 3n edges).
func ellipsoidHull(t testing.TB, rng interface{ NormFloat64() float64 }, n int, s vec3) *shapes.Hull {
	t.Helper()
	pts := make([]vec3, n)
	for i := range pts {
		d, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
		pts[i] = vec3{d[0] * s[0], d[1] * s[1], d[2] * s[2]}
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	return h
}

// TestBoxHullMatchesReference: the box-hull separating-axis test (crossings
// found from the box frame's coordinate planes) finds the least
// penetration of the brute-force test over every face and every edge pair,
// up to the edge bias, and the same value as the generic pruned test on the
// same polytopes; on pairs apart it finds a separating axis exactly when the
// generic test does.
func TestBoxHullMatchesReference(t *testing.T) {
	const tol = 1e-12 // projections of the same vertices, coordinates of size 1
	rng := rand.New(rand.NewSource(23))
	// A few hulls, random clouds and 40-vertex ellipsoids, each with its
	// brute-force facets (which a rigid motion keeps).
	type refHull struct {
		h   *shapes.Hull
		ref refPoly
	}
	var hulls []refHull
	for k := 0; k < 12; k++ {
		var hull *shapes.Hull
		if k%2 == 0 {
			h, err := shapes.NewHull(randomCloud(rng, 4+rng.Intn(30), vec3{0.3 + rng.Float64(), 0.3 + rng.Float64(), 0.3 + rng.Float64()}))
			if err != nil {
				t.Fatal(err)
			}
			hull = h
		} else {
			hull = ellipsoidHull(t, rng, 40, vec3{0.5 + rng.Float64(), 0.5 + rng.Float64(), 0.3 + rng.Float64()})
		}
		hulls = append(hulls, refHull{hull, bruteHull(hull.Vertices)})
	}
	d := NewDetector()
	over, apart := 0, 0
	for i := 0; i < 400; i++ {
		half := vec3{0.2 + rng.Float64(), 0.2 + rng.Float64(), 0.2 + rng.Float64()}
		rh := hulls[i%len(hulls)]
		hull := rh.h
		pa := shapes.Pose{Position: vec3{rng.Float64(), rng.Float64(), rng.Float64()}, Orientation: randomRotation(rng)}
		dir, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
		pb := shapes.Pose{Position: pa.Position.Add(dir.Mul(2.5 * rng.Float64())), Orientation: randomRotation(rng)}
		var corners []vec3
		for k := 0; k < 8; k++ {
			corners = append(corners, pa.Apply(boxVertex(half, k)))
		}
		placed := rh.ref
		placed.pts = place(hull.Vertices, pb)
		ref, _ := refGap(bruteHull(corners), placed)

		// The fast test in the hull's frame, as boxHull runs it.
		fa, fb := poseFrame(pa), poseFrame(pb)
		var a, b view
		a.setConvex(shapes.Box{Half: half}, fa.rot, fa.pos)
		b.setConvex(hull, fb.rot, fb.pos)
		bv := a
		bv.rot = mulTM(b.rot, a.rot)
		bv.pos = mulT(b.rot, a.pos.Sub(b.pos))
		hv := b
		hv.rot, hv.pos = identity3, vec3{}
		d.polyP.set(&bv)
		d.polyQ.set(&hv)
		var r satResult
		ok := d.satBoxHull(&d.polyP, hull, &bv, a.size+b.size, 0, pairHint{}, &r, nil, d.hullSlack(hull))
		generic, gok := sat(&d.polyP, &d.polyQ, 0)
		if ok != gok {
			t.Errorf("pair %d: fast test overlap %v, generic %v (brute-force gap %.3g)", i, ok, gok, ref)
			continue
		}
		if ref > 1e-9 {
			if ok {
				// Both found no separating face or crossing edge pair, so
				// the pair is within rounding of touching.
				t.Errorf("pair %d: apart by %.3g but no separating axis", i, ref)
			}
			apart++
			continue
		}
		if ref < -1e-9 {
			scale := a.size + b.size
			if !ok || !biasedMatch(r.sep, ref, tol, scale) {
				t.Errorf("pair %d: fast %.15g (ok %v), brute force %.15g", i, r.sep, ok, ref)
			}
			if math.Abs(r.sep-generic.sep) > tol {
				t.Errorf("pair %d: fast %.15g (kind %d), generic %.15g (kind %d)", i, r.sep, r.kind, generic.sep, generic.kind)
			}
			over++
		}
	}
	if over < 100 || apart < 50 {
		t.Errorf("only %d overlapping and %d separated pairs", over, apart)
	}
}

// cacheShapes is one of each shape the pair memory serves, of sizes about
// 0.1, with hulls small enough for the separating-axis test and large
// enough for the general path.
func cacheShapes(t *testing.T, rng *rand.Rand) []shapes.Shape {
	return []shapes.Shape{
		shapes.Box{Half: vec3{0.05, 0.03, 0.02}},
		shapes.Cylinder{Radius: 0.03, HalfLength: 0.04},
		ellipsoidHull(t, rng, 40, vec3{0.05, 0.04, 0.03}),
		prismHull(t, 6, 0.04, 0.02),
		shapes.Sphere{Radius: 0.03},
		shapes.Capsule{Radius: 0.02, HalfLength: 0.03},
	}
}

// sameManifolds reports whether two results are equal in every bit.
func sameManifolds(a, b []Manifold) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// TestPairMemorySameResults: CollidePair returns exactly what Collide
// returns, query by query, for every pair of shape kinds moving through
// separated, speculative and touching poses over many steps, while its
// memory answers most of the separated queries. A second detector fed the
// same queries gives the same results (determinism).
func TestPairMemorySameResults(t *testing.T) {
	rng := rand.New(rand.NewSource(31))
	ss := cacheShapes(t, rng)
	type track struct {
		a, b      shapes.Shape
		pa, pb    shapes.Pose
		vel, spin vec3
		spinA     vec3
		key       uint64
		margin    float64
	}
	var tracks []*track
	for i := range ss {
		for j := range ss {
			for k := 0; k < 4; k++ {
				dir, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
				pa := shapes.Pose{Position: vec3{rng.Float64(), rng.Float64(), rng.Float64()}, Orientation: randomRotation(rng)}
				pb := shapes.Pose{Position: pa.Position.Add(dir.Mul(0.06 + 0.12*rng.Float64())), Orientation: randomRotation(rng)}
				// Moving toward A, so that the pair passes from apart to
				// touching (and through) within the run.
				vel := dir.Mul(-0.05 - 0.1*rng.Float64()).Add(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(0.02))
				tracks = append(tracks, &track{
					a: ss[i], b: ss[j], pa: pa, pb: pb, vel: vel,
					spin:   vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()},
					spinA:  vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(0.5),
					key:    uint64(len(tracks)) * 7, // sparse keys, in order
					margin: 0.002 * float64(k),
				})
			}
		}
	}
	const steps, dt = 150, 0.01
	cached, again, plain := NewDetector(), NewDetector(), NewDetector()
	// The warm start of GJK changes results within its tolerance
	// (TestWarmGJKMatchesCold); the memory of this test changes none.
	cached.warm.off, again.warm.off = true, true
	var r1, r2, r3 []Manifold
	queries, touching := 0, 0
	for s := 0; s < steps; s++ {
		for n, tr := range tracks {
			if s%7 == 3 && n%5 == 0 {
				continue // a pair left out of a step is forgotten, then remembered anew
			}
			r1 = cached.CollidePair(r1[:0], tr.key, tr.a, tr.pa, tr.b, tr.pb, tr.margin)
			r2 = again.CollidePair(r2[:0], tr.key, tr.a, tr.pa, tr.b, tr.pb, tr.margin)
			r3 = plain.Collide(r3[:0], tr.a, tr.pa, tr.b, tr.pb, tr.margin)
			if !sameManifolds(r1, r3) {
				t.Fatalf("step %d pair %d (%T, %T): with memory %+v, without %+v", s, n, tr.a, tr.b, r1, r3)
			}
			if !sameManifolds(r1, r2) {
				t.Fatalf("step %d pair %d: two detectors differ", s, n)
			}
			queries++
			if len(r3) > 0 {
				touching++
			}
		}
		cached.NextStep()
		again.NextStep()
		for _, tr := range tracks {
			tr.pb.Position = tr.pb.Position.Add(tr.vel.Mul(dt))
			tr.pb.Orientation = mgl64.QuatRotate(tr.spin.Len()*dt, tr.spin.Normalize()).Mul(tr.pb.Orientation).Normalize()
			tr.pa.Orientation = mgl64.QuatRotate(tr.spinA.Len()*dt, tr.spinA.Normalize()).Mul(tr.pa.Orientation).Normalize()
		}
	}
	st := cached.Stats()
	apart := queries - touching
	// Most separated queries follow one that the same axis separated.
	if touching < queries/10 || st.Remembered < apart/2 {
		t.Errorf("%d queries, %d touching, %d answered from memory: the test does not exercise the memory", queries, touching, st.Remembered)
	}
	if p := plain.Stats(); p.Remembered != 0 {
		t.Errorf("Collide used the memory %d times", p.Remembered)
	}
}

// TestPairMemoryKeysReused: a key queried with other shapes (an index
// reused for a new body) neither panics nor changes the answer.
func TestPairMemoryKeysReused(t *testing.T) {
	rng := rand.New(rand.NewSource(37))
	ss := cacheShapes(t, rng)
	cached, plain := NewDetector(), NewDetector()
	var r1, r2 []Manifold
	for s := 0; s < 200; s++ {
		a, b := ss[rng.Intn(len(ss))], ss[rng.Intn(len(ss))]
		pa := shapes.Pose{Position: vec3{}, Orientation: randomRotation(rng)}
		dir, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
		pb := shapes.Pose{Position: dir.Mul(0.2 * rng.Float64()), Orientation: randomRotation(rng)}
		r1 = cached.CollidePair(r1[:0], 1, a, pa, b, pb, 0.01)
		r2 = plain.Collide(r2[:0], a, pa, b, pb, 0.01)
		if !sameManifolds(r1, r2) {
			t.Fatalf("query %d (%T, %T): with memory %+v, without %+v", s, a, b, r1, r2)
		}
		cached.NextStep()
	}
}
