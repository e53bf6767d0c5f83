package engine

import (
	"math"

	"clatter/shapes"
)

// jgeom is a joint's geometry at the bodies' current poses, world frame.
type jgeom struct {
	rA, rB shapes.Vec3 // lever arms from the bodies' positions to their anchors
	d      shapes.Vec3 // A's anchor minus B's
	axis   shapes.Vec3 // the axis as B carries it
	axA    shapes.Vec3 // the axis as A carries it
	twist  shapes.Vec3 // rotation vector of A away from its pose relative to B at the zero
	raw    float64     // a revolute joint's angle in (-pi, pi]
}

func (w *World) jointGeom(jt *joint) jgeom {
	pa, qa := w.frame(jt.a)
	pb, qb := w.frame(jt.b)
	return jointGeomAt(jt, pa, qa, pb, qb, true)
}

// jointGeomAt is the joint's geometry with the bodies at the given poses;
// a revolute joint's raw angle only if angle is true (the equality rows'
// values do not need it).
func jointGeomAt(jt *joint, pa shapes.Vec3, qa shapes.Quat, pb shapes.Vec3, qb shapes.Quat, angle bool) jgeom {
	var g jgeom
	g.rA, g.rB = rotate(qa, jt.ra), rotate(qb, jt.rb)
	g.d = pa.Add(g.rA).Sub(pb.Add(g.rB))
	g.axis, g.axA = rotate(qb, jt.axB), rotate(qa, jt.axA)
	switch jt.def.Kind {
	case Revolute:
		if !angle {
			break
		}
		ub, ua := rotate(qb, jt.refB), rotate(qa, jt.refA)
		g.raw = math.Atan2(g.axis.Dot(ub.Cross(ua)), ub.Dot(ua))
	case Prismatic, Fixed:
		g.twist = rotationVector(qa.Mul(qb.Mul(jt.rel0).Conjugate()))
	}
	return g
}

// rotate turns v by unit quaternion q: v + w t + u x t with t = 2 u x v
// (u the vector part), without forming quaternion products.
func rotate(q shapes.Quat, v shapes.Vec3) shapes.Vec3 {
	u := q.V
	t := shapes.Vec3{2 * (u[1]*v[2] - u[2]*v[1]), 2 * (u[2]*v[0] - u[0]*v[2]), 2 * (u[0]*v[1] - u[1]*v[0])}
	return shapes.Vec3{
		v[0] + q.W*t[0] + u[1]*t[2] - u[2]*t[1],
		v[1] + q.W*t[1] + u[2]*t[0] - u[0]*t[2],
		v[2] + q.W*t[2] + u[0]*t[1] - u[1]*t[0],
	}
}

// rotationVector returns the axis times the angle (rad, at most pi) of a
// unit quaternion.
func rotationVector(q shapes.Quat) shapes.Vec3 {
	if q.W < 0 {
		q = q.Scale(-1)
	}
	s := q.V.Len()
	if s < 1e-12 {
		return q.V.Mul(2) // small angle: 2 sin(a/2) axis = a axis to rounding
	}
	return q.V.Mul(2 * math.Atan2(s, q.W) / s)
}

// wrapAngle maps an angle difference into [-pi, pi).
func wrapAngle(a float64) float64 {
	return a - 2*math.Pi*math.Floor((a+math.Pi)/(2*math.Pi))
}

// perpendiculars returns two unit vectors normal to unit n and to each
// other, without a branch on a near-zero component: Duff, Burgess,
// Christensen, Hery, Kensler, Liani and Villemin, "Building an orthonormal
// basis, revisited", JCGT 6(1), 2017.
func perpendiculars(n shapes.Vec3) (shapes.Vec3, shapes.Vec3) {
	sign := math.Copysign(1, n[2])
	a := -1 / (sign + n[2])
	b := n[0] * n[1] * a
	return shapes.Vec3{1 + sign*n[0]*n[0]*a, sign * b, -sign * n[0]}, shapes.Vec3{b, sign + n[1]*n[1]*a, -n[1]}
}

// eqBasis holds the directions that a joint's equality rows measure along
// this step: normals of the axis in the world, and in B's frame for rows
// that turn with B.
type eqBasis struct{ p1, p2, p1B, p2B shapes.Vec3 }

// eqValues writes the values C of a joint's equality rows, in the order of
// its rows, with the bodies at the poses of geometry g (B turned by qb),
// and returns how many rows there are.
func eqValues(jt *joint, g *jgeom, qb shapes.Quat, bs *eqBasis, out *[6]float64) int {
	switch jt.def.Kind {
	case Revolute:
		cr := g.axis.Cross(g.axA)
		out[0], out[1], out[2], out[3], out[4] = g.d[0], g.d[1], g.d[2], bs.p1.Dot(cr), bs.p2.Dot(cr)
		return 5
	case Spherical:
		out[0], out[1], out[2] = g.d[0], g.d[1], g.d[2]
		return 3
	case Fixed:
		out[0], out[1], out[2], out[3], out[4], out[5] = g.d[0], g.d[1], g.d[2], g.twist[0], g.twist[1], g.twist[2]
		return 6
	case Prismatic:
		out[0], out[1], out[2] = g.twist[0], g.twist[1], g.twist[2]
		out[3], out[4] = rotate(qb, bs.p1B).Dot(g.d), rotate(qb, bs.p2B).Dot(g.d)
		return 5
	case Distance:
		l := g.d.Len()
		if !(l > 1e-12) {
			return 0
		}
		if jt.def.MinLength == jt.def.MaxLength {
			out[0] = l - jt.length
			return 1
		}
		out[0], out[1] = l-jt.def.MinLength, jt.def.MaxLength-l
		return 2
	}
	return 0
}
