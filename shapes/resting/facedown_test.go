package resting

import (
	"math"
	"testing"

	"clatter/shapes"
)

// tilted turns the unit vector n by angle a toward a direction perpendicular to it.
func tilted(n vec, a float64) vec {
	p := n.Cross(vec{0.3, 0.5, 0.7}).Normalize()
	return n.Mul(math.Cos(a)).Add(p.Mul(math.Sin(a)))
}

func TestFaceDownBox(t *testing.T) {
	faces, err := OfShape(shapes.Box{Half: vec{0.05, 0.03, 0.02}}, vec{})
	if err != nil {
		t.Fatal(err)
	}
	// The box's outward normals in the documented order +x, -x, +y, -y, +z, -z.
	normals := []vec{{1, 0, 0}, {-1, 0, 0}, {0, 1, 0}, {0, -1, 0}, {0, 0, 1}, {0, 0, -1}}
	for k, n := range normals {
		cases := []struct {
			what string
			down vec
			want int
		}{
			{"exactly down", n, k},
			{"scaled by g", n.Mul(9.80665), k},
			{"tilted within the tolerance", tilted(n, 0.9*FaceDownTolerance), k},
			{"tilted beyond the tolerance", tilted(n, 1.1*FaceDownTolerance), -1},
		}
		for _, c := range cases {
			if got := FaceDown(faces, c.down); got != c.want {
				t.Errorf("face %d %s: FaceDown = %d, want %d", k, c.what, got, c.want)
			}
		}
		if got := FaceDownWithin(faces, tilted(n, 0.3), 0.31); got != k {
			t.Errorf("face %d with a wide tolerance: %d", k, got)
		}
	}
	for _, down := range []vec{{1, 1, 1}, {}, {math.NaN(), 0, -1}, {0, 0, math.Inf(-1)}} {
		if got := FaceDown(faces, down); got != -1 {
			t.Errorf("FaceDown(%v) = %d, want -1", down, got)
		}
	}
}

func TestFaceDownRound(t *testing.T) {
	cyl, err := OfShape(shapes.Cylinder{Radius: 1, HalfLength: 2}, vec{})
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		down vec
		want int
	}{
		{vec{0, 0, 1}, 0},
		{vec{0, 0, -3}, 1},
		{vec{1, 0, 0}, 2},
		{vec{-0.6, 0.8, 0}, 2},
		{tilted(vec{0, 1, 0}, 0.9*FaceDownTolerance), 2},
		{vec{1, 0, 1}, -1},
	}
	for _, c := range cases {
		if got := FaceDown(cyl, c.down); got != c.want {
			t.Errorf("cylinder FaceDown(%v) = %d, want %d", c.down, got, c.want)
		}
	}
	if got := FaceDown(nil, vec{0, 0, -1}); got != -1 {
		t.Errorf("ball: FaceDown = %d, want -1", got)
	}
}
