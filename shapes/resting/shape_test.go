package resting

import (
	"math"
	"testing"

	"clatter/shapes"
)

// coneShare is the share of directions in a cone of half-angle alpha,
// 2 pi (1 - cos alpha) / (4 pi) (the solid angle of a cone; any
// geometry text), for a disc of radius r seen from d on
// its axis: cos alpha = d / sqrt(d^2 + r^2).
func coneShare(r, d float64) float64 {
	return 2 * math.Pi * (1 - d/math.Hypot(d, r)) / (4 * math.Pi)
}

func TestCylinderOnAxis(t *testing.T) {
	cases := []struct {
		name    string
		r, l, z float64 // radius, half length, com height on the axis
	}{
		{"disc", 1, 0.1, 0},
		{"square cylinder", 1, 1, 0},
		{"long pin", 0.002, 0.02, 0},
		{"weighted toward +z", 1, 2, 0.8},
		{"weighted toward -z", 0.5, 0.5, -0.3},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			faces, err := OfShape(shapes.Cylinder{Radius: c.r, HalfLength: c.l}, vec{0, 0, c.z})
			if err != nil {
				t.Fatal(err)
			}
			if len(faces) != 3 {
				t.Fatalf("%d faces, want 3", len(faces))
			}
			dTop, dBot := c.l-c.z, c.l+c.z
			top, bot := coneShare(c.r, dTop), coneShare(c.r, dBot)
			within(t, "+z cap probability", faces[0].Probability, top, exactTol)
			within(t, "-z cap probability", faces[1].Probability, bot, exactTol)
			within(t, "side probability", faces[2].Probability, 1-top-bot, exactTol)
			// Statics of a rigid block on a tilt table: a cap tips at atan(b/h),
			// here atan(r/d); the side tips along its axis at atan(d/r).
			within(t, "+z cap tip angle", faces[0].TipAngleRad, math.Atan(c.r/dTop), exactTol)
			within(t, "-z cap tip angle", faces[1].TipAngleRad, math.Atan(c.r/dBot), exactTol)
			within(t, "side tip angle", faces[2].TipAngleRad, math.Atan(math.Min(dTop, dBot)/c.r), exactTol)
			if faces[0].Normal != (vec{0, 0, 1}) || faces[1].Normal != (vec{0, 0, -1}) || !faces[2].Curved() || faces[0].Curved() {
				t.Errorf("face list: %+v", faces)
			}
			checkSums(t, faces)
		})
	}
}

func TestDiscOffAxisAgainstPolygons(t *testing.T) {
	// The solid angle of a disc seen from off its axis against the regular
	// polygons inscribed in it, computed by the hull code's Van Oosterom and
	// Strackee sum: a polygon of n corners misses the disc by a smooth series
	// in 1/n^2, so Richardson's extrapolation (4 Omega_2n - Omega_n) / 3 of
	// n = 4096 and 8192 leaves an error of order n^-4 (it shrinks 16-fold per
	// doubling of n; 3e-14 relative for the foot 0.01 from the rim, the worst
	// case here). polyTol allows for that and the rounding of 8192-term sums.
	const polyTol = 1e-12
	cases := []struct{ r, rho, d float64 }{
		{1, 0.3, 1}, {1, 0.9, 0.5}, {1, 0.99, 0.05}, {2, 1, 10}, {0.01, 0.002, 0.001},
	}
	for _, c := range cases {
		poly := func(n int) float64 {
			h := prismHull(t, regularPolygon(n, c.r, 0.3), c.d+1)
			a, err := newAnalysis(h, vec{c.rho, 0, 1})
			if err != nil {
				t.Fatal(err)
			}
			return a.solidAngle(0) // the +z end, at height d above com
		}
		ref := (4*poly(8192) - poly(4096)) / 3
		got := discSolidAngle(c.r, c.rho, c.d)
		within(t, "disc solid angle off axis", got, ref, polyTol*ref)
	}
}

func TestCapsule(t *testing.T) {
	// One curved face, probability 1; its own capture share is the band of
	// directions through the cylindrical part, 1 - 2 coneShare(r, l) =
	// l / sqrt(l^2 + r^2) for com at the centre (the zone of a sphere between
	// two parallel planes; any geometry text).
	for _, c := range []struct{ r, l float64 }{{1, 1}, {0.5, 3}, {0.002, 0.001}} {
		faces, err := OfShape(shapes.Capsule{Radius: c.r, HalfLength: c.l}, vec{})
		if err != nil {
			t.Fatal(err)
		}
		if len(faces) != 1 || !faces[0].Curved() || !faces[0].Stable {
			t.Fatalf("capsule faces %+v", faces)
		}
		within(t, "capsule probability", faces[0].Probability, 1, 0)
		within(t, "capsule side direct share", faces[0].Direct, c.l/math.Hypot(c.l, c.r), exactTol)
		within(t, "capsule tip angle", faces[0].TipAngleRad, math.Atan(c.l/c.r), exactTol)
	}
}

