package contact

import (
	"fmt"
	"math"
	"slices"
)

// Patch friction: the friction of a face or edge contact taken as a whole.
//
// The points of a manifold sample a contact patch; friction at the points
// alone resists twisting about the normal as if the load sat where the points
// are (a disc's rim: a lever arm R where uniform pressure gives 2R/3). A patch
// (consecutive points of one pair with the same PatchCenter and PatchRadius >
// 0) therefore gets its friction from three rows of its own in place of the
// points' tangent rows: two tangents at the patch centre and one twist about
// the normal, bounded together by the ellipsoidal approximation of the
// patch's limit surface,
//
//	(|f_t| / (mu N))^2 + (tau / (mu N r))^2 <= 1,
//
// with N the patch's normal impulse and r its effective friction radius
// (Goyal, Ruina and Papadopoulos, "Planar sliding with dry friction, Part 1:
// limit surface and moment function", Wear 143, 1991; the ellipsoid as in
// Howe and Cutkosky, "Practical force-motion models for sliding
// manipulation", IJRR 15(6), 1996). The twist row's Jacobian is scaled by r,
// so that its impulse is tau/r and the ellipsoid becomes the ball of radius
// mu N in impulse space. Where the ball limits the impulse, an isotropic step
// (as in solveFriction) settles with the impulse opposite to the generalised
// slip (v_t, r w_n): maximal dissipation on the ellipsoid, f_t = mu N v_t / s
// and tau = mu N r^2 w_n / s with s = |(v_t, r w_n)|.
//
// Memory between steps goes through the points' keys: every point of a patch
// remembers the patch's whole friction and twist impulses, and a patch starts
// from their mean over its points that persist, so that it keeps its warm
// start while some of its points change their features (coincident faces of
// a stack do so step after step). Remembering shares instead, summed over the
// persisting points, makes the warm start jump with every change, and a
// tower of ten boxes then rocks without end (measured).

// patch is one contact patch of this step.
type patch struct {
	lo, hi   int32   // its points
	r        float64 // effective friction radius (m)
	rows     [3]crow // tangent 1, tangent 2 at the centre; twist about the normal (scaled by r)
	inv      [6]float64
	block    bool       // inv holds the inverse of the 3x3 block (11, 12, 13, 22, 23, 33)
	k        [6]float64 // the block J M^-1 J^T (11, 12, 13, 22, 23, 33)
	live     bool       // the block is not zero: the rows can move something
	miso     float64    // 1 / largest eigenvalue of the block, 0 until needed (isoMass)
	muS, muK float64
	mu       float64 // this step's coefficient
	sliding  bool
	found    bool       // some point has a warm start
	prevSl   bool       // sliding last step
	prevSlip uint8      // consecutive steps that ended at the limit and slipping
	sat      bool       // the last velocity update hit the limit surface
	imp      [3]float64 // impulses of the current impact processing
	impSum   [3]float64 // impact impulses summed over this step's processing
}

// patchState is the Solver's patch data, kept in one field so that the rest
// of the Solver need not know about it.
type patchState struct {
	list    []patch
	ofGroup []int32    // first patch of each pair group, then len(list)
	mem     []patchMem // the patch impulses of each point of the last step, as prevPts
}

// patchMem is what a point remembers of its patch.
type patchMem struct {
	friction vec     // world friction impulse of the patch (N s)
	twist    float64 // its moment impulse about the normal (N m s)
	on       bool    // the point belonged to a patch
}

// samePatch reports whether point q continues the patch of point p.
func samePatch(p, q *Point) bool {
	return samePair(p, q) && p.PatchRadius == q.PatchRadius && p.PatchCenter == q.PatchCenter
}

// preparePatches finds this step's patches, sets up their rows and turns off
// the tangent rows of their points. It runs after prepare and matchPoints.
func (s *Solver) preparePatches(bodies []Body, points []Point) {
	ps := &s.patches
	ps.list = ps.list[:0]
	ps.ofGroup = ps.ofGroup[:0]
	for g := 0; g+1 < len(s.groups); g++ {
		ps.ofGroup = append(ps.ofGroup, int32(len(ps.list)))
		hi := int(s.groups[g+1])
		for i := int(s.groups[g]); i < hi; {
			j := i + 1
			for j < hi && samePatch(&points[i], &points[j]) {
				j++
			}
			if points[i].PatchRadius > 0 {
				// Set in place: a patch is some seven hundred bytes.
				ps.list = slices.Grow(ps.list, 1)[:len(ps.list)+1]
				pa := &ps.list[len(ps.list)-1]
				*pa = patch{lo: int32(i), hi: int32(j)}
				s.setupPatch(bodies, points, pa)
				s.matchPatch(pa)
			}
			i = j
		}
	}
	ps.ofGroup = append(ps.ofGroup, int32(len(ps.list)))
}

