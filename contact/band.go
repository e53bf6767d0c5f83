package contact

import (
	"cmp"
	"slices"

	"clatter/internal/scratch"
)

// The direct solve of large islands whose system is banded.
//
// What limits the direct solve (block.go) is the work of its Cholesky
// factorisation, not the number of points. The rows of two points couple
// only through a shared body, so a tower's system is banded: each point
// couples with the points of the two faces of its boxes, and with the rows
// in order along the tower the factor of an envelope (profile) method has
// at most a few dozen entries per row, however tall the tower (A. George
// and J. W. H. Liu, "Computer Solution of Large Sparse Positive Definite
// Systems", Prentice-Hall 1981, chapter 4). A pile of a thousand parts
// couples each part with a dozen others in all directions, and its
// envelope stays wide in any order.
//
// An island of more than MaxBlock points therefore gets the direct solve
// too when, with its points ordered along its contact graph, the envelope
// factorisation costs no more per row than the dense one of MaxBlock
// points (bandBudget). The order is that of Cuthill and McKee: the bodies by
// breadth-first search from one of fewest contacts, the points by their
// bodies' places (E. Cuthill and J. McKee, "Reducing the bandwidth of
// sparse symmetric matrices", Proc. 24th ACM National Conference, 1969;
// George and Liu, section 4.3). The points of one pair stay together and
// in their order, as the patches' rows need (blockrows.go).
//
// Such a banded solve keeps its factor in the order of the rows: a pivot
// that changes the active set at row p keeps the factor's rows before p
// and appends the active rows from p on again, which costs the envelope
// work of that tail; updates by rotations (cholesky.go) would fill the
// envelope in below a deleted row.
//
// Friction rows keep a tower banded too when each pair's friction rows
// follow its normal rows (systemRows). An island of more than
// maxFrictionBlock points whose system with friction is banded within
// the budget per row of the dense system with friction (bandBudget) is
// tall: it gets the direct solve with friction at every step, before the
// sweeps and after them if they did not converge, even where its normal
// rows alone are over their own budget (a pyramid of ten rows of boxes
// side by side: left to the sweeps it drifted 1.3 mm in 5 s at 1/60 s). Left to the sweeps, a tower's
// friction and the patches' update after a normal-only solve
// (settlePatches) rocked a tower of 50 boxes at 1/60 s more each step
// until it fell (measured: its sway grew tenfold every 20 steps from
// 1e-8 m); the sweeps' own tolerance on each face, summed over the height,
// leaned a tower of 100 boxes at 1 ms by 0.7 mm in 5 s.
//
// The points of a pair apart and without impulse (loose: beyond the slop
// and beyond the bodies' depth, bandnear.go) go last in the order and are
// left to the sweeps: at a coarse step the margin of speculative points
// reaches past a small part's neighbours and would make a tower of them
// dense.
//
// A banded velocity solve starts with every touching point pressing
// (touches), and takes one step of iterative refinement (refine.go),
// which removes the error that the shift (blockShift) makes in every
// face, summed over the tower's height.
//
// Islands of up to maxFrictionBlock points, and islands of up to MaxBlock
// points that are not tall and have more than maxFrictionBlock points that
// are not loose, are solved as before, bit for bit.

// bandMemoPoints: an island of more points remembers that it is not
// banded (bandMemo) and is not ordered again while its contacts stay the
// same. A resting pile of a thousand parts, 4300 points, is over the band's
// budget in any order; ordering it anew at every step to find that out
// would cost it about a percent of its step.
const bandMemoPoints = 1024

// bandPivotBudgets bounds the factorisation work of one banded solve,
// over all its pivots, in multiples of blockBudget. A dense solve of
// MaxBlock points pays one factorisation (one budget) and up to maxPivots
// row updates of at most MaxBlock^2 each, 1 + 24*3/96 = 1.75 budgets at
// most; a banded solve gets about twice that before it is left to the
// sweeps, so that a tower at a coarse step can take the twenty pivots it
// needs while an island in motion costs no more than a small one.
const bandPivotBudgets = 4

