package contact

import "math"

// Direct solve of the normal rows of small islands.
//
// Projected Gauss-Seidel passes a load from one body to the next a fraction
// of the light body's share per sweep: a 1 kg block on a 1 g block needs
// thousands of sweeps, a tower of a dozen boxes hundreds, and until then
// the lower bodies sink and the top rises. For an island of at most
// MaxBlock points (the bodies joined by contacts, no joint rows) the normal
// impulses are instead found exactly: the linear complementarity problem
//
//	v = v0 + A lambda,  lambda >= 0,  v >= target,  lambda (v - target) = 0
//
// with the Delassus matrix A = J M^-1 J^T of the normal rows, by principal
// pivoting on the set of pressing points (K. G. Murty, "Linear
// Complementarity, Linear and Nonlinear Programming", Heldermann 1988,
// chapter 4; for contact, D. Baraff, "Fast contact force computation for
// nonpenetrating rigid bodies", SIGGRAPH 1994). The set starts from the
// points that pressed last step, so a resting island needs one Cholesky
// factorisation. Four corners of a face constrain only three motions, so A
// is singular; a diagonal shift of blockShift times its largest entry picks
// the smallest impulses among the equal solutions (the even spread of a
// load over a face).
//
// Friction stays with the sweeps, which see the exact normal impulses.

// blockShift regularises A: 1e-9 of its largest diagonal entry changes an
// impulse by that fraction of the lightest body's response, far below the
// solve's other errors, and keeps the Cholesky factor of a singular A
// finite.
const blockShift = 1e-9

// blockConsistent: a solution whose shift term (shift times the impulse) is
// above this fraction of the largest velocity error it removes belongs to
// a system without a solution. A consistent one keeps the term near
// blockShift times the ratio of heaviest to lightest response, 1e-6 for a
// mass ratio of 1000.
const blockConsistent = 1e-3

// maxPivots bounds the factorisations of one island's solve. A resting
// island starts from last step's pressing points and needs one or two, a
// tower of a dozen boxes at 1/60 s up to about twenty; an island whose
// contacts keep opening and closing (parts tumbling in a bin) is in motion,
// where the sweeps serve as well, and is left to them rather than cost a
// factorisation per change (measured: 25 times the cost of a pile of 100
// tumbling parts without the bound).
const maxPivots = 24

// blockState is the scratch space of the block solve.
type blockState struct {
	parent []int32 // union-find over the solver's body slots
	size   []int32 // points per island root; -1 for an island with joint rows
	start  []int32 // first entry of each root's points in order
	order  []int32 // points grouped by island
	a, l   []float64
	v0, x  []float64
	lam    []float64 // the rows' impulses when the solve starts
	tgt    []float64 // the rows' targets
	active []bool
	free   []freeRow  // friction rows released from the system (blockrows.go)
	sub    []int32    // the active rows in the order of the factor b.l (cholesky.go)
	first  []int32    // where each row of the factor may start to be nonzero (cholesky.go)
	pos    []int32    // each row's place in b.sub, -1 if inactive
	col    []float64  // scratch column of a row deletion
	y      []float64  // forward solution, in factor order
	z      []float64  // scratch of the back substitution
	rows   []*crow    // the rows of the system: normal rows (in idx order), then friction rows
	ab     [][2]int32 // the body slots of each row of the system
	kind   []rowKind  // what each row of the system is
	of     []int32    // a tangent row's normal row; a patch row's first normal row
	cnt    []int32    // a patch row's number of normal rows
	root   []int32    // island root of each point
	excess []float64  // per island root: the last sweep's largest excess (velocities)
	band   bandState  // large islands with a banded system (band.go)
	held   []float64  // a solution that holds while its released rows are back (blockstick.go)
	hfree  []freeRow  // its released rows
}

func (b *blockState) find(i int32) int32 {
	for b.parent[i] != i {
		b.parent[i] = b.parent[b.parent[i]]
		i = b.parent[i]
	}
	return i
}

// islands groups the points by island into b.order and reports the number
// of points in each island root in b.size (-1 where joint rows take part).
func (s *Solver) islands(points []Point, rows []Row) {
	if !s.islandOne(points, rows) { // one moving body (islandone.go)
		s.unionIslands(points, rows)
	}
	s.blk.band.pressing = grow(s.blk.band.pressing, len(points))
	clear(s.blk.band.pressing)
}

