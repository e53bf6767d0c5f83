package resting

import (
	"fmt"
	"math"

	"clatter/shapes"
)

// OfShape analyses the resting faces of a part made of shape s, with centre
// of mass com in the shape's frame (for a uniform solid, s.Mass(density).Center).
//
// The faces, by shape:
//   - *shapes.Hull: as OfHull, in the hull's face order.
//   - shapes.Box: its hull, faces in the order +x, -x, +y, -y, +z, -z (the
//     order shapes.NewHull gives the box's corners).
//   - shapes.Cylinder: three faces, exact rather than through a polygon:
//     0 the +z cap, 1 the -z cap, 2 the curved side (Axis z, zero Normal).
//     A cap captures the directions whose ray from com pierces its disc (a
//     cone of half-angle alpha with tan(alpha) = r/d for com on the axis,
//     Omega = 2 pi (1 - cos(alpha))), and its tip angle is
//     atan((r - rho)/d) with rho the distance of com from the axis. The
//     side takes the rest. Standing on its side the part is stable along
//     the axis but neutral across it: it rolls at any cross tilt, so the
//     side's TipAngleRad is the tilt along the axis that brings com over a
//     rim, atan(d_min/(r - rho)) with d_min the distance of com from the
//     nearer cap plane.
//   - shapes.Capsule: one face, the curved side (Axis z). The hemispherical
//     ends have no flat spot to stand on, so a capsule always comes to rest
//     on its side: Probability 1. Direct is the side's own capture share (the
//     directions whose ray from com pierces the cylindrical part), the rest
//     being the ends that roll onto it; TipAngleRad is the tilt along the
//     axis that brings com past the end of the straight contact line.
//   - shapes.Sphere (or a capsule of zero length): no faces, nil; a ball
//     rests anywhere.
//   - *shapes.Compound of boxes and hulls: the analysis of the convex hull
//     of all pieces' corners (shapes.NewHull, its face order). Compounds with
//     curved pieces, planes and triangle meshes are ErrUnsupported.
//
// Pointers to Box, Cylinder, Capsule and Sphere are accepted as well.
func OfShape(s shapes.Shape, com shapes.Vec3) ([]Face, error) {
	if !finite(com) {
		return nil, fmt.Errorf("resting: centre of mass %v is not finite: %w", com, ErrOutside)
	}
	switch sh := s.(type) {
	case *shapes.Hull:
		return OfHull(sh, com)
	case shapes.Box:
		h, err := boxHull(sh)
		if err != nil {
			return nil, err
		}
		return OfHull(h, com)
	case *shapes.Box:
		if sh != nil {
			return OfShape(*sh, com)
		}
	case shapes.Cylinder:
		return ofCylinder(sh, com)
	case *shapes.Cylinder:
		if sh != nil {
			return ofCylinder(*sh, com)
		}
	case shapes.Capsule:
		return ofCapsule(sh, com)
	case *shapes.Capsule:
		if sh != nil {
			return ofCapsule(*sh, com)
		}
	case shapes.Sphere:
		return ofSphere(sh, com)
	case *shapes.Sphere:
		if sh != nil {
			return ofSphere(*sh, com)
		}
	case *shapes.Compound:
		if sh != nil {
			return ofCompound(sh, com)
		}
	}
	return nil, fmt.Errorf("resting: %T has no resting faces (only parts made of boxes, cylinders, capsules, spheres, hulls and compounds of boxes and hulls do): %w", s, ErrUnsupported)
}

// boxHull builds the hull of a box by hand, exact, faces +x, -x, +y, -y, +z, -z.
func boxHull(b shapes.Box) (*shapes.Hull, error) {
	hx, hy, hz := b.Half[0], b.Half[1], b.Half[2]
	if !(hx > 0 && hy > 0 && hz > 0) || !finite(b.Half) {
		return nil, fmt.Errorf("resting: box half sizes %v must be positive and finite: %w", b.Half, ErrDegenerate)
	}
	// Vertex i has x = +hx when bit 0 is set, y = +hy for bit 1, z = +hz for bit 2.
	h := &shapes.Hull{Vertices: make([]shapes.Vec3, 8)}
	for i := range h.Vertices {
		v := shapes.Vec3{-hx, -hy, -hz}
		for k := 0; k < 3; k++ {
			if i&(1<<k) != 0 {
				v[k] = -v[k]
			}
		}
		h.Vertices[i] = v
	}
	// Counter-clockwise seen from outside.
	quads := [6][4]int32{
		{1, 3, 7, 5}, // +x
		{0, 4, 6, 2}, // -x
		{2, 6, 7, 3}, // +y
		{0, 1, 5, 4}, // -y
		{4, 5, 7, 6}, // +z
		{0, 2, 3, 1}, // -z
	}
	for i, q := range quads {
		var n shapes.Vec3
		n[i/2] = 1
		if i%2 == 1 {
			n[i/2] = -1
		}
		h.Faces = append(h.Faces, shapes.Face{Normal: n, Offset: b.Half[i/2], Verts: q[:]})
	}
	return h, nil
}

