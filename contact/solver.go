package contact

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"clatter/shapes"
)

type vec = shapes.Vec3

// impactRelTol ends the Gauss-Seidel sweeps over one pair's points in the
// impact phase once no row changes a velocity by more than this fraction of
// the pair's impact speed: far below any measurable bounce height.
const impactRelTol = 1e-12

// loadFraction: a point carried load last step if its normal impulse
// changed the approach speed by more than this fraction of BounceThreshold.
// A part resting at a step of 0.1 ms presses with g dt = 1e-3 m/s, ten
// times this at the default threshold; rounding is twelve orders below.
const loadFraction = 1e-3

// pstate is the solver's per-point state beside the point's three rows.
//
// The fields a velocity sweep reads and writes (solvePoint) come first, so
// that they mostly share one cache line.
type pstate struct {
	mu                  float64 // this step's friction coefficient
	inv11, inv12, inv22 float64 // inverse of the 2x2 friction block, zero if singular
	miso                float64 // 1 / largest eigenvalue of the friction block
	sat                 bool
	found               bool
	patch               int32 // 1 + index of the patch that carries its friction, 0 if none (twist.go)
	muS, muK, e         float64
	sep                 float64
	slop                float64 // the point's slop (slop.go)
	turn                float64 // normal acceleration of the point from its bodies' spins (bounce.go)
	prevSliding         bool    // last step used the kinetic coefficient
	prevSlips           uint8   // consecutive steps that ended at the cone's limit and slipping
	active              bool    // takes part in the current impact processing
	iTarget             float64 // normal target velocity of the current impact processing
	iN, iT1, iT2        float64 // impulses of the current impact processing
	pending             float64 // approach speed of an impact deferred from the last step, 0 if none
	held                float64 // energy its stops have taken so far, J (held.go)
	stop                float64 // normal impulse its stops have given so far, N s (held.go)
	aStart              float64 // a deferred point's approach at its stop (held.go)
	aNow, aArr          float64 // an arriving deferred impact's approach now and on arrival (held.go)
	arrived             bool    // a deferred impact arrives at it in this pass
	prevN               float64 // last step's normal impulse of the velocity solve (the load it carried)
	deferred            float64 // approach speed of an impact deferred to the next step, 0 if none
	struck              bool    // an impact reaches it this step, now or deferred (impacts)
	tau                 float64 // how far into the step it lands from within its slop, s; 0 if not (landing.go)
	pN, pTarget, pLo    float64 // position pass
	reach               float64 // its moving bodies' mean depth along the normal if it is a support, else 0, m (bandnear.go)
}

// jpos is a joint row's state in the position pass.
type jpos struct {
	on             bool
	target, lo, hi float64
	lambda         float64
}

type warmPoint struct {
	key      uint64
	normal   float64
	friction vec // world vector, so that a new tangent basis can take it over
	sliding  bool
	slips    uint8
	pushed   bool    // the position pass's banded solve had it pressing (bandStart)
	pending  float64 // approach speed of a deferred impact
	held     float64 // energy its stops have taken, J (held.go)
	stop     float64 // normal impulse its stops have given, N s (held.go)
	a, b     int32   // bodies, for matching by position (match.go)
	pos      vec     // world contact point
}

type warmRow struct {
	key     uint64
	impulse float64
}

// Solver holds the rows, the warm-start memory and the scratch space of the
// contact solve. Reuse one Solver per world: it allocates only while its
// slices grow. A Solver is not safe for concurrent use.
type Solver struct {
	Settings Settings
	passed   Settings // the last Settings that passed Validate (valid.go); the zero value does

	sl slots // the compact body arrays (bodies.go)
	// The rows of point i: its normal row nrows[i] and its tangent rows
	// trows[2i], trows[2i+1] (zero for a point of a patch). The sweeps read
	// the normal rows of every point but the tangent rows of the points
	// without a patch only: kept apart, a patch's points leave the zero rows
	// out of the stream of memory the sweeps read.
	nrows  []crow
	trows  []crow
	jrows  []jrow // the extra rows
	pts    []pstate
	jp     []jpos
	groups []int32 // start of each run of points of one pair, then len(points)

	// The memory of last step's points, in the order of those points
	// (then the entries added by Recall), and its index by key: prevKeys
	// lists the keys sorted, each with its entry in prevPts. Kept in point
	// order, the memory is written and read (warm start, patches) in
	// nearly the order of the points, which change little from step to
	// step; kept in key order, each of those accesses would be a jump.
	prevPts, curPts   []warmPoint
	prevKeys          []keyIndex
	prevRows, curRows []warmRow
	prevDt            float64

	// This step's points in key order (sortKeys): byKey lists them sorted,
	// match[i] is point i's entry in prevPts (-1 if none).
	byKey, keyTmp []keyIndex
	match         []int32
	owner         []int32 // scratch of sortKeysAligned (align.go), empty between uses

	// Matching by position (match.go): prevPair lists the runs of prevPts
	// by body pair, claimed marks the entries this step's points have
	// taken.
	prevPair, curPair []pairIndex
	claimed           []bool

	blk blockState // block.go

	patches patchState // patch friction (twist.go)

	live liveState // the rows still moving (live.go)

	heldSums [][3]float64 // the patches' impact impulses before a bounded pair impact (held.go)

	chain []int32 // per slot, the pair of its touching unloaded contacts (chain.go)
}

// NewSolver returns a solver with the given settings and no warm-start memory.
func NewSolver(s Settings) *Solver { return &Solver{Settings: s} }

