package contact

// refine takes one step of iterative refinement on the direct solve's
// solution b.x, with the factor of its active rows (G. H. Golub and C. F.
// Van Loan, "Matrix Computations", 4th ed., Johns Hopkins 2013, section
// 3.5.3); with band over each row's band only (bandstore.go). The factor is that
// of A + shift I, so the step removes the shift's error, shift times the
// impulse, to its square (iterated Tikhonov regularisation: H. W. Engl,
// M. Hanke and A. Neubauer, "Regularization of Inverse Problems", Kluwer
// 1996, section 5.1).
//
// The shift is blockShift times the largest diagonal entry, the response of
// the lightest body, while its error lands on every row in proportion to
// the row's impulse: on the faces under a heavy body it is a velocity into
// the face. Along a tower that error, summed over its height, sank and
// turned a tower of 200 boxes of 10 cm at 3 um/s; a 40 kg box on 0.4 kg on
// 4 g (boxes of 20 x 20 x 10 cm), kept awake, sank 4.8 um/s a face at
// 1/30 s, 0.6 mm in 60 s (both measured without the step).
//
// A dense system takes the step only where the shift's error passes
// refineAbove, and keeps it only if no pressing row's impulse turns
// negative: along the nearly singular directions of a stack's faces (four
// corners constrain three motions) the step grows what the shift held
// small, and towers of a dozen cubes at 1/60 s gained energy when it was
// always kept (measured). Then the shifted solution stands, as before.
// A banded system keeps the step always.
func (b *blockState) refine(n int, band bool) {
	m := len(b.sub)
	b.z = grow(b.z, m)
	z := b.z
	// Forward: L z = r, with r = target - v0 - A x on the active rows.
	for k, i := range b.sub {
		r := b.tgt[i] - b.v0[i]
		lo, hi, ar := 0, n-1, []float64(nil)
		if band {
			lo, hi, ar = int(b.band.lo[i]), int(b.band.hi[i]), b.bandRow(int(i))
		} else {
			ar = b.a[int(i)*n : int(i)*n+n]
		}
		x := b.x[lo : hi+1]
		for j, a := range ar[lo : hi+1] {
			r -= a * x[j]
		}
		Lk := b.lowerRow(k, n, band)
		f := int(b.first[k])
		for j, l := range Lk[f:k] {
			r -= l * z[f+j]
		}
		z[k] = r / Lk[k]
	}
	// Back: L^T d = z, into z (in factor order).
	for k := m - 1; k >= 0; k-- {
		Lk := b.lowerRow(k, n, band)
		d := z[k] / Lk[k]
		z[k] = d
		f := int(b.first[k])
		for j, l := range Lk[f:k] {
			z[f+j] -= l * d
		}
	}
	if !band {
		for k, i := range b.sub {
			if b.kind[i] == normalRow && b.x[i]+z[k] < 0 {
				return
			}
		}
	}
	for k, i := range b.sub {
		b.x[i] += z[k]
	}
}

// refineAbove: a dense solve is refined where the shift's velocity error,
// shift times the largest impulse, passes this fraction of the solver's
// Tolerance. Near-equal masses keep it orders below (their results stay as
// they were, at no cost); the heavy-on-light stacks above pass it. A tenth
// bounds the creep the shift leaves to 1e-8 m/s, a micrometre in 100 s,
// where Tolerance alone would allow one in 10 s.
const refineAbove = 0.1