func TestBalls(t *testing.T) {
	// A ball rests anywhere: no faces, no error.
	for _, s := range []shapes.Shape{shapes.Sphere{Radius: 1}, &shapes.Sphere{Radius: 2}, shapes.Capsule{Radius: 1}} {
		faces, err := OfShape(s, vec{0.1, 0, 0})
		if err != nil || faces != nil {
			t.Errorf("%T: %v, %v; want no faces", s, faces, err)
		}
	}
}

func TestCompoundOfBoxes(t *testing.T) {
	// Two boxes stacked into a cube of half size 1: the compound's hull is the
	// cube, its faces +x, -x, +y, -y, +z, -z. Uniform: each face 1/6
	// (symmetry). A heavier bottom moves com to z = -0.25, and
	// the faces follow the off-centre rectangle formula of the cube.
	half := vec{1, 1, 0.5}
	c := &shapes.Compound{Pieces: []shapes.Piece{
		{Shape: shapes.Box{Half: half}, Pose: shapes.Pose{Position: vec{0, 0, -0.5}, Orientation: shapes.IdentityPose.Orientation}},
		{Shape: &shapes.Box{Half: half}, Pose: shapes.Pose{Position: vec{0, 0, 0.5}, Orientation: shapes.IdentityPose.Orientation}},
	}}
	for _, com := range []vec{c.Mass(1).Center, {0, 0, -0.25}} {
		faces, err := OfShape(c, com)
		if err != nil {
			t.Fatal(err)
		}
		if len(faces) != 6 {
			t.Fatalf("%d faces, want 6", len(faces))
		}
		for k, f := range faces {
			omega, tip := boxReference(vec{1, 1, 1}, com, k)
			within(t, "compound face probability", f.Probability, omega/(4*math.Pi), exactTol)
			within(t, "compound face tip angle", f.TipAngleRad, tip, exactTol)
		}
		checkSums(t, faces)
	}
}

func TestHullPointerAndValue(t *testing.T) {
	h, err := boxHull(shapes.Box{Half: vec{1, 2, 3}})
	if err != nil {
		t.Fatal(err)
	}
	a, err := OfShape(h, vec{})
	if err != nil {
		t.Fatal(err)
	}
	b, err := OfShape(&shapes.Box{Half: vec{1, 2, 3}}, vec{})
	if err != nil {
		t.Fatal(err)
	}
	for i := range a {
		if a[i] != b[i] {
			t.Errorf("face %d: %+v != %+v", i, a[i], b[i])
		}
	}
}

func TestFacetedCylinderTendsToExact(t *testing.T) {
	// The hull (shapes.NewHull) of m points around each rim of a cylinder,
	// com off the axis: the part lying on its side rolls round to its lowest
	// facets, so no side facet may roll onto a cap, and the caps' shares tend
	// to the exact cylinder's. An inscribed m-gon misses the fraction
	// delta = 1 - m sin(2 pi / m) / (2 pi), about (2 pi / m)^2 / 6, of the
	// disc's area, and its solid angle falls short by a like fraction (by
	// 0.65 to 0.85 delta here); facetTol = 2 delta bounds it.
	const m = 720
	r, l := 1.0, 1.0
	com := vec{0.6, 0, 0.3}
	var pts []vec
	for i := 0; i < m; i++ {
		a := 2 * math.Pi * float64(i) / m
		pts = append(pts, vec{r * math.Cos(a), r * math.Sin(a), l}, vec{r * math.Cos(a), r * math.Sin(a), -l})
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	faceted, err := OfHull(h, com)
	if err != nil {
		t.Fatal(err)
	}
	exact, err := OfShape(shapes.Cylinder{Radius: r, HalfLength: l}, com)
	if err != nil {
		t.Fatal(err)
	}
	checkSums(t, faceted)
	delta := 1 - m*math.Sin(2*math.Pi/m)/(2*math.Pi)
	facetTol := 2 * delta
	var caps [2]float64
	for i, f := range faceted {
		isCap := math.Abs(f.Normal[2]) > 0.5
		switch {
		case isCap && f.Normal[2] > 0:
			caps[0] = f.Probability
		case isCap:
			caps[1] = f.Probability
		case math.Abs(faceted[f.RollsTo].Normal[2]) > 0.5:
			t.Errorf("side facet %d rolls onto cap %d", i, f.RollsTo)
		}
	}
	within(t, "faceted +z cap", caps[0], exact[0].Probability, facetTol*exact[0].Probability)
	within(t, "faceted -z cap", caps[1], exact[1].Probability, facetTol*exact[1].Probability)
}
