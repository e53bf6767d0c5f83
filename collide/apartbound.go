package collide

import (
	"math"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// A bound on the gap of a pair proved apart: conservative advancement
// (Mirtich, "Impulse-based Dynamic Simulation of Rigid Body Systems", PhD
// thesis, UC Berkeley, 1996, ch. 2; van den Bergen, "Collision Detection in
// Interactive 3D Environments", 2003, sec. 5.4): a gap between two shapes
// can close no faster than the points of one move relative to the other.
// When the remembered axis proves a pair apart (cache.go), the pair keeps
// the gap it found and the relative pose of the shapes then; at a later
// pose the gap along the same axis is at least that gap less the relative
// motion since (relMotion, persist.go), and while that bound still exceeds
// the margin the pair is apart without measuring the axis again: a resting
// pair apart costs the motion bound, a few dozen flops, instead of a
// support search on each shape.
//
// The bound proves what the axis itself would prove, so the answer is the
// one the full query gives, as with the axis:
//
//   - a face axis (hintFaceP, hintFaceQ) turns with the face's owner F, so
//     the gap along it is the least distance of the other shape M's points
//     above a plane fixed in F's frame, which falls by at most the distance
//     M's points move in F's frame;
//   - a direction of the general path (hintDir) bounds the distance of the
//     shapes from below, and the distance falls by at most the same motion
//     (M is then the smaller shape);
//   - an edge axis of two boxes turns with both shapes: it is measured
//     every step, as before.
//
// The rounding of the bound's arithmetic is about 1e-16 of the lengths in
// it, far inside the memBand the comparison adds, as for the axis.

// apartRef is the reference of a pair's bound: the gap along the axis and
// the relative pose at the step the axis last measured it.
type apartRef struct {
	on   bool
	mOnB bool         // the moving shape M is B
	a, b shapes.Shape // the shapes measured: a key queried with others measures again
	rq   mgl64.Quat   // M's orientation in F's frame
	rt   vec3         // M's origin in F's frame
	rho  float64      // bound on the distance of M's points from its origin
	rsum float64      // radius(a) + radius(b), for the band
	gap  float64      // the gap along the axis at that pose
}

// boundedApart reports whether the bound of the pair's reference (h.ref)
// proves shape a at pa and b at pb apart by more than margin plus memBand.
func (d *Detector) boundedApart(h *pairHint, a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose, margin float64) bool {
	r := &h.ref
	if !r.on || r.a != a || r.b != b {
		return false
	}
	left := r.gap - relMotion(r.mOnB, &r.rq, &r.rt, r.rho, &pa, &pb)
	if !(left > margin) {
		return false // the band is not negative
	}
	// First twice the band with the sum of each position's components'
	// sizes in place of its length: that sum is at least the length over
	// sqrt(3), so this is above the band as computed, whatever the
	// rounding; a gap beyond it is beyond the band, and only one between
	// the two needs the lengths themselves (two square roots).
	if left <= margin+2*memBand*(r.rsum+l1(&pa.Position)+l1(&pb.Position)) &&
		!(left > margin+memBand*(r.rsum+pa.Position.Len()+pb.Position.Len())) {
		return false
	}
	d.stats.Bounded++
	d.noteRoom(r, left, &pa, &pb)
	return true
}

// l1 is the sum of the sizes of v's components.
func l1(v *vec3) float64 { return math.Abs(v[0]) + math.Abs(v[1]) + math.Abs(v[2]) }

// measuredApart reports whether the pair's remembered axis h, measured at
// the current poses, proves shape a at pa and b at pb apart by more than
// margin plus memBand; the gap it measures becomes h's reference.
func (d *Detector) measuredApart(h *pairHint, a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose, margin float64) bool {
	gap, ok := hintGap(h, a, pa, b, pb)
	ra, rb := radius(a), radius(b)
	band := memBand * (ra + rb + pa.Position.Len() + pb.Position.Len())
	if !ok || !(gap > margin+band) {
		return false
	}
	switch h.kind {
	case hintFaceP, hintFaceQ:
		// M is the shape opposite the face's owner.
		mOnB := (h.kind == hintFaceQ) == h.swap
		rho := rb
		if !mOnB {
			rho = ra
		}
		h.ref = apartRef{on: true, mOnB: mOnB, a: a, b: b, rho: rho, rsum: ra + rb, gap: gap}
	case hintDir:
		h.ref = apartRef{on: true, mOnB: rb <= ra, a: a, b: b, rho: min(ra, rb), rsum: ra + rb, gap: gap}
	default:
		h.ref.on = false
		return true
	}
	h.ref.rq, h.ref.rt = relPose(h.ref.mOnB, &pa, &pb)
	r := &h.ref
	d.noteRoom(r, r.gap-relMotion(r.mOnB, &r.rq, &r.rt, r.rho, &pa, &pb), &pa, &pb)
	return true
}
