package engine

import "math"

// cholesky is the Cholesky factor L (lower triangular, L L^T = K) of a
// symmetric positive definite matrix K of order n <= 6: the coupling
// matrix of a joint's equality rows (n = 0: no factor). It is a fixed-size
// value so that a joint keeps its factor without allocating.
//
// The factorization and the triangular solve are the textbook ones: Golub
// and Van Loan, "Matrix Computations", 4th ed., 2013, section 4.2
// (Cholesky, computed row by row) and section 3.1 (forward substitution).
// A general dense routine would do the same arithmetic in another order
// (a dot product subtracted at once rather than term by term) and so round
// differently; this one keeps the joints' results as they were.
type cholesky struct {
	n int
	l [6][6]float64
}

// factor computes the factor of the n x n matrix whose lower triangle is
// k's (the upper is not read). It fails, leaving ch.n at 0, when a pivot
// falls to tol times its own diagonal entry or below: the matrix is then
// numerically singular (a body with no mass in some direction).
func (ch *cholesky) factor(k *[6][6]float64, n int, tol float64) bool {
	ch.n = 0
	L := &ch.l
	for i := 0; i < n; i++ {
		for j := 0; j <= i; j++ {
			s := k[i][j]
			for m := 0; m < j; m++ {
				s -= L[i][m] * L[j][m]
			}
			if i == j {
				if !(s > tol*k[i][i]) {
					return false
				}
				L[i][i] = math.Sqrt(s)
			} else {
				L[i][j] = s / L[j][j]
			}
		}
	}
	ch.n = n
	return true
}

// apply writes L^-1 c into c (forward substitution).
func (ch *cholesky) apply(c *[6]float64) {
	for i := 0; i < ch.n; i++ {
		v := c[i]
		for k := 0; k < i; k++ {
			v -= ch.l[i][k] * c[k]
		}
		c[i] = v / ch.l[i][i]
	}
}
