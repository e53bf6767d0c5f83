package collide

import (
	"math"

	"clatter/shapes"
)

// kind tells the concrete convex shape behind a view, so that the hot loops
// switch on a small integer instead of calling through interfaces.
type kind uint8

const (
	kNone kind = iota
	kSphere
	kBox
	kCapsule
	kCylinder
	kHull
	kTriangle
	kConvex
)

// view is one convex shape placed in the computation frame of a query (the
// local frame of A for convex pairs, the mesh frame for mesh triangles, the
// world for planes).
//
// Spheres and capsules are handled as a core (a point, a segment) swept by a
// ball of radius rad: support and feature queries on the core are exact and
// the radius is added afterwards.
type view struct {
	kind kind
	rot  mat3 // local axes expressed in the frame (columns)
	pos  vec3 // local origin in the frame
	rad  float64
	half vec3 // box half extents; half[2] is the half length of capsules and cylinders
	cylR float64
	hull *shapes.Hull
	tri  [3]vec3 // triangle corners in the frame
	triN vec3    // triangle unit normal (counter-clockwise side)
	conv shapes.Convex
	// size is a length scale of the shape (its bounding radius) for tolerances.
	size float64
}

// setConvex fills v for convex shape s at (rot, pos); it reports false for a
// shape it cannot handle (nil, or a non-convex Shape).
func (v *view) setConvex(s shapes.Shape, rot mat3, pos vec3) bool {
	*v = view{rot: rot, pos: pos}
	switch c := s.(type) {
	case shapes.Sphere:
		v.kind, v.rad, v.size = kSphere, c.Radius, c.Radius
	case *shapes.Sphere:
		if c == nil {
			return false
		}
		v.kind, v.rad, v.size = kSphere, c.Radius, c.Radius
	case shapes.Box:
		v.kind, v.half, v.size = kBox, c.Half, c.Half.Len()
	case *shapes.Box:
		if c == nil {
			return false
		}
		v.kind, v.half, v.size = kBox, c.Half, c.Half.Len()
	case shapes.Capsule:
		v.kind, v.rad, v.half[2], v.size = kCapsule, c.Radius, c.HalfLength, c.Radius+c.HalfLength
	case *shapes.Capsule:
		if c == nil {
			return false
		}
		v.kind, v.rad, v.half[2], v.size = kCapsule, c.Radius, c.HalfLength, c.Radius+c.HalfLength
	case shapes.Cylinder:
		v.kind, v.cylR, v.half[2], v.size = kCylinder, c.Radius, c.HalfLength, math.Hypot(c.Radius, c.HalfLength)
	case *shapes.Cylinder:
		if c == nil {
			return false
		}
		v.kind, v.cylR, v.half[2], v.size = kCylinder, c.Radius, c.HalfLength, math.Hypot(c.Radius, c.HalfLength)
	case *shapes.Hull:
		if c == nil || len(c.Vertices) == 0 {
			return false
		}
		v.kind, v.hull = kHull, c
		b := c.Bounds()
		v.size = 0.5*b.Size().Len() + b.Center().Len()
		if !(v.size > 0) || math.IsInf(v.size, 0) {
			// Bounds not recorded (a hull assembled by hand): measure it.
			v.size = 0
			for _, p := range c.Vertices {
				v.size = math.Max(v.size, p.Len())
			}
		}
	case shapes.Convex:
		if c == nil {
			return false
		}
		v.kind, v.conv = kConvex, c
		b := c.Bounds()
		v.size = 0.5*b.Size().Len() + b.Center().Len()
	default:
		return false
	}
	return true
}

// setTriangle fills v with triangle abc (already in the frame) of unit normal n.
func (v *view) setTriangle(a, b, c, n vec3) {
	*v = view{kind: kTriangle, rot: identity3, tri: [3]vec3{a, b, c}, triN: n}
	// Written out per component, as a.Add(b).Add(c).Mul(1.0/3) and
	// b.Sub(a).Len() compute them: the same operations in the same order,
	// without the copies of whole vectors the compiler makes for those.
	const third = 1.0 / 3
	v.pos = vec3{(a[0] + b[0] + c[0]) * third, (a[1] + b[1] + c[1]) * third, (a[2] + b[2] + c[2]) * third}
	v.size = max(distance(&b, &a), distance(&c, &b), distance(&a, &c)) // max as math.Max: NaN wins
}

// distance is p.Sub(q).Len() for vectors passed by pointer.
func distance(p, q *vec3) float64 {
	x, y, z := p[0]-q[0], p[1]-q[1], p[2]-q[2]
	return math.Sqrt(x*x + y*y + z*z)
}

var identity3 = mat3{1, 0, 0, 0, 1, 0, 0, 0, 1}

func sgn(x float64) float64 {
	if x < 0 {
		return -1
	}
	return 1
}

// axis returns the local z axis in the frame (capsule and cylinder axis).
func (v *view) axis() vec3 { return col(v.rot, 2) }

// support returns a point of the core farthest along frame direction d.
func (v *view) support(d vec3) vec3 {
	switch v.kind {
	case kSphere:
		return v.pos
	case kCapsule:
		ax := v.axis()
		if ax.Dot(d) >= 0 {
			return v.pos.Add(ax.Mul(v.half[2]))
		}
		return v.pos.Sub(ax.Mul(v.half[2]))
	case kBox:
		l := mulT(v.rot, d)
		return v.pos.Add(mul(v.rot, vec3{sgn(l[0]) * v.half[0], sgn(l[1]) * v.half[1], sgn(l[2]) * v.half[2]}))
	case kCylinder:
		l := mulT(v.rot, d)
		return v.pos.Add(mul(v.rot, shapes.Cylinder{Radius: v.cylR, HalfLength: v.half[2]}.Support(l)))
	case kHull:
		l := mulT(v.rot, d)
		return v.pos.Add(mul(v.rot, v.hull.Vertices[v.hull.SupportIndex(l)]))
	case kTriangle:
		best, bi := v.tri[0].Dot(d), 0
		if p := v.tri[1].Dot(d); p > best {
			best, bi = p, 1
		}
		if p := v.tri[2].Dot(d); p > best {
			bi = 2
		}
		return v.tri[bi]
	case kConvex:
		return v.pos.Add(mul(v.rot, v.conv.Support(mulT(v.rot, d))))
	}
	return v.pos
}

// supportFull is the support point of the whole shape, radius included.
func (v *view) supportFull(d vec3) vec3 {
	p := v.support(d)
	if v.rad > 0 {
		if l := d.Len(); l > 0 {
			p = p.Add(d.Mul(v.rad / l))
		} else {
			p[0] += v.rad
		}
	}
	return p
}

// center is a point inside the shape (its bounds centre), used to orient
// fallback directions.
func (v *view) center() vec3 {
	switch v.kind {
	case kHull:
		return v.pos.Add(mul(v.rot, v.hull.Bounds().Center()))
	case kConvex:
		return v.pos.Add(mul(v.rot, v.conv.Bounds().Center()))
	}
	return v.pos
}
