package collide

import (
	"cmp"
	"math"
	"slices"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// Persistent manifolds: temporal coherence for touching pairs. A pair at
// rest finds the same features touching step after step; CollidePair keeps
// each point of a pair's last full query as the two surface points it joins,
// each in its own shape's frame, and while the shapes have barely moved
// relative to each other since then it moves those points with the shapes
// instead of querying again: the separation is the gap between them along
// the normal, the position midway between them. This is the coherence of
// Lin and Canny, "A fast algorithm for incremental distance calculation",
// IEEE ICRA 1991 (the closest features change rarely between steps, so the
// last ones are the starting guess), taken to its simplest form for
// contact manifolds (Ericson, "Real-Time Collision Detection", 2005, on
// exploiting frame-to-frame coherence).
//
// A refreshed point is exact for the same features as long as they touch:
// a vertex against a face keeps its separation along the face's normal, and
// the position it reports is off by at most the motion. What a refresh
// cannot see is a feature coming within the margin that was not there at
// the full query, and a near tie (reduce's choice of four points, the
// resting face of restband.go, the reference face) that a fresh query would
// now decide the other way. So the full query runs again when
//
//   - the relative motion since the full query exceeds persistFraction of
//     the contact slop: no feature not seen then can have closed more than
//     that. It is measured as the motion of the smaller shape (or the
//     bounded one, against a plane or mesh) in the other's frame: the
//     translation of its origin plus the chord its farthest point sweeps
//     by the rotation;
//   - the margin has grown by more than that: a speculative point could
//     appear that the old margin excluded;
//   - the full query is persistAge steps old while the shapes have moved
//     more than persistStill of the motion limit since, or, while they
//     have not, persistAgeStill steps old, or twice as old as the last
//     such wait if the full query that ended it found the same features
//     (up to persistAgeMax);
//   - a refreshed point is beyond the margin (a fresh query would drop it)
//     or its two surface points have drifted apart along the surface by more
//     than the slop (the same point no longer);
//   - a manifold changed between lying flat and tilted in restband.go's
//     sense (its points' depths within restBand of their spread), where the
//     resting-face rule of hulls on planes and reduce's depth ties switch.
//
// A pair is kept when its full query gave one manifold: any two convex
// shapes, a convex shape on a plane, a compound with one piece touching, a
// convex shape on one flat region of a mesh. Results of several manifolds
// (compounds and meshes touching in several places) run the full query
// every step.
//
// The memory is a pure function of the poses and margins queried, in the
// order queried: the same queries give bit-identical results.

// persistFraction is the part of the contact slop that the shapes may move
// relative to each other before the full query runs again. The solver
// matches a point to last step's within the slop (contact/match.go) and
// leaves penetration below the slop alone; with a tenth of it, a refreshed
// point's position stays within a tenth of the slop of a fresh query's
// (each point moved with its shape by at most the motion), its separation
// is exact for the same features, and a point a refresh misses is still
// apart by most of the slop beyond this step's travel, so it could carry
// no load this step.
const persistFraction = 0.1

// persistAge is the most steps a full query's points are refreshed before
// the full query runs again. Motion and margin below their limits cannot
// bring a new feature into contact, but a near tie of the query (which four
// points reduce keeps, which face is the reference, whether a hull rests
// flat) may be decided another way at the current pose; this bounds how long
// the persistent result may lag the fresh one, and the history a step's
// contacts depend on, to a few steps, while a resting pair still skips
// seven full queries in eight.
const persistAge = 8

// persistStill and persistAgeStill let a pair at rest keep its points
// longer. The ties persistAge guards are decided by the relative pose: a
// query at a pose that differs from the full query's by under persistStill
// of the motion limit (a fortieth of the slop) decides them as the full
// query did, unless the tie was closer than that motion, which no age limit
// rules out either (a later full query at nearly the same pose may decide
// it either way). So a pair that has stayed that still refreshes up to
// persistAgeStill steps at first (longer once full queries confirm it,
// persistAgeMax). Its points meanwhile are as good as a fresh query's: the
// same features, separations exact for them, positions within the motion,
// which stays under persistStill of the limit (5 um at the default slop)
// however long the pair rests, since the motion is measured from the full
// query's pose (a creeping part meets the persistAge rule once its drift
// adds up to that); the cap only bounds the history a step's contacts
// depend on.
const (
	persistStill    = 0.25
	persistAgeStill = 128
)

// persistAgeMax is the longest wait of a still pair. The full query that
// ends a still wait of persistAgeStill or more steps tests whether a tie
// within the motion since has been decided another way: if it finds the
// same features (sub-shapes and point ids) as the points it replaces,
// none was, and the pair, still as before, waits twice as long for the
// next test; if not, the wait starts again from persistAgeStill. A pair
// resting for good then runs one full query in some thousand steps, and
// the history its contacts depend on stays bounded by that.
const persistAgeMax = 8 * persistAgeStill

// persistEntry is the memory of one pair.
type persistEntry struct {
	key        uint64
	full, seen uint32 // step of the last full query, of the last query (0: forgotten)
	// The shapes of the full query: a key queried with others (an index
	// reused for a new body) runs a full query.
	a, b shapes.Shape
	// mOnB: the moving shape M, whose motion in the frame of the other
	// shape F is measured, is B (the smaller of the two, or the bounded one
	// against a plane or mesh).
	mOnB   bool
	rq     mgl64.Quat // M's orientation in F's frame at the full query
	rt     vec3       // M's origin in F's frame at the full query
	rho    float64    // bound on the distance of M's points from its origin
	margin float64    // the margin of the full query
	flat   bool       // the manifold lay flat (see flatPoints)
	// wait: the age at which a still pair runs the full query again
	// (persistAgeMax); aged: this entry's full query is running because
	// the still pair reached it.
	wait uint32
	aged bool
	// nOnA: the kept normal is in A's frame (else B's): F's, or the shape
	// that does not roll (roll.go). rollA, rollB: the shape touches along a
	// curved surface.
	nOnA, rollA, rollB bool
	m                  keptManifold
	// cores: the touching features of A and B when both roll
	// (rollboth.go), refreshed by rollBoth.
	cores [2]rollCore
}

// keptManifold is a manifold in the shapes' frames.
type keptManifold struct {
	n          vec3 // normal, A toward B, in F's frame
	pa, pb     [4]vec3
	id         [4]uint32
	count      int
	subA, subB int32
	ca, cb     vec3 // the patch centre in A's and in B's frame
	radius     float64
}

// persistMem holds the entries sorted by key, and those first made this
// step until NextStep merges them in.
type persistMem struct {
	slop   float64 // the contact slop; 0 turns the memory off
	size   float64 // the slop's cap as a part of the pair's size (persistsize.go)
	step   uint32  // counts NextStep calls from 1
	mem    []persistEntry
	add    []persistEntry
	cursor int
}

// SetPersistence turns persistent manifolds of CollidePair on for contacts
// whose slop, the depth the solver leaves alone (m), is slop, or off when
// slop is 0: every touching pair then runs a full query, as Collide does.
// They are off in a new Detector.
func (d *Detector) SetPersistence(slop float64) {
	if !(slop > 0) || math.IsInf(slop, 0) {
		slop = 0
	}
	d.persist = persistMem{slop: slop, step: 1, mem: d.persist.mem[:0], add: d.persist.add[:0]}
}

// CollidePair is Collide for a pair that is queried step after step under
// the same key (for example the two body ids; a key names one pair of
// shapes): it uses what the pair's last query found to answer sooner. A
// pair apart is proved apart by the axis that separated it last (cache.go)
// and returns the same manifolds as Collide. A touching pair that has
// barely moved since its last full query, with persistence on
// (SetPersistence), refreshes that query's points (persist.go): the same
// features and ids, positions within persistFraction of the slop and
// separations exact for those features. Call NextStep once all of a step's
// pairs have been queried.
func (d *Detector) CollidePair(dst []Manifold, key uint64, a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose, margin float64) []Manifold {
	d.room.ok = false
	p := &d.persist
	if p.slop == 0 {
		return d.collideHinted(dst, key, a, pa, b, pb, margin)
	}
	if !(margin >= 0) || math.IsInf(margin, 0) {
		margin = 0
	}
	e := p.lookup(key)
	// A pose that is not finite makes the motion NaN or infinite, so
	// refresh leaves it to the full query (which checks the poses).
	if e != nil && e.a == a && e.b == b {
		// Refreshed in place at the end of dst (a manifold is some two
		// hundred bytes), and dropped again if the refresh fails.
		n := len(dst)
		dst = append(dst, Manifold{})
		if p.refresh(e, &pa, &pb, margin, &dst[n]) {
			e.seen = p.step
			d.cache.carry(key)
			d.stats.Persisted++
			return dst
		}
		dst = dst[:n]
	}
	n := len(dst)
	dst = d.collideHinted(dst, key, a, pa, b, pb, margin)
	p.keep(e, key, a, pa, b, pb, margin, dst[n:])
	return dst
}

// lookup returns the pair's entry, or nil.
func (p *persistMem) lookup(key uint64) *persistEntry {
	m, i := p.mem, p.cursor
	// Queries come in key order: the key is at the cursor, or between it
	// and the entry before (most pairs of a step are apart and have none).
	if (i == 0 || m[i-1].key < key) && (i == len(m) || m[i].key >= key) {
		if i < len(m) && m[i].key == key {
			p.cursor++
			return &m[i]
		}
		return nil
	}
	i, ok := slices.BinarySearchFunc(m, key, func(e persistEntry, k uint64) int { return cmp.Compare(e.key, k) })
	if !ok {
		p.cursor = i
		return nil
	}
	p.cursor = i + 1
	return &m[i]
}

// relPose returns the pose of M in F's frame.
func relPose(mOnB bool, pa, pb *shapes.Pose) (mgl64.Quat, vec3) {
	f, m := pa, pb
	if !mOnB {
		f, m = pb, pa
	}
	return qmulConjA(&f.Orientation, &m.Orientation), qrotateConj(&f.Orientation, m.Position.Sub(f.Position))
}

// refresh moves e's points with the shapes at pa and pb into out, a zero
// Manifold, and reports whether they stand for a fresh query (the
// conditions of the file comment); out is left partly written when they do
// not.
func (p *persistMem) refresh(e *persistEntry, pa, pb *shapes.Pose, margin float64, out *Manifold) bool {
	slop := p.pairSlop(e) // (persistsize.go)
	tol := persistFraction * slop
	age := p.step - e.full
	if margin > e.margin+tol {
		return false
	}
	motion := e.motion(pa, pb)
	if !(motion <= tol) || (age >= persistAge && motion > persistStill*tol) {
		return false
	}
	if age >= e.wait {
		e.aged = true // still, and waited long enough (persistAgeMax)
		return false
	}
	if e.rollA && e.rollB {
		return e.rollBoth(pa, pb, margin, out) // rollboth.go
	}
	ra, rb := shapes.RotationMatrix(pa.Orientation), shapes.RotationMatrix(pb.Orientation)
	rf := &ra
	if !e.nOnA {
		rf = &rb
	}
	k := &e.m
	n := mul(*rf, k.n)
	// Field by field: out is zero (appended so by CollidePair), and a
	// Manifold written whole is some two hundred bytes written twice.
	out.Normal, out.Count, out.SubA, out.SubB, out.PatchRadius = n, k.count, k.subA, k.subB, k.radius
	// By component, as in motion; the same operations as the vector
	// methods, so the same roundings.
	var a, b vec3
	var r rollDir
	if e.rollA || e.rollB {
		r = e.rollDir(&ra, &rb, &n) // roll.go
	}
	for i := 0; i < k.count; i++ {
		placeTo(&a, &ra, &pa.Position, &k.pa[i])
		placeTo(&b, &rb, &pb.Position, &k.pb[i])
		if e.rollA || e.rollB {
			e.rollPoints(&a, &b, &ra, &rb, pa, pb, &n, &r, i)
		}
		g0, g1, g2 := b[0]-a[0], b[1]-a[1], b[2]-a[2]
		sep := g0*n[0] + g1*n[1] + g2*n[2]
		d0, d1, d2 := g0-n[0]*sep, g1-n[1]*sep, g2-n[2]*sep
		if sep > margin || math.Sqrt(d0*d0+d1*d1+d2*d2) > slop {
			return false
		}
		pt := &out.Points[i]
		pt.Position = vec3{(a[0] + b[0]) * 0.5, (a[1] + b[1]) * 0.5, (a[2] + b[2]) * 0.5}
		pt.Separation, pt.ID = sep, k.id[i]
	}
	if flatPoints(out) != e.flat {
		return false
	}
	placeTo(&a, &ra, &pa.Position, &k.ca)
	placeTo(&b, &rb, &pb.Position, &k.cb)
	if e.rollA || e.rollB {
		e.rollPoints(&a, &b, &ra, &rb, pa, pb, &n, &r, -1)
	}
	out.PatchCenter = vec3{(a[0] + b[0]) * 0.5, (a[1] + b[1]) * 0.5, (a[2] + b[2]) * 0.5}
	return true
}

// placeTo sets dst to o + m v, rounded as o.Add(mul(m, v)).
func placeTo(dst *vec3, m *mat3, o, v *vec3) {
	dst[0] = o[0] + (m[0]*v[0] + m[3]*v[1] + m[6]*v[2])
	dst[1] = o[1] + (m[1]*v[0] + m[4]*v[1] + m[7]*v[2])
	dst[2] = o[2] + (m[2]*v[0] + m[5]*v[1] + m[8]*v[2])
}

// motion is the relative motion of the shapes at pa, pb since e's full
// query (relMotion).
func (e *persistEntry) motion(pa, pb *shapes.Pose) float64 {
	return relMotion(e.mOnB, &e.rq, &e.rt, e.rho, pa, pb)
}

// relMotion bounds how far any point of the moving shape M has moved in
// the frame of the other shape F since M's pose there was rq, rt (relPose):
// with q, t the pose of M in F's frame now and dq the rotation from rq to
// q, the translation |t - rt| plus the chord a point at distance rho from
// M's origin sweeps by dq, 2 sin(angle/2) rho = 2 |dq.V| rho. It is the
// quaternion algebra of relPose written out by component (a quaternion or
// vector passed by value costs a stalled store forward per field here),
// with the same operations in the same order, so the same roundings.
func relMotion(mOnB bool, rq *mgl64.Quat, rt *vec3, rho float64, pa, pb *shapes.Pose) float64 {
	f, m := pa, pb
	if !mOnB {
		f, m = pb, pa
	}
	// fc, the conjugate of F's orientation; q = fc m.Orientation.
	fw, fx, fy, fz := f.Orientation.W, -f.Orientation.V[0], -f.Orientation.V[1], -f.Orientation.V[2]
	mw, mx, my, mz := m.Orientation.W, m.Orientation.V[0], m.Orientation.V[1], m.Orientation.V[2]
	qw := fw*mw - (fx*mx + fy*my + fz*mz)
	qx := fy*mz - fz*my + mx*fw + fx*mw
	qy := fz*mx - fx*mz + my*fw + fy*mw
	qz := fx*my - fy*mx + mz*fw + fz*mw
	// t = fc rotating d = m.Position - f.Position: d + 2w (v x d) + 2v x (v x d).
	dx, dy, dz := m.Position[0]-f.Position[0], m.Position[1]-f.Position[1], m.Position[2]-f.Position[2]
	cx, cy, cz := fy*dz-fz*dy, fz*dx-fx*dz, fx*dy-fy*dx
	w2, ux, uy, uz := 2*fw, fx*2, fy*2, fz*2
	tx := dx + cx*w2 + (uy*cz - uz*cy) - rt[0]
	ty := dy + cy*w2 + (uz*cx - ux*cz) - rt[1]
	tz := dz + cz*w2 + (ux*cy - uy*cx) - rt[2]
	// The vector part of dq = conj(rq) q.
	rw, rx, ry, rz := rq.W, -rq.V[0], -rq.V[1], -rq.V[2]
	vx := ry*qz - rz*qy + qx*rw + rx*qw
	vy := rz*qx - rx*qz + qy*rw + ry*qw
	vz := rx*qy - ry*qx + qz*rw + rz*qw
	return math.Sqrt(tx*tx+ty*ty+tz*tz) + 2*math.Sqrt(vx*vx+vy*vy+vz*vz)*rho
}

// flatPoints reports whether m's points lie flat in the sense of
// restband.go: their depths within restBand of their spread in the contact
// plane (a tilt under a milliradian).
func flatPoints(m *Manifold) bool {
	if m.Count < 2 {
		return false
	}
	lo, hi, w := math.Inf(1), math.Inf(-1), 0.0
	p0 := &m.Points[0].Position
	for i := range m.Points[:m.Count] {
		pt := &m.Points[i]
		lo, hi = min(lo, pt.Separation), max(hi, pt.Separation)
		d0, d1, d2 := pt.Position[0]-p0[0], pt.Position[1]-p0[1], pt.Position[2]-p0[2]
		w = max(w, math.Sqrt(d0*d0+d1*d1+d2*d2))
	}
	return hi-lo <= restBand*w
}

// keep stores the result res of a full query of the pair in its entry e
// (nil if it has none): a result of one manifold is kept, any other forgets
// the pair.
func (p *persistMem) keep(e *persistEntry, key uint64, a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose, margin float64, res []Manifold) {
	wait := uint32(persistAgeStill)
	if e != nil {
		e.seen = 0
		if e.aged && e.a == a && e.b == b && sameFeatures(&e.m, res) {
			wait = min(2*e.wait, persistAgeMax)
		}
	}
	// A result with points comes from a query that found both poses finite
	// (Collide tests them first).
	if len(res) != 1 || res[0].Count == 0 || !persistable(a) || !persistable(b) {
		return
	}
	n := res[0].Normal
	rollA := rolling(a, res[0].SubA, qrotateConj(&pa.Orientation, n)) // roll.go
	rollB := rolling(b, res[0].SubB, qrotateConj(&pb.Orientation, n))
	var cores [2]rollCore
	if rollA && rollB {
		var ok bool
		if cores[0], cores[1], ok = bothCores(a, b, &pa, &pb, &res[0]); !ok { // rollboth.go
			return
		}
	} else if rollA && !rollable(a) || rollB && !rollable(b) {
		return
	}
	var mOnB bool
	var rho float64
	if e != nil && e.a == a && e.b == b {
		mOnB, rho = e.mOnB, e.rho // the same shapes: their bounds as measured before
	} else {
		sa, sb := boundRadius(a), boundRadius(b)
		if math.IsInf(sa, 0) && math.IsInf(sb, 0) {
			return
		}
		mOnB, rho = sb <= sa, min(sa, sb)
	}
	if e == nil {
		p.add = append(p.add, persistEntry{})
		e = &p.add[len(p.add)-1]
	}
	*e = persistEntry{key: key, full: p.step, seen: p.step, a: a, b: b, mOnB: mOnB, margin: margin, wait: wait}
	e.rollA, e.rollB, e.cores = rollA, rollB, cores
	e.nOnA = mOnB && !rollA || rollB
	e.rho = rho
	e.rq, e.rt = relPose(e.mOnB, &pa, &pb)
	m := &res[0]
	e.flat = flatPoints(m)
	ra, rb := shapes.RotationMatrix(pa.Orientation), shapes.RotationMatrix(pb.Orientation)
	rf := ra
	if !e.nOnA {
		rf = rb
	}
	k := &e.m
	k.n = mulT(rf, m.Normal)
	k.count, k.subA, k.subB, k.radius = m.Count, m.SubA, m.SubB, m.PatchRadius
	for i, pt := range m.Points[:m.Count] {
		h := m.Normal.Mul(0.5 * pt.Separation)
		k.pa[i] = mulT(ra, pt.Position.Sub(h).Sub(pa.Position))
		k.pb[i] = mulT(rb, pt.Position.Add(h).Sub(pb.Position))
		k.id[i] = pt.ID
	}
	k.ca = mulT(ra, m.PatchCenter.Sub(pa.Position))
	k.cb = mulT(rb, m.PatchCenter.Sub(pb.Position))
}

// sameFeatures reports whether res is one manifold of the sub-shapes and
// point ids of k, in the same order.
func sameFeatures(k *keptManifold, res []Manifold) bool {
	if len(res) != 1 {
		return false
	}
	m := &res[0]
	if m.Count != k.count || m.SubA != k.subA || m.SubB != k.subB {
		return false
	}
	for i := 0; i < m.Count; i++ {
		if m.Points[i].ID != k.id[i] {
			return false
		}
	}
	return true
}

// persistable reports the shapes of this package whose values == compares
// without a panic (a pointer, or a struct of numbers).
func persistable(s shapes.Shape) bool {
	switch s.(type) {
	case shapes.Box, shapes.Cylinder, shapes.Sphere, shapes.Capsule, shapes.Plane,
		*shapes.Hull, *shapes.Compound, *shapes.Plane, *Mesh:
		return true
	}
	return false
}

// boundRadius bounds the distance of s's points from its frame's origin
// (infinite for a plane).
func boundRadius(s shapes.Shape) float64 {
	bb := s.Bounds()
	if !finite(bb.Min) || !finite(bb.Max) {
		return math.Inf(1)
	}
	return 0.5*bb.Size().Len() + bb.Center().Len()
}

// nextStep forgets the pairs not queried this step and merges in the new.
func (p *persistMem) nextStep() {
	if p.slop == 0 {
		return
	}
	n := 0
	for i := range p.mem {
		if p.mem[i].seen == p.step {
			if n != i { // entries stay put until one is forgotten
				p.mem[n] = p.mem[i]
			}
			n++
		}
	}
	mem := mergeKeyed(p.mem, n, p.add, func(e *persistEntry) uint64 { return e.key }) // keymerge.go
	p.mem, p.add = mem, p.add[:0]
	p.cursor = 0
	if p.step++; p.step == 0 { // wrapped: 0 marks forgotten entries
		p.step = 1
	}
}

// carry keeps the pair's separating-axis memory for the next step when its
// persistent points answered the query instead.
func (c *pairCache) carry(key uint64) {
	if h := c.lookup(key); h != nil && h.kind != hintNone {
		c.keepHint(h)
	}
}
