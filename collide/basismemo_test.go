package collide

import (
	"math"
	"testing"
)

// TestBasisMemoMatchesPerpendicular: the remembered axes are those that
// perpendicular and a cross product give afresh (the reference) for each
// normal of a sequence that repeats normals, alternates them and differs
// only in the sign of a zero, and they are orthonormal with the normal
// (to rounding, basisTol).
func TestBasisMemoMatchesPerpendicular(t *testing.T) {
	// basisTol: a few units in the last place of unit vectors.
	const basisTol = 1e-15
	negZero := math.Copysign(0, -1)
	tilted, _ := unit(vec3{0.3, -0.4, 0.866})
	normals := []vec3{{0, 0, 1}, {0, 0, 1}, {negZero, negZero, -1}, {0, 0, -1}, tilted, {0, 0, 1}, tilted, {1, 0, 0}, {0, negZero, 1}}
	var m basisMemo
	for i, n := range normals {
		u, v := m.basis(n)
		wu := perpendicular(n)
		wv := n.Cross(wu)
		for k := 0; k < 3; k++ {
			if math.Float64bits(u[k]) != math.Float64bits(wu[k]) || math.Float64bits(v[k]) != math.Float64bits(wv[k]) {
				t.Fatalf("normal %d %v: axes %v, %v; afresh %v, %v", i, n, u, v, wu, wv)
			}
		}
		if math.Abs(u.Dot(n)) > basisTol || math.Abs(v.Dot(n)) > basisTol || math.Abs(u.Dot(v)) > basisTol ||
			math.Abs(u.Len()-1) > basisTol || math.Abs(v.Len()-1) > basisTol {
			t.Fatalf("normal %d %v: axes %v, %v not orthonormal with it", i, n, u, v)
		}
	}
}
