package collide

import (
	"math"

	"clatter/shapes"
)

// A refreshed point moves with both shapes (persist.go), which is where a
// fresh query finds it only while each shape touches with a face, an edge
// or a vertex: a material point. A ball, a capsule or a cylinder on its
// side touches along a curved surface instead, and rolling carries the
// material point of the last full query off the contact: the kept point
// lags behind the true one by the distance rolled since, up to the motion
// limit, and the normal load there turns the part on in the direction it
// rolls. That feeds on itself: a ball of 2 cm resting on a box resting on
// a floor, kept awake, started rolling from rounding and left the box in
// 10 s at 1 ms; a capsule lying on a box crept 4 mm in 30 s at 1/30 s
// (measured; with the refresh off both stay within 1e-8 m). Such pairs run
// the full query every step.

// capAlign is the cosine above which a cylinder's contact normal counts as
// along its axis, the contact then being on a flat cap: 1e-3 rad, far
// above the rounding of a normal found for a face and far below any tilt
// at which a cylinder stands on its rim.
const capAlign = 1 - 5e-7

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
