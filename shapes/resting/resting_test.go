package resting

import (
	"errors"
	"math"
	"testing"

	"clatter/shapes"
)

// boxReference gives, for face k (in the order +x, -x, +y, -y, +z, -z) of a
// box of half sizes half with centre of mass com, the solid angle of the face
// seen from com (rectOffAxis, on axis for a centred com) and the tip angle
// min over the face's four edges of atan(r / d) (the statics of a
// rigid block's atan(b/h) for a centred com: r = b/2, d = h/2).
func boxReference(half, com vec, k int) (omega, tip float64) {
	ax := k / 2
	i, j := (ax+1)%3, (ax+2)%3
	d := half[ax] - com[ax]
	if k%2 == 1 {
		d = half[ax] + com[ax]
	}
	omega = rectOffAxis(-half[i], half[i], -half[j], half[j], com[i], com[j], d)
	r := math.Min(math.Min(half[i]-com[i], half[i]+com[i]), math.Min(half[j]-com[j], half[j]+com[j]))
	return omega, math.Atan(r / d)
}

func TestCube(t *testing.T) {
	// By symmetry a cube rests on each face with probability 1/6 and
	// tips over an edge at 45 degrees.
	faces, err := OfShape(shapes.Box{Half: vec{0.5, 0.5, 0.5}}, vec{})
	if err != nil {
		t.Fatal(err)
	}
	if len(faces) != 6 {
		t.Fatalf("%d faces, want 6", len(faces))
	}
	for i, f := range faces {
		if !f.Stable || f.RollsTo != i {
			t.Errorf("face %d: stable %v, rolls to %d", i, f.Stable, f.RollsTo)
		}
		within(t, "cube probability", f.Probability, 1.0/6, exactTol)
		within(t, "cube tip angle (deg)", f.TipAngleRad*180/math.Pi, 45, exactTol)
		within(t, "cube face area", f.Area, 1, exactTol)
		within(t, "cube height", f.Height, 0.5, exactTol)
	}
	checkSums(t, faces)
}

func TestBoxAspectRatios(t *testing.T) {
	normals := []vec{{1, 0, 0}, {-1, 0, 0}, {0, 1, 0}, {0, -1, 0}, {0, 0, 1}, {0, 0, -1}}
	cases := []struct {
		name string
		half vec
		com  vec
	}{
		{"cube", vec{1, 1, 1}, vec{}},
		{"brick 1:2:3", vec{1, 2, 3}, vec{}},
		{"rod", vec{0.5, 0.5, 4}, vec{}},
		{"plate", vec{5, 5, 0.2}, vec{}},
		{"small part in metres", vec{0.01, 0.02, 0.005}, vec{}},
		// An offset centre of mass (a weighted part): the foot of com on each
		// face is off its centre, the reference the four corner rectangles.
		// A box is a right prism, so every face stays stable however far
		// inside com moves: the foot of an interior point on a face plane
		// always lies inside that face.
		{"brick, offset com", vec{1, 2, 3}, vec{0.3, -0.2, 0.5}},
		{"cube, com near +x", vec{1, 1, 1}, vec{0.99, 0, 0}},
		{"rod, com near an edge", vec{0.5, 0.5, 4}, vec{0.45, -0.4, -3.5}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			faces, err := OfShape(shapes.Box{Half: c.half}, c.com)
			if err != nil {
				t.Fatal(err)
			}
			if len(faces) != 6 {
				t.Fatalf("%d faces, want 6", len(faces))
			}
			for k, f := range faces {
				omega, tip := boxReference(c.half, c.com, k)
				if f.Normal != normals[k] {
					t.Errorf("face %d normal %v, want %v", k, f.Normal, normals[k])
				}
				if !f.Stable {
					t.Errorf("face %d unstable", k)
				}
				within(t, "direct share", f.Direct, omega/(4*math.Pi), exactTol)
				within(t, "probability", f.Probability, omega/(4*math.Pi), exactTol)
				within(t, "tip angle", f.TipAngleRad, tip, exactTol)
			}
			checkSums(t, faces)
		})
	}
}