// blockBudget is the envelope work, the sum over the factor's rows of the
// square of the row's width (George and Liu, section 4.2), of the dense
// factor of m rows: 1^2 + 2^2 + ... + m^2.
func blockBudget(m int) int64 {
	k := int64(m)
	return k * (k + 1) * (2*k + 1) / 6
}

// bandState is the scratch space of the banded solve.
type bandState struct {
	ok       []bool   // per island root: solved by the banded solve
	tall     []bool   // per island root: solved with friction by the banded solve
	cut      []int32  // per island root: its points solved directly, first in its order
	loose    []run    // the island's pairs apart (loose)
	runs     []run    // the island's pairs, as runs of points
	node     []int32  // per body slot: its place among the island's bodies, -1 if none
	firstRow []int32  // per body slot: the first row on it
	lastRow  []int32  // per body slot: the last row on it
	deg      []int32  // per body u: its list of neighbours is adj[deg[u]:deg[u+1]]
	adj      []int32  // the neighbours of each body, by body
	fill     []int32  // per body: entries of adj written so far
	queue    []int32  // bodies in breadth-first order
	place    []int32  // per body: its place in queue
	ground   []bool   // per body: touches a fixed body
	perm     []int32  // the points in the new order
	lo       []int32  // per row of the system: the first row coupled with it
	hi       []int32  // per row of the system: the last row coupled with it
	work     int64    // the factor work spent by the current solve
	memo     []uint64 // per island root: bandSignature of an island found not banded, kept from step to step
	flip     []int32  // the rows a pivot exchanges (bandpivot.go)
	aoff     []int32  // per row of the system: where its band starts in A (bandstore.go)
	lbase    []int32  // per row of the factor: where its column 0 would be in L (bandstore.go)
	cycle    setTrail // the active sets of the pivots (bandcycle.go)
	held     []bool   // per body slot: has a point in the banded system, while dropLoose runs (bandloose.go)
	pressing []int8   // per point: +1 or -1 if this step's last banded velocity solve of its island had it pressing or free, 0 if none ran
}

// run is the points idx[start:end] of one pair of an island, with the
// places of its bodies in the breadth-first order (key).
type run struct {
	key        [2]int32
	start, end int32
}

// orderBands decides for each island of more than maxFrictionBlock points
// whether it gets the banded solve, of its normal rows if it has more than
// MaxBlock points (ok), with friction (tall), and if so puts its points in
// b.order in band order.
func (s *Solver) orderBands() {
	b := &s.blk
	b.band.ok, b.band.tall = grow(b.band.ok, len(b.size)), grow(b.band.tall, len(b.size))
	b.band.cut = grow(b.band.cut, len(b.size))
	clear(b.band.ok)
	clear(b.band.tall)
	copy(b.band.cut, b.size)
	memo := &b.band.memo
	if len(*memo) != len(b.size) { // the body slots changed
		*memo = grow(*memo, len(b.size))
		clear(*memo)
	}
	for r, n := range b.size {
		if int(n) <= maxFrictionBlock {
			continue
		}
		idx := b.order[b.start[r] : b.start[r]+n]
		sig := uint64(0)
		if n > bandMemoPoints {
			if sig = s.bandSignature(idx); (*memo)[r] == sig {
				continue // not banded last time, and nothing changed
			}
		}
		b.band.ok[r], b.band.tall[r], b.band.cut[r] = s.bandOrder(idx)
		(*memo)[r] = 0
		if !b.band.ok[r] && b.band.cut[r] == n { // left as it was, to the sweeps
			(*memo)[r] = sig
		}
	}
}

