package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// TestSpeculativeWall: a 5 mm part falling at 5 m/s toward a static 2 mm
// wall, stepped at 1 ms, must see the wall one step ahead: with margin =
// speed x step + slop the pair reports a point whose separation is the true
// gap (known from the placement) and whose normal is the wall's.
func TestSpeculativeWall(t *testing.T) {
	const (
		speed, step, slop = 5.0, 1e-3, 1e-4
		margin            = speed*step + slop
		// tol: gaps are differences of coordinates of size 1e-2.
		tol = 1e-15
	)
	h := 2.5e-3
	hull := boxHull(t, vec3{h, h, h})
	parts := []struct {
		name string
		s    shapes.Shape
	}{
		{"box", shapes.Box{Half: vec3{h, h, h}}}, {"sphere", shapes.Sphere{Radius: h}},
		{"cylinder", shapes.Cylinder{Radius: h, HalfLength: h}}, {"capsule", shapes.Capsule{Radius: h, HalfLength: h}},
		{"hull", hull},
	}
	// The wall's top face is z = 0: a box 2 mm thick, a plane, a mesh.
	walls := []struct {
		name string
		s    shapes.Shape
		p    shapes.Pose
	}{
		{"box wall", shapes.Box{Half: vec3{0.05, 0.05, 1e-3}}, at(0, 0, -1e-3)},
		{"plane", shapes.Plane{Normal: vec3{0, 0, 1}}, shapes.IdentityPose},
		{"mesh", NewMesh(gridMesh(4, 0.05, flatZero)), shapes.IdentityPose},
	}
	d := NewDetector()
	for _, w := range walls {
		for _, p := range parts {
			for _, rot := range []shapes.Quat{mgl64.QuatIdent(), mgl64.QuatRotate(0.3, vec3{1, 1, 0}.Normalize())} {
				var v view
				v.setConvex(p.s, shapes.RotationMatrix(rot), vec3{})
				low := -v.supportFull(vec3{0, 0, -1})[2]
				for _, gap := range []float64{0.5e-3, 2e-3, 4.9e-3, 5.09e-3, 5.2e-3} {
					pose := shapes.Pose{Position: vec3{0.01, 0.003, low + gap}, Orientation: rot}
					ms := d.Collide(nil, w.s, w.p, p.s, pose, margin)
					sep, n := minSeparation(ms)
					if gap > margin {
						if len(ms) != 0 {
							t.Errorf("%s %s gap %g beyond margin: %d manifolds", w.name, p.name, gap, len(ms))
						}
						continue
					}
					if len(ms) == 0 {
						t.Errorf("%s %s gap %g: no speculative contact", w.name, p.name, gap)
						continue
					}
					if math.Abs(sep-gap) > tol*100 || n.Sub(vec3{0, 0, 1}).Len() > 1e-12 {
						t.Errorf("%s %s rot %v gap %g: separation %.17g normal %v", w.name, p.name, rot, gap, sep, n)
					}
				}
			}
		}
	}
}

// TestCompound: each piece meets the other shape on its own, SubA/SubB
// naming the piece.
func TestCompound(t *testing.T) {
	// A dumbbell: two boxes 1 apart along x, joined (the rod is left out).
	c := &shapes.Compound{Pieces: []shapes.Piece{
		{Shape: shapes.Box{Half: vec3{0.1, 0.1, 0.1}}, Pose: at(-0.5, 0, 0)},
		{Shape: shapes.Sphere{Radius: 0.1}, Pose: at(0.5, 0, 0)},
	}}
	d := NewDetector()
	pose := atRot(vec3{0, 0, 0.099}, 0, vec3{0, 0, 1})
	ms := d.Collide(nil, shapes.Plane{Normal: vec3{0, 0, 1}}, shapes.IdentityPose, c, pose, 0)
	if len(ms) != 2 {
		t.Fatalf("%d manifolds", len(ms))
	}
	for _, m := range ms {
		want := map[int32]int{0: 4, 1: 1}[m.SubB]
		if m.Count != want || m.SubA != 0 {
			t.Errorf("piece %d: %d points, want %d", m.SubB, m.Count, want)
		}
		if math.Abs(m.Points[0].Separation+1e-3) > 1e-15 {
			t.Errorf("piece %d: separation %g", m.SubB, m.Points[0].Separation)
		}
	}
	// Compound against compound, turned by 90 degrees so the sphere of one
	// meets the box of the other: only that piece pair touches.
	other := atRot(vec3{0.5, 0.5 + 0.2 - 1e-3, 0}, math.Pi/2, vec3{0, 0, 1})
	ms = d.Collide(nil, c, shapes.IdentityPose, c, other, 0)
	if len(ms) != 1 || ms[0].SubA != 1 || ms[0].SubB != 0 {
		t.Fatalf("compound pair: %+v", ms)
	}
	if math.Abs(ms[0].Points[0].Separation+1e-3) > 1e-12 {
		t.Errorf("compound pair separation %g", ms[0].Points[0].Separation)
	}
	// Against a mesh: piece index on the compound's side, triangle region on the mesh's.
	mesh := NewMesh(gridMesh(4, 1, flatZero))
	ms = d.Collide(nil, c, pose, mesh, shapes.IdentityPose, 0)
	if len(ms) != 2 {
		t.Fatalf("compound on mesh: %d manifolds", len(ms))
	}
	for _, m := range ms {
		if m.Normal != (vec3{0, 0, -1}) {
			t.Errorf("compound on mesh normal %v", m.Normal)
		}
	}
}