func ofCompound(c *shapes.Compound, com shapes.Vec3) ([]Face, error) {
	var pts []shapes.Vec3
	for i, p := range c.Pieces {
		var local []shapes.Vec3
		switch sh := p.Shape.(type) {
		case shapes.Box:
			h, err := boxHull(sh)
			if err != nil {
				return nil, fmt.Errorf("resting: compound piece %d: %w", i, err)
			}
			local = h.Vertices
		case *shapes.Box:
			h, err := boxHull(*sh)
			if err != nil {
				return nil, fmt.Errorf("resting: compound piece %d: %w", i, err)
			}
			local = h.Vertices
		case *shapes.Hull:
			local = sh.Vertices
		default:
			return nil, fmt.Errorf("resting: compound piece %d is a %T: resting faces of compounds need polyhedral pieces (boxes, hulls): %w", i, p.Shape, ErrUnsupported)
		}
		for _, v := range local {
			pts = append(pts, p.Pose.Apply(v))
		}
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		return nil, fmt.Errorf("resting: hull of the compound: %v: %w", err, ErrDegenerate)
	}
	return OfHull(h, com)
}

func ofSphere(s shapes.Sphere, com shapes.Vec3) ([]Face, error) {
	if !(s.Radius > 0) || math.IsInf(s.Radius, 0) {
		return nil, fmt.Errorf("resting: sphere radius %g must be positive and finite: %w", s.Radius, ErrDegenerate)
	}
	if !(com.Len() < s.Radius*(1-insideTol)) {
		return nil, fmt.Errorf("resting: centre of mass %v is not inside the sphere of radius %g: %w", com, s.Radius, ErrOutside)
	}
	return nil, nil
}

// roundCore checks a cylinder's or capsule's dimensions and com, and returns
// the distance rho of com from the axis and its distances below the planes
// z = +l and above z = -l.
func roundCore(kind string, r, l float64, com shapes.Vec3) (rho, dTop, dBot float64, err error) {
	if !(r > 0) || !(l >= 0) || math.IsInf(r, 0) || math.IsInf(l, 0) {
		return 0, 0, 0, fmt.Errorf("resting: %s radius %g and half length %g must be positive and finite: %w", kind, r, l, ErrDegenerate)
	}
	rho = math.Hypot(com[0], com[1])
	dTop, dBot = l-com[2], l+com[2]
	return rho, dTop, dBot, nil
}

func ofCylinder(c shapes.Cylinder, com shapes.Vec3) ([]Face, error) {
	r, l := c.Radius, c.HalfLength
	rho, dTop, dBot, err := roundCore("cylinder", r, l, com)
	if err != nil {
		return nil, err
	}
	if !(l > 0) {
		return nil, fmt.Errorf("resting: cylinder half length %g must be positive: %w", l, ErrDegenerate)
	}
	tol := insideTol * math.Hypot(2*r, 2*l)
	if !(r-rho > tol && dTop > tol && dBot > tol) {
		return nil, fmt.Errorf("resting: centre of mass %v is not inside the cylinder of radius %g and half length %g: %w", com, r, l, ErrOutside)
	}
	top := discSolidAngle(r, rho, dTop) / (4 * math.Pi)
	bot := discSolidAngle(r, rho, dBot) / (4 * math.Pi)
	capFace := func(n float64, d, share float64) Face {
		return Face{
			Normal: shapes.Vec3{0, 0, n}, Area: math.Pi * r * r, Height: d, Stable: true,
			TipAngleRad: math.Atan2(r-rho, d), Direct: share, Probability: share,
		}
	}
	side := 1 - top - bot
	faces := []Face{
		capFace(1, dTop, top),
		capFace(-1, dBot, bot),
		{
			Axis: shapes.Vec3{0, 0, 1}, Area: 2 * math.Pi * r * 2 * l, Height: r - rho, Stable: true,
			TipAngleRad: math.Atan2(math.Min(dTop, dBot), r-rho), Direct: side, Probability: side,
		},
	}
	for i := range faces {
		faces[i].RollsTo = i
	}
	return faces, nil
}

