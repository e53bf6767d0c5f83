package engine

// sincosOctant is math.Sincos(x), bit for bit, for x with a = |x| in
// the first octant: a > 0 and a 4/pi < 1, that is uint64(a 4/pi) == 0, the
// octant number math.Sincos works out. There math.Sincos reduces nothing
// (the reduced angle is a itself) and only evaluates its two polynomials;
// this is that evaluation, written out here so that the free rotation's
// calls (almost all of them small turns, above tinyTurn while a part
// rocks or tumbles) skip the special cases, the reduction and a call. The
// coefficients and the order of the operations are math.Sincos's, whose
// polynomials are those of S. L. Moshier's Cephes library (sin.c), so the
// roundings are the same.
func sincosOctant(x, a float64) (sin, cos float64) {
	const (
		s0, s1, s2 = 1.58962301576546568060e-10, -2.50507477628578072866e-8, 2.75573136213857245213e-6
		s3, s4, s5 = -1.98412698295895385996e-4, 8.33333333332211858878e-3, -1.66666666666666307295e-1
		c0, c1, c2 = -1.13585365213876817300e-11, 2.08757008419747316778e-9, -2.75573141792967388112e-7
		c3, c4, c5 = 2.48015872888517045348e-5, -1.38888888888730564116e-3, 4.16666666666665929218e-2
	)
	zz := a * a
	cos = 1.0 - 0.5*zz + zz*zz*((((((c0*zz)+c1)*zz+c2)*zz+c3)*zz+c4)*zz+c5)
	sin = a + a*zz*((((((s0*zz)+s1)*zz+s2)*zz+s3)*zz+s4)*zz+s5)
	if x < 0 {
		sin = -sin
	}
	return sin, cos
}