// Reset forgets the impulses remembered from earlier steps.
func (s *Solver) Reset() {
	s.prevPts, s.prevKeys, s.prevRows, s.prevDt = s.prevPts[:0], s.prevKeys[:0], s.prevRows[:0], 0
	s.prevPair = s.prevPair[:0]
}

// Solve runs one step of the contact solve on bodies whose velocities already
// include this step's gravity and applied forces:
//
//  1. rows from the points (normal and two tangents each) and the extra rows;
//     last step's points matched by Key, or by position within the pair
//     when a feature id changed (match.go);
//  2. on the velocities without this step's forces (V-DV, W-DW): sticking
//     or sliding per point, choosing the static or kinetic coefficient, and
//     impacts: Newton restitution pair by pair in sequence (Guendelman,
//     Bridson and Fedkiw 2003), where a point that carried load last step
//     is never an impact;
//  3. warm start: last step's impulses scaled by WarmStart and the ratio of
//     step sizes (Catto 2005);
//  4. velocity iterations: projected Gauss-Seidel with accumulated clamping
//     (Catto 2005), friction in the disk |f_t| <= mu f_n, until converged
//     (see Settings.Convergence) or VelocityIterations;
//  5. the position pass, which writes the pseudo-velocities Vp, Wp.
//
// It writes V, W, Vp, Wp of the bodies, the output fields of points and
// Impulse of rows. A bad index or a non-finite value is an error, and then
// nothing is changed.
func (s *Solver) Solve(dt float64, bodies []Body, points []Point, rows []Row) (Report, error) {
	var rep Report
	if err := s.validSettings(); err != nil {
		return rep, err
	}
	if !(dt > 0) || math.IsInf(dt, 1) {
		return rep, fmt.Errorf("contact: step %v s: must be a finite time > 0", dt)
	}
	if err := check(bodies, points, rows); err != nil {
		return rep, err
	}
	s.sl.gather(bodies, points, rows)
	s.prepare(dt, bodies, points, rows)
	s.matchPoints(points)
	s.preparePatches(bodies, points) // twist.go
	// Sticking or sliding, and the impacts, are judged on the motion the
	// bodies arrived with: this step's forces are taken out meanwhile.
	s.sl.addForces(-1)
	s.classify(points)
	s.classifyPatches(points) // twist.go
	s.impacts(dt, bodies, points, &rep)
	s.sl.addForces(1)
	s.noteStops() // held.go
	s.warmStart(dt, points, rows)
	s.warmPatches(dt) // twist.go
	s.velocities(points, rows, &rep)
	s.store(dt, points, rows, &rep)
	s.storePatches(points) // twist.go
	s.positions(dt, points, rows)
	s.sl.scatter(bodies)
	return rep, nil
}

func finite3(v vec) bool {
	return !math.IsNaN(v[0]+v[1]+v[2]) && !math.IsInf(v[0]+v[1]+v[2], 0)
}

func check(bodies []Body, points []Point, rows []Row) error {
	n := int32(len(bodies))
	for i := range points {
		p := &points[i]
		if pointOK(p, n) { // pointok.go
			continue
		}
		if p.A < 0 || p.A >= n || p.B < 0 || p.B >= n {
			return fmt.Errorf("contact: point %d (key %#x): bodies %d, %d: index out of range [0, %d)", i, p.Key, p.A, p.B, n)
		}
		if p.A == p.B {
			return fmt.Errorf("contact: point %d (key %#x): body %d touches itself; a point needs two bodies", i, p.Key, p.A)
		}
		if l := dot3(&p.Normal, &p.Normal); !(math.Abs(l-1) <= 1e-6) {
			return fmt.Errorf("contact: point %d (key %#x), bodies %d, %d: normal %v must be a unit vector", i, p.Key, p.A, p.B, p.Normal)
		}
		if !finite3(p.Position) || !finite3(p.SurfaceVelocity) || math.IsNaN(p.Separation) || math.IsInf(p.Separation, 0) ||
			math.IsNaN(p.Friction+p.StaticFriction+p.Restitution) || math.IsInf(p.Friction+p.StaticFriction+p.Restitution, 0) {
			return fmt.Errorf("contact: point %d (key %#x), bodies %d, %d: position, separation, surface velocity and coefficients must be finite", i, p.Key, p.A, p.B)
		}
		if !patchOK(p) { // patch friction (twist.go)
			return checkPatch(i, p)
		}
	}
	for j := range rows {
		r := &rows[j]
		if r.A < 0 || r.A >= n || r.B < 0 || r.B >= n {
			return fmt.Errorf("contact: row %d (key %#x): bodies %d, %d: index out of range [0, %d)", j, r.Key, r.A, r.B, n)
		}
		if r.A == r.B {
			return fmt.Errorf("contact: row %d (key %#x): both ends on body %d; a row needs two bodies (use a static body for the world)", j, r.Key, r.A)
		}
		if !(r.Lo <= r.Hi) || math.IsNaN(r.Target+r.Drift) || math.IsInf(r.Target+r.Drift, 0) ||
			!finite3(r.LinA) || !finite3(r.AngA) || !finite3(r.LinB) || !finite3(r.AngB) {
			return fmt.Errorf("contact: row %d (key %#x): needs finite Jacobian, Target and Drift and Lo <= Hi, got Lo %v, Hi %v", j, r.Key, r.Lo, r.Hi)
		}
	}
	return nil
}

