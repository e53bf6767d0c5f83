package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"
	"clatter/testdata/gen/partgen"
)

// The tree search of a box against a large hull (boxhulltree.go) must give
// exactly what the plain loops over every face and edge give (the brute
// force of satBoxHull, itself checked against brute-force facets of both
// shapes by TestBoxHullMatchesReference): the same overlap verdict, the same
// axis kind, feature, separation and axis, and the same contact points,
// bit for bit. The cases cover the moulded cap of the drop benchmark, a UV
// sphere, a filleted cylinder, an ellipsoid and small random hulls (indexed
// although the Detector would not index them), against tiny, part-sized and
// tray-sized boxes, touching, penetrating, apart within and beyond the
// margin, and sequences of poses in which last step's separating axis is
// stale.

// meshHull is the hull of a generated part's vertices in metres.
func meshHull(t testing.TB, g *partgen.Mesh, scale float64) *shapes.Hull {
	t.Helper()
	var pts []vec3
	for _, p := range g.V {
		pts = append(pts, vec3{p[0], p[1], p[2]}.Mul(scale))
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	return h
}

// boxHullRun is one box-hull query, as boxHull runs it, by the plain loops
// over every axis (x nil) or through index x: the verdict, the axis and the
// points.
type boxHullRun struct {
	ok   bool
	r    satResult
	n    vec3
	cand []candPoint
}

func runBoxHull(d *Detector, a, b *view, margin float64, hint pairHint, x *hullIndex) boxHullRun {
	return runBoxHullWith(d, a, b, margin, hint, x, x == nil)
}

// runBoxHullWith is runBoxHull with the early-out of boxhullrest.go on or
// off (all).
func runBoxHullWith(d *Detector, a, b *view, margin float64, hint pairHint, x *hullIndex, all bool) boxHullRun {
	d.allAxes = all
	defer func() { d.allAxes = false }()
	bv := *a
	bv.rot = mulTM(b.rot, a.rot)
	bv.pos = mulT(b.rot, a.pos.Sub(b.pos))
	p := &d.polyP
	p.set(&bv)
	var out boxHullRun
	out.ok = d.satBoxHull(p, b.hull, &bv, a.size+b.size, margin, hint, &out.r, x, d.hullSlack(b.hull))
	if !out.ok {
		return out
	}
	hv := *b
	hv.rot, hv.pos = identity3, vec3{}
	q := &d.polyQ
	if x != nil {
		q.setIndexed(&hv, x)
		out.n = d.indexedContact(p, q, out.r, margin, x)
	} else {
		q.set(&hv)
		out.n = d.polyContact(p, q, out.r, margin)
	}
	out.cand = append([]candPoint(nil), d.cand...)
	return out
}

// sameRun compares the answers that decide the contact; r.fail (the axis a
// separated pair remembers) may name another separating axis.
func sameRun(ref, got boxHullRun) bool {
	if ref.ok != got.ok {
		return false
	}
	if !ref.ok {
		return true
	}
	a, b := ref.r, got.r
	a.fail, b.fail = pairHint{}, pairHint{}
	if a != b || ref.n != got.n || len(ref.cand) != len(got.cand) {
		return false
	}
	for i := range ref.cand {
		if ref.cand[i] != got.cand[i] {
			return false
		}
	}
	return true
}

func TestBoxHullTreeMatchesLoops(t *testing.T) {
	rng := rand.New(rand.NewSource(13))
	type hullCase struct {
		name string
		h    *shapes.Hull
	}
	hulls := []hullCase{
		{"cap", meshHull(t, partgen.Cap(), 1e-3)},
		{"uv sphere", meshHull(t, partgen.UVSphere(48, 24, 20), 1e-3)},
		{"fillet cylinder", meshHull(t, partgen.FilletCylinder(64, 10, 30, 2, 6), 1e-3)},
		{"ellipsoid", ellipsoidHull(t, rng, 300, vec3{0.05, 0.03, 0.02})},
		{"small cloud", meshHullPts(t, randomCloud(rng, 20, vec3{0.02, 0.03, 0.01}))},
		{"tiny cloud", meshHullPts(t, randomCloud(rng, 6, vec3{0.01, 0.01, 0.01}))},
	}
	kinds := map[string]int{}
	d := NewDetector()
	for _, hc := range hulls {
		x := newHullIndex(hc.h)
		size := hc.h.Size()
		boxes := []vec3{
			{0.01 * size, 0.02 * size, 0.015 * size}, // a grain
			{0.3 * size, 0.2 * size, 0.25 * size},    // a part
			{5 * size, 5 * size, 0.15 * size},        // a tray
		}
		for i := 0; i < 1500; i++ {
			half := boxes[i%len(boxes)]
			a, b := placeBoxNearHull(rng, half, hc.h, size)
			if i%2 == 1 {
				a, b = placeEdgeOnEdge(rng, half, hc.h, size)
			}
			margin := 0.0
			if i%3 == 0 {
				margin = 0.02 * size * rng.Float64()
			}
			ref := runBoxHull(d, &a, &b, margin, pairHint{}, nil)
			got := runBoxHull(d, &a, &b, margin, pairHint{}, x)
			if !sameRun(ref, got) {
				t.Fatalf("%s, pose %d: tree %+v, loops %+v", hc.name, i, got, ref)
			}
			kinds[runKind(ref)]++
		}
		// Sequences: the box tumbles past the hull; each path remembers its
		// own separating axis, which goes stale as the box moves.
		for sq := 0; sq < 20; sq++ {
			half := boxes[sq%len(boxes)]
			a, b := placeBoxNearHull(rng, half, hc.h, size)
			w := randomRotation(rng)
			step := vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(0.01 * size)
			var hRef, hTree pairHint
			for k := 0; k < 60; k++ {
				ref := runBoxHull(d, &a, &b, 0.01*size, hRef, nil)
				got := runBoxHull(d, &a, &b, 0.01*size, hTree, x)
				if !sameRun(ref, got) {
					t.Fatalf("%s, sequence %d step %d: tree %+v, loops %+v", hc.name, sq, k, got, ref)
				}
				kinds[runKind(ref)]++
				hRef, hTree = ref.r.fail, got.r.fail
				// Move the box: a small turn about a fixed axis and a drift
				// back and forth through the hull's surface.
				turn := shapes.RotationMatrix(slerpSmall(w, 0.02))
				a.rot = mulMM(turn, a.rot)
				a.pos = a.pos.Add(step.Mul(math.Cos(0.2 * float64(k))))
			}
		}
	}
	// Every kind of answer must have been compared many times (the counts
	// are what this seed gives, rounded down; fewer would mean the poses no
	// longer reach that kind).
	for _, k := range []string{"apart", "face of box", "face of hull", "edge pair"} {
		if kinds[k] < 300 {
			t.Errorf("only %d cases of %s: %v", kinds[k], k, kinds)
		}
	}
	t.Logf("cases: %v", kinds)
}

func meshHullPts(t testing.TB, pts []vec3) *shapes.Hull {
	t.Helper()
	h, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	return h
}

func runKind(r boxHullRun) string {
	if !r.ok {
		return "apart"
	}
	return [...]string{"face of box", "face of hull", "edge pair"}[r.r.kind]
}

// placeBoxNearHull poses a box of half sizes half at a random orientation
// beside hull h (at a random pose), its extent along a random direction
// from the hull's support along it by a gap from 30% of size deep to 5%
// apart, a tenth of the time exactly touching.
func placeBoxNearHull(rng *rand.Rand, half vec3, h *shapes.Hull, size float64) (a, b view) {
	pb := shapes.Pose{Position: vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(size), Orientation: randomRotation(rng)}
	fb := poseFrame(pb)
	b.setConvex(h, fb.rot, fb.pos)
	dir, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
	ra := randomRotation(rng)
	rot := shapes.RotationMatrix(ra)
	top := pb.Position.Add(mul(fb.rot, h.Support(mulT(fb.rot, dir))))
	ext := half[0]*math.Abs(col(rot, 0).Dot(dir)) + half[1]*math.Abs(col(rot, 1).Dot(dir)) + half[2]*math.Abs(col(rot, 2).Dot(dir))
	gap := size * (0.35*rng.Float64() - 0.3)
	if rng.Intn(10) == 0 {
		gap = 0
	}
	a.setConvex(shapes.Box{Half: half}, rot, top.Add(dir.Mul(ext+gap)))
	return a, b
}

// placeEdgeOnEdge poses a box of half sizes half with an edge across a
// random edge of hull h (at a random pose), both extreme along the bisector
// m of the hull edge's face normals: the box's axis u_0 is square to m, so
// its extreme along -m is its edge along u_0, and the pair's axis u_0 x dq
// is m. The gap along m runs from 2% of size deep to 1% apart: edge pairs
// then tie closely with the faces beside them, the cases that test where
// the search stops.
func placeEdgeOnEdge(rng *rand.Rand, half vec3, h *shapes.Hull, size float64) (a, b view) {
	pb := shapes.Pose{Position: vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Mul(size), Orientation: randomRotation(rng)}
	fb := poseFrame(pb)
	b.setConvex(h, fb.rot, fb.pos)
	e := h.Edges[rng.Intn(len(h.Edges))]
	m, _ := unit(mul(fb.rot, h.Faces[e.F[0]].Normal.Add(h.Faces[e.F[1]].Normal)))
	mid := fb.pos.Add(mul(fb.rot, h.Vertices[e.V[0]].Add(h.Vertices[e.V[1]]).Mul(0.5)))
	u0, _ := unit(m.Cross(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}))
	w := vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
	u1, _ := unit(w.Sub(u0.Mul(w.Dot(u0))))
	u2 := u0.Cross(u1)
	rot := mat3{u0[0], u0[1], u0[2], u1[0], u1[1], u1[2], u2[0], u2[1], u2[2]}
	ext := half[0]*math.Abs(u0.Dot(m)) + half[1]*math.Abs(u1.Dot(m)) + half[2]*math.Abs(u2.Dot(m))
	gap := size * (0.03*rng.Float64() - 0.02)
	a.setConvex(shapes.Box{Half: half}, rot, mid.Add(m.Mul(ext+gap)))
	return a, b
}