// biasedMatch accepts a SAT separation equal to the reference, or below it
// by at most the edge bias: a face is kept over an edge pair that is better
// by less than satEdgeBias of the size (so that near ties resolve to
// multi-point face contacts).
func biasedMatch(sep, ref, tol, scale float64) bool {
	return sep <= ref+tol && sep >= ref-satEdgeBias*scale-tol
}

// TestSATMatchesReference: on overlapping random hulls the separating-axis
// test with Gauss-map pruning finds the same least penetration as the
// brute-force test over every face and every edge pair.
func TestSATMatchesReference(t *testing.T) {
	const tol = 1e-12 // both are projections of the same vertices
	rng := rand.New(rand.NewSource(11))
	d := NewDetector()
	n := 0
	for i := 0; i < 400; i++ {
		la, lb, pa, pb := randomPair(rng)
		ha, errA := shapes.NewHull(la)
		hb, errB := shapes.NewHull(lb)
		if errA != nil || errB != nil {
			t.Fatal(errA, errB)
		}
		ref, _ := refGap(bruteHull(place(ha.Vertices, pa)), bruteHull(place(hb.Vertices, pb)))
		if ref > -1e-9 {
			continue
		}
		fa, fb := poseFrame(pa), poseFrame(pb)
		var va, vb view
		rot, pos := fa.relative(fb)
		va.setConvex(ha, identity3, vec3{})
		vb.setConvex(hb, rot, pos)
		d.polyP.set(&va)
		d.polyQ.set(&vb)
		r, ok := sat(&d.polyP, &d.polyQ, 0)
		if !ok || !biasedMatch(r.sep, ref, tol, va.size+vb.size) {
			t.Errorf("pair %d: SAT %.15g (ok %v), brute force %.15g", i, r.sep, ok, ref)
		}
		n++
	}
	if n < 100 {
		t.Errorf("only %d overlapping pairs", n)
	}
}

// TestBoxEdgeEdge: two boxes crossed edge on edge give one point at the
// crossing, depth from the geometry (edges at distance known by
// construction).
func TestBoxEdgeEdge(t *testing.T) {
	const tol = 1e-12
	b := shapes.Box{Half: vec3{0.5, 0.5, 0.5}}
	// A: rotated 45 degrees about x, its top edge along x at z = h.
	// B: rotated 45 degrees about y, its bottom edge along y at z = h - pen.
	h := 0.5 * math.Sqrt2
	pen := 1e-3
	pa := atRot(vec3{0, 0, 0}, math.Pi/4, vec3{1, 0, 0})
	pb := atRot(vec3{0.1, -0.2, 2*h - pen}, math.Pi/4, vec3{0, 1, 0})
	ms := NewDetector().Collide(nil, b, pa, b, pb, 0)
	if len(ms) != 1 || ms[0].Count != 1 {
		t.Fatalf("%+v", ms)
	}
	p := ms[0].Points[0]
	if math.Abs(p.Separation+pen) > tol || ms[0].Normal.Sub(vec3{0, 0, 1}).Len() > tol {
		t.Errorf("edge-edge: %+v normal %v", p, ms[0].Normal)
	}
	// The edges cross over x = 0.1 (B's edge) and y = 0 (A's edge).
	if p.Position.Sub(vec3{0.1, 0, h - pen/2}).Len() > tol {
		t.Errorf("edge-edge position %v", p.Position)
	}
}