// tangents returns an orthonormal basis of the plane normal to unit n,
// without a branch on a near-zero component: Duff, Burgess, Christensen,
// Hery, Kensler, Liani and Villemin, "Building an orthonormal basis,
// revisited", JCGT 6(1), 2017.
func tangents(n vec) (t1, t2 vec) {
	sign := math.Copysign(1, n[2])
	a := -1 / (sign + n[2])
	b := n[0] * n[1] * a
	t1 = vec{1 + sign*n[0]*n[0]*a, sign * b, -sign * n[0]}
	t2 = vec{b, sign + n[1]*n[1]*a, -n[1]}
	return t1, t2
}

func grow[T any](s []T, n int) []T {
	if cap(s) < n {
		return make([]T, n, n+n/4)
	}
	return s[:n]
}

// The hot loops are written out by component: the vector methods pass
// 24-byte arrays by value and cost about twice as much here.

func dot3(a, b *vec) float64 { return a[0]*b[0] + a[1]*b[1] + a[2]*b[2] }

func addScaled(v *vec, a *vec, d float64) {
	v[0] += a[0] * d
	v[1] += a[1] * d
	v[2] += a[2] * d
}

// hypotAbove reports whether math.Hypot(x, y) > b, with the same answer,
// without the square root where the squares decide: away from underflow
// and overflow x*x+y*y and b*b are within a few roundings (1e-15) of the
// squares of the exact values, so a relative margin of 1e-12 between them
// cannot be a rounding's doing; only closer cases take math.Hypot.
func hypotAbove(x, y, b float64) bool {
	const margin = 1e-12
	const tiny, huge = 1e-290, 1e290 // squares in the normal range
	if s2, b2 := x*x+y*y, b*b; b > 0 && s2 > tiny && b2 > tiny && s2 < huge && b2 < huge {
		if s2 < b2*(1-margin) {
			return false
		}
		if s2 > b2*(1+margin) {
			return true
		}
	}
	return math.Hypot(x, y) > b
}

// arrivalSpeed is the approach speed with which a contact closing a gap sep
// within the step arrives: the bodies approach at a0 before the step's
// forces, which add fd to the approach in the step. The world integrates
// free flight exactly (a constant acceleration fd/dt over the step), so
// energy along the normal gives a^2 = a0^2 + 2 (fd/dt) sep. Bouncing with e
// times it from the surface makes an elastic bounce return exactly to its
// height; a0 alone would lose the fall through the gap.
func arrivalSpeed(a0, fd, sep, dt float64) float64 {
	d := a0*a0 + 2*fd*sep/dt
	if !(d > 0) {
		return max(a0, 0)
	}
	return math.Sqrt(d)
}

// solveFriction updates the two tangent rows of point i together: the 2x2
// block impulse that brings the tangential relative velocity to the rows'
// targets, then the accumulated pair (l1, l2) projected radially onto the
// disk of radius bound (Coulomb's cone as a disk, not a pyramid). It returns
// the velocity change and whether the disk limited the impulse.
func (s *Solver) solveFriction(vel []sbody, i int, bound float64, l1, l2 *float64) (float64, bool) {
	p := &s.pts[i]
	if p.inv11 == 0 && p.inv22 == 0 {
		return 0, false
	}
	r1, r2 := &s.trows[2*i], &s.trows[2*i+1]
	// Both rows join the point's bodies; rowVel and applyPair written out
	// as in solveNormal.
	A, B := &vel[r1.a], &vel[r1.b]
	onA, onB := r1.a != fixedSlot, r1.b != fixedSlot
	c1, c2 := 0.0, 0.0
	if onA {
		c1 = -dot3(&r1.d, &A.v) - dot3(&r1.cA, &A.w)
		c2 = -dot3(&r2.d, &A.v) - dot3(&r2.cA, &A.w)
	}
	if onB {
		c1 += dot3(&r1.d, &B.v)
		c1 += dot3(&r1.cB, &B.w)
		c2 += dot3(&r2.d, &B.v)
		c2 += dot3(&r2.cB, &B.w)
	}
	e1, e2 := r1.target-c1, r2.target-c2
	n1 := *l1 + p.inv11*e1 + p.inv12*e2
	n2 := *l2 + p.inv12*e1 + p.inv22*e2
	clamped := false
	if n1*n1+n2*n2 > bound*bound {
		// Static friction cannot hold. The block step projected radially
		// would settle with the impulse along K^-1 times the slip, not
		// against the slip; an isotropic step (scalar mass 1/lambda_max(K))
		// has its fixed point on the disk exactly where the impulse opposes
		// the remaining slip, the direction of maximal dissipation.
		clamped = true
		n1, n2 = *l1+p.miso*e1, *l2+p.miso*e2
		if m2 := n1*n1 + n2*n2; m2 > bound*bound {
			if bound > 0 {
				f := bound / math.Sqrt(m2)
				n1, n2 = n1*f, n2*f
			} else {
				n1, n2 = 0, 0
			}
		}
	}
	d1, d2 := n1-*l1, n2-*l2
	*l1, *l2 = n1, n2
	if onA {
		if d1 != 0 {
			addM(&A.v, &r1.d, r1.mA, -d1)
			addScaled(&A.w, &r1.wA, -d1)
		}
		if d2 != 0 {
			addM(&A.v, &r2.d, r2.mA, -d2)
			addScaled(&A.w, &r2.wA, -d2)
		}
	}
	if onB {
		if d1 != 0 {
			addM(&B.v, &r1.d, r1.mB, d1)
			addScaled(&B.w, &r1.wB, d1)
		}
		if d2 != 0 {
			addM(&B.v, &r2.d, r2.mB, d2)
			addScaled(&B.w, &r2.wB, d2)
		}
	}
	return max(math.Abs(d1)*r1.k, math.Abs(d2)*r2.k), clamped
}

