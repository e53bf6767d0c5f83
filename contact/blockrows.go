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
func (s *Solver) systemRows(idx []int32, nf int, band bool) {
	b := &s.blk
	b.rows, b.kind, b.of, b.cnt = b.rows[:0], b.kind[:0], b.of[:0], b.cnt[:0]
	for k, pi := range idx {
		b.addRow(&s.nrows[pi], normalRow, k, 0)
		if k < nf && band {
			s.frictionRows(idx, k, len(b.rows)-1, true)
		}
	}
	if band {
		return
	}
	for k := range idx[:nf] {
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
			b.active[i] = b.active[b.of[i]] && b.free[i] == inSystem
		case patchRow:
			b.active[i] = false
			for k := b.of[i]; k < b.of[i]+b.cnt[i]; k++ {
				b.active[i] = b.active[i] || b.active[k]
			}
			b.active[i] = b.active[i] && b.free[i] == inSystem
		}
	}
}

// release takes out of the system the friction rows of every point or
// patch of points idx whose friction impulse in the solution b.x lies
// outside its bound (a point's disk, a patch's limit surface, twist.go, by
// the normal impulses of b.x), at zero impulse, and reports how many
// contacts it released: none if every contact sticks.
//
// The sticking solution of a statically indeterminate structure is one of
// many, the one of least impulses (blockShift), and may ask a lightly
// loaded contact for friction it cannot give while another solution needs
// none there: a light box on two heavy ones at the top of a pyramid was
// asked for 24 times its bound by the friction that squeezed it (measured,
// 100:1 in mass at 1/60 s), the whole island was left to the sweeps, and
// they let it fall. Released, such a contact presses without friction,
// the others stick, and the solution stands if it does not slip (holds):
// an active set over the friction rows, in the manner of the pivoting of
// D. Baraff, "Fast contact force computation for nonpenetrating rigid
// bodies", SIGGRAPH 1994. Held at its bound instead, the top box's
// friction squeezed it for real, and pyramids that stand now fell
// (measured).
func (s *Solver) release(idx []int32) int {
	b := &s.blk
	freed := 0
	for i := 0; i < len(b.rows); {
		w, over := s.overBound(idx, i)
		if over && b.free[i] == inSystem {
			for j := i; j < i+w; j++ {
				b.free[j] = zeroRow
			}
			freed++
		}
		i += w
	}
	return freed
}

// sticks reports whether the solution b.x of the system of points idx has
// every friction impulse within its bound.
func (s *Solver) sticks(idx []int32) bool {
	for i := 0; i < len(s.blk.rows); {
		w, over := s.overBound(idx, i)
		if over {
			return false
		}
		i += w
	}
	return true
}

// overBound reports the width w of the group of rows starting at row i of
// the system of points idx (1 for a normal row, 2 for a point's friction,
// 3 for a patch's) and whether its friction impulse in b.x lies outside
// its bound: a point's disk, a patch's limit surface (twist.go), by the
// normal impulses of b.x.
func (s *Solver) overBound(idx []int32, i int) (w int, over bool) {
	b := &s.blk
	k := b.of[i] // the (first) normal row
	switch b.kind[i] {
	case normalRow:
		return 1, false
	case tangentRow:
		return 2, math.Hypot(b.x[i], b.x[i+1]) > s.pts[idx[b.of[k]]].mu*max(b.x[k], 0)
	}
	pa := &s.patches.list[s.pts[idx[b.of[k]]].patch-1]
	n := 0.0
	for j := k; j < k+b.cnt[i]; j++ {
		n += max(b.x[j], 0)
	}
	return 3, math.Sqrt(b.x[i]*b.x[i]+b.x[i+1]*b.x[i+1]+b.x[i+2]*b.x[i+2]) > pa.mu*n
}

// releaseOf frees the friction rows that normal row i of a banded system
// brings into it: its point's, or its patch's, which follow the normal
// rows of their pair (systemRows) within row i's band.
func (b *blockState) releaseOf(i int) {
	for j := i + 1; j <= int(b.band.hi[i]); j++ {
		switch k := int(b.of[j]); b.kind[j] {
		case tangentRow:
			if k == i && b.free[j] == inSystem {
				b.free[j] = zeroRow
			}
		case patchRow:
			if k <= i && i < k+int(b.cnt[j]) && b.free[j] == inSystem {
				b.free[j] = zeroRow
			}
		}
	}
}

// freeRow says whether a friction row takes part in the direct solve.
type freeRow uint8

const (
	inSystem freeRow = iota
	zeroRow          // released at zero impulse
)

// holds reports whether the solution b.x of a system with released
// friction rows (release) obeys Coulomb's law at them: a released row has
// no impulse, which is right only where its contact does not slip, within
// tol, or does not press. A light box at a pyramid's top, squeezed by
// friction in the sticking solution, needs none and holds; a block pushed
// at 0.99 of its static limit, whose lightly loaded corners and then all
// were released, slips, and its friction is left to the sweeps (before
// this test it slid, measured).
//
// A released patch presses where any of its points does, and holds while
// its generalised slip stays under its creep limit (creep.go), the slip
// below which the step counts a patch as held. Tested at its first point
// alone, a patch whose first point was a hair above the floor counted as
// not pressing, its friction was taken at zero while it slid, and a
// bracket glided on its face at constant speed while its other points
// carried its weight (measured). Held to tol instead, a patch slipping at
// twice tol, far under its creep limit, sent a pyramid of boxes 1:10 in
// mass to the sweeps, and they let it slump (measured).
func (s *Solver) holds(n int, band bool) bool {
	b := &s.blk
	tol := s.Settings.Tolerance
	for j := 0; j < n; j++ {
		if b.free[j] == inSystem {
			continue
		}
		if b.kind[j] == patchRow {
			if s.patchHolds(j, n, band) {
				j += 2 // the patch's three rows
				continue
			}
			return false
		}
		if b.x[b.of[j]] > 0 && math.Abs(b.rowVel(j, n, band)) > tol {
			return false
		}
	}
	return true
}

// patchHolds reports whether the released patch whose rows start at row j
// of the system of n rows holds in the solution b.x (holds).
func (s *Solver) patchHolds(j, n int, band bool) bool {
	b := &s.blk
	k := int(b.of[j])
	load := 0.0
	for _, x := range b.x[k : k+int(b.cnt[j])] {
		load += max(x, 0)
	}
	if load == 0 {
		return true // it does not press
	}
	slip := math.Hypot(math.Hypot(b.rowVel(j, n, band), b.rowVel(j+1, n, band)), b.rowVel(j+2, n, band))
	return slip <= s.creepLimit(load*max(b.rows[j].k, b.rows[j+1].k), s.Settings.PatchCreepRatio)
}

// rowVel is the velocity error of row j of the system of n rows in the
// solution b.x.
func (b *blockState) rowVel(j, n int, band bool) float64 {
	lo, hi, row := 0, n-1, []float64(nil)
	if band {
		lo, hi, row = int(b.band.lo[j]), int(b.band.hi[j]), b.bandRow(j)
	} else {
		row = b.a[j*n : j*n+n]
	}
	v := b.v0[j] - b.tgt[j]
	for k, a := range row[lo : hi+1] {
		v += a * b.x[lo+k]
	}
	return v
}

// maxReleases bounds the rounds of release in one direct solve with
// friction. Each round solves the system again from the last active set,
// a pivot or two; a pyramid's top needs one (measured).
const maxReleases = 4
