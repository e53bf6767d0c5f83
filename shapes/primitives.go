package shapes

import "math"

// Sphere is a ball of the given radius centred on the local origin.
type Sphere struct{ Radius float64 }

// Support implements Convex.
func (s Sphere) Support(d Vec3) Vec3 {
	l := d.Len()
	if l == 0 {
		return Vec3{s.Radius, 0, 0}
	}
	return d.Mul(s.Radius / l)
}

// Bounds implements Convex.
func (s Sphere) Bounds() AABB {
	r := s.Radius
	return AABB{Min: Vec3{-r, -r, -r}, Max: Vec3{r, r, r}}
}

// Mass implements Convex: I = 2 m r^2 / 5.
func (s Sphere) Mass(density float64) Mass {
	v := 4.0 / 3 * math.Pi * s.Radius * s.Radius * s.Radius
	m := density * v
	i := 0.4 * m * s.Radius * s.Radius
	return Mass{Volume: v, Mass: m, Inertia: diagInertia(i, i, i)}
}

// Box is a rectangular block centred on the local origin with half edge
// lengths Half along its x, y and z axes.
type Box struct{ Half Vec3 }

// Support implements Convex.
func (b Box) Support(d Vec3) Vec3 {
	return Vec3{sign(d[0]) * b.Half[0], sign(d[1]) * b.Half[1], sign(d[2]) * b.Half[2]}
}

// Bounds implements Convex.
func (b Box) Bounds() AABB { return AABB{Min: b.Half.Mul(-1), Max: b.Half} }

// Mass implements Convex: I_x = m (b^2 + c^2) / 12 for full edges b, c.
func (b Box) Mass(density float64) Mass {
	x, y, z := 2*b.Half[0], 2*b.Half[1], 2*b.Half[2]
	v := x * y * z
	m := density * v
	return Mass{Volume: v, Mass: m, Inertia: diagInertia(m*(y*y+z*z)/12, m*(x*x+z*z)/12, m*(x*x+y*y)/12)}
}

// Capsule is a cylinder of Radius capped by hemispheres, its core segment of
// length 2 HalfLength along the local z axis.
type Capsule struct{ Radius, HalfLength float64 }

// Support implements Convex.
func (c Capsule) Support(d Vec3) Vec3 {
	p := Sphere{c.Radius}.Support(d)
	if d[2] >= 0 {
		p[2] += c.HalfLength
	} else {
		p[2] -= c.HalfLength
	}
	return p
}

// Bounds implements Convex.
func (c Capsule) Bounds() AABB {
	r, h := c.Radius, c.HalfLength+c.Radius
	return AABB{Min: Vec3{-r, -r, -h}, Max: Vec3{r, r, h}}
}

// Mass implements Convex: a cylinder of length h plus two hemispheres, each
// hemisphere's inertia moved by the parallel-axis theorem (its centre of mass
// lies 3r/8 from its flat face).
func (c Capsule) Mass(density float64) Mass {
	r, h := c.Radius, 2*c.HalfLength
	mc := density * math.Pi * r * r * h
	ms := density * 4.0 / 3 * math.Pi * r * r * r
	iz := mc*r*r/2 + ms*2*r*r/5
	ix := mc*(h*h/12+r*r/4) + ms*(2*r*r/5+h*h/4+3*h*r/8)
	return Mass{Volume: (mc + ms) / density, Mass: mc + ms, Inertia: diagInertia(ix, ix, iz)}
}

// Cylinder is a solid circular cylinder of Radius, its axis of length
// 2 HalfLength along the local z axis. It is exact, not a polygon.
type Cylinder struct{ Radius, HalfLength float64 }

// Support implements Convex.
func (c Cylinder) Support(d Vec3) Vec3 {
	var p Vec3
	if l := math.Hypot(d[0], d[1]); l > 0 {
		p[0], p[1] = c.Radius*d[0]/l, c.Radius*d[1]/l
	} else {
		p[0] = c.Radius
	}
	if d[2] >= 0 {
		p[2] = c.HalfLength
	} else {
		p[2] = -c.HalfLength
	}
	return p
}

// Bounds implements Convex.
func (c Cylinder) Bounds() AABB {
	r, h := c.Radius, c.HalfLength
	return AABB{Min: Vec3{-r, -r, -h}, Max: Vec3{r, r, h}}
}

// Mass implements Convex: I_z = m r^2 / 2, I_x = m (3 r^2 + h^2) / 12.
func (c Cylinder) Mass(density float64) Mass {
	r, h := c.Radius, 2*c.HalfLength
	v := math.Pi * r * r * h
	m := density * v
	ix := m * (3*r*r + h*h) / 12
	return Mass{Volume: v, Mass: m, Inertia: diagInertia(ix, ix, m*r*r/2)}
}

// sign returns +1 for x >= 0 and -1 otherwise, so that support points of
// boxes are always vertices.
func sign(x float64) float64 {
	if x < 0 {
		return -1
	}
	return 1
}