func TestBoxMatchesQuickhull(t *testing.T) {
	// The hand-built box hull and shapes.NewHull of the box's corners must give
	// the same faces in the same order (the order the README and inspect
	// document: +x, -x, +y, -y, +z, -z), so that a box's resting face index means the same in both.
	half := vec{0.02, 0.01, 0.005}
	com := vec{0.003, -0.001, 0.002}
	var pts []vec
	for i := 0; i < 8; i++ {
		p := half
		for k := 0; k < 3; k++ {
			if i&(1<<k) == 0 {
				p[k] = -p[k]
			}
		}
		pts = append(pts, p)
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	a, err := OfHull(h, com)
	if err != nil {
		t.Fatal(err)
	}
	b, err := OfShape(shapes.Box{Half: half}, com)
	if err != nil {
		t.Fatal(err)
	}
	for i := range b {
		if a[i].Normal.Sub(b[i].Normal).Len() > exactTol || math.Abs(a[i].Probability-b[i].Probability) > exactTol ||
			math.Abs(a[i].TipAngleRad-b[i].TipAngleRad) > exactTol {
			t.Errorf("face %d: quickhull %+v, box %+v", i, a[i], b[i])
		}
	}
}

func TestRegularPrism(t *testing.T) {
	// Regular n-gon prisms (a hex nut for n = 6) with com at the centre: the
	// end faces against the closed form for a regular polygon seen on its
	// axis (regularPolygonOnAxis, from Napier's rules), the sides against the
	// rectangle formula from their inradius; the sides are equal by symmetry.
	cases := []struct {
		n    int
		R, l float64
	}{
		{3, 1, 0.5}, {4, 1, 2}, {5, 2, 0.3}, {6, 1, 0.4}, {6, 0.008, 0.003}, {8, 1, 1}, {12, 1, 5},
	}
	for _, c := range cases {
		h := prismHull(t, regularPolygon(c.n, c.R, 0.1), c.l)
		faces, err := OfHull(h, vec{})
		if err != nil {
			t.Fatal(err)
		}
		rin := c.R * math.Cos(math.Pi/float64(c.n))
		halfSide := c.R * math.Sin(math.Pi/float64(c.n))
		end := regularPolygonOnAxis(c.n, c.R, c.l) / (4 * math.Pi)
		side := rectOnAxis(halfSide, c.l, rin) / (4 * math.Pi)
		for i, f := range faces {
			if !f.Stable {
				t.Errorf("n=%d face %d unstable", c.n, i)
			}
			if i < 2 {
				within(t, "prism end probability", f.Probability, end, exactTol)
				within(t, "prism end tip angle", f.TipAngleRad, math.Atan(rin/c.l), exactTol)
				within(t, "prism end area", f.Area, float64(c.n)*rin*halfSide, exactTol*c.R*c.R)
			} else {
				within(t, "prism side probability", f.Probability, side, exactTol)
				within(t, "prism side tip angle", f.TipAngleRad, math.Atan(math.Min(halfSide, c.l)/rin), exactTol)
			}
		}
		checkSums(t, faces)
	}
}

func TestWedgeRollsOver(t *testing.T) {
	// A prism along y over the obtuse triangle A = (0, 0), B = (4, 0),
	// C = (-3, 1) in the xz plane, 2 long, com at the centroid (1/3, 0, 1/3).
	//
	// By hand: on face AB (z = 0) the foot x = 1/3 lies inside [0, 4]:
	// stable. On face BC the foot's parameter along B -> C is
	// ((1/3 - 4)(-7) + (1/3)(1)) / 50 = 0.52, inside: stable. On face AC the
	// parameter along A -> C is ((1/3)(-3) + (1/3)(1)) / 10 = -1/15 < 0: the
	// foot lies beyond A, so the part turns over the long edge through A and
	// lands on AB. The triangular ends are stable (the centroid projects onto
	// itself).
	verts := []vec{{0, -1, 0}, {4, -1, 0}, {-3, -1, 1}, {0, 1, 0}, {4, 1, 0}, {-3, 1, 1}}
	const (
		ab = iota
		bc
		ac
		endNeg
		endPos
	)
	h := polyHull(t, verts, [][]int32{
		ab:     {0, 1, 4, 3},
		bc:     {1, 2, 5, 4},
		ac:     {2, 0, 3, 5},
		endNeg: {0, 1, 2},
		endPos: {3, 4, 5},
	})
	com := vec{1.0 / 3, 0, 1.0 / 3}
	faces, err := OfHull(h, com)
	if err != nil {
		t.Fatal(err)
	}
	wantStable := []bool{true, true, false, true, true}
	wantRoll := []int{ab, bc, ab, endNeg, endPos}
	for i, f := range faces {
		if f.Stable != wantStable[i] || f.RollsTo != wantRoll[i] {
			t.Errorf("face %d: stable %v rolls to %d, want %v and %d", i, f.Stable, f.RollsTo, wantStable[i], wantRoll[i])
		}
	}
	// Each rectangular side against the corner rectangles, in the face's own
	// coordinates: along the triangle edge (from its first corner) and along y.
	tri := [][2]float64{{0, 0}, {4, 0}, {-3, 1}}
	sides := map[int][2]int{ab: {0, 1}, bc: {1, 2}, ac: {2, 0}}
	g := [2]float64{com[0], com[2]}
	for fi, e := range sides {
		p, q := tri[e[0]], tri[e[1]]
		dx, dz := q[0]-p[0], q[1]-p[1]
		length := math.Hypot(dx, dz)
		along := ((g[0]-p[0])*dx + (g[1]-p[1])*dz) / length
		dist := math.Abs((g[0]-p[0])*dz-(g[1]-p[1])*dx) / length
		want := rectOffAxis(0, length, -1, 1, along, 0, dist) / (4 * math.Pi)
		within(t, "wedge side direct share", faces[fi].Direct, want, exactTol)
		if faces[fi].Stable {
			r := math.Min(math.Min(along, length-along), 1)
			within(t, "wedge side tip angle", faces[fi].TipAngleRad, math.Atan(r/dist), exactTol)
		}
	}
	for _, fi := range []int{endNeg, endPos} {
		pts := []vec{verts[h.Faces[fi].Verts[0]], verts[h.Faces[fi].Verts[1]], verts[h.Faces[fi].Verts[2]]}
		within(t, "wedge end direct share (Girard)", faces[fi].Direct, girardPolygon(pts, com)/(4*math.Pi), exactTol)
	}
	within(t, "AB collects AC's share", faces[ab].Probability, faces[ab].Direct+faces[ac].Direct, exactTol)
	checkSums(t, faces)
}

func TestHexagonRollChain(t *testing.T) {
	// A hexagonal prism (circumradius 1, corners at 0, 60, ..., 300 degrees,
	// so side i has its outward normal at 30 + 60 i degrees), 4 long along z,
	// with the centre of mass moved to (0, -0.7, 0), near the bottom side
	// (side 4, normal at 270 degrees).
	//
	// By hand: side i's midpoint is M = cos(30 deg) n and its tangent
	// t = (-sin theta, cos theta); the foot of com lies at s = com.t =
	// -0.7 cos(theta) along it, and the side is 1 long. Sides 1 (top) and 4
	// (bottom) have s = 0: stable. The four slanted sides have |s| = 0.606 >
	// 0.5: unstable. Side 0 (normal 30 deg) has s < 0, beyond its corner at
	// 0 deg, so it turns over that corner's edge onto side 5 (normal 330
	// deg), where s = -0.606 again lies beyond the corner at 300 deg: on to
	// the bottom, side 4. Likewise side 2 -> side 3 -> side 4. A chain of two
	// rolls.
	h := prismHull(t, regularPolygon(6, 1, 0), 2)
	com := vec{0, -0.7, 0}
	faces, err := OfHull(h, com)
	if err != nil {
		t.Fatal(err)
	}
	side := func(i int) int { return 2 + i }
	want := map[int]int{
		0: 0, 1: 1, // the ends
		side(0): side(4), side(1): side(1), side(2): side(4),
		side(3): side(4), side(4): side(4), side(5): side(4),
	}
	for i, f := range faces {
		if f.RollsTo != want[i] {
			t.Errorf("face %d rolls to %d, want %d", i, f.RollsTo, want[i])
		}
	}
	// Bottom: its own share and the four slanted sides'.
	got := faces[side(4)].Probability
	wantP := faces[side(4)].Direct
	for _, i := range []int{0, 2, 3, 5} {
		wantP += faces[side(i)].Direct
	}
	within(t, "bottom collects the chain", got, wantP, exactTol)
	// Tip angles of top and bottom: half a side over the height of com.
	rin := math.Cos(math.Pi / 6)
	within(t, "top tip angle", faces[side(1)].TipAngleRad, math.Atan(0.5/(rin+0.7)), exactTol)
	within(t, "bottom tip angle", faces[side(4)].TipAngleRad, math.Atan(0.5/(rin-0.7)), exactTol)
	// The sides' direct shares against the corner rectangles, foot inside or
	// outside; the ends against Girard's theorem.
	for i := 0; i < 6; i++ {
		th := math.Pi/6 + float64(i)*math.Pi/3
		s := -0.7 * math.Cos(th)
		d := rin - com.Dot(vec{math.Cos(th), math.Sin(th), 0})
		want := rectOffAxis(-0.5, 0.5, -2, 2, s, 0, d) / (4 * math.Pi)
		within(t, "hexagon side direct share", faces[side(i)].Direct, want, exactTol)
	}
	for e := 0; e < 2; e++ {
		var pts []vec
		for _, v := range h.Faces[e].Verts {
			pts = append(pts, h.Vertices[v])
		}
		within(t, "hexagon end direct share (Girard)", faces[e].Direct, girardPolygon(pts, com)/(4*math.Pi), exactTol)
	}
	checkSums(t, faces)
}

func TestErrors(t *testing.T) {
	cube := func() *shapes.Hull {
		h, err := boxHull(shapes.Box{Half: vec{1, 1, 1}})
		if err != nil {
			t.Fatal(err)
		}
		return h
	}
	open := cube()
	open.Faces = open.Faces[:5]
	flipped := cube()
	flipped.Faces[0].Verts = []int32{5, 7, 3, 1}
	badIndex := cube()
	badIndex.Faces[2].Verts = []int32{2, 6, 7, 9}
	badNormal := cube()
	badNormal.Faces[3].Normal = vec{0, -2, 0}
	nanVert := cube()
	nanVert.Vertices = append([]vec(nil), nanVert.Vertices...)
	nanVert.Vertices[3] = vec{math.NaN(), 1, -1}
	cases := []struct {
		name string
		h    *shapes.Hull
		com  vec
		want error
	}{
		{"nil hull", nil, vec{}, ErrDegenerate},
		{"empty hull", &shapes.Hull{}, vec{}, ErrDegenerate},
		{"open hull", open, vec{}, ErrDegenerate},
		{"face wound inward", flipped, vec{}, ErrDegenerate},
		{"vertex index out of range", badIndex, vec{}, ErrDegenerate},
		{"normal not unit", badNormal, vec{}, ErrDegenerate},
		{"vertex not finite", nanVert, vec{}, ErrDegenerate},
		{"com outside", cube(), vec{2, 0, 0}, ErrOutside},
		{"com on a face", cube(), vec{1, 0.2, 0}, ErrOutside},
		{"com not finite", cube(), vec{math.NaN(), 0, 0}, ErrOutside},
	}
	for _, c := range cases {
		faces, err := OfHull(c.h, c.com)
		if !errors.Is(err, c.want) || faces != nil {
			t.Errorf("%s: got %v, %v; want error %v", c.name, faces, err, c.want)
		}
	}
	shapeCases := []struct {
		name string
		s    shapes.Shape
		com  vec
		want error
	}{
		{"plane", shapes.Plane{Normal: vec{0, 0, 1}}, vec{}, ErrUnsupported},
		{"triangle mesh", &shapes.TriMesh{}, vec{}, ErrUnsupported},
		{"nil box pointer", (*shapes.Box)(nil), vec{}, ErrUnsupported},
		{"compound with a sphere", &shapes.Compound{Pieces: []shapes.Piece{{Shape: shapes.Sphere{Radius: 1}, Pose: shapes.IdentityPose}}}, vec{}, ErrUnsupported},
		{"flat box", shapes.Box{Half: vec{1, 1, 0}}, vec{}, ErrDegenerate},
		{"com outside box", shapes.Box{Half: vec{1, 1, 1}}, vec{0, 0, 1.5}, ErrOutside},
		{"com outside cylinder", shapes.Cylinder{Radius: 1, HalfLength: 1}, vec{1.1, 0, 0}, ErrOutside},
		{"com outside sphere", shapes.Sphere{Radius: 1}, vec{0, 1, 0}, ErrOutside},
		{"com outside capsule", shapes.Capsule{Radius: 1, HalfLength: 1}, vec{0, 0, 2.5}, ErrOutside},
		{"com in a capsule end", shapes.Capsule{Radius: 1, HalfLength: 1}, vec{0, 0, 1.5}, ErrUnsupported},
		{"zero-length cylinder", shapes.Cylinder{Radius: 1}, vec{}, ErrDegenerate},
		{"negative radius", shapes.Cylinder{Radius: -1, HalfLength: 1}, vec{}, ErrDegenerate},
		{"com not finite", shapes.Sphere{Radius: 1}, vec{0, math.Inf(1), 0}, ErrOutside},
	}
	for _, c := range shapeCases {
		faces, err := OfShape(c.s, c.com)
		if !errors.Is(err, c.want) || faces != nil {
			t.Errorf("%s: got %v, %v; want error %v", c.name, faces, err, c.want)
		}
	}
}