func samePair(p, q *Point) bool {
	return (p.A == q.A && p.B == q.B) || (p.A == q.B && p.B == q.A)
}

func (s *Solver) prepare(dt float64, bodies []Body, points []Point, rows []Row) {
	n := len(points)
	s.nrows, s.trows = grow(s.nrows, n), grow(s.trows, 2*n)
	s.pts = grow(s.pts, n)
	s.jp = grow(s.jp, len(rows))
	s.groups = s.groups[:0]
	for i := range points {
		if i == 0 || !samePair(&points[i-1], &points[i]) {
			s.groups = append(s.groups, int32(i))
		}
	}
	s.groups = append(s.groups, int32(n))

	for i := range points {
		p := &points[i]
		A, B := &bodies[p.A], &bodies[p.B]
		a, b := s.sl.of[p.A], s.sl.of[p.B]
		rA := vec{p.Position[0] - A.Position[0], p.Position[1] - A.Position[1], p.Position[2] - A.Position[2]}
		rB := vec{p.Position[0] - B.Position[0], p.Position[1] - B.Position[1], p.Position[2] - B.Position[2]}

		rn, r1, r2 := &s.nrows[i], &s.trows[2*i], &s.trows[2*i+1]
		rn.setupContact(A, B, a, b, &p.Normal, &rA, &rB)
		// A speculative point may approach by its gap within the step.
		rn.target = -max(p.Separation, 0) / dt

		ps := &s.pts[i]
		*ps = pstate{}
		ps.muK = max(p.Friction, 0)
		ps.muS = max(p.StaticFriction, ps.muK)
		ps.e = max(p.Restitution, 0)
		ps.sep = p.Separation
		ps.slop = PointSlop(&s.Settings, A.Size, B.Size)
		ps.reach = reach(A, B, &rA, &rB, &p.Normal, p.Separation, ps.muS)
		if s.Settings.BounceSteps > 0 {
			ps.turn = turnAcceleration(A, &rA, &p.Normal) + turnAcceleration(B, &rB, &p.Normal) // bounce.go
		}
		if p.PatchRadius > 0 {
			// Its patch carries its friction (twist.go): no tangent rows.
			*r1, *r2 = crow{a: a, b: b}, crow{a: a, b: b}
		} else {
			t1, t2 := tangents(p.Normal)
			r1.setupContact(A, B, a, b, &t1, &rA, &rB)
			r1.target = dot3(&t1, &p.SurfaceVelocity)
			r2.setupContact(A, B, a, b, &t2, &rA, &rB)
			r2.target = dot3(&t2, &p.SurfaceVelocity)
			// Off-diagonal of the friction block.
			k12 := r1.kWith(r2)
			if det := r1.k*r2.k - k12*k12; det > 1e-12*r1.k*r2.k && det > 0 {
				ps.inv11, ps.inv12, ps.inv22 = r2.k/det, -k12/det, r1.k/det
				h := 0.5 * (r1.k - r2.k)
				ps.miso = 1 / (0.5*(r1.k+r2.k) + math.Sqrt(h*h+k12*k12))
			}
		}

		p.NormalImpulse, p.FrictionImpulse = 0, vec{}
		p.ImpactImpulse, p.ImpactFriction, p.ImpactSpeed, p.StopImpulse = 0, vec{}, 0, 0
		p.Sliding = false
	}
	s.jrows = grow(s.jrows, len(rows))
	for j := range rows {
		r := &rows[j]
		s.jrows[j].setup(&bodies[r.A], &bodies[r.B], s.sl.of[r.A], s.sl.of[r.B], r)
		r.Impulse = 0
	}
}

func rowKeyOrder(w warmRow, k uint64) int { return cmp.Compare(w.key, k) }

// warmStart applies last step's impulses to the points matched by
// matchPoints and the rows whose keys persist (Catto 2005). Friction is remembered as a world vector and
// projected onto this step's tangents, so a turned basis loses nothing.
func (s *Solver) warmStart(dt float64, points []Point, rows []Row) {
	vel := s.sl.vel
	f := s.Settings.WarmStart
	if s.prevDt > 0 {
		f *= dt / s.prevDt // impulses of a steady load scale with the step
	}
	for i := range points {
		k := s.match[i]
		if k < 0 || f == 0 {
			continue
		}
		w := &s.prevPts[k]
		ps := &s.pts[i]
		rn, r1, r2 := &s.nrows[i], &s.trows[2*i], &s.trows[2*i+1]
		ln := f * w.normal
		if rn.mass > 0 {
			rn.lambda = ln
			rn.apply(vel, ln)
		}
		if ps.inv11 != 0 || ps.inv22 != 0 {
			l1, l2 := f*w.friction.Dot(r1.d), f*w.friction.Dot(r2.d)
			if b := ps.muS * ln; hypotAbove(l1, l2, b) {
				m := math.Hypot(l1, l2)
				l1, l2 = l1*b/m, l2*b/m
			}
			r1.lambda, r2.lambda = l1, l2
			r1.apply(vel, l1)
			r2.apply(vel, l2)
		}
	}
	if f == 0 {
		return
	}
	prev, k := s.prevRows, 0
	for j := range rows {
		// A cursor over last step's rows, which are in key order: the rows
		// of a step mostly come in key order too, and where one does not,
		// a binary search puts the cursor back.
		key := rows[j].Key
		if k > 0 && prev[k-1].key >= key {
			k, _ = slices.BinarySearchFunc(prev, key, rowKeyOrder)
		}
		for k < len(prev) && prev[k].key < key {
			k++
		}
		if k == len(prev) || prev[k].key != key {
			continue
		}
		k++
		jr := &s.jrows[j]
		if jr.mass == 0 {
			continue
		}
		jr.lambda = min(max(f*prev[k-1].impulse, jr.lo), jr.hi)
		jr.apply(vel, jr.lambda)
	}
}