// unionIslands is islands for any step: a union-find over the body slots.
func (s *Solver) unionIslands(points []Point, rows []Row) {
	b := &s.blk
	im := s.sl.im
	nb := len(im)
	b.parent, b.size, b.start = grow(b.parent, nb), grow(b.size, nb), grow(b.start, nb)
	for i := range b.parent {
		b.parent[i], b.size[i] = int32(i), 0
	}
	dyn := func(i int32) bool { return im[i] > 0 }
	join := func(x, y int32) {
		if dyn(x) && dyn(y) {
			if rx, ry := b.find(x), b.find(y); rx != ry {
				b.parent[max(rx, ry)] = min(rx, ry)
			}
		}
	}
	for i := range points {
		join(s.nrows[i].a, s.nrows[i].b)
	}
	for j := range rows {
		join(s.jrows[j].a, s.jrows[j].b)
	}
	b.root = grow(b.root, len(points))
	b.excess = grow(b.excess, nb)
	for i := range points {
		r := s.pointRoot(i)
		b.root[i] = r
		b.size[r]++
	}
	for j := range rows {
		for _, x := range [2]int32{s.jrows[j].a, s.jrows[j].b} {
			if dyn(x) {
				b.size[b.find(x)] = math.MinInt32 / 2
			}
		}
	}
	sum := int32(0)
	for r := range b.start {
		b.start[r] = sum
		sum += max(b.size[r], 0)
	}
	b.order = grow(b.order, int(sum))
	for i := range points {
		r := b.root[i]
		if b.size[r] > 0 {
			b.order[b.start[r]] = int32(i)
			b.start[r]++
		}
	}
	for r := range b.start {
		b.start[r] -= max(b.size[r], 0)
	}
	s.orderBands() // band.go
}

// pointRoot is the island root of point i: that of its dynamic body.
func (s *Solver) pointRoot(i int) int32 {
	r := &s.nrows[i]
	if s.sl.im[r.a] > 0 {
		return s.blk.find(r.a)
	}
	return s.blk.find(r.b)
}

// blockSolve solves the normal rows of every island with 2 to MaxBlock
// points exactly, on the real velocities (pseudo false, targets the rows')
// or on the pseudo-velocities of the position pass (pseudo true, targets
// pTarget, impulses pN).
//
// After sweeps that did not converge (final), friction joins the system
// of every island small enough (maxFrictionBlock); before them only where
// masses differ (blockFrictionRatio) or loose points join as normal rows
// (denseloose.go). A tall island (band.go) is solved with friction before
// and after the sweeps.
//
// After the sweeps the solve is spent only on islands whose last sweep had
// not converged, in the position pass only on islands with a penetration
// to remove.
func (s *Solver) blockSolve(pseudo, final bool) {
	b := &s.blk
	for r := range b.size {
		n := int(b.size[r])
		if n > s.Settings.MaxBlock && !b.band.ok[r] {
			continue
		}
		nf := n // the points whose friction rows may join the system
		if n > maxFrictionBlock {
			nf = int(b.band.cut[r]) // its loose points last (band.go)
			if n > s.Settings.MaxBlock || b.band.tall[r] {
				n = nf // left to the sweeps; else normal rows (denseloose.go)
			}
			if !pseudo && !final && nf > maxFrictionBlock {
				s.dropLoose(b.order[b.start[r]:int(b.start[r])+nf], b.order[int(b.start[r])+nf:b.start[r]+b.size[r]]) // banded: bandloose.go
			}
		}
		if n < 2 {
			continue
		}
		idx := b.order[b.start[r] : int(b.start[r])+n]
		switch {
		case pseudo && !s.penetrates(idx):
			continue
		case final && b.excess[r] <= s.Settings.Tolerance:
			continue
		}
		if !s.solveIsland(idx, nf, pseudo, final) && final {
			s.settlePatches(idx) // twist.go
		}
	}
}

// warmSolved reports whether the warm start already solves the normal rows
// of points idx to the precision the solve works to: every pressing row's
// velocity within Tolerance of its target, or within warmExact of the
// velocity change of its impulse (the shift's own share, blockShift, lets
// the direct solve be off by as much), and no free row approaching faster
// than Tolerance (the direct solve's own test for a row to enter). A
// resting island whose load has not changed since last step passes.
//
// Tolerance is where the sweeps that follow stop, and their first sweep
// still moves each row by its whole error: a warm start within it leaves
// them the same work the factorisation would have left, and a load that
// changes by more (a new contact, a part that tips) fails the test and is
// solved directly again, so a row's error cannot build up from step to
// step. A point that slides keeps the exact test (slides).
func (s *Solver) warmSolved(idx []int32) bool {
	vel, tol := s.sl.vel, s.Settings.Tolerance
	for _, i := range idx {
		r := &s.nrows[i]
		e := r.cdot(vel) - r.target
		exact := warmExact * r.lambda * r.k
		if !s.slides(i) {
			exact = max(exact, tol)
		}
		if e < -tol || r.lambda > 0 && math.Abs(e) > exact {
			return false
		}
	}
	return true
}