// bandSignature is a hash of what bandOrder decides points idx by: the
// body slots of each point, which of them move, and whether it touches or
// presses (loose). It is never 0.
func (s *Solver) bandSignature(idx []int32) uint64 {
	im := s.sl.im
	h := uint64(len(idx))
	for _, i := range idx {
		r := &s.nrows[i]
		x := uint64(uint32(r.a))<<32 | uint64(uint32(r.b))<<3
		if s.near(i) || r.lambda > 0 && s.pressed(i) { // as loose judges
			x |= 1
		}
		if im[r.a] > 0 {
			x |= 2
		}
		if im[r.b] > 0 {
			x |= 4
		}
		h = (h ^ x) * 0x100000001b3 // FNV-1a's prime, on 64-bit words
	}
	return h | 1
}

// loose reports whether the points of run ru of idx are all apart, none
// near (bandnear.go), and carry no impulse, or one that only the sweeps of their own
// pair gave them (pressed). The margin of speculative points grows
// with the step, g dt^2 for parts at rest: at 1/60 s, 2.7 mm, so that
// each of a tower of 1 mm cubes has speculative points with the three
// above it, and its system is dense (measured: 10 cubes, 168 points,
// envelope 3.6 times the budget) and the tower, left to the sweeps, fell.
// Such points press only if a part falls through the gap within the step,
// which the sweeps that follow take care of; the banded solve leaves them
// out of its graph and order, and solves the others.
func (s *Solver) loose(idx []int32, ru run) bool {
	for _, i := range idx[ru.start:ru.end] {
		if s.near(i) || s.nrows[i].lambda > 0 && s.pressed(i) { // bandpivot.go
			return false
		}
	}
	return true
}

