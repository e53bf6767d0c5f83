package collide

import (
	"math"

	"clatter/shapes"
)

type (
	vec3 = shapes.Vec3
	mat3 = shapes.Mat3
)

// Hot loops over slices of vectors, or of structs that hold them (vertices,
// planes, candidate points), index the slice rather than range over its
// values: ranging by value copies each element, and with Go 1.26 on amd64
// a loop of dot products over a 40-vertex hull's 76 face planes measured
// 4 to 5 times slower that way (the same for a slice of vec3). The sums
// are the same either way, so the results are too, bit for bit.

// mulT returns m^T v: for a rotation, the inverse rotation of v.
func mulT(m mat3, v vec3) vec3 {
	return vec3{
		m[0]*v[0] + m[1]*v[1] + m[2]*v[2],
		m[3]*v[0] + m[4]*v[1] + m[5]*v[2],
		m[6]*v[0] + m[7]*v[1] + m[8]*v[2],
	}
}

// mul returns m v (column-major m).
func mul(m mat3, v vec3) vec3 {
	return vec3{
		m[0]*v[0] + m[3]*v[1] + m[6]*v[2],
		m[1]*v[0] + m[4]*v[1] + m[7]*v[2],
		m[2]*v[0] + m[5]*v[1] + m[8]*v[2],
	}
}

// col returns column i of m, the image of local axis i.
func col(m mat3, i int) vec3 { return vec3{m[3*i], m[3*i+1], m[3*i+2]} }

// mulTM returns a^T b.
func mulTM(a, b mat3) mat3 {
	var out mat3
	for c := 0; c < 3; c++ {
		bc := col(b, c)
		out[3*c] = col(a, 0).Dot(bc)
		out[3*c+1] = col(a, 1).Dot(bc)
		out[3*c+2] = col(a, 2).Dot(bc)
	}
	return out
}

// unit returns v normalised and its length; a zero vector stays zero.
func unit(v vec3) (vec3, float64) {
	l := v.Len()
	if l == 0 {
		return v, 0
	}
	return v.Mul(1 / l), l
}

// perpendicular returns a unit vector orthogonal to the unit vector n.
func perpendicular(n vec3) vec3 {
	// Cross with the axis least aligned with n (robust for every n).
	a := vec3{1, 0, 0}
	if math.Abs(n[1]) < math.Abs(n[0]) && math.Abs(n[1]) <= math.Abs(n[2]) {
		a = vec3{0, 1, 0}
	} else if math.Abs(n[2]) < math.Abs(n[0]) {
		a = vec3{0, 0, 1}
	}
	p, _ := unit(n.Cross(a))
	return p
}

func argmaxAbs(v vec3) int {
	k := 0
	if math.Abs(v[1]) > math.Abs(v[k]) {
		k = 1
	}
	if math.Abs(v[2]) > math.Abs(v[k]) {
		k = 2
	}
	return k
}

func clamp01(x float64) float64 {
	if x < 0 {
		return 0
	}
	if x > 1 {
		return 1
	}
	return x
}

// closestSegmentSegment returns the closest points c1 = p1 + s (q1 - p1) and
// c2 = p2 + t (q2 - p2) of two segments (C. Ericson, "Real-Time Collision
// Detection", Morgan Kaufmann 2005, section 5.1.9). Parallel segments give one
// of the closest pairs.
func closestSegmentSegment(p1, q1, p2, q2 vec3) (s, t float64, c1, c2 vec3) {
	d1 := q1.Sub(p1)
	d2 := q2.Sub(p2)
	r := p1.Sub(p2)
	a := d1.Dot(d1)
	e := d2.Dot(d2)
	f := d2.Dot(r)
	switch {
	case a == 0 && e == 0:
		return 0, 0, p1, p2
	case a == 0:
		t = clamp01(f / e)
	default:
		c := d1.Dot(r)
		if e == 0 {
			s = clamp01(-c / a)
		} else {
			b := d1.Dot(d2)
			den := a*e - b*b
			if den > 0 {
				s = clamp01((b*f - c*e) / den)
			}
			t = (b*s + f) / e
			if t < 0 {
				t = 0
				s = clamp01(-c / a)
			} else if t > 1 {
				t = 1
				s = clamp01((b - c) / a)
			}
		}
	}
	return s, t, p1.Add(d1.Mul(s)), p2.Add(d2.Mul(t))
}

// closestPointTriangle returns the point of triangle abc closest to p
// (Ericson 2005, section 5.1.5, by Voronoi regions).
func closestPointTriangle(p, a, b, c vec3) vec3 {
	ab, ac, ap := b.Sub(a), c.Sub(a), p.Sub(a)
	d1, d2 := ab.Dot(ap), ac.Dot(ap)
	if d1 <= 0 && d2 <= 0 {
		return a
	}
	bp := p.Sub(b)
	d3, d4 := ab.Dot(bp), ac.Dot(bp)
	if d3 >= 0 && d4 <= d3 {
		return b
	}
	vc := d1*d4 - d3*d2
	if vc <= 0 && d1 >= 0 && d3 <= 0 {
		return a.Add(ab.Mul(d1 / (d1 - d3)))
	}
	cp := p.Sub(c)
	d5, d6 := ab.Dot(cp), ac.Dot(cp)
	if d6 >= 0 && d5 <= d6 {
		return c
	}
	vb := d5*d2 - d1*d6
	if vb <= 0 && d2 >= 0 && d6 <= 0 {
		return a.Add(ac.Mul(d2 / (d2 - d6)))
	}
	va := d3*d6 - d5*d4
	if va <= 0 && d4-d3 >= 0 && d5-d6 >= 0 {
		return b.Add(c.Sub(b).Mul((d4 - d3) / ((d4 - d3) + (d5 - d6))))
	}
	den := 1 / (va + vb + vc)
	return a.Add(ab.Mul(vb * den)).Add(ac.Mul(vc * den))
}

var posInf = math.Inf(1)