// slides reports whether point i's friction is, or may be, mu times its
// normal impulse this step: its patch slides (classifyPatches), or the
// point uses the kinetic coefficient, slid or slipped last step. Such a
// point's friction takes every error of its normal impulse, and a slide's
// deceleration is then off by it step after step, so its warm start must
// be exact to count as solved.
func (s *Solver) slides(i int32) bool {
	ps := &s.pts[i]
	if ps.patch > 0 {
		return s.patches.list[ps.patch-1].sliding
	}
	return ps.prevSliding || ps.prevSlips > 0 || ps.mu != ps.muS
}

// warmExact is the relative error in a pressing row's velocity that the
// warm start may keep in place of the direct solve: blockShift, the
// precision of the solve itself.
const warmExact = blockShift

// penetrates reports whether the position pass has work on points idx.
func (s *Solver) penetrates(idx []int32) bool {
	for _, i := range idx {
		if s.pts[i].pTarget > 0 {
			return true
		}
	}
	return false
}

// solveIsland solves the island of points idx. With friction (real
// velocities only) the tangent rows of pressing points join the system as
// sticking rows; a contact whose friction impulse would leave its cone
// is released from the system (release, blockrows.go), and the solution
// is taken only if the released contacts do not slip, else the normal
// rows are solved alone.
//
// A point of a contact patch (twist.go) has no friction rows of its own:
// the patch's three rows (two tangents and the twist) join the system in
// their place, and its sticking solution is taken only if it lies inside
// the patch's limit surface, so the direct solve and the sweeps bound the
// same friction the same way.
//
// Before the sweeps, a normal-rows-only solve is skipped where the warm
// start already solves them (warmSolved). A tall island (a tower, band.go)
// is solved with friction every time, but after the sweeps only while no
// impact reaches it (struck), and never where its warm start already
// solves that system or a point slides faster than its friction can stop
// (tallpolicy.go). It reports whether the friction rows
// were solved too.
func (s *Solver) solveIsland(idx []int32, nf int, pseudo, final bool) bool {
	small := nf <= maxFrictionBlock
	tall := !small && s.tall(idx)
	asTall := tall || denseLoose(idx, nf) // denseloose.go
	if !pseudo && (small && (final || s.massRatio(idx) > blockFrictionRatio || asTall) || tall && !(final && s.struck(idx))) {
		if asTall && !final && s.warmSticks(idx, nf) { // tallpolicy.go
			return true
		}
		if !(asTall && s.outrunsFriction(idx[:nf])) && s.solveRows(idx, nf, false, true) {
			return true
		}
	} else if !pseudo && !final && s.warmSolved(idx) {
		return false
	}
	s.solveRows(idx, nf, pseudo, false)
	return false
}

// struck reports whether an impact reaches any of points idx this step.
// The banded solve with friction of a large island (band.go) is for
// structures at rest, whose loads the sweeps pass on too slowly (towers,
// pyramids). An island that something strikes still gets it before the
// sweeps, which then start from its loads (a part landing on a resting
// pile must not make the pile sag), but not again after them: a moving
// pile's contacts open and close through the step, and factorising a
// thousand rows with friction twice a step, to fail half the time, made a
// step of 1000 parts poured into a bin 2.1 times as costly (measured).
func (s *Solver) struck(idx []int32) bool {
	for _, i := range idx {
		if s.pts[i].struck {
			return true
		}
	}
	return false
}

// massRatio is the ratio of the largest to the smallest inverse mass of the
// dynamic bodies of an island.
func (s *Solver) massRatio(idx []int32) float64 {
	if len(s.sl.im) == 2 {
		return 1 // one moving body (slot 0 holds the fixed ones): no ratio above 1
	}
	lo, hi := math.Inf(1), 0.0
	for _, i := range idx {
		r := &s.nrows[i]
		if m := s.sl.im[r.a]; m > 0 {
			lo, hi = min(lo, m), max(hi, m)
		}
		if m := s.sl.im[r.b]; m > 0 {
			lo, hi = min(lo, m), max(hi, m)
		}
	}
	return hi / lo
}