// slerpSmall is the rotation by angle about q's axis.
func slerpSmall(q shapes.Quat, angle float64) shapes.Quat {
	ax, _ := unit(q.V)
	if ax == (vec3{}) {
		ax = vec3{0, 0, 1}
	}
	s, c := math.Sincos(angle / 2)
	return shapes.Quat{W: c, V: ax.Mul(s)}
}

// TestHullIncidentMatchesLoop: the tree's incident face is incidentFace's
// (the first face of least n_j.n) for random and for face-normal
// directions, on which faces tie.
func TestHullIncidentMatchesLoop(t *testing.T) {
	rng := rand.New(rand.NewSource(5))
	for _, g := range []*partgen.Mesh{partgen.Cap(), partgen.UVSphere(48, 24, 20)} {
		h := meshHull(t, g, 1e-3)
		x := newHullIndex(h)
		var q polytope
		q.init()
		q.setIndexed(&view{kind: kHull, hull: h, rot: identity3, size: h.Size()}, x)
		for i := 0; i < 4000; i++ {
			n, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
			if i%2 == 1 {
				n = h.Faces[rng.Intn(len(h.Faces))].Normal.Mul(-1)
			}
			// The search starts from face 0, the answer, or any face.
			want := incidentFace(&q, n)
			for _, from := range []int{0, want, rng.Intn(len(h.Faces))} {
				if got := x.incident(n, from); want != got {
					t.Fatalf("direction %v from face %d: tree face %d, loop face %d", n, from, got, want)
				}
			}
		}
	}
}