// matchPatch takes pa's sliding state of last step from its first point
// that persists (matchPoints), for classifyPatches.
func (s *Solver) matchPatch(pa *patch) {
	for i := pa.lo; i < pa.hi; i++ {
		if m := s.match[i]; m >= 0 {
			w := &s.prevPts[m]
			pa.found, pa.prevSl, pa.prevSlip = true, w.sliding, w.slips
			return
		}
	}
}

// checkPatch reports point i, p, if its patch is not finite. The test
// itself (patchOK) is small enough to be inlined into check's loop, which
// then calls this only for a bad point.
func checkPatch(i int, p *Point) error {
	if !patchOK(p) {
		return fmt.Errorf("contact: point %d (key %#x), bodies %d, %d: patch centre %v and radius %v must be finite, radius >= 0", i, p.Key, p.A, p.B, p.PatchCenter, p.PatchRadius)
	}
	return nil
}

// patchOK reports whether p's patch centre is finite and its radius finite
// and >= 0.
func patchOK(p *Point) bool {
	return finite3(p.PatchCenter) && p.PatchRadius >= 0 && !math.IsInf(p.PatchRadius, 1)
}

// setupPatch fills the rows and the block inverse of pa.
func (s *Solver) setupPatch(bodies []Body, points []Point, pa *patch) {
	p := &points[pa.lo]
	A, B := &bodies[p.A], &bodies[p.B]
	a, b := s.sl.of[p.A], s.sl.of[p.B]
	c := p.PatchCenter
	rA := vec{c[0] - A.Position[0], c[1] - A.Position[1], c[2] - A.Position[2]}
	rB := vec{c[0] - B.Position[0], c[1] - B.Position[1], c[2] - B.Position[2]}
	n := p.Normal
	t1, t2 := tangents(n)
	pa.r = p.PatchRadius
	pa.rows[0].setupContact(A, B, a, b, &t1, &rA, &rB)
	pa.rows[0].target = dot3(&t1, &p.SurfaceVelocity)
	pa.rows[1].setupContact(A, B, a, b, &t2, &rA, &rB)
	pa.rows[1].target = dot3(&t2, &p.SurfaceVelocity)
	rn := n.Mul(pa.r)
	pa.rows[2].setup(A, B, a, b, &vec{}, &rn, &rn)
	pa.rows[2].target = 0
	pa.muK = max(p.Friction, 0)
	pa.muS = max(p.StaticFriction, pa.muK)

	// The block J M^-1 J^T: 11, 12, 13, 22, 23, 33.
	r := &pa.rows
	k := [6]float64{r[0].k, r[0].kWith(&r[1]), r[0].kWith(&r[2]), r[1].k, r[1].kWith(&r[2]), r[2].k}
	pa.k = k
	pa.inv, pa.block = invSym3(k)
	// The block is positive semi-definite, so its largest eigenvalue is
	// positive exactly when its trace is; the eigenvalue itself (two
	// trigonometric functions) waits until a sliding patch needs it.
	q := (k[0] + k[3] + k[5]) / 3
	pa.live = q > 0 && !math.IsInf(q, 1)
	for i := pa.lo; i < pa.hi; i++ {
		q := &s.pts[i]
		q.inv11, q.inv12, q.inv22 = 0, 0, 0  // the patch carries the friction
		q.patch = int32(len(s.patches.list)) // pa is the list's last
	}
}

// isoMass is the scalar mass of the isotropic step, 1 / the largest
// eigenvalue of the block, computed on first use.
func (pa *patch) isoMass() float64 {
	if pa.miso == 0 {
		pa.miso = 1 / maxEigSym3(pa.k)
	}
	return pa.miso
}

