package contact

import "math"

// The Cholesky factor of the direct solve's active rows (block.go), kept
// from one pivot to the next. A pivot adds or removes a few rows of the
// active set; refactorising costs m^3/6 operations, while updating the
// factor for one row costs about m^2:
//
//   - A row enters at the end of the factor's order by bordering: its row
//     of L solves L l = a with the factor so far, and its diagonal is
//     sqrt(a_pp + shift - l.l). This is the last step of the row-oriented
//     factorisation itself, so the first factor of a solve is built by
//     appends too.
//   - A row leaves by deleting its row and column of L: the rows below it
//     then carry an extra column x, and their trailing block L22 is
//     replaced by the factor of L22 L22^T + x x^T, a rank-one update by
//     plane rotations, which is stable (G. H. Golub and C. F. Van Loan,
//     "Matrix Computations", 4th ed., Johns Hopkins 2013, section 6.5.4;
//     for the use in principal pivoting, K. G. Murty, "Linear
//     Complementarity, Linear and Nonlinear Programming", Heldermann 1988,
//     chapter 4).
//
// The factor is stored row by row with stride n, the size of the system:
// row k of L (k-th active row in factor order b.sub) is l[k*n : k*n+k+1].
// The forward solution y of L y = target - v0 is kept with it (b.y, in
// factor order): an appended row adds one entry, a deletion turns y by the
// same rotations as L, so a pivot's solve is one back substitution.
//
// Points couple only through a shared body, so the system is sparse and a
// row of L starts with zeros up to its first point coupled to an earlier
// one. b.first[k] bounds where row k's nonzero entries start, and the inner
// products of an append run over the overlap of the two rows' nonzero parts
// only (the envelope or profile method: A. George and J. W. H. Liu,
// "Computer Solution of Large Sparse Positive Definite Systems",
// Prentice-Hall 1981, chapter 4). The terms left out are products with a
// zero, and a partial sum that starts from an entry of A (never -0) is
// never -0, so leaving them out changes no bit.

// resetFactor empties the factor of a system of n rows.
func (b *blockState) resetFactor(n int) {
	b.sub = b.sub[:0]
	b.l = grow(b.l, n*n)
	b.first = grow(b.first, n)
	// Entries of y past the factor's rows are never read; zeroed, they
	// do not carry what an earlier, larger system left.
	b.y = grow(b.y, n)
	clear(b.y)
	b.pos = grow(b.pos, n)
	for i := range b.pos {
		b.pos[i] = -1
	}
}

// refactor brings the factor of (A + shift I) on the active rows up to
// date with b.active: rows that left are deleted, rows that entered are
// appended in index order. It reports false if the matrix is not positive
// definite.
func (b *blockState) refactor(n int, shift float64) bool {
	for k := len(b.sub) - 1; k >= 0; k-- {
		if !b.active[b.sub[k]] {
			b.deleteRow(n, k)
		}
	}
	for i := 0; i < n; i++ {
		if b.active[i] && b.pos[i] < 0 {
			if !b.appendRow(n, i, shift, 0) {
				return false
			}
		}
	}
	return true
}

// appendRow borders the factor with row p of the system, whose entries in
// the factor's rows before from are known to be zero.
func (b *blockState) appendRow(n, p int, shift float64, from int) bool {
	return b.border(b.a[p*n:p*n+n], p, n, shift, from, false)
}

// border appends row p of the system, ap (indexed by column), to the
// factor of n rows, stored in its envelope if band (bandstore.go).
func (b *blockState) border(ap []float64, p, n int, shift float64, from int, band bool) bool {
	m := len(b.sub)
	Lm := b.lowerRow(m, n, band)
	diag, rhs := ap[p]+shift, b.tgt[p]-b.v0[p]
	f := m // Lm's first nonzero entry so far
	for jf, sj := range b.sub[from:] {
		j := from + jf
		sum := ap[sj]
		// Row slices, so that the inner product runs without index
		// arithmetic and bounds checks.
		Lj := b.lowerRow(j, n, band)
		if lo := max(f, int(b.first[j])); lo < j {
			lm := Lm[lo:j]
			for k, x := range Lj[lo:j] {
				sum -= lm[k] * x
			}
		}
		if sum != 0 {
			Lm[j] = sum / Lj[j]
			f = min(f, j)
			diag -= Lm[j] * Lm[j]
		} else {
			Lm[j] = 0 // as 0 / Lj[j], which is > 0; diag loses 0
		}
		rhs -= Lm[j] * b.y[j]
	}
	if !(diag > 0) {
		return false
	}
	b.first[m] = int32(f)
	Lm[m] = math.Sqrt(diag)
	b.y[m] = rhs / Lm[m]
	b.pos[p] = int32(m)
	b.sub = append(b.sub, int32(p))
	return true
}

// deleteRow removes the k-th row of the factor order and restores the
// factor of the remaining rows by a rank-one update of the rows below.
func (b *blockState) deleteRow(n, k int) {
	m := len(b.sub)
	L := b.l
	b.pos[b.sub[k]] = -1
	// x: column k of the rows below k, which the rotations consume.
	x := b.col[:0]
	for i := k + 1; i < m; i++ {
		x = append(x, L[i*n+k])
	}
	b.col = x
	yk := b.y[k]
	copy(b.y[k:m-1], b.y[k+1:m])
	// Shift rows k+1.. up one row and columns k+1.. left one column.
	for i := k + 1; i < m; i++ {
		dst, src := L[(i-1)*n:(i-1)*n+i], L[i*n:i*n+i+1]
		copy(dst[:k], src[:k])
		copy(dst[k:], src[k+1:])
		b.sub[i-1] = b.sub[i]
		b.pos[b.sub[i-1]] = int32(i - 1)
		// Its columns before k stay; the rotations below fill it in from
		// column k on.
		b.first[i-1] = min(b.first[i], int32(k))
	}
	b.sub = b.sub[:m-1]
	// Rank-one update of the trailing block, rows and columns k..m-2. The
	// rotation that zeroes x[j] against column j turns (y[j], yk) too.
	for j := range x {
		d := &L[(k+j)*n+k+j]
		r := math.Hypot(*d, x[j])
		c, s := r / *d, x[j] / *d
		yj := &b.y[k+j]
		*yj, yk = (*d**yj+x[j]*yk)/r, (*d*yk-x[j]**yj)/r
		*d = r
		for i := j + 1; i < len(x); i++ {
			e := &L[(k+i)*n+k+j]
			*e = (*e + s*x[i]) / c
			x[i] = c*x[i] - s**e
		}
	}
}

// solveFactor solves (A + shift I) x = target - v0 on the active rows by
// back substitution from y, with x = 0 on the others. It runs by rows of L
// (columns of L^T), which are contiguous, on a copy z of y; with band
// (band.go) only over each row's envelope.
func (b *blockState) solveFactor(n int, band bool) {
	L, m := b.l, len(b.sub)
	clear(b.x[:n])
	b.z = append(b.z[:0], b.y[:m]...)
	z := b.z
	for i := m - 1; i >= 0; i-- {
		Li := L[i*n : i*n+i+1]
		xi := z[i] / Li[i]
		b.x[b.sub[i]] = xi
		lo := 0
		if band {
			lo = int(b.first[i])
		}
		for k, l := range Li[lo:i] {
			z[lo+k] -= l * xi
		}
	}
}