// TestZeroAllocs: once the buffers have grown, Collide allocates nothing.
func TestZeroAllocs(t *testing.T) {
	hull := prismHull(t, 8, 0.3, 0.2)
	mesh := NewMesh(gridMesh(10, 1, flatZero))
	box := shapes.Box{Half: vec3{0.2, 0.15, 0.1}}
	cyl := shapes.Cylinder{Radius: 0.2, HalfLength: 0.1}
	comp := &shapes.Compound{Pieces: []shapes.Piece{{Shape: box, Pose: at(-0.3, 0, 0)}, {Shape: cyl, Pose: at(0.3, 0, 0)}}}
	floor := shapes.Plane{Normal: vec3{0, 0, 1}}
	tilt := mgl64.QuatRotate(0.05, vec3{1, 2, 0}.Normalize())
	rest := func(z float64) shapes.Pose { return shapes.Pose{Position: vec3{0.05, 0.02, z}, Orientation: tilt} }
	cases := []struct {
		name string
		a    shapes.Shape
		pa   shapes.Pose
		b    shapes.Shape
		pb   shapes.Pose
	}{
		{"box-box", shapes.Box{Half: vec3{1, 1, 0.5}}, at(0, 0, -0.5), box, rest(0.09)},
		{"hull-hull", hull, at(0, 0, -0.2), hull, rest(0.19)},
		{"box-plane", floor, shapes.IdentityPose, box, rest(0.09)},
		{"hull-plane", floor, shapes.IdentityPose, hull, rest(0.19)},
		{"cylinder-plane", floor, shapes.IdentityPose, cyl, rest(0.09)},
		{"cylinder-box", shapes.Box{Half: vec3{1, 1, 0.5}}, at(0, 0, -0.5), cyl, rest(0.09)},
		{"sphere-box", shapes.Box{Half: vec3{1, 1, 0.5}}, at(0, 0, -0.5), shapes.Sphere{Radius: 0.1}, rest(0.09)},
		{"capsule-hull", hull, at(0, 0, -0.2), shapes.Capsule{Radius: 0.05, HalfLength: 0.2}, atRot(vec3{0, 0, 0.045}, math.Pi/2, vec3{1, 0, 0})},
		{"box-mesh", mesh, shapes.IdentityPose, box, rest(0.09)},
		{"hull-mesh", mesh, shapes.IdentityPose, hull, rest(0.19)},
		{"cylinder-mesh", mesh, shapes.IdentityPose, cyl, rest(0.09)},
		{"compound-plane", floor, shapes.IdentityPose, comp, rest(0.09)},
		{"compound-mesh", comp, rest(0.09), mesh, shapes.IdentityPose},
	}
	d := NewDetector()
	dst := make([]Manifold, 0, 16)
	for _, c := range cases {
		dst = d.Collide(dst[:0], c.a, c.pa, c.b, c.pb, 0.01)
		if len(dst) == 0 {
			t.Errorf("%s: no contact in the allocation test's pose", c.name)
		}
		allocs := testing.AllocsPerRun(50, func() {
			dst = d.Collide(dst[:0], c.a, c.pa, c.b, c.pb, 0.01)
		})
		if allocs != 0 {
			t.Errorf("%s: %g allocations per Collide", c.name, allocs)
		}
	}
}