// classify picks the friction coefficient of every point. A point slides
// (kinetic coefficient) if its tangential speed relative to the surface
// velocity, measured after the warm start, exceeds SlipSpeed. Otherwise a
// new point sticks (static coefficient), and a persisting one keeps its
// state until the evidence turns: a sliding point keeps sliding while its
// steps end with friction at the cone's limit and slip above its creep limit (so
// kinetic friction has not stopped it); a sticking point breaks loose after
// two such steps in a row. One step would do for a converged solve, but an
// unconverged step (a new contact, a stack) can end at the limit with a
// little slip that the next, warm-started step removes; taking that for
// sliding would hand a block that static friction holds over to kinetic
// friction for good.
func (s *Solver) classify(points []Point) {
	vel := s.sl.vel
	for i := range points {
		if points[i].PatchRadius > 0 {
			continue // its patch decides (classifyPatches)
		}
		ps := &s.pts[i]
		r1, r2 := &s.trows[2*i], &s.trows[2*i+1]
		sliding := hypotAbove(r1.cdot(vel)-r1.target, r2.cdot(vel)-r2.target, s.Settings.SlipSpeed)
		if !sliding && ps.found {
			if ps.prevSliding {
				sliding = ps.prevSlips >= 1 // kinetic friction has not stopped it
			} else {
				sliding = ps.prevSlips >= 2 // static friction failed twice running
			}
		}
		ps.mu = ps.muS
		if sliding {
			ps.mu = ps.muK
		}
		points[i].Sliding = sliding
	}
}

// impacts is the restitution phase of Guendelman, Bridson and Fedkiw,
// "Nonconvex rigid bodies with stacking", SIGGRAPH 2003: pairs are visited in
// their given order, and each pair with a point approaching faster than
// BounceThreshold gets the impulses that turn the current approach speed of
// each such point into e times that speed away, with friction clamped to mu
// times the normal impulse. Passes repeat while anything impacts, so an
// impact travels through a chain (Newton's cradle).
//
// The points of one pair are solved together by Gauss-Seidel sweeps (to
// convergence) on their own accumulators: a flat face landing on four points
// gets four equal impulses and no spin, which a point-by-point sequence would
// not give. Touching points of the pair that do not impact keep the velocity
// solve's target (no approach; a speculative point its gap per step).
// A speculative point counts only if it would close its gap within the step.
func (s *Solver) impacts(dt float64, bodies []Body, points []Point, rep *Report) {
	vel := s.sl.vel
	set := &s.Settings
	// Every point's struck is false from prepare on.
	if set.PairIterations == 0 {
		return
	}
	s.supportedForces(bodies) // supported.go
	fv := s.sl.fs
	s.markChains(dt) // chain.go
	for pass := 0; pass < set.ImpactPasses; pass++ {
		hitAny := false
		for g := 0; g+1 < len(s.groups); g++ {
			lo, hi := int(s.groups[g]), int(s.groups[g+1])
			vmax := 0.0
			for i := lo; i < hi; i++ {
				ps, rn := &s.pts[i], &s.nrows[i]
				// Whether and how fast it arrives is judged anew in every
				// pass, on the velocities the impacts so far have left:
				// those of other points may have turned the bodies.
				ps.active, ps.deferred, ps.arrived = false, 0, false
				if rn.mass == 0 {
					continue
				}
				// The bodies' velocities here lack this step's forces
				// (Solve): approach is the speed they arrived with, and
				// the gap closes at that plus the forces' part.
				approach := -rn.cdot(vel)
				if ps.sep > 0 && (approach-rn.cdot(fv))*dt <= ps.sep {
					continue // stays apart this step
				}
				thr := s.bounceThreshold(ps, dt) // bounce.go
				if s.carriedLoad(ps, rn, thr) {
					// It carried load last step: a resting contact, whatever
					// an unconverged solve or a sway left of approach. It
					// takes part as a touching point, inelastic.
					ps.pending, ps.held, ps.stop = 0, 0, 0
					ps.active = ps.sep <= ps.slop
					ps.iTarget = rn.target
					continue
				}
				if ps.sep > ps.slop && !(approach > thr && s.chained(g, rn)) {
					// Closing within the step but not yet touching: the
					// velocity solve lets it arrive exactly (approach sep/dt)
					// and the impact is deferred to the next step with this
					// approach speed. Bouncing now would reverse the bodies a
					// gap short of each other; moving them to make up for it
					// would change angular momentum.
					//
					// A point still apart after last step's stop waits on
					// only while it approaches as an impact: one that no
					// longer does was turned away, and an impact held for
					// it would arrive, steps later, at a speed it has long
					// lost (held.go).
					if approach > thr {
						ac := arrivalSpeed(approach, -rn.cdot(fv), ps.sep, dt)
						ps.deferred, ps.aStart = max(ac, ps.pending), ac
						ps.struck = true
					}
					continue
				}
				if ps.pending > approach && approach > -thr {
					// The impact deferred from the last step arrives now,
					// giving back no more than its stops took (held.go).
					ps.arrived, ps.aNow, ps.aArr = true, max(approach, 0), ps.pending
					approach = ps.pending
					points[i].StopImpulse = ps.stop // the impact's first part (held.go)
				}
				ps.pending = 0
				ps.active = true
				ps.iTarget = rn.target
				if approach > thr {
					// The bodies leave the surface at e times the approach,
					// before this step's forces: those then act on the
					// free flight that follows, which the world integrates
					// exactly, so an elastic bounce returns to its height.
					ps.iTarget = ps.e * approach
					if !ps.arrived && ps.sep != 0 && ps.sep <= ps.slop {
						fd := -rn.cdot(fv)
						ps.iTarget = gapRebound(ps.e, approach, fd, ps.sep, dt) // gapbounce.go
						if ps.iTarget == 0 && ps.sep > 0 && fd > 0 {
							ps.iTarget = s.land(ps, rn, approach, fd, dt) // landing.go
						}
					}
					ps.struck = true
					vmax = max(vmax, approach)
					points[i].ImpactSpeed = max(points[i].ImpactSpeed, approach)
				}
			}
			if vmax == 0 {
				continue
			}
			hitAny = true
			if !s.boundHeld(bodies, g, points, impactRelTol*vmax) { // held.go
				s.pairImpact(g, impactRelTol*vmax)
			}
			for i := lo; i < hi; i++ {
				ps, p := &s.pts[i], &points[i]
				if !ps.active {
					continue
				}
				p.ImpactImpulse += ps.iN
				if p.PatchRadius == 0 {
					p.ImpactFriction = p.ImpactFriction.Add(s.trows[2*i].d.Mul(ps.iT1)).Add(s.trows[2*i+1].d.Mul(ps.iT2))
				}
			}
		}
		if !hitAny {
			break
		}
		rep.ImpactPasses++
	}
	for i := range points {
		if v := points[i].ImpactSpeed; v > 0 {
			rep.Impacts++
			rep.MaxImpactSpeed = max(rep.MaxImpactSpeed, v)
		}
	}
}

