package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"
	"clatter/testdata/gen/partgen"
)

// The early-out of boxhullrest.go must leave the box-hull test's answer
// exactly as the plain loops over every face and edge give it (themselves
// checked against brute-force facets by TestBoxHullMatchesReference), both
// through a hull's index and in the plain loops: a large or small hull
// lying on a tray, on one of its faces, on an edge or on a
// vertex, tilted from flat by nothing up to a tenth of a radian, from
// penetrating to apart within the margin, over the tray or hanging over
// its edge. A hull face lying exactly flat ties with the tray's face (the
// tie the face bias settles), and the edges around it tie closely with
// both, the cases where a wrong bound would change the answer.

// restPose poses hull h on the top face (z = 0) of a tray of half sizes
// half centred below the origin: the hull's direction down (in its own
// frame) points along -z after a turn of tilt about a random horizontal
// axis, its lowest vertex is gap above the top face, and its centre is at
// (cx, cy).
func restPose(rng *rand.Rand, h *shapes.Hull, half, down vec3, tilt, gap, cx, cy float64) (a, b view) {
	a.setConvex(shapes.Box{Half: half}, identity3, vec3{0, 0, -half[2]})
	// Turn down onto -z, then about z at random, then tilt.
	r := shapes.RotationMatrix(rotationBetween(down, vec3{0, 0, -1}))
	yaw := shapes.RotationMatrix(shapes.Quat{W: math.Cos(rng.Float64() * math.Pi), V: vec3{0, 0, 1}.Mul(math.Sin(rng.Float64() * math.Pi))}.Normalize())
	phi := rng.Float64() * 2 * math.Pi
	s, c := math.Sincos(tilt / 2)
	tq := shapes.Quat{W: c, V: vec3{math.Cos(phi), math.Sin(phi), 0}.Mul(s)}
	rot := mulMM(shapes.RotationMatrix(tq), mulMM(yaw, r))
	low := math.Inf(1)
	for _, v := range h.Vertices {
		low = math.Min(low, mul(rot, v)[2])
	}
	b.setConvex(h, rot, vec3{cx, cy, gap - low})
	return a, b
}

// rotationBetween is the shortest rotation taking unit u to unit v.
func rotationBetween(u, v vec3) shapes.Quat {
	c := u.Cross(v)
	w := 1 + u.Dot(v)
	if w < 1e-12 { // opposite: a half turn about any axis square to u
		ax, _ := unit(u.Cross(vec3{1, 0, 0}))
		if ax == (vec3{}) {
			ax, _ = unit(u.Cross(vec3{0, 1, 0}))
		}
		return shapes.Quat{W: 0, V: ax}
	}
	return shapes.Quat{W: w, V: c}.Normalize()
}

// restSkips reports whether the early-out skips the face and the edge
// searches of the query (as satBoxHull decides it).
func restSkips(d *Detector, a, b *view, margin float64, x *hullIndex) (faces, edges bool) {
	bv := *a
	bv.rot = mulTM(b.rot, a.rot)
	bv.pos = mulT(b.rot, a.pos.Sub(b.pos))
	p := &d.polyP
	p.set(&bv)
	var bh boxHullAxes
	bh.init(p, b.hull, &bv)
	var r satResult
	s := newSatSearch(&r, margin, a.size+b.size)
	if !bh.boxFacesBounded(x, &s) {
		return false, false
	}
	fb, eb := bh.restBound(x, bh.deep, s.scale)
	faces = fb <= s.margin && fb <= s.best[0]+satFaceBias*s.scale
	edges = eb <= s.margin && eb <= s.best[0]+satEdgeBias*s.scale
	return faces, edges
}

func TestBoxHullRestMatchesLoops(t *testing.T) {
	rng := rand.New(rand.NewSource(29))
	hulls := []struct {
		name string
		h    *shapes.Hull
	}{
		{"cap", meshHull(t, partgen.Cap(), 1e-3)},
		{"uv sphere", meshHull(t, partgen.UVSphere(48, 24, 20), 1e-3)},
		{"fillet cylinder", meshHull(t, partgen.FilletCylinder(64, 10, 30, 2, 6), 1e-3)},
		{"ellipsoid", ellipsoidHull(t, rng, 300, vec3{0.05, 0.03, 0.02})},
		{"part", ellipsoidHull(t, rng, 40, vec3{0.015, 0.012, 0.008})},
		{"small cloud", meshHullPts(t, randomCloud(rng, 20, vec3{0.02, 0.03, 0.01}))},
	}
	tilts := []float64{0, 1e-9, 1e-6, 1e-4, 1e-2, 0.1}
	d := NewDetector()
	skipped, total := 0, 0
	for _, hc := range hulls {
		h := hc.h
		x := newHullIndex(h)
		size := h.Size()
		for i := 0; i < 1200; i++ {
			// Down: a face's normal (lying on the face), the mean of an
			// edge's (on the edge), a vertex's direction (on the vertex).
			var down vec3
			switch i % 3 {
			case 0:
				down = h.Faces[rng.Intn(len(h.Faces))].Normal
			case 1:
				e := h.Edges[rng.Intn(len(h.Edges))]
				down, _ = unit(h.Faces[e.F[0]].Normal.Add(h.Faces[e.F[1]].Normal))
			default:
				down, _ = unit(h.Vertices[rng.Intn(len(h.Vertices))])
			}
			half := vec3{5 * size, 4 * size, 0.2 * size}
			cx, cy := size*rng.NormFloat64(), size*rng.NormFloat64()
			if i%5 == 0 { // hanging over the tray's edge
				cx = half[0] + size*(rng.Float64()-0.5)
			}
			gap := size * 0.01 * (rng.Float64() - 0.7)
			margin := size * 0.01 * rng.Float64()
			a, b := restPose(rng, h, half, down, tilts[i%len(tilts)], gap, cx, cy)
			ref := runBoxHull(d, &a, &b, margin, pairHint{}, nil)
			if got := runBoxHull(d, &a, &b, margin, pairHint{}, x); !sameRun(ref, got) {
				t.Fatalf("%s, pose %d: indexed %+v, loops %+v", hc.name, i, got, ref)
			}
			if got := runBoxHullWith(d, &a, &b, margin, pairHint{}, nil, false); !sameRun(ref, got) {
				t.Fatalf("%s, pose %d: loops with the early-out %+v, without %+v", hc.name, i, got, ref)
			}
			if _, e := restSkips(d, &a, &b, margin, x); e {
				skipped++
			}
			total++
		}
	}
	// The early-out must have decided most of these cases, or they test
	// the searches instead (a fifth hang over the edge).
	if skipped < total/2 {
		t.Errorf("the early-out decided only %d of %d cases", skipped, total)
	}
	t.Logf("early-out in %d of %d cases", skipped, total)
}