// bandOrder orders points idx along the island's contact graph, its loose
// pairs last. It reports whether the envelope work of the normal rows of
// the others (cut, the points the direct solve takes) in that order is
// within the budget (ok), and whether that of the system with friction is
// too (tall), and then writes the order into idx. An island of at most
// MaxBlock points keeps its order, and all its points, unless it is tall:
// its normal rows get the dense solve.
func (s *Solver) bandOrder(idx []int32) (ok, tall bool, cut int32) {
	bs := &s.blk.band
	im := s.sl.im
	nb := len(im)
	bs.node, bs.firstRow, bs.lastRow = growFill(bs.node, nb), grow(bs.firstRow, nb), grow(bs.lastRow, nb)
	// The pairs, as runs of consecutive points on the same slots.
	bs.runs, bs.loose = bs.runs[:0], bs.loose[:0]
	for k := 0; k < len(idx); {
		r := &s.nrows[idx[k]]
		e := k + 1
		for e < len(idx) && s.nrows[idx[e]].a == r.a && s.nrows[idx[e]].b == r.b {
			e++
		}
		if ru := (run{start: int32(k), end: int32(e)}); s.loose(idx, ru) {
			bs.loose = append(bs.loose, ru)
		} else {
			bs.runs = append(bs.runs, ru)
		}
		k = e
	}
	// The island's bodies and their neighbours (lists in adj, by body).
	nodes := int32(0)
	bodies := func(ru run) (int32, int32) {
		r := &s.nrows[idx[ru.start]]
		return r.a, r.b
	}
	for _, ru := range bs.runs {
		a, b := bodies(ru)
		for _, x := range [2]int32{a, b} {
			if im[x] > 0 && bs.node[x] < 0 {
				bs.node[x] = nodes
				nodes++
			}
		}
	}
	bs.deg = grow(bs.deg, int(nodes)+1)
	clear(bs.deg)
	both := func(ru run) (int32, int32, bool) {
		a, b := bodies(ru)
		return bs.node[a], bs.node[b], im[a] > 0 && im[b] > 0
	}
	bs.ground = grow(bs.ground, int(nodes))
	clear(bs.ground)
	for _, ru := range bs.runs {
		u, v, ok := both(ru)
		switch a, _ := bodies(ru); {
		case ok:
			bs.deg[u+1]++
			bs.deg[v+1]++
		case im[a] > 0:
			bs.ground[u] = true
		default:
			bs.ground[v] = true
		}
	}
	for i := int32(1); i <= nodes; i++ {
		bs.deg[i] += bs.deg[i-1] // deg[u]: the offset of u's list
	}
	bs.adj = grow(bs.adj, int(bs.deg[nodes]))
	bs.fill = grow(bs.fill, int(nodes))
	copy(bs.fill, bs.deg[:nodes])
	for _, ru := range bs.runs {
		if u, v, ok := both(ru); ok {
			bs.adj[bs.fill[u]], bs.adj[bs.fill[v]] = v, u
			bs.fill[u]++
			bs.fill[v]++
		}
	}
	s.breadthFirst(nodes)
	// The runs by the places of their bodies; a run on one moving body
	// has both at its place.
	for i := range bs.runs {
		ru := &bs.runs[i]
		a, b := bodies(*ru)
		p, q := int32(-1), int32(-1)
		if im[a] > 0 {
			p = bs.place[bs.node[a]]
		}
		if im[b] > 0 {
			q = bs.place[bs.node[b]]
		}
		if p < 0 || q >= 0 && q < p {
			p, q = q, p
		}
		if p < 0 {
			p = q
		}
		ru.key = [2]int32{p, q}
	}
	slices.SortStableFunc(bs.runs, func(x, y run) int {
		return cmp.Or(cmp.Compare(x.key[0], y.key[0]), cmp.Compare(x.key[1], y.key[1]))
	})
	bs.perm = bs.perm[:0]
	for _, ru := range bs.runs {
		bs.perm = append(bs.perm, idx[ru.start:ru.end]...)
	}
	cut = int32(len(bs.perm))
	for _, ru := range bs.loose {
		bs.perm = append(bs.perm, idx[ru.start:ru.end]...)
	}
	// The system with friction holds the normal rows in the same order
	// with rows between them, so its envelope work is at least theirs: a
	// pile whose normal rows are over the budget with friction is not
	// ordered again with friction rows.
	work := s.envelopeWork(bs.perm[:cut])
	ok = work <= bandBudget(int(cut), s.Settings.MaxBlock)
	tall = cut > maxFrictionBlock && work <= bandBudget(3*int(cut), 3*maxFrictionBlock) && s.frictionBanded(bs.perm[:cut])
	// A tall island's normal rows alone, the solve when its friction
	// slides, cost less than its system with friction.
	ok = ok || tall
	small := int(cut) <= maxFrictionBlock && int(cut) < len(idx) // the dense solve with friction takes the others
	if !(ok && len(idx) > s.Settings.MaxBlock || tall || small) {
		return ok, tall, int32(len(idx))
	}
	copy(idx, bs.perm)
	return ok, tall, cut
}

// frictionBanded reports whether the system with friction of points idx,
// in that order, has an envelope work within its budget (bandBudget).
func (s *Solver) frictionBanded(idx []int32) bool {
	b := &s.blk
	s.systemRows(idx, len(idx), true)
	n := len(b.rows)
	b.ab = grow(b.ab, n)
	for i, r := range b.rows {
		b.ab[i] = [2]int32{r.a, r.b}
	}
	s.bandRanges(n)
	work := int64(0)
	for i, lo := range b.band.lo[:n] {
		w := int64(i) - int64(lo) + 1
		work += w * w
	}
	return work <= bandBudget(n, 3*maxFrictionBlock)
}