// pairImpact runs the Gauss-Seidel sweeps of pair group g's impact, from
// zero impulses, until no row changes a velocity by more than tol.
func (s *Solver) pairImpact(g int, tol float64) {
	vel := s.sl.vel
	lo, hi := int(s.groups[g]), int(s.groups[g+1])
	for i := lo; i < hi; i++ {
		ps := &s.pts[i]
		ps.iN, ps.iT1, ps.iT2 = 0, 0, 0
	}
	inf := math.Inf(1)
	for it := 0; it < s.Settings.PairIterations; it++ {
		res := 0.0
		for i := lo; i < hi; i++ {
			ps := &s.pts[i]
			if !ps.active {
				continue
			}
			res = max(res, solveScalar(vel, &s.nrows[i], ps.iTarget, 0, inf, &ps.iN))
			d, _ := s.solveFriction(vel, i, ps.mu*ps.iN, &ps.iT1, &ps.iT2)
			res = max(res, d)
		}
		res = max(res, s.impactPatches(g, it == 0)) // twist.go
		if res <= tol {
			break
		}
	}
}

// solvePoint is one Gauss-Seidel update of point i in the velocity solve:
// the normal row, then its friction disk, so that friction is clamped with
// the normal impulse the update ends with and the impulses always lie in the
// cone.
func (s *Solver) solvePoint(vel []sbody, i int) float64 {
	ps, rn := &s.pts[i], &s.nrows[i]
	res := solveNormal(vel, rn)
	if rn.lambda == 0 && s.trows[2*i].lambda == 0 && s.trows[2*i+1].lambda == 0 {
		// Apart, with no friction to take back: the disk of radius 0
		// leaves both friction impulses at zero, whatever the slip (the
		// full update differs only for a slip of exactly zero, by the
		// sign of a zero impulse). A third of a resting pile's point
		// updates end apart (speculative, or lifted off); their tangent
		// rows need not be read.
		if ps.inv11 != 0 || ps.inv22 != 0 {
			s.trows[2*i].lambda, s.trows[2*i+1].lambda = 0, 0
		}
		ps.sat = false
		return res
	}
	bound := ps.mu * rn.lambda
	d, clamped := s.solveFriction(vel, i, bound, &s.trows[2*i].lambda, &s.trows[2*i+1].lambda)
	ps.sat = clamped && bound > 0
	return max(res, d)
}

// coldRelTol ends the pre-solve of a cold pair once a sweep changes
// velocities by less than this fraction of what its first sweep changed.
const coldRelTol = 1e-6