// blockFrictionRatio: islands whose masses differ by more than this factor
// also get their friction from the direct solve. The sweeps pass friction
// between a heavy and a light body as slowly as normal loads, and a light
// foot under a heavy carton is pushed sideways until it flies out; for
// near-equal masses they converge in a few sweeps at a fraction of the
// cost of a system three times as large.
const blockFrictionRatio = 20

// maxFrictionBlock bounds the points of an island solved with friction
// by the dense solve: 64 points (192 rows) is a tower of 16 boxes or a
// carton on four feet; its factorisation costs about 1.2 million
// operations, a millisecond, spent only where the sweeps did not converge
// or masses differ. Larger islands get friction only where their system
// is banded (tall, band.go).
const maxFrictionBlock = 64

// solveRows solves the rows of points idx, the normal rows or with fric all
// three rows of each point, and applies the impulses unless the system has
// no solution or, with fric, a friction impulse would leave its cone. It
// reports whether it applied them.
func (s *Solver) solveRows(idx []int32, nf int, pseudo, fric bool) bool {
	b := &s.blk
	vel := s.sl.vel
	if pseudo {
		vel = s.sl.ps
	}
	band := len(idx) > s.Settings.MaxBlock || fric && nf > maxFrictionBlock // a tall island (band.go)
	if fric {
		s.systemRows(idx, nf, band)
	} else {
		s.systemRows(idx, 0, band)
	}
	n := len(b.rows)
	b.v0, b.x = grow(b.v0, n), grow(b.x, n)
	b.active = grow(b.active, n)
	shift := 0.0
	// Rows couple only through a shared body slot: the others' entries are
	// the zero coupling returns for them, without reading the rows. An
	// island of more than MaxBlock points is banded (band.go): only each
	// row's band [lo, hi] is written and read.
	b.ab = grow(b.ab, n)
	for i, r := range b.rows {
		b.ab[i] = [2]int32{r.a, r.b}
	}
	if band {
		s.bandRanges(n)
		shift = b.bandMatrix(n) // bandstore.go
	} else {
		b.a = grow(b.a, n*n)
	}
	for i := 0; i < n && !band; i++ {
		ri, ai, bi := b.rows[i], b.ab[i][0], b.ab[i][1]
		for j, abj := range b.ab[:i+1] {
			c := 0.0
			if abj[0] == ai || abj[0] == bi || abj[1] == ai || abj[1] == bi {
				c = coupling(b.rows[j], ri)
			}
			b.a[i*n+j], b.a[j*n+i] = c, c
		}
		shift = max(shift, b.a[i*n+i])
	}
	shift *= blockShift
	lambda := func(i int) *float64 {
		if pseudo {
			return &s.pts[idx[i]].pN
		}
		return &b.rows[i].lambda
	}
	// The impulses and targets, read once.
	b.lam, b.tgt = grow(b.lam, n), grow(b.tgt, n)
	for i := 0; i < n; i++ {
		b.lam[i] = *lambda(i)
		b.tgt[i] = b.rows[i].target
		if pseudo {
			b.tgt[i] = s.pts[idx[i]].pTarget
		}
	}
	// v0: each row's velocity without its island's impulses.
	for i := 0; i < n; i++ {
		v := b.rows[i].cdot(vel)
		lo, row := 0, []float64(nil)
		if band {
			lo = int(b.band.lo[i])
			row = b.bandRow(i)[lo : b.band.hi[i]+1] // bandstore.go
		} else {
			row = b.a[i*n : i*n+n]
		}
		for j, a := range row {
			v -= a * b.lam[lo+j]
		}
		b.v0[i] = v
	}
	// The active set starts from the points that press: in the velocity
	// solve those of the warm start (last step's, matched by key), in the
	// position pass, whose impulses start at zero, those of the velocity
	// solve just done. A pile's points mostly press in both, so the pass
	// starts next to its solution instead of adding them one pivot each.
	// A banded system's velocity solve starts from the touching points
	// instead (touches, band.go), whatever their impulse: a point apart
	// beyond the slop that the sweeps of its pair alone made press (a
	// 1 mm cube's speculative point on the floor two rows below, at
	// 1/60 s) asks for a velocity the touching points forbid, impulses of
	// the order of the difference over the shift (blockShift) came out,
	// and the pivots went round until their bound and left a pyramid of
	// 1 mm cubes to the sweeps, which let it fall (measured). Such a point
	// enters at the first pivot if it must press. Without friction, only
	// the touching points that pressed last step or are new start so, or
	// those this step's banded solve before the sweeps left pressing; a
	// banded position pass starts from last step's (bandStart). A dense
	// system's loose points start from whether they touch (denseloose.go).
	for i := 0; i < n; i++ {
		if b.kind[i] == normalRow {
			b.active[i] = b.lam[i] > 0 || pseudo && b.rows[i].lambda > 0
			if band {
				b.active[i] = s.bandStart(idx[b.of[i]], b.active[i], fric, pseudo) // band.go
			} else if int(b.of[i]) >= nf && !pseudo { // denseloose.go
				b.active[i] = s.touches(idx[b.of[i]])
			}
		}
	}
	b.free = grow(b.free, n)
	clear(b.free)
	b.follow()
	if band {
		b.resetBandFactor(n)
	} else {
		b.resetFactor(n)
	}
	b.band.work = 0
	for round := 0; ; round++ {
		if !s.pivotRows(n, band, fric, shift) {
			return false // contacts still opening and closing: the sweeps' business
		}
		// A consistent system is solved to within the shift's share of the
		// impulses; one without a solution (a body squeezed between a driven
		// and a fixed one) gives impulses of the order of 1/shift. Leave those
		// to the sweeps and the world's checks.
		rhs, big := 0.0, 0.0
		for i := 0; i < n; i++ {
			rhs = max(rhs, math.Abs(b.tgt[i]-b.v0[i]))
			big = max(big, shift*math.Abs(b.x[i]))
		}
		if big > blockConsistent*rhs {
			return false
		}
		if band || denseLoose(idx, nf) || big > refineAbove*s.Settings.Tolerance {
			b.refine(n, band) // refine.go
		}
		if !fric {
			break
		}
		// Friction outside its bound: release it (blockrows.go) and solve
		// the others again; the sweeps take the released friction.
		if k := s.release(idx); k == 0 {
			if !s.holds(n, band) { // blockrows.go
				return false // a released contact slips: the sweeps' business
			}
			if band || denseLoose(idx, nf) {
				s.restick(idx, n, shift, band) // blockstick.go
			}
			break
		} else if round == maxReleases {
			return false // some contacts slide: the sweeps' business
		}
		b.follow()
	}
	for i := 0; i < n; i++ {
		x := b.x[i]
		if b.kind[i] == normalRow {
			x = max(x, 0)
		}
		l := lambda(i)
		d := x - *l
		if d == 0 {
			continue
		}
		*l += d
		b.rows[i].apply(vel, d)
	}
	if band {
		s.notePressing(idx, n, pseudo) // band.go
	}
	return true
}