// bandBudget bounds the envelope work of a banded system of rows rows: as
// much per row as the dense system of dense rows costs per row, and at
// least all of that. The dense bounds are MaxBlock rows for the normal
// rows alone and 3*maxFrictionBlock with friction, the largest systems the
// direct solve takes otherwise (block.go). Tied to the rows rather than to
// a fixed total, the bound takes a tower of any height (a tower's pairs
// bring their friction rows next to their normal rows, systemRows, about
// 1300 per row, under 200 boxes' worth of the dense solve's 12 thousand)
// and a pyramid of ten rows of boxes side by side (about 3000 per row
// with friction, measured), while a pile's rows couple with thousands of
// others in any order and stay with the sweeps.
func bandBudget(rows, dense int) int64 {
	if dense < 1 {
		return 0
	}
	return max(blockBudget(dense), int64(rows)*(blockBudget(dense)/int64(dense)))
}

// tall reports whether the island of points idx, of more than
// maxFrictionBlock points, is solved with friction by the banded solve,
// before the sweeps as well as after, even where the warm start would do
// for its normal rows: the sweeps leave each face a velocity error within
// Tolerance, and over a tower's height those errors turn it. At 1 ms, a
// tower of 100 boxes of 10 cm solved with friction only after sweeps that
// did not converge leaned faster step after step in between, its top
// 0.7 mm off in 5 s (measured); solved so each step, it stays within
// 1e-11 m.
func (s *Solver) tall(idx []int32) bool {
	b := &s.blk
	return b.band.tall[b.root[idx[0]]]
}

// breadthFirst orders the island's bodies (nodes of the graph in adj) by
// breadth-first search from one with the fewest neighbours among those on
// a fixed body, into bs.queue, with each body's place in bs.place. Loads
// reach a tower from its support: starting there, the faces that begin to
// press during a solve come one after the other at the end of the order,
// where a pivot refactorises little.
func (s *Solver) breadthFirst(nodes int32) {
	bs := &s.blk.band
	bs.place = growFill(bs.place, int(nodes))
	bs.queue = bs.queue[:0]
	degree := func(u int32) int32 { return bs.deg[u+1] - bs.deg[u] }
	better := func(u, v int32) bool {
		if bs.ground[u] != bs.ground[v] {
			return bs.ground[u]
		}
		return degree(u) < degree(v)
	}
	for len(bs.queue) < int(nodes) {
		// A start among the bodies not yet placed (one search suffices
		// for an island, which is connected).
		start := int32(-1)
		for u := int32(0); u < nodes; u++ {
			if bs.place[u] < 0 && (start < 0 || better(u, start)) {
				start = u
			}
		}
		bs.place[start] = int32(len(bs.queue))
		bs.queue = append(bs.queue, start)
		for h := len(bs.queue) - 1; h < len(bs.queue); h++ {
			u := bs.queue[h]
			for _, v := range bs.adj[bs.deg[u]:bs.deg[u+1]] {
				if bs.place[v] < 0 {
					bs.place[v] = int32(len(bs.queue))
					bs.queue = append(bs.queue, v)
				}
			}
		}
	}
}

// envelopeWork is the envelope work of the normal rows of points idx in
// that order: each row's width from the first row sharing a moving body
// with it.
func (s *Solver) envelopeWork(idx []int32) int64 {
	bs := &s.blk.band
	im := s.sl.im
	for _, i := range idx {
		r := &s.nrows[i]
		bs.firstRow[r.a], bs.firstRow[r.b] = -1, -1
	}
	work := int64(0)
	for k, i := range idx {
		r := &s.nrows[i]
		lo := int32(k)
		for _, x := range [2]int32{r.a, r.b} {
			if im[x] > 0 {
				if bs.firstRow[x] < 0 {
					bs.firstRow[x] = int32(k)
				}
				lo = min(lo, bs.firstRow[x])
			}
		}
		w := int64(int32(k) - lo + 1)
		work += w * w
	}
	return work
}