// velocities runs the projected Gauss-Seidel sweeps (Catto 2005): extra rows
// first, then the points.
//
// Pairs with a point that has no warm start are first solved on their own to
// convergence (at most PairIterations sweeps over their points). Sweeping
// the corners of a new manifold once in sequence leaves a rocking and
// turning motion (the first corner takes all the load) that plain sweeps
// remove only slowly, and that slip could make static friction look broken.
//
// A resting pile's sweeps rarely meet the stopping test (live.go). A
// nonsmooth nonlinear conjugate gradient step after each sweep (Silcowitz,
// Niebe and Erleben, "A nonsmooth nonlinear conjugate gradient method for
// interactive contact force problems", The Visual Computer 26, 2010) did
// not pay there: over 300 steps of the Pile1000 pile at 8 sweeps it left
// the last sweep's largest excess 9 percent lower (30 percent higher with
// the steps weighted by the rows' k) and 14 percent fewer rows changing by
// more than 1e-7 m/s, for 21 percent more row updates and two more passes
// over the rows a sweep (measured, December 2026).
//
// Skipping, in a large island's sweeps, the points with no impulse whose
// gap stays open (normal velocity at or above the target -sep/dt; about
// 1000 of the pile's 4300 points, a quarter of the point updates) did not
// pay either, though exact (each tested on a copy of its normal row's
// velocity terms with solveNormal's operations; results bit-identical):
// Pile1000's CPU time a step moved by less than the noise of the shared
// machine (4 of 5 runs of two variants faster, medians 6.2 against 7.1 ms, the runs of
// one binary 5.2 to 8.2 ms; on a stored copy of the pile 4 of 5 runs
// slower), and Pour1000 took 5 percent longer a step (3 of 3 runs, each
// binary's runs within 2 percent; measured, December 2026). Those
// updates read their rows in sweep order, which costs little, and the pass
// that finds them and the test cost about as much; a test on a bound of
// the bodies' velocity changes instead read a snapshot of the velocities
// out of order and cost more.
func (s *Solver) velocities(points []Point, rows []Row, rep *Report) {
	vel := s.sl.vel
	if s.Settings.VelocityIterations > 0 {
		for g := 0; g+1 < len(s.groups); g++ {
			lo, hi := int(s.groups[g]), int(s.groups[g+1])
			cold := false
			for i := lo; i < hi; i++ {
				cold = cold || !s.pts[i].found
			}
			if !cold {
				continue
			}
			first := -1.0
			for it := 0; it < s.Settings.PairIterations; it++ {
				res := 0.0
				for i := lo; i < hi; i++ {
					res = max(res, s.solvePoint(vel, i))
				}
				res = max(res, s.solveGroupPatches(g)) // twist.go
				if first < 0 {
					first = res
				}
				if res <= coldRelTol*first {
					break
				}
			}
		}
	}
	block := s.Settings.MaxBlock >= 2 && s.Settings.VelocityIterations > 0
	if block {
		s.islands(points, rows)
		s.blockSolve(false, false)
	}
	conv, converged := s.Settings.Convergence, false
	s.live.start(len(s.sl.vel), len(s.pts)+len(s.patches.list), s.Settings.Tolerance, s.anyLarge(block)) // live.go
	s.liveRows(block && s.Settings.Tolerance > 0)
	for it := 0; it < s.Settings.VelocityIterations; it++ {
		// res is the largest velocity change of a row in this sweep, excess
		// the largest by which one exceeds its share Convergence of the
		// velocity change its accumulated impulse makes.
		res, excess := 0.0, 0.0
		for j := range rows {
			r := &s.jrows[j]
			d := r.solve(vel, r.target, r.lo, r.hi, &r.lambda)
			res, excess = max(res, d), max(excess, d-conv*math.Abs(r.lambda)*r.k)
		}
		if block {
			clear(s.blk.excess)
		}
		// The points of each pair, then the pair's patches (twist.go).
		r, ex := s.sweepPoints(block)
		res, excess = max(res, r), max(excess, ex)
		rep.Iterations++
		rep.Residual = res
		if s.live.settle(excess, s.Settings.Tolerance) { // live.go
			converged = true
			break
		}
	}
	if block && !converged {
		// The sweeps' friction moved the normal impulses off the exact
		// solution again, and the sweeps bring them back slowly where
		// masses differ or stacks are tall: solve them once more, with
		// friction where the island is small enough.
		s.blockSolve(false, true)
	}
}

// pointScale is the largest velocity change that one of point i's rows
// makes with its accumulated impulse.
func (s *Solver) pointScale(i int) float64 {
	rn, r1, r2 := &s.nrows[i], &s.trows[2*i], &s.trows[2*i+1]
	return max(rn.lambda*rn.k, math.Abs(r1.lambda)*r1.k, math.Abs(r2.lambda)*r2.k)
}