func ofCapsule(c shapes.Capsule, com shapes.Vec3) ([]Face, error) {
	r, l := c.Radius, c.HalfLength
	rho, dTop, dBot, err := roundCore("capsule", r, l, com)
	if err != nil {
		return nil, err
	}
	// Inside: within r of the core segment.
	z := math.Max(-l, math.Min(l, com[2]))
	if !(math.Hypot(rho, com[2]-z) < r*(1-insideTol)) {
		return nil, fmt.Errorf("resting: centre of mass %v is not inside the capsule of radius %g and half length %g: %w", com, r, l, ErrOutside)
	}
	if l == 0 {
		return nil, nil // a ball
	}
	if tol := insideTol * (r + l); !(dTop > tol && dBot > tol) {
		// A centre of mass inside a hemispherical end sits below that end's
		// centre when the part stands on the end, which is then a stable
		// rest on a curved cap (a roly-poly toy), outside this model.
		return nil, fmt.Errorf("resting: centre of mass %v lies in an end of the capsule (|z| >= half length %g), where the part would stand on its end: %w", com, l, ErrUnsupported)
	}
	side := 1 - (discSolidAngle(r, rho, dTop)+discSolidAngle(r, rho, dBot))/(4*math.Pi)
	return []Face{{
		Axis: shapes.Vec3{0, 0, 1}, Area: 2 * math.Pi * r * 2 * l, Height: r - rho, Stable: true,
		TipAngleRad: math.Atan2(math.Min(dTop, dBot), r-rho),
		Direct:      side, Probability: 1, RollsTo: 0,
	}}, nil
}

// discSolidAngle is the solid angle of a disc of radius r seen from a point
// at height d > 0 above its plane whose foot lies rho < r from the centre.
//
// On the axis it is the cone's 2 pi (1 - d / sqrt(d^2 + r^2)). Off the axis,
// in polar coordinates about the foot, a ray at azimuth phi leaves the disc
// at R(phi) = sqrt(r^2 - rho^2 sin^2 phi) - rho cos phi, and integrating
// d s ds / (d^2 + s^2)^(3/2) from 0 to R gives
//
//	Omega = integral over phi in [0, 2 pi) of (1 - d / sqrt(d^2 + R(phi)^2)).
//
// The integrand is smooth and periodic, so the trapezoidal rule converges
// geometrically (Trefethen and Weideman, "The exponentially convergent
// trapezoidal rule", SIAM Review 56(3), 2014); the number of nodes doubles
// until the result stops changing at rounding level.
func discSolidAngle(r, rho, d float64) float64 {
	if rho == 0 {
		return 2 * math.Pi * (1 - d/math.Hypot(d, r))
	}
	f := func(phi float64) float64 {
		s := math.Sin(phi)
		R := math.Sqrt(math.Max(0, r*r-rho*rho*s*s)) - rho*math.Cos(phi)
		return 1 - d/math.Hypot(d, R)
	}
	// By symmetry about phi = 0 integrate over [0, pi] and double; the
	// trapezoidal rule on the half period with end weights 1/2 is the full
	// periodic rule.
	n := 16
	var sum float64
	for i := 0; i <= n; i++ {
		w := 1.0
		if i == 0 || i == n {
			w = 0.5
		}
		sum += w * f(math.Pi*float64(i)/float64(n))
	}
	prev := 2 * math.Pi / float64(n) * sum
	for n < 1<<20 {
		// Doubling adds the midpoints.
		for i := 0; i < n; i++ {
			sum += f(math.Pi * (float64(2*i) + 1) / float64(2*n))
		}
		n *= 2
		cur := 2 * math.Pi / float64(n) * sum
		if math.Abs(cur-prev) <= 1e-15*cur {
			return cur
		}
		prev = cur
	}
	return prev
}