// pivotRows finds the active set of the system of n rows and leaves its
// solution in b.x: by block principal pivoting if band (bandpivot.go),
// else one or a few rows a pivot. It reports false if it found none
// within its bounds or the system is not positive definite.
func (s *Solver) pivotRows(n int, band, fric bool, shift float64) bool {
	b := &s.blk
	tol := s.Settings.Tolerance + 1e-12
	if band {
		return b.pivotBand(n, shift, tol, s.bandLimit(n, fric)) // bandpivot.go
	}
	for it := 0; it < maxPivots; it++ {
		// Each pivot changes the active set by a row or a few: update the
		// factor rather than refactorise (cholesky.go).
		if !b.refactor(n, shift) {
			// Not positive definite: leave the impulses to the sweeps.
			return false
		}
		b.solveFactor(n, false)
		worst, wv := -1, 0.0
		for i := 0; i < n; i++ {
			if b.kind[i] == normalRow && b.active[i] && b.x[i] < 0 {
				b.active[i] = false
				worst = i
			}
		}
		if worst >= 0 {
			b.follow()
			continue
		}
		for i := 0; i < n; i++ {
			if b.active[i] || b.kind[i] != normalRow {
				continue
			}
			v := b.v0[i] - b.tgt[i]
			for j, a := range b.a[i*n : i*n+n] {
				v += a * b.x[j]
			}
			if v < -tol && v < wv {
				worst, wv = i, v
			}
		}
		if worst < 0 {
			return true
		}
		b.active[worst] = true
		b.follow()
	}
	return false
}
