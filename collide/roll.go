package collide

import (
	"math"

	"clatter/shapes"
)

// A refreshed point moves with both shapes (persist.go), which is where a
// fresh query finds it only while each shape touches with a face, an edge
// or a vertex: a material point. A ball, a capsule or a cylinder on its
// side touches along a curved surface instead, and rolling carries the
// material point of the last full query off the contact: kept, it would
// lag behind the true one by the distance rolled since, and the normal
// load there would turn the part on in the direction it rolls. That feeds
// on itself: a ball of 2 cm resting on a box resting on a floor, kept
// awake, started rolling from rounding and left the box in 10 s at 1 ms;
// a capsule lying on a box crept 4 mm in 30 s at 1/30 s (measured; with
// the refresh off both stay within 1e-8 m).
//
// So the curved shape's point is not kept but found again at each refresh:
// its support along the kept normal at the point's place along its axis
// (rollPoints), where a fresh query finds it; the normal is kept in the
// frame of the other shape, whose face, edge or vertex touches; and the
// other shape's point is moved along its surface under it. Two curved
// shapes touching at one point find it again from their touching features
// (rollboth.go); a curved piece of a compound, and two curved shapes
// touching at two points or rim to rim, run the full query every step.

// capAlign is the cosine above which a cylinder's contact normal counts as
// along its axis, the contact then being on a flat cap: 0.05 rad (about 3
// degrees). A cylinder settled upright on a box in a pile of parts stood
// with its cap 7.5 mrad off the box's face, where the full query gives the
// cap's face manifold (four points); with 1e-3 rad its refresh took it for
// a rolling contact and put its points at the support along the normal, and
// it slid off at 7 mm/s for 20 steps where the full query held it still
// (0.14 mm apart after 0.3 s at 1 ms; measured, TestPersistentPileSamePhysics).
// With 0.05 rad that pile and the same pile settled otherwise stay within
// 1e-4 mm of the full query's (0.03 mm with 1e-3 rad).
const capAlign = 1 - 1.25e-3 // cos(0.05) to 2e-7

// rolling reports whether shape s touches along a curved surface with
// contact normal n (in s's frame); sub names the piece of a compound.
func rolling(s shapes.Shape, sub int32, n vec3) bool {
	switch c := s.(type) {
	case shapes.Sphere, shapes.Capsule:
		return true
	case shapes.Cylinder:
		return math.Abs(n[2]) < capAlign*n.Len()
	case *shapes.Compound:
		if sub < 0 || int(sub) >= len(c.Pieces) {
			return true // unknown piece: the full query is always right
		}
		p := &c.Pieces[sub]
		return rolling(p.Shape, -1, p.Pose.Orientation.Conjugate().Rotate(n))
	}
	return false
}

// rollable reports whether rollPoints places the points of s: a ball, a
// capsule or a cylinder, not a compound's piece.
func rollable(s shapes.Shape) bool {
	switch s.(type) {
	case shapes.Sphere, shapes.Capsule, shapes.Cylinder:
		return true
	}
	return false
}

// rollPoints places the refreshed points a and b (world) of e's kept point
// i (-1: the patch centre) at the support of the rolling shape along the
// normal n, A toward B: the rolling shape's point where a fresh query
// finds it, and the other's moved to lie across from it along n, which
// keeps their separation along n. r is that support's part that depends on
// n alone (e.rollDir), the same for every point of the manifold.
func (e *persistEntry) rollPoints(a, b *vec3, ra, rb *mat3, pa, pb *shapes.Pose, n *vec3, r *rollDir, i int) {
	k := &e.m
	if e.rollA {
		z := k.ca[2]
		if i >= 0 {
			z = k.pa[i][2]
		}
		loc := r.at(z)
		placeTo(a, ra, &pa.Position, &loc)
		sep := (b[0]-a[0])*n[0] + (b[1]-a[1])*n[1] + (b[2]-a[2])*n[2]
		*b = vec3{a[0] + n[0]*sep, a[1] + n[1]*sep, a[2] + n[2]*sep}
		return
	}
	z := k.cb[2]
	if i >= 0 {
		z = k.pb[i][2]
	}
	loc := r.at(z)
	placeTo(b, rb, &pb.Position, &loc)
	sep := (b[0]-a[0])*n[0] + (b[1]-a[1])*n[1] + (b[2]-a[2])*n[2]
	*a = vec3{b[0] - n[0]*sep, b[1] - n[1]*sep, b[2] - n[2]*sep}
}

// rollDir returns the support direction of e's rolling shape for the
// normal n (world, A toward B): n, or -n for B, in that shape's frame.
func (e *persistEntry) rollDir(ra, rb *mat3, n *vec3) rollDir {
	if e.rollA {
		return newRollDir(e.a, mulT(*ra, *n))
	}
	return newRollDir(e.b, mulT(*rb, vec3{-n[0], -n[1], -n[2]}))
}

// A rollDir is the point of a rollable shape farthest along a direction d
// (its frame), found once for every height along its axis (at): the ball's
// along d, the capsule's from its core, the cylinder's on its side. The
// square root (and a cylinder's hypotenuse) of the direction's length is
// then taken once for a manifold's points, not once for each.
type rollDir struct {
	base vec3    // the support of the ball, of the capsule's core's middle, or the cylinder's side (x, y)
	half float64 // the half-length of the capsule's core or of the cylinder
	kind uint8   // rollBall, rollCapsule or rollCylinder
}

const (
	rollBall uint8 = iota
	rollCapsule
	rollCylinder
)

// newRollDir returns the support of rollable shape s along d.
func newRollDir(s shapes.Shape, d vec3) rollDir {
	switch c := s.(type) {
	case shapes.Sphere:
		return rollDir{base: d.Mul(c.Radius / d.Len()), kind: rollBall}
	case shapes.Capsule:
		return rollDir{base: d.Mul(c.Radius / d.Len()), half: c.HalfLength, kind: rollCapsule}
	case shapes.Cylinder:
		l := math.Hypot(d[0], d[1])
		return rollDir{base: vec3{d[0] * c.Radius / l, d[1] * c.Radius / l}, half: c.HalfLength, kind: rollCylinder}
	}
	panic("collide: rollDir of a shape that does not roll")
}

// at is the support at height z along the shape's axis.
func (r *rollDir) at(z float64) vec3 {
	switch r.kind {
	case rollBall:
		return r.base
	case rollCapsule:
		return r.base.Add(vec3{0, 0, min(max(z, -r.half), r.half)})
	}
	return vec3{r.base[0], r.base[1], min(max(z, -r.half), r.half)}
}
