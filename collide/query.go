package collide

import (
	"clatter/shapes"
)

// DistanceResult is the outcome of a distance query between two convex
// shapes.
type DistanceResult struct {
	// Distance between the surfaces; zero when the shapes overlap or touch.
	Distance float64
	// PointA and PointB are the closest world points of A and B (when apart).
	PointA, PointB shapes.Vec3
	// Normal is the unit separating direction from A toward B (zero when the
	// shapes overlap: see Penetration).
	Normal shapes.Vec3
	// Overlap reports that the shapes intersect or touch.
	Overlap bool
	// Iterations of GJK, and whether it stopped on its iteration cap (the
	// result is then the best upper bound found).
	Iterations int
	Capped     bool
}

// Distance returns the distance between convex shapes a at pose pa and b at
// pose pb by GJK with the signed-volumes sub-simplex step. Spheres and
// capsules are measured exactly through their core point or segment. A pose
// that is not finite gives the zero result.
func (d *Detector) Distance(a shapes.Convex, pa shapes.Pose, b shapes.Convex, pb shapes.Pose) DistanceResult {
	var res DistanceResult
	if !finitePose(pa) || !finitePose(pb) {
		return res
	}
	fa, fb := poseFrame(pa), poseFrame(pb)
	var va, vb view
	rot, pos := fa.relative(fb)
	if !va.setConvex(a, identity3, vec3{}) || !vb.setConvex(b, rot, pos) {
		return res
	}
	g := d.gjk(&va, &vb, false)
	res.Iterations, res.Capped = g.iters, g.capped
	r := va.rad + vb.rad
	if g.overlap || g.dist <= r {
		res.Overlap = true
		return res
	}
	n := g.v.Mul(-1 / g.dist)
	res.Distance = g.dist - r
	res.Normal = mul(fa.rot, n)
	res.PointA = fa.pos.Add(mul(fa.rot, g.pa.Add(n.Mul(va.rad))))
	res.PointB = fa.pos.Add(mul(fa.rot, g.pb.Sub(n.Mul(vb.rad))))
	return res
}

// PenetrationResult is the outcome of a penetration query.
type PenetrationResult struct {
	// Overlap reports that the shapes intersect. When false, Depth is the
	// negated distance and the rest describe the closest points.
	Overlap bool
	// Depth is the length of the least translation of B that separates the
	// shapes, along Normal (unit, from A toward B).
	Depth  float64
	Normal shapes.Vec3
	// PointA is the deepest point of A inside B and PointB the deepest of B
	// inside A (world).
	PointA, PointB shapes.Vec3
	// Capped reports that EPA stopped on its iteration or size cap (Depth is
	// then a lower bound); Failed that no depth could be measured (the
	// Minkowski difference is flat) and Normal is the line of centres.
	Capped, Failed bool
}

// Penetration returns the penetration depth and normal of convex shapes a
// and b by GJK and EPA: the signed separation is -Depth.
func (d *Detector) Penetration(a shapes.Convex, pa shapes.Pose, b shapes.Convex, pb shapes.Pose) PenetrationResult {
	var res PenetrationResult
	if !finitePose(pa) || !finitePose(pb) {
		res.Failed = true
		return res
	}
	fa, fb := poseFrame(pa), poseFrame(pb)
	var va, vb view
	rot, pos := fa.relative(fb)
	if !va.setConvex(a, identity3, vec3{}) || !vb.setConvex(b, rot, pos) {
		return res
	}
	before := d.stats
	r, _ := d.distance(&va, &vb, posInf)
	res.Overlap = r.sep < 0
	res.Depth = -r.sep
	res.Normal = mul(fa.rot, r.n)
	res.PointA = fa.pos.Add(mul(fa.rot, r.pa))
	res.PointB = fa.pos.Add(mul(fa.rot, r.pb))
	res.Capped = d.stats.EPACapped > before.EPACapped
	res.Failed = r.failed
	return res
}
