package shapes

import (
	"math"

	"github.com/go-gl/mathgl/mgl64"
)

// Vec3 and Quat are the project's vector and quaternion types (float64,
// quaternions as w, x, y, z).
type (
	Vec3 = mgl64.Vec3
	Quat = mgl64.Quat
	Mat3 = mgl64.Mat3
)

// Pose places a local frame in the world: x_world = Position + Orientation.Rotate(x_local).
type Pose struct {
	Position    Vec3
	Orientation Quat
}

// IdentityPose is the pose of a frame that coincides with the world.
var IdentityPose = Pose{Orientation: mgl64.QuatIdent()}

// Apply maps a local point to the world.
func (p Pose) Apply(v Vec3) Vec3 { return p.Position.Add(p.Orientation.Rotate(v)) }

// ApplyInv maps a world point into the local frame.
func (p Pose) ApplyInv(v Vec3) Vec3 { return p.Orientation.Conjugate().Rotate(v.Sub(p.Position)) }

// Rotate turns a local direction into the world.
func (p Pose) Rotate(v Vec3) Vec3 { return p.Orientation.Rotate(v) }

// RotateInv turns a world direction into the local frame.
func (p Pose) RotateInv(v Vec3) Vec3 { return p.Orientation.Conjugate().Rotate(v) }

// Mul composes poses: (p.Mul(q)).Apply(x) == p.Apply(q.Apply(x)).
func (p Pose) Mul(q Pose) Pose {
	return Pose{Position: p.Apply(q.Position), Orientation: p.Orientation.Mul(q.Orientation).Normalize()}
}

// Inverse returns the pose that undoes p.
func (p Pose) Inverse() Pose {
	c := p.Orientation.Conjugate()
	return Pose{Position: c.Rotate(p.Position).Mul(-1), Orientation: c}
}

// AABB is an axis-aligned box given by its corners.
type AABB struct{ Min, Max Vec3 }

// EmptyAABB returns a box that contains nothing and grows by Extend.
func EmptyAABB() AABB {
	inf := math.Inf(1)
	return AABB{Min: Vec3{inf, inf, inf}, Max: Vec3{-inf, -inf, -inf}}
}

// Extend grows the box to contain v.
func (b AABB) Extend(v Vec3) AABB {
	for i := 0; i < 3; i++ {
		b.Min[i] = math.Min(b.Min[i], v[i])
		b.Max[i] = math.Max(b.Max[i], v[i])
	}
	return b
}

// Union returns the smallest box containing both (an empty box adds nothing).
func (b AABB) Union(c AABB) AABB {
	for i := 0; i < 3; i++ {
		b.Min[i] = math.Min(b.Min[i], c.Min[i])
		b.Max[i] = math.Max(b.Max[i], c.Max[i])
	}
	return b
}

// Overlaps reports whether the two boxes intersect (touching counts).
func (b AABB) Overlaps(c AABB) bool {
	return b.Min[0] <= c.Max[0] && c.Min[0] <= b.Max[0] &&
		b.Min[1] <= c.Max[1] && c.Min[1] <= b.Max[1] &&
		b.Min[2] <= c.Max[2] && c.Min[2] <= b.Max[2]
}

// Grow enlarges the box by d on every side.
func (b AABB) Grow(d float64) AABB {
	g := Vec3{d, d, d}
	return AABB{Min: b.Min.Sub(g), Max: b.Max.Add(g)}
}

// Size is the diagonal extent Max - Min.
func (b AABB) Size() Vec3 { return b.Max.Sub(b.Min) }

// Center is the midpoint of the box.
func (b AABB) Center() Vec3 { return b.Min.Add(b.Max).Mul(0.5) }

// Transform returns the world bounds of local box b placed at pose p
// (bounds of the rotated box, exact for the box, conservative for its content).
//
// It is p.Apply(b.Center()) plus and minus the extents along the rows of
// p.Orientation.Mat4(), written out by component with those methods'
// arithmetic (the same roundings): the methods pass their operands by value
// and made this five times slower, a twentieth of a resting part's step.
func (b AABB) Transform(p Pose) AABB {
	w, x, y, z := p.Orientation.W, p.Orientation.V[0], p.Orientation.V[1], p.Orientation.V[2]
	// Centre, turned as by Quat.Rotate: v + 2w (u x v) + 2u x (u x v).
	v := Vec3{(b.Min[0] + b.Max[0]) * 0.5, (b.Min[1] + b.Max[1]) * 0.5, (b.Min[2] + b.Max[2]) * 0.5}
	uv := Vec3{y*v[2] - z*v[1], z*v[0] - x*v[2], x*v[1] - y*v[0]}
	w2, x2, y2, z2 := 2*w, x*2, y*2, z*2
	c := Vec3{
		p.Position[0] + (v[0] + uv[0]*w2 + (y2*uv[2] - z2*uv[1])),
		p.Position[1] + (v[1] + uv[1]*w2 + (z2*uv[0] - x2*uv[2])),
		p.Position[2] + (v[2] + uv[2]*w2 + (x2*uv[1] - y2*uv[0])),
	}
	h := Vec3{(b.Max[0] - b.Min[0]) * 0.5, (b.Max[1] - b.Min[1]) * 0.5, (b.Max[2] - b.Min[2]) * 0.5}
	r := [9]float64{ // column-major, as Mat4's upper left block
		1 - 2*y*y - 2*z*z, 2*x*y + 2*w*z, 2*x*z - 2*w*y,
		2*x*y - 2*w*z, 1 - 2*x*x - 2*z*z, 2*y*z + 2*w*x,
		2*x*z + 2*w*y, 2*y*z - 2*w*x, 1 - 2*x*x - 2*y*y,
	}
	var e Vec3
	for i := 0; i < 3; i++ {
		e[i] = math.Abs(r[i])*h[0] + math.Abs(r[3+i])*h[1] + math.Abs(r[6+i])*h[2]
	}
	return AABB{Min: Vec3{c[0] - e[0], c[1] - e[1], c[2] - e[2]}, Max: Vec3{c[0] + e[0], c[1] + e[1], c[2] + e[2]}}
}

// RotationMatrix returns the 3x3 rotation matrix of unit quaternion q.
func RotationMatrix(q Quat) Mat3 {
	w, x, y, z := q.W, q.V[0], q.V[1], q.V[2]
	return Mat3{
		1 - 2*(y*y+z*z), 2 * (x*y + w*z), 2 * (x*z - w*y),
		2 * (x*y - w*z), 1 - 2*(x*x+z*z), 2 * (y*z + w*x),
		2 * (x*z + w*y), 2 * (y*z - w*x), 1 - 2*(x*x+y*y),
	}
}