// bandRanges sets bs.lo and bs.hi, the first and last row of the system
// (b.ab, n rows) that shares a moving body with each row: the only ones
// with a nonzero coupling.
func (s *Solver) bandRanges(n int) {
	b := &s.blk
	bs := &b.band
	im := s.sl.im
	bs.lo, bs.hi = grow(bs.lo, n), grow(bs.hi, n)
	for _, ab := range b.ab[:n] {
		bs.firstRow[ab[0]], bs.firstRow[ab[1]] = -1, -1
	}
	for i, ab := range b.ab[:n] {
		for _, x := range ab {
			if im[x] > 0 {
				if bs.firstRow[x] < 0 {
					bs.firstRow[x] = int32(i)
				}
				bs.lastRow[x] = int32(i)
			}
		}
	}
	for i, ab := range b.ab[:n] {
		lo, hi := int32(i), int32(i)
		for _, x := range ab {
			if im[x] > 0 {
				lo, hi = min(lo, bs.firstRow[x]), max(hi, bs.lastRow[x])
			}
		}
		bs.lo[i], bs.hi[i] = lo, hi
	}
}

// growFill is grow with every entry set to -1.
func growFill(s []int32, n int) []int32 {
	s = grow(s, n)
	for i := range s {
		s[i] = -1
	}
	return s
}

// refactorBand brings the factor of (A + shift I) on the active rows up to
// date with b.active, the rows kept in index order: the factor's rows
// before the first row whose state changed stay, the active rows from
// there on are appended again. It reports false if the matrix is not
// positive definite or the solve's factor work exceeds limit.
func (b *blockState) refactorBand(n int, shift float64, limit int64) bool {
	p := n
	for _, i := range b.sub {
		if !b.active[i] {
			p = int(i)
			break
		}
	}
	for i := 0; i < p; i++ {
		if b.active[i] && b.pos[i] < 0 {
			p = i
			break
		}
	}
	m := len(b.sub)
	for m > 0 && int(b.sub[m-1]) >= p {
		m--
		b.pos[b.sub[m]] = -1
	}
	b.sub = b.sub[:m]
	bs := &b.band
	for i := p; i < n; i++ {
		if !b.active[i] {
			continue
		}
		if !b.appendBandRow(i, shift, b.bandFrom(i)) { // bandstore.go
			return false
		}
		k := len(b.sub) - 1
		w := int64(k - int(b.first[k]) + 1)
		if bs.work += w * w; bs.work > limit {
			return false
		}
	}
	return true
}

// reused is an empty band state with bs's buffers.
func (bs *bandState) reused() bandState {
	return bandState{
		ok: scratch.Reuse(bs.ok), tall: scratch.Reuse(bs.tall), cut: scratch.Reuse(bs.cut), loose: scratch.Reuse(bs.loose), runs: scratch.Reuse(bs.runs), node: scratch.Reuse(bs.node),
		firstRow: scratch.Reuse(bs.firstRow), lastRow: scratch.Reuse(bs.lastRow),
		deg: scratch.Reuse(bs.deg), adj: scratch.Reuse(bs.adj), fill: scratch.Reuse(bs.fill),
		queue: scratch.Reuse(bs.queue), place: scratch.Reuse(bs.place), ground: scratch.Reuse(bs.ground), perm: scratch.Reuse(bs.perm),
		lo: scratch.Reuse(bs.lo), hi: scratch.Reuse(bs.hi), flip: scratch.Reuse(bs.flip),
		aoff: scratch.Reuse(bs.aoff), lbase: scratch.Reuse(bs.lbase),
		cycle: setTrail{seen: scratch.Reuse(bs.cycle.seen)}, held: scratch.Reuse(bs.held), pressing: scratch.Reuse(bs.pressing),
	}
}

// maxBandPivots bounds the pivots of a banded solve. A tower set down
// without warm start would press one more face per pivot, and starts from
// all its touching points instead (touches). The solve's work bound
// (bandPivotBudgets) limits its cost: a pivot refactorises only the
// factor's tail. More pivots let a pyramid of boxes side by side at a
// coarse step end on a solution that pushes the boxes apart (measured).
const maxBandPivots = 4 * maxPivots

