package contact

import (
	"math"
	"testing"
)

// factorTol bounds the relative error of L L^T against A + shift I and of
// the solution's residual. Cholesky factorisation is backward stable with
// an error of order n u ||A|| (G. H. Golub and C. F. Van Loan, "Matrix
// Computations", 4th ed., 2013, section 4.2), u = 1.1e-16 and n = 8 here;
// the rotations of each deletion add errors of the same order, and a
// sequence of a dozen changes stays far below 1e-12.
const factorTol = 1e-12

// TestFactorUpdate checks the factor kept by appends and deletions against
// the definition A + shift I = L L^T on the active rows, and the solution
// against (A + shift I) x = target - v0, after every change of a sequence
// of active sets such as the pivots of a solve make.
func TestFactorUpdate(t *testing.T) {
	const n = 8
	var b blockState
	// A = B B^T + I, symmetric positive definite for any B.
	b.a = make([]float64, n*n)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			for k := 0; k < n; k++ {
				b.a[i*n+j] += math.Sin(float64(i+2*k+1)) * math.Sin(float64(j+2*k+1))
			}
			if i == j {
				b.a[i*n+j]++
			}
		}
	}
	b.tgt, b.v0, b.x = make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range b.tgt {
		b.tgt[i], b.v0[i] = math.Cos(float64(3*i)), 0.1*float64(i)
	}
	b.active = make([]bool, n)
	const shift = 1e-9
	steps := []struct {
		name   string
		active string // one character per row: 'x' active
	}{
		{"empty", "........"},
		{"append all", "xxxxxxxx"},
		{"delete first", ".xxxxxxx"},
		{"delete middle two", ".xx.x.xx"},
		{"delete last", ".xx.x.x."},
		{"append back", "xxx.x.x."},
		{"delete and append", "x.xxxx.x"},
		{"one left", "....x..."},
		{"all again", "xxxxxxxx"},
	}
	b.resetFactor(n)
	for _, st := range steps {
		for i, c := range st.active {
			b.active[i] = c == 'x'
		}
		if !b.refactor(n, shift) {
			t.Fatalf("%s: positive definite matrix reported singular", st.name)
		}
		b.solveFactor(n, false)
		m := len(b.sub)
		for p := 0; p < m; p++ {
			for q := 0; q <= p; q++ {
				llt := 0.0
				for k := 0; k <= q; k++ {
					llt += b.l[p*n+k] * b.l[q*n+k]
				}
				want := b.a[int(b.sub[p])*n+int(b.sub[q])]
				if p == q {
					want += shift
				}
				if math.Abs(llt-want) > factorTol*(1+math.Abs(want)) {
					t.Errorf("%s: (L L^T)[%d][%d] = %.17g, want %.17g", st.name, p, q, llt, want)
				}
			}
		}
		for i := 0; i < n; i++ {
			if !b.active[i] {
				if b.x[i] != 0 {
					t.Errorf("%s: inactive row %d has x = %g, want 0", st.name, i, b.x[i])
				}
				continue
			}
			res := b.v0[i] - b.tgt[i] + shift*b.x[i]
			for j := 0; j < n; j++ {
				res += b.a[i*n+j] * b.x[j]
			}
			if math.Abs(res) > factorTol {
				t.Errorf("%s: residual of row %d is %g", st.name, i, res)
			}
		}
	}
}