// store writes the outputs and remembers this step's impulses by key.
func (s *Solver) store(dt float64, points []Point, rows []Row, rep *Report) {
	vel := s.sl.vel
	s.curPts = grow(s.curPts, len(points))
	for i := range points {
		p := &points[i]
		rn, r1, r2 := &s.nrows[i], &s.trows[2*i], &s.trows[2*i+1]
		p.NormalImpulse = rn.lambda
		p.FrictionImpulse = vec{} // a patch's point: storePatches shares it out
		if p.PatchRadius == 0 {
			d1, d2, l1, l2 := &r1.d, &r2.d, r1.lambda, r2.lambda
			p.FrictionImpulse = vec{d1[0]*l1 + d2[0]*l2, d1[1]*l1 + d2[1]*l2, d1[2]*l1 + d2[2]*l2}
		}
		rep.NormalImpulse += p.NormalImpulse + p.ImpactImpulse
		// At the cone's limit and still slipping: count the steps in a row.
		ps := &s.pts[i]
		slips := uint8(0)
		if ps.sat && hypotAbove(r1.cdot(vel)-r1.target, r2.cdot(vel)-r2.target, s.pointCreep(i)) {
			slips = min(ps.prevSlips, 254) + 1
		}
		pending := ps.deferred
		if pending > 0 && !s.stoppedAtGap(i) { // held.go
			// Other contacts turned the body away: it does not arrive at
			// that speed, and no energy waits for it to give back. Keeping
			// the speed would bounce the point next step at a speed it
			// never had, adding energy (seen with tumbling boxes, e = 1).
			pending = 0
		}
		// Written in place: a warmPoint built and then copied costs a
		// second pass over its bytes.
		w := &s.curPts[i]
		w.key, w.normal, w.friction = p.Key, rn.lambda, p.FrictionImpulse
		w.sliding, w.slips, w.pending, w.held, w.stop, w.pushed = p.Sliding, slips, pending, 0, 0, false
		if pending > 0 {
			w.held = ps.held + stopEnergy(rn.lambda, ps.aStart, -rn.cdot(vel)) // held.go
			w.stop = ps.stop + rn.lambda                                       // held.go
		}
		w.a, w.b, w.pos = p.A, p.B, p.Position
		if ps.deferred > 0 {
			// The impulse that stopped a deferred impact at the gap is no
			// steady load: the impact itself replaces it next step.
			w.normal, w.friction = 0, vec{}
		}
	}
	s.prevPts, s.curPts = s.curPts, s.prevPts
	s.prevKeys, s.byKey = s.byKey, s.prevKeys[:0] // byKey is empty until the next sortKeys
	s.storePairs(points)

	s.curRows = s.curRows[:0]
	for j := range rows {
		rows[j].Impulse = s.jrows[j].lambda
		s.curRows = append(s.curRows, warmRow{key: rows[j].Key, impulse: rows[j].Impulse})
	}
	order := func(a, b warmRow) int { return cmp.Compare(a.key, b.key) }
	if !slices.IsSortedFunc(s.curRows, order) {
		slices.SortFunc(s.curRows, order)
	}
	s.prevRows, s.curRows = s.curRows, s.prevRows
	s.prevDt = dt
}

// positions is the position pass with pseudo-velocities (split impulses):
// its own projected Gauss-Seidel sweeps over the normal rows, from zero
// impulses, drive each point's relative pseudo-velocity toward Correction
// times its penetration beyond Slop per step. The penetration is the one
// predicted at the end of the step, Separation + vn dt with the solved real
// normal velocity vn, because the engine integrates with V+Vp. The real
// velocities are never touched, so this adds no kinetic energy.
//
// A point that impacted while still apart (speculative) is instead moved to
// the gap that the impact within the step would have left.
func (s *Solver) positions(dt float64, points []Point, rows []Row) {
	vel, pv := s.sl.vel, s.sl.ps
	clear(pv)
	landed := s.strikeLate(dt, points) // landing.go
	set := &s.Settings
	if set.PositionIterations == 0 {
		return
	}
	n := len(points)
	inf := math.Inf(1)
	work := false // a target that moves something: else the sweeps leave pv as it is
	for i := 0; i < n; i++ {
		ps, rn := &s.pts[i], &s.nrows[i]
		ps.pN, ps.pTarget, ps.pLo = 0, 0, 0
		if rn.mass == 0 {
			continue
		}
		pred, base := ps.sep+rn.cdot(vel)*dt, 0.0
		if landed {
			// A landing's move to the surface stays: the pass pushes out
			// only what penetrates beyond the slop after it.
			c := rn.cdot(pv)
			pred += c * dt
			base = min(c, 0)
			ps.pTarget = base
		}
		if pen := -pred - ps.slop; pen > 0 {
			ps.pTarget = base + set.Correction*pen/dt
			work = true
		}
	}
	levelled := s.level(dt) // level.go
	for j := range rows {
		r, jp := &rows[j], &s.jp[j]
		*jp = jpos{on: r.Correct}
		if !r.Correct {
			continue
		}
		work = true
		jp.target = -set.Correction * (r.Drift + s.jrows[j].cdot(vel)*dt) / dt
		jp.lo, jp.hi = 0, 0
		if r.Lo < 0 {
			jp.lo = -inf
		}
		if r.Hi > 0 {
			jp.hi = inf
		}
	}
	if !work && !levelled {
		// No point penetrates beyond the slop (a resting part, one in
		// flight) and no joint row corrects: from zero impulses every row
		// would keep its impulse zero, and pv stays zero.
		return
	}
	// Levelling alone is left to the sweeps: its lifts are below a tenth of
	// the velocity tolerance per step (level.go); the direct solve run for
	// it alone left its block scratch differing between a reused world and
	// a new one (TestBuildInSameAsNew, pusher scene; not yet explained).
	if work && set.MaxBlock >= 2 && set.VelocityIterations > 0 {
		s.blockSolve(true, false) // islands as found by velocities
	}
	for it := 0; it < set.PositionIterations; it++ {
		res := 0.0
		for j := range rows {
			if jp := &s.jp[j]; jp.on {
				res = max(res, s.jrows[j].solve(pv, jp.target, jp.lo, jp.hi, &jp.lambda))
			}
		}
		for i := 0; i < n; i++ {
			ps := &s.pts[i]
			res = max(res, solveScalar(pv, &s.nrows[i], ps.pTarget, ps.pLo, inf, &ps.pN))
		}
		if res <= set.Tolerance {
			break
		}
	}
}