// invSym3 inverts the symmetric 3x3 matrix k (11, 12, 13, 22, 23, 33) by
// cofactors; false if it is singular to rounding.
func invSym3(k [6]float64) ([6]float64, bool) {
	a, b, c, d, e, f := k[0], k[1], k[2], k[3], k[4], k[5]
	c11, c12, c13 := d*f-e*e, c*e-b*f, b*e-c*d
	c22, c23, c33 := a*f-c*c, b*c-a*e, a*d-b*b
	det := a*c11 + b*c12 + c*c13
	if !(det > 1e-12*a*d*f) {
		return [6]float64{}, false
	}
	return [6]float64{c11 / det, c12 / det, c13 / det, c22 / det, c23 / det, c33 / det}, true
}

// maxEigSym3 is the largest eigenvalue of the symmetric 3x3 matrix k, in
// closed form: O. K. Smith, "Eigenvalues of a symmetric 3 x 3 matrix",
// CACM 4(4), 1961.
func maxEigSym3(k [6]float64) float64 {
	a, b, c, d, e, f := k[0], k[1], k[2], k[3], k[4], k[5]
	q := (a + d + f) / 3
	p1 := b*b + c*c + e*e
	p2 := (a-q)*(a-q) + (d-q)*(d-q) + (f-q)*(f-q) + 2*p1
	if p2 <= 1e-30*q*q {
		return q
	}
	p := math.Sqrt(p2 / 6)
	// det((k - q I) / p) / 2
	ba, bd, bf := (a-q)/p, (d-q)/p, (f-q)/p
	bb, bc, be := b/p, c/p, e/p
	h := 0.5 * (ba*(bd*bf-be*be) - bb*(bb*bf-be*bc) + bc*(bb*be-bd*bc))
	phi := math.Acos(min(max(h, -1), 1)) / 3
	return q + 2*p*math.Cos(phi)
}

// normalSum is the patch's accumulated normal impulse in the velocity solve.
func (s *Solver) normalSum(pa *patch) float64 {
	n := 0.0
	for i := pa.lo; i < pa.hi; i++ {
		n += s.nrows[i].lambda
	}
	return n
}

// solvePatch is one update of the patch's three friction rows with
// accumulators l inside the ball of radius bound: the block step if it stays
// inside, else the isotropic step projected radially (see the file comment).
// It returns the largest velocity change and whether the ball limited it.
func solvePatch(vel []sbody, pa *patch, bound float64, l *[3]float64) (float64, bool) {
	r := &pa.rows
	if !pa.live {
		return 0, false
	}
	// The three rows join the same two bodies: rowVel and applyPair
	// written out as in solveNormal, with the fixed slot tested once.
	A, B := &vel[r[0].a], &vel[r[0].b]
	onA, onB := r[0].a != fixedSlot, r[0].b != fixedSlot
	var e [3]float64
	for k := range r {
		rk := &r[k]
		v := 0.0
		if onA {
			v = -dot3(&rk.d, &A.v) - dot3(&rk.cA, &A.w)
		}
		if onB {
			v += dot3(&rk.d, &B.v)
			v += dot3(&rk.cB, &B.w)
		}
		e[k] = rk.target - v
	}
	var nl [3]float64
	in := pa.inv
	ok := pa.block
	if ok {
		nl[0] = l[0] + in[0]*e[0] + in[1]*e[1] + in[2]*e[2]
		nl[1] = l[1] + in[1]*e[0] + in[3]*e[1] + in[4]*e[2]
		nl[2] = l[2] + in[2]*e[0] + in[4]*e[1] + in[5]*e[2]
		ok = nl[0]*nl[0]+nl[1]*nl[1]+nl[2]*nl[2] <= bound*bound
	}
	clamped := false
	if !ok {
		clamped = true
		miso := pa.isoMass()
		for k := range nl {
			nl[k] = l[k] + miso*e[k]
		}
		if m2 := nl[0]*nl[0] + nl[1]*nl[1] + nl[2]*nl[2]; m2 > bound*bound {
			f := 0.0
			if bound > 0 {
				f = bound / math.Sqrt(m2)
			}
			nl = [3]float64{nl[0] * f, nl[1] * f, nl[2] * f}
		}
	}
	res := 0.0
	for k := range r {
		d := nl[k] - l[k]
		if d == 0 {
			continue
		}
		l[k] = nl[k]
		rk := &r[k]
		if onA {
			addM(&A.v, &rk.d, rk.mA, -d)
			addScaled(&A.w, &rk.wA, -d)
		}
		if onB {
			addM(&B.v, &rk.d, rk.mB, d)
			addScaled(&B.w, &rk.wB, d)
		}
		res = max(res, math.Abs(d)*rk.k)
	}
	return res, clamped
}