// bandLimit is the factor work that the banded solve of a system of n
// rows, with or without friction, may spend over all its pivots:
// bandPivotBudgets times the budget of its envelope.
func (s *Solver) bandLimit(n int, fric bool) int64 {
	if fric {
		return bandPivotBudgets * bandBudget(n, 3*maxFrictionBlock)
	}
	return bandPivotBudgets * bandBudget(n, s.Settings.MaxBlock)
}

// touches reports whether point i touches, within Slop or across a gap
// near enough (near, bandnear.go), the start of a banded solve's active
// set with the points that pressed last step. A tower set down with gaps
// has no point within the slop at its first step; started from its near
// points, its solve lands every face in one or two pivots (measured: 20
// boxes 0.47 mm apart at 1/30 s), where starting from none it took in a
// face per pivot and ran out of them.
// A tower set down without warm start otherwise takes in one face per
// pivot, as the boxes above a face that does not press yet fall together
// (measured: 200 boxes of 10 cm at 1/60 s started with 44 faces pressing
// after the sweeps of their pairs, and the solve reached its pivot bound
// at 140 and left the tower to the sweeps, which let it fall). A touching
// point that need not press leaves the set at the first pivot.
func (s *Solver) touches(i int32) bool {
	return s.near(i)
}

// bandStart reports whether point i starts in the active set of a
// banded solve, where pressed is the start of the dense solve (block.go:
// it pressed after the warm start, or in the position pass after the
// velocity solve). With friction, it starts where it touches (touches).
// For the normal rows alone in the velocity solve: where this step's
// banded solve of its island before the sweeps had it pressing, or else
// where it touches and pressed or is new (no warm start). In the position
// pass: where last step's banded position pass had it pressing, or, if
// it is new (no memory), where pressed.
//
// The normal rows alone have one solution whatever the start (A plus the
// shift is positive definite, so a P-matrix: R. W. Cottle, J.-S. Pang and
// R. E. Stone, "The Linear Complementarity Problem", Academic Press 1992,
// section 3.3), so the start decides only how many pivots find it (and,
// within the pivots' tolerance, which of the near-solutions they stop at).
// In a pile in motion many touching points do not press: in the pour of
// 4000 parts into a bin, 40 percent of an island's 6000 points left the
// set of touching points at the first pivot; after the sweeps, whose
// friction moves the normal impulses little, the solve before them is
// nearer. The position pass's targets change little from step to step,
// and last step's pass is nearer its solution than the velocity solve's
// pressing points, about a sixth of which changed at its first pivot:
// started from last step's, the banded solves of that pour did 29
// percent less factor work (measured, December 2026). A tower set down
// without warm start still starts with every touching point pressing.
func (s *Solver) bandStart(i int32, pressed, fric, pseudo bool) bool {
	switch {
	case fric:
		return s.touches(i)
	case pseudo:
		// Solve has stored this step's memory (store): last step's is
		// in curPts until the next store.
		if m := s.match[i]; m >= 0 {
			return s.curPts[m].pushed
		}
		return pressed
	}
	if p := s.blk.band.pressing[i]; p != 0 {
		return p > 0
	}
	return s.touches(i) && (pressed || !s.pts[i].found)
}

// notePressing records, per point of the banded solve of points idx just
// applied (n rows), whether it pressed: for the velocity solve's later
// banded solve of this step, and for the position pass in the point's
// memory (prevPts, this step's once stored) for next step's (bandStart).
func (s *Solver) notePressing(idx []int32, n int, pseudo bool) {
	b := &s.blk
	for i := 0; i < n; i++ {
		if b.kind[i] != normalRow {
			continue
		}
		if pseudo {
			s.prevPts[idx[b.of[i]]].pushed = b.active[i]
			continue
		}
		p := int8(-1)
		if b.active[i] {
			p = 1
		}
		b.band.pressing[idx[b.of[i]]] = p
	}
}
