package engine

import "math"

// sincos is math.Sincos, bit for bit, with the case of the free rotation
// written out: its angles are one step's turn about one axis, well under
// pi/4, where math.Sincos's reduction leaves the argument as it is and only
// its two polynomials remain. Those are the minimax polynomials of
// S. L. Moshier, "Methods and Programs for Mathematical Functions", 1989
// (the Cephes library's sin.c), with the Go standard library's
// coefficients and order of evaluation, so the results are the same to the
// bit; any other argument goes to math.Sincos. Skipping the reduction and
// the special cases shortens the chain of dependent operations that the
// five turns of freeRotation form: it took a sixth off freeRotation.
func sincos(x float64) (sin, cos float64) {
	neg := x < 0
	if neg {
		x = -x
	}
	// x*(4/Pi) < 1 is math.Sincos's own test for the first octant (there
	// j == 0 and z == x); it is false for NaN and infinities. Zero keeps
	// its sign through math.Sincos.
	if x == 0 || !(x*(4/math.Pi) < 1) {
		if neg {
			x = -x
		}
		return math.Sincos(x)
	}
	const (
		s0 = 1.58962301576546568060e-10
		s1 = -2.50507477628578072866e-8
		s2 = 2.75573136213857245213e-6
		s3 = -1.98412698295895385996e-4
		s4 = 8.33333333332211858878e-3
		s5 = -1.66666666666666307295e-1
		c0 = -1.13585365213876817300e-11
		c1 = 2.08757008419747316778e-9
		c2 = -2.75573141792967388112e-7
		c3 = 2.48015872888517045348e-5
		c4 = -1.38888888888730564116e-3
		c5 = 4.16666666666665929218e-2
	)
	z := x
	zz := z * z
	cos = 1.0 - 0.5*zz + zz*zz*((((((c0*zz)+c1)*zz+c2)*zz+c3)*zz+c4)*zz+c5)
	sin = z + z*zz*((((((s0*zz)+s1)*zz+s2)*zz+s3)*zz+s4)*zz+s5)
	if neg {
		sin = -sin
	}
	return sin, cos
}
