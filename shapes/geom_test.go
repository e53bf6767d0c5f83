package shapes

import (
	"math"
	"math/rand/v2"
	"testing"
)

// transformRef is AABB.Transform as the composition of the mgl64 methods
// it writes out.
func transformRef(b AABB, p Pose) AABB {
	c := p.Apply(b.Center())
	h := b.Size().Mul(0.5)
	r := p.Orientation.Mat4()
	var e Vec3
	for i := 0; i < 3; i++ {
		e[i] = math.Abs(r.At(i, 0))*h[0] + math.Abs(r.At(i, 1))*h[1] + math.Abs(r.At(i, 2))*h[2]
	}
	return AABB{Min: c.Sub(e), Max: c.Add(e)}
}

// TestTransformMatchesMethods: Transform gives the mgl64 methods' result
// bit for bit (the step loop's results must not change with it), and its
// box holds the box's corners (rounding aside).
func TestTransformMatchesMethods(t *testing.T) {
	const cornerTol = 1e-12 // rounding of the rotated corners, boxes of size ~1 at distances ~10
	rng := rand.New(rand.NewPCG(1, 2))
	bits := func(v Vec3) [3]uint64 {
		return [3]uint64{math.Float64bits(v[0]), math.Float64bits(v[1]), math.Float64bits(v[2])}
	}
	for i := 0; i < 1000; i++ {
		lo := Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		b := AABB{Min: lo, Max: lo.Add(Vec3{rng.Float64(), rng.Float64(), rng.Float64()})}
		q := Quat{W: rng.NormFloat64(), V: Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}}.Normalize()
		p := Pose{Position: Vec3{10 * rng.NormFloat64(), 10 * rng.NormFloat64(), 10 * rng.NormFloat64()}, Orientation: q}
		got, want := b.Transform(p), transformRef(b, p)
		if bits(got.Min) != bits(want.Min) || bits(got.Max) != bits(want.Max) {
			t.Fatalf("case %d: Transform %v, methods %v", i, got, want)
		}
		for k := 0; k < 8; k++ {
			c := p.Apply(Vec3{[2]float64{b.Min[0], b.Max[0]}[k&1], [2]float64{b.Min[1], b.Max[1]}[k>>1&1], [2]float64{b.Min[2], b.Max[2]}[k>>2]})
			for a := 0; a < 3; a++ {
				if c[a] < got.Min[a]-cornerTol || c[a] > got.Max[a]+cornerTol {
					t.Fatalf("case %d: corner %v outside %v", i, c, got)
				}
			}
		}
	}
}
