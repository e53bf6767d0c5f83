package contact

import "slices"

// The storage of a banded system (band.go): each row of A keeps only its
// band, the columns lo..hi of the rows it shares a moving body with, and
// each row of the factor L only the columns from its first possible
// nonzero on, one row after the other (the envelope or profile storage of
// A. George and J. W. H. Liu, "Computer Solution of Large Sparse Positive
// Definite Systems", Prentice-Hall 1981, section 4.2). A tower of 256 boxes
// with friction, 1792 rows, took 51 MB stored densely; in its band it
// takes about 40 entries a row.
//
// A row is handed out as a slice indexed by column, as the dense storage
// does: it starts where column 0 would be, which lies at or after the
// start of the storage since every row before takes at least one entry.
// The entries before the row's band belong to the rows before and are
// never read through it.

// bandRow is row i of the banded A, indexed by column: valid from lo[i] to
// hi[i].
func (b *blockState) bandRow(i int) []float64 {
	bs := &b.band
	base := int(bs.aoff[i]) - int(bs.lo[i])
	return b.a[base : base+int(bs.hi[i])+1]
}

// factorRow is row k of the banded factor L, indexed by column: valid from
// the column it was appended with (appendBandRow) to k.
func (b *blockState) factorRow(k int) []float64 {
	base := int(b.band.lbase[k])
	return b.l[base : base+k+1]
}

// bandMatrix writes the band of A = J M^-1 J^T for the system's n rows
// (b.rows, with b.ab and the band's lo and hi set) and returns its largest
// diagonal entry.
func (b *blockState) bandMatrix(n int) float64 {
	bs := &b.band
	bs.aoff = grow(bs.aoff, n+1)
	size, lower := 0, 0
	for i := 0; i < n; i++ {
		bs.aoff[i] = int32(size)
		size += int(bs.hi[i]-bs.lo[i]) + 1
		lower += i - int(bs.lo[i]) + 1
	}
	bs.aoff[n] = int32(size)
	b.a = grow(b.a, size)
	b.l = grow(b.l, lower) // the factor's rows are at most as wide
	diag := 0.0
	for i := 0; i < n; i++ {
		ri, ai, bi := b.rows[i], b.ab[i][0], b.ab[i][1]
		lo, hi := int(bs.lo[i]), int(bs.hi[i])
		ar := b.bandRow(i)
		clear(ar[i+1 : hi+1]) // the rows below write what couples
		for jb, abj := range b.ab[lo : i+1] {
			j := lo + jb
			c := 0.0
			if abj[0] == ai || abj[0] == bi || abj[1] == ai || abj[1] == bi {
				c = coupling(b.rows[j], ri)
			}
			ar[j] = c
			if i <= int(bs.hi[j]) { // else c is 0, outside row j's band
				b.bandRow(j)[i] = c
			}
		}
		diag = max(diag, ar[i])
	}
	return diag
}

// resetBandFactor empties the factor of a banded system of n rows.
func (b *blockState) resetBandFactor(n int) {
	b.sub = b.sub[:0]
	b.first = grow(b.first, n)
	b.band.lbase = grow(b.band.lbase, n)
	b.y = grow(b.y, n)
	clear(b.y)
	b.pos = grow(b.pos, n)
	for i := range b.pos {
		b.pos[i] = -1
	}
}

// appendBandRow borders the banded factor with row p of the system, whose
// entries in the factor's rows before from are zero: appendRow
// (cholesky.go) on the profile storage, whose row m starts where row m-1
// ends.
func (b *blockState) appendBandRow(p int, shift float64, from int) bool {
	m := len(b.sub)
	start := 0
	if m > 0 {
		start = int(b.band.lbase[m-1]) + m // the end of row m-1
	}
	b.band.lbase[m] = int32(start - from)
	return b.border(b.bandRow(p), p, 0, shift, from, true)
}

// lowerRow is row k of the factor L of an n-row system, indexed by
// column up to k: stored in its envelope if band, else densely.
func (b *blockState) lowerRow(k, n int, band bool) []float64 {
	if band {
		return b.factorRow(k)
	}
	return b.l[k*n : k*n+k+1]
}

// solveBandFactor is solveFactor (cholesky.go) on the banded factor.
func (b *blockState) solveBandFactor(n int) {
	m := len(b.sub)
	clear(b.x[:n])
	b.z = append(b.z[:0], b.y[:m]...)
	z := b.z
	for i := m - 1; i >= 0; i-- {
		Li := b.factorRow(i)
		xi := z[i] / Li[i]
		b.x[b.sub[i]] = xi
		lo := int(b.first[i])
		for k, l := range Li[lo:i] {
			z[lo+k] -= l * xi
		}
	}
}

// bandFrom is the first of the factor's rows that may couple with row i
// of the system: the rows before the first one in its band have zeros in
// its row of L.
func (b *blockState) bandFrom(i int) int {
	from, _ := slices.BinarySearch(b.sub, b.band.lo[i])
	return from
}