// lambdas returns the velocity-solve accumulators of pa's rows.
func (pa *patch) lambdas() [3]float64 {
	return [3]float64{pa.rows[0].lambda, pa.rows[1].lambda, pa.rows[2].lambda}
}

// solvePatchVel is one velocity-solve update of pa.
func (s *Solver) solvePatchVel(pa *patch) float64 {
	bound := pa.mu * s.normalSum(pa)
	l := pa.lambdas()
	d, clamped := solvePatch(s.sl.vel, pa, bound, &l)
	pa.rows[0].lambda, pa.rows[1].lambda, pa.rows[2].lambda = l[0], l[1], l[2]
	pa.sat = clamped && bound > 0
	return d
}

// sweepPoints is one velocity-solve sweep over the points and patches: the
// points of each pair, then the pair's patches, so that a patch's friction
// is solved right after its normal rows, as a point's is (solvePoint).
// Solving all patches after all points instead lets the normal impulses of
// a whole stack change between a patch's updates, and a pyramid of boxes
// then slips while it settles (measured: 1.9 mm against 0.04 mm).
//
// It returns the sweep's largest velocity change and largest excess over
// Convergence times the velocity change of the accumulated impulses (a
// point's by pointScale, a patch's by patchScale); with block it also
// records each island's largest excess for blockSolve.
func (s *Solver) sweepPoints(block bool) (res, excess float64) {
	if !s.live.loose {
		return s.sweepFew(block) // no row is skipped (sweepfew.go)
	}
	vel := s.sl.vel
	t := sweepTally{conv: s.Settings.Convergence, tol: s.Settings.Tolerance}
	if block {
		t.root, t.island = s.blk.root, s.blk.excess
	}
	ps := &s.patches
	lv := &s.live // live.go
	np := len(s.pts)
	for g := 0; g+1 < len(s.groups); g++ {
		// The points of the group's patches (consecutive, in the order of
		// the patches) have no friction rows of their own: their normal
		// rows alone, without the point's state (solvePoint).
		k, kEnd := ps.ofGroup[g], ps.ofGroup[g+1]
		for i, hi := int(s.groups[g]), int(s.groups[g+1]); i < hi; i++ {
			inPatch := k < kEnd && int32(i) >= ps.list[k].lo
			if inPatch && int32(i)+1 == ps.list[k].hi {
				k++
			}
			lr := lv.rows[i]
			if lr.track && !lv.due(i, lr.a, lr.b) {
				continue
			}
			var d float64
			if inPatch {
				d = solveNormal(vel, &s.nrows[i])
			} else {
				d = s.solvePoint(vel, i)
			}
			if lr.track {
				lv.note(lr.a, lr.b, d, lv.tick(i))
			}
			res = max(res, d)
			if c := s.sl.rowCap(lr.a, lr.b); !(d <= t.tol && d <= c) && t.mayRaise(d, c, i) {
				t.note(d, s.pointScale(i), c, i)
			}
		}
		for k := ps.ofGroup[g]; k < ps.ofGroup[g+1]; k++ {
			lr := lv.rows[np+int(k)]
			if lr.track && !lv.due(np+int(k), lr.a, lr.b) {
				continue
			}
			pa := &ps.list[k]
			d := s.solvePatchVel(pa)
			if lr.track {
				lv.note(lr.a, lr.b, d, lv.tick(np+int(k)))
			}
			res = max(res, d)
			if c := s.sl.rowCap(lr.a, lr.b); !(d <= t.tol && d <= c) && t.mayRaise(d, c, int(pa.lo)) {
				t.note(d, pa.scale(), c, int(pa.lo))
			}
		}
	}
	return res, t.excess
}