// TestSATBoxesMatchReference: the 15-axis box test and the 13-axis
// box-triangle test agree with brute force over every candidate axis (for
// overlapping pairs, where the largest gap is minus the penetration depth),
// up to the edge bias.
func TestSATBoxesMatchReference(t *testing.T) {
	const tol = 1e-12 // projections of the same vertices
	rng := rand.New(rand.NewSource(5))
	nb, nt := 0, 0
	for i := 0; i < 600; i++ {
		ha := vec3{0.2 + rng.Float64(), 0.2 + rng.Float64(), 0.2 + rng.Float64()}
		hb := vec3{0.2 + rng.Float64(), 0.2 + rng.Float64(), 0.2 + rng.Float64()}
		pa := shapes.Pose{Position: vec3{rng.Float64(), rng.Float64(), rng.Float64()}, Orientation: randomRotation(rng)}
		pb := shapes.Pose{Position: pa.Position.Add(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}), Orientation: randomRotation(rng)}
		var ca, cb []vec3
		for k := 0; k < 8; k++ {
			ca = append(ca, pa.Apply(boxVertex(ha, k)))
			cb = append(cb, pb.Apply(boxVertex(hb, k)))
		}
		var va, vb view
		va.setConvex(shapes.Box{Half: ha}, shapes.RotationMatrix(pa.Orientation), pa.Position)
		vb.setConvex(shapes.Box{Half: hb}, shapes.RotationMatrix(pb.Orientation), pb.Position)
		if ref, _ := refGap(bruteHull(ca), bruteHull(cb)); ref < -1e-9 {
			r, ok := satBoxes(&va, &vb, 0)
			if !ok || !biasedMatch(r.sep, ref, tol, va.size+vb.size) {
				t.Errorf("boxes %d: %.15g, brute force %.15g", i, r.sep, ref)
			}
			nb++
		}
		// A triangle through B's region, one-sided: the reference is the
		// gap over the box's axes, the triangle's front normal and the
		// edge cross products (both senses), by projection.
		tri := [3]vec3{cb[0], cb[3], cb[5]}
		n, _ := unit(tri[1].Sub(tri[0]).Cross(tri[2].Sub(tri[0])))
		var tv view
		tv.setTriangle(tri[0], tri[1], tri[2], n)
		ref := gapAlong(tri[:], ca, n) // the box beyond the front face
		for _, ax := range []vec3{col(va.rot, 0), col(va.rot, 1), col(va.rot, 2)} {
			ref = math.Max(ref, math.Max(gapAlong(ca, tri[:], ax), gapAlong(ca, tri[:], ax.Mul(-1))))
			for k := 0; k < 3; k++ {
				e, l := unit(ax.Cross(tri[(k+1)%3].Sub(tri[k])))
				if l > 1e-9 {
					ref = math.Max(ref, math.Max(gapAlong(ca, tri[:], e), gapAlong(ca, tri[:], e.Mul(-1))))
				}
			}
		}
		if ref < -1e-9 {
			r, ok := satBoxTriangle(&va, &tv, 0)
			if !ok || !biasedMatch(r.sep, ref, tol, va.size+tv.size) {
				t.Errorf("box-triangle %d: %.15g, reference %.15g", i, r.sep, ref)
			}
			nt++
		}
	}
	if nb < 100 || nt < 100 {
		t.Errorf("only %d box and %d triangle overlaps", nb, nt)
	}
}

// TestLargeHullsResting: hulls too large for the separating-axis test take
// GJK, EPA and face clipping; resting flat they still get four corner
// points at the known depth with the exact face normal.
func TestLargeHullsResting(t *testing.T) {
	const (
		pen = 1e-3
		tol = 1e-9 // EPA on polytopes converges to the face exactly; rounding of EPA's barycentric step
	)
	h := prismHull(t, 24, 0.3, 0.1)
	if len(h.Edges)*len(h.Edges) <= satMaxEdgePairs {
		t.Fatalf("test setup: %d edges take the separating-axis path", len(h.Edges))
	}
	d := NewDetector()
	for _, yaw := range []float64{0, 0.1, 0.7} {
		pose := atRot(vec3{0.05, -0.02, 0.2 - pen}, yaw, vec3{0, 0, 1})
		for _, margin := range []float64{0, 0.01} {
			ms := d.Collide(nil, h, shapes.IdentityPose, h, pose, margin)
			if len(ms) != 1 || ms[0].Count != 4 {
				t.Fatalf("yaw %g: %+v", yaw, ms)
			}
			if ms[0].Normal.Sub(vec3{0, 0, 1}).Len() > tol {
				t.Errorf("yaw %g: normal %v", yaw, ms[0].Normal)
			}
			for i := 0; i < 4; i++ {
				p := ms[0].Points[i]
				if math.Abs(p.Separation+pen) > tol || math.Abs(p.Position[2]-(0.1-pen/2)) > tol {
					t.Errorf("yaw %g: point %+v", yaw, p)
				}
			}
		}
	}
}
