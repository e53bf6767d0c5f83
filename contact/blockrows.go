package contact

import "math"

// The rows of an island's direct solve (block.go): its normal rows, and
// with friction the friction rows of its points, where a contact patch
// (twist.go) brings its own three rows in place of its points' tangent rows.

// rowKind says what a row of the direct solve's system is.
type rowKind uint8

const (
	normalRow  rowKind = iota
	tangentRow         // one of a point's two tangent rows
	patchRow           // one of a patch's three rows
)

// systemRows lists the rows of the system of points idx: their normal rows
// in the order of idx, then with fric the friction rows. A normal row's of
// is its place in idx.
//
// With band (an island ordered along its contact graph, band.go) each
// point's friction rows follow its normal row instead, and a patch's follow
// the normal rows of its last point, so that the rows of one pair stay
// together and the system stays banded.
func (s *Solver) systemRows(idx []int32, fric, band bool) {
	b := &s.blk
	b.rows, b.kind, b.of, b.cnt = b.rows[:0], b.kind[:0], b.of[:0], b.cnt[:0]
	for k, pi := range idx {
		b.addRow(&s.nrows[pi], normalRow, k, 0)
		if fric && band {
			s.frictionRows(idx, k, len(b.rows)-1, true)
		}
	}
	if !fric || band {
		return
	}
	for k := range idx {
		s.frictionRows(idx, k, k, false)
	}
}

// addRow appends row r of kind k to the system.
func (b *blockState) addRow(r *crow, k rowKind, of, cnt int) {
	b.rows, b.kind = append(b.rows, r), append(b.kind, k)
	b.of, b.cnt = append(b.of, int32(of)), append(b.cnt, int32(cnt))
}

// frictionRows appends the friction rows of point idx[k], whose normal row
// is row nr: its two tangent rows, or, at the first point of a patch (its
// last with band), the patch's three rows.
func (s *Solver) frictionRows(idx []int32, k, nr int, band bool) {
	b := &s.blk
	pi := idx[k]
	q := s.pts[pi].patch
	if q == 0 {
		b.addRow(&s.trows[2*pi], tangentRow, nr, 0)
		b.addRow(&s.trows[2*pi+1], tangentRow, nr, 0)
		return
	}
	// A patch's points are consecutive, in idx too (islands and
	// bandOrder keep the points' order within a pair), so their normal
	// rows are consecutive.
	pa := &s.patches.list[q-1]
	cnt := int(pa.hi - pa.lo)
	at, first := pa.lo, nr
	if band {
		at, first = pa.hi-1, nr-(cnt-1)
	}
	if pi == at && pa.live {
		for j := range pa.rows {
			b.addRow(&pa.rows[j], patchRow, first, cnt)
		}
	}
}

// follow makes the friction rows of the system active with their normal
// rows: a point's with its own, a patch's with any of its points'.
func (b *blockState) follow() {
	for i := range b.rows {
		switch b.kind[i] {
		case tangentRow:
			b.active[i] = b.active[b.of[i]]
		case patchRow:
			b.active[i] = false
			for k := b.of[i]; k < b.of[i]+b.cnt[i]; k++ {
				b.active[i] = b.active[i] || b.active[k]
			}
		}
	}
}

// sticks reports whether the solution b.x of the system of points idx has
// every friction impulse within its bound: a point's in its disk, a
// patch's in its limit surface (twist.go), by the normal impulses of b.x.
func (s *Solver) sticks(idx []int32) bool {
	b := &s.blk
	for i := 0; i < len(b.rows); {
		k := b.of[i] // the (first) normal row
		switch b.kind[i] {
		case normalRow:
			i++
		case tangentRow:
			if math.Hypot(b.x[i], b.x[i+1]) > s.pts[idx[b.of[k]]].mu*max(b.x[k], 0) {
				return false
			}
			i += 2
		default: // patchRow
			pa := &s.patches.list[s.pts[idx[b.of[k]]].patch-1]
			n := 0.0
			for j := k; j < k+b.cnt[i]; j++ {
				n += max(b.x[j], 0)
			}
			if math.Sqrt(b.x[i]*b.x[i]+b.x[i+1]*b.x[i+1]+b.x[i+2]*b.x[i+2]) > pa.mu*n {
				return false
			}
			i += 3
		}
	}
	return true
}