// sweepTally keeps a sweep's largest excess, and with the block solve on
// (root, island set) each island's. An excess counts only against
// Tolerance, and it is at most the velocity change d: a row that changed
// by no more than Tolerance (most of them once the sweeps near
// convergence) needs no scale. A row may keep no more than its bodies'
// turn cap either (turn.go).
type sweepTally struct {
	conv, tol float64
	excess    float64
	root      []int32   // island root of each point (blockState.root), nil without the block solve
	island    []float64 // largest excess of each island (blockState.excess)
}

// mayRaise reports whether a row of point i (a patch's: its first point)
// that changed by d with turn cap c can raise the largest excess or its
// island's. Its excess is d - conv*scale or d - c + tol, at most the larger
// of d and d - c + tol (conv and scale are >= 0), so a row under both
// largest ones need not find its scale. A NaN anywhere fails the test.
func (t *sweepTally) mayRaise(d, c float64, i int) bool {
	ub := max(d, d-c+t.tol)
	if !(ub <= t.excess) {
		return true
	}
	return t.root != nil && !(ub <= t.island[t.root[i]])
}

// note records the excess of a row of point i (a patch's: its first point)
// that changed by d, with the velocity change scale of its accumulated
// impulses and turn cap c.
func (t *sweepTally) note(d, scale, c float64, i int) {
	ex := d - t.conv*scale
	if over := d - c + t.tol; over > ex {
		ex = over
	}
	t.excess = max(t.excess, ex)
	if t.root != nil {
		r := t.root[i]
		t.island[r] = max(t.island[r], ex)
	}
}

// scale is the largest velocity change that one of pa's rows makes with its
// accumulated impulse (as pointScale for a point).
func (pa *patch) scale() float64 {
	r := &pa.rows
	return max(math.Abs(r[0].lambda)*r[0].k, math.Abs(r[1].lambda)*r[1].k, math.Abs(r[2].lambda)*r[2].k)
}

// solveGroupPatches is solvePatches for the patches of pair group g.
func (s *Solver) solveGroupPatches(g int) float64 {
	res := 0.0
	ps := &s.patches
	for k := ps.ofGroup[g]; k < ps.ofGroup[g+1]; k++ {
		res = max(res, s.solvePatchVel(&ps.list[k]))
	}
	return res
}

// settlePatches updates once more the patches among points idx, an island
// whose normal impulses the direct solve after unconverged sweeps has just
// replaced without friction (blockSolve), so that their friction is bounded
// by the normal impulses the step ends with. A patch at its limit whose
// friction lifts its own normal rows (an edge pivoting and slipping under a
// high coefficient) makes the sweeps alternate between pressing with full
// friction and lifting off with none; without this update a step can end
// with the direct solve's load and the friction of the lifted-off half of
// that cycle, none (measured: a plank slapping down on its far edge 2
// percent too slowly, as its struck edge slid without friction).
func (s *Solver) settlePatches(idx []int32) {
	for _, i := range idx {
		if q := s.pts[i].patch; q > 0 && s.patches.list[q-1].lo == i {
			s.solvePatchVel(&s.patches.list[q-1])
		}
	}
}

// impactPatches is one update of the patches of pair group g in the impact
// phase, bounded by the impact's normal impulses; start resets their
// accumulators at the start of the pair's processing.
func (s *Solver) impactPatches(g int, start bool) float64 {
	res := 0.0
	ps := &s.patches
	for k := ps.ofGroup[g]; k < ps.ofGroup[g+1]; k++ {
		pa := &ps.list[k]
		if start {
			pa.imp = [3]float64{}
		}
		n := 0.0
		for i := pa.lo; i < pa.hi; i++ {
			if q := &s.pts[i]; q.active {
				n += q.iN
			}
		}
		old := pa.imp
		d, _ := solvePatch(s.sl.vel, pa, pa.mu*n, &pa.imp)
		for j := range old {
			pa.impSum[j] += pa.imp[j] - old[j]
		}
		res = max(res, d)
	}
	return res
}

