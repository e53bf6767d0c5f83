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
// in the order of idx, then with fric the friction rows.
func (s *Solver) systemRows(idx []int32, fric bool) {
	b := &s.blk
	b.rows, b.kind, b.of, b.cnt = b.rows[:0], b.kind[:0], b.of[:0], b.cnt[:0]
	add := func(r *crow, k rowKind, of, cnt int) {
		b.rows, b.kind = append(b.rows, r), append(b.kind, k)
		b.of, b.cnt = append(b.of, int32(of)), append(b.cnt, int32(cnt))
	}
	for k, pi := range idx {
		add(&s.nrows[pi], normalRow, k, 0)
	}
	if !fric {
		return
	}
	for k, pi := range idx {
		q := s.pts[pi].patch
		switch {
		case q == 0:
			add(&s.trows[2*pi], tangentRow, k, 0)
			add(&s.trows[2*pi+1], tangentRow, k, 0)
		case s.patches.list[q-1].lo == pi && s.patches.list[q-1].live:
			// A patch's points are consecutive, in idx too (islands keeps
			// the points' order), so they are idx[k:k+cnt].
			pa := &s.patches.list[q-1]
			for j := range pa.rows {
				add(&pa.rows[j], patchRow, k, int(pa.hi-pa.lo))
			}
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
	for i := len(idx); i < len(b.rows); {
		k := b.of[i]
		switch b.kind[i] {
		case tangentRow:
			if math.Hypot(b.x[i], b.x[i+1]) > s.pts[idx[k]].mu*max(b.x[k], 0) {
				return false
			}
			i += 2
		default: // patchRow
			pa := &s.patches.list[s.pts[idx[k]].patch-1]
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
