package pack

import (
	"errors"
	"math"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// DropOrientation returns the rotation of a body's axes that presents the
// feature to a surface whose upward normal is up, as the drop-test
// standards (ASTM D5276, ISTA procedures) prescribe: a face parallel to the
// surface, facing it; for an edge or a corner, the centre of mass
// vertically above it. b is the body's box of bounds and com its centre of
// mass, both in its own axes. Of the rotations that do this, it returns the
// smallest, so that the body keeps its heading as far as it can.
func DropOrientation(b shapes.AABB, com shapes.Vec3, ft Feature, up shapes.Vec3) (shapes.Quat, error) {
	up = up.Normalize()
	for a := 0; a < 3; a++ {
		if !(com[a] > b.Min[a] && com[a] < b.Max[a]) {
			return shapes.Quat{}, errors.New("the centre of mass is not inside the body's box of bounds")
		}
	}
	if len(ft) == 1 {
		return arc(ft[0].Normal(), up.Mul(-1)), nil
	}
	// From the feature to the centre of mass, perpendicular to an edge.
	p := com.Sub(ft.Point(b, com))
	if !(p.Len() > 0) {
		return shapes.Quat{}, errors.New("the centre of mass lies on the struck feature")
	}
	return arc(p.Normalize(), up), nil
}

// arc is the smallest rotation taking unit vector a to unit vector b; for
// opposite vectors, a half turn about an axis perpendicular to a.
func arc(a, b shapes.Vec3) shapes.Quat {
	c := a.Cross(b)
	d := a.Dot(b)
	if d < -1+1e-12 {
		// Half turn about the body axis least aligned with a.
		ax := shapes.Vec3{1, 0, 0}
		if math.Abs(a[0]) > 0.9 {
			ax = shapes.Vec3{0, 1, 0}
		}
		ax = ax.Sub(a.Mul(ax.Dot(a))).Normalize()
		return mgl64.Quat{W: 0, V: ax}
	}
	return mgl64.Quat{W: 1 + d, V: c}.Normalize()
}

// Lowest returns the distance below the centre of mass, along up, of the
// lowest point of a convex or compound shape turned by q, whose centre of
// mass is com in its own axes: the height of the centre of mass above the
// surface when the shape rests on it.
func Lowest(s shapes.Shape, com shapes.Vec3, q shapes.Quat, up shapes.Vec3) (float64, bool) {
	down := q.Conjugate().Rotate(up.Normalize().Mul(-1)) // in the shape's axes
	var p shapes.Vec3
	switch c := s.(type) {
	case shapes.Convex:
		p = c.Support(down)
	case *shapes.Compound:
		best := math.Inf(-1)
		for _, pc := range c.Pieces {
			d := pc.Pose.RotateInv(down)
			x := pc.Pose.Apply(pc.Shape.Support(d))
			if v := x.Dot(down); v > best {
				best, p = v, x
			}
		}
	default:
		return 0, false
	}
	return p.Sub(com).Dot(down), true
}