// warmPatches applies last step's patch impulses, summed over the points of
// each patch that persist, scaled like the points' (factor f), and held in
// the limit ball of the static coefficient. It runs after warmStart.
func (s *Solver) warmPatches(dt float64) {
	f := s.Settings.WarmStart
	if s.prevDt > 0 {
		f *= dt / s.prevDt
	}
	for k := range s.patches.list {
		pa := &s.patches.list[k]
		var fr, own vec
		tw, cnt := 0.0, 0
		for i := pa.lo; i < pa.hi; i++ {
			m := s.match[i]
			if m < 0 {
				continue
			}
			w := &s.prevPts[m]
			if int(m) < len(s.patches.mem) && s.patches.mem[m].on {
				fr = fr.Add(s.patches.mem[m].friction)
				tw += s.patches.mem[m].twist
				cnt++
			} else {
				own = own.Add(w.friction) // a point contact last step
			}
		}
		if cnt > 0 {
			fr, tw = fr.Mul(1/float64(cnt)), tw/float64(cnt)
		} else {
			fr = own // the pair's point contacts became a patch: their sum
		}
		if !pa.found || f == 0 || !pa.live {
			continue
		}
		r := &pa.rows
		l := [3]float64{f * fr.Dot(r[0].d), f * fr.Dot(r[1].d), 0}
		if pa.r > 0 {
			l[2] = f * tw / pa.r
		}
		b := pa.muS * s.normalSum(pa)
		if m := math.Sqrt(l[0]*l[0] + l[1]*l[1] + l[2]*l[2]); m > b {
			for j := range l {
				l[j] *= b / m
			}
		}
		for j := range r {
			r[j].lambda = l[j]
			r[j].apply(s.sl.vel, l[j])
		}
	}
}

// patchSlip is the generalised slip speed |(v_t, r w_n)| of pa.
func patchSlip(vel []sbody, pa *patch) float64 {
	r := &pa.rows
	a, b, c := r[0].cdot(vel)-r[0].target, r[1].cdot(vel)-r[1].target, r[2].cdot(vel)-r[2].target
	return math.Sqrt(a*a + b*b + c*c)
}

// classifyPatches picks each patch's coefficient by the rule of classify,
// on the patch's generalised slip. It runs after classify.
func (s *Solver) classifyPatches(points []Point) {
	for k := range s.patches.list {
		pa := &s.patches.list[k]
		sliding := patchSlip(s.sl.vel, pa) > s.Settings.SlipSpeed
		if !sliding && pa.found {
			if pa.prevSl {
				sliding = pa.prevSlip >= 1
			} else {
				sliding = pa.prevSlip >= 2
			}
		}
		pa.sliding = sliding
		pa.mu = pa.muS
		if sliding {
			pa.mu = pa.muK
		}
		for i := pa.lo; i < pa.hi; i++ {
			points[i].Sliding = sliding
		}
	}
}

// storePatches shares each patch's impulses out to its points (outputs and
// memory) by normal impulse. It runs after store.
func (s *Solver) storePatches(points []Point) {
	ps := &s.patches
	ps.mem = grow(ps.mem, len(points))
	clear(ps.mem)
	for k := range ps.list {
		pa := &ps.list[k]
		r := &pa.rows
		fr := r[0].d.Mul(r[0].lambda).Add(r[1].d.Mul(r[1].lambda))
		tw := r[2].lambda * pa.r
		fi := r[0].d.Mul(pa.impSum[0]).Add(r[1].d.Mul(pa.impSum[1]))
		slips := uint8(0)
		if pa.sat && patchSlip(s.sl.vel, pa) > s.patchCreep(pa) {
			slips = min(pa.prevSlip, 254) + 1
		}
		nSum, iSum := s.normalSum(pa), 0.0
		for i := pa.lo; i < pa.hi; i++ {
			iSum += points[i].ImpactImpulse
		}
		cnt := float64(pa.hi - pa.lo)
		even := fr.Mul(1 / cnt) // each point's share of a load it does not spread by
		for i := pa.lo; i < pa.hi; i++ {
			p := &points[i]
			share := 1 / cnt
			if nSum > 0 {
				share = s.nrows[i].lambda / nSum
			}
			p.FrictionImpulse = fr.Mul(share)
			if iSum > 0 {
				p.ImpactFriction = p.ImpactFriction.Add(fi.Mul(p.ImpactImpulse / iSum))
			}
			w := &s.prevPts[i]
			w.sliding, w.slips = pa.sliding, slips
			if s.pts[i].deferred > 0 {
				continue // no steady load (see store)
			}
			w.friction = even // should the pair turn into point contacts
			ps.mem[i] = patchMem{friction: fr, twist: tw, on: true}
		}
	}
}
