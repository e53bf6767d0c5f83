package view

import (
	"math"

	"clatter/shapes"
)

// Tri is a triangle, counter-clockwise seen from outside.
type Tri [3]shapes.Vec3

// normal is the triangle's unit normal, or zero for a degenerate one.
func (t Tri) normal() shapes.Vec3 {
	n := t[1].Sub(t[0]).Cross(t[2].Sub(t[0]))
	if l := n.Len(); l > 0 {
		return n.Mul(1 / l)
	}
	return shapes.Vec3{}
}

// Segments around a round shape's axis and from pole to pole: enough for
// a smooth outline in a picture a few hundred pixels across, few enough
// that a scene of hundreds of parts stays a small file.
const (
	roundSegments = 32
	poleSegments  = 12
)

// triangles tessellates a body's shape in its own frame. Planes give none:
// they are cut to a patch once the scene's extent is known (patch).
func triangles(s shapes.Shape) []Tri {
	switch s := s.(type) {
	case shapes.Box:
		return boxTriangles(s.Half)
	case shapes.Sphere:
		return revolve(arc(s.Radius, 0, 0, math.Pi, poleSegments))
	case shapes.Capsule:
		top := arc(s.Radius, s.HalfLength, 0, math.Pi/2, poleSegments/2)
		bottom := arc(s.Radius, -s.HalfLength, math.Pi/2, math.Pi, poleSegments/2)
		return revolve(append(top, bottom...))
	case shapes.Cylinder:
		r, h := s.Radius, s.HalfLength
		return revolve([][2]float64{{0, h}, {r, h}, {r, -h}, {0, -h}})
	case *shapes.Hull:
		return hullTriangles(s)
	case *shapes.Compound:
		var out []Tri
		for _, p := range s.Pieces {
			for _, t := range triangles(p.Shape) {
				out = append(out, Tri{p.Pose.Apply(t[0]), p.Pose.Apply(t[1]), p.Pose.Apply(t[2])})
			}
		}
		return out
	case *shapes.TriMesh:
		out := make([]Tri, len(s.Triangles))
		for i := range s.Triangles {
			a, b, c := s.Triangle(i)
			out[i] = Tri{a, b, c}
		}
		return out
	case interface{ TriMesh() *shapes.TriMesh }:
		// A static mesh as the world keeps it, ready for collision.
		return triangles(s.TriMesh())
	case shapes.Convex:
		return supportTriangles(s)
	}
	return nil
}

func hullTriangles(h *shapes.Hull) []Tri {
	idx := h.Triangles()
	out := make([]Tri, len(idx))
	for i, t := range idx {
		out[i] = Tri{h.Vertices[t[0]], h.Vertices[t[1]], h.Vertices[t[2]]}
	}
	return out
}

func boxTriangles(h shapes.Vec3) []Tri {
	var out []Tri
	for axis := 0; axis < 3; axis++ {
		u, v := (axis+1)%3, (axis+2)%3
		for _, s := range [2]float64{1, -1} {
			corner := func(a, b float64) shapes.Vec3 {
				var p shapes.Vec3
				p[axis], p[u], p[v] = s*h[axis], a*h[u], b*h[v]
				return p
			}
			p00, p10, p11, p01 := corner(-1, -1), corner(1, -1), corner(1, 1), corner(-1, 1)
			if s > 0 {
				out = append(out, Tri{p00, p10, p11}, Tri{p00, p11, p01})
			} else {
				out = append(out, Tri{p00, p11, p10}, Tri{p00, p01, p11})
			}
		}
	}
	return out
}

// arc is the profile of a circular arc of radius r about the point z of
// the axis, as (distance from the axis, height), from the angle from to the
// angle to (from +z, radians) in n segments.
func arc(r, z, from, to float64, n int) [][2]float64 {
	out := make([][2]float64, n+1)
	for i := range out {
		a := from + (to-from)*float64(i)/float64(n)
		out[i] = [2]float64{r * math.Sin(a), z + r*math.Cos(a)}
	}
	return out
}

// revolve turns a profile, from the top of the axis down, about the z
// axis.
func revolve(profile [][2]float64) []Tri {
	var out []Tri
	at := func(p [2]float64, j int) shapes.Vec3 {
		a := 2 * math.Pi * float64(j) / roundSegments
		return shapes.Vec3{p[0] * math.Cos(a), p[0] * math.Sin(a), p[1]}
	}
	for i := 0; i+1 < len(profile); i++ {
		p, q := profile[i], profile[i+1]
		for j := 0; j < roundSegments; j++ {
			a, b := at(p, j), at(p, j+1)
			c, d := at(q, j), at(q, j+1)
			// Going down the profile and counter-clockwise about +z, the
			// quad (a, c, d, b) faces outward.
			if p[0] > 0 {
				out = append(out, Tri{a, c, b})
			}
			if q[0] > 0 {
				out = append(out, Tri{b, c, d})
			}
		}
	}
	return out
}

// supportTriangles draws a convex shape of a kind not known here as the
// hull of its support points in many directions.
func supportTriangles(c shapes.Convex) []Tri {
	var pts []shapes.Vec3
	for i := 0; i <= poleSegments; i++ {
		theta := math.Pi * float64(i) / poleSegments
		for j := 0; j < roundSegments; j++ {
			phi := 2 * math.Pi * float64(j) / roundSegments
			d := shapes.Vec3{math.Sin(theta) * math.Cos(phi), math.Sin(theta) * math.Sin(phi), math.Cos(theta)}
			pts = append(pts, c.Support(d))
		}
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		return nil
	}
	return hullTriangles(h)
}

// planePatch is the square of a plane's surface, half as wide again as the
// extent of the other bodies, centred below them, in square tiles of a
// round size (1, 2 or 5 times a power of ten, at most a sixth of the
// extent) for a checker that shows depth and scale. The corners are in
// the world; tile is the tiles' side.
func planePatch(p shapes.Plane, pose shapes.Pose, around shapes.AABB) (tiles [2][]Tri, tile float64) {
	n := pose.Rotate(p.Normal)
	surface := pose.Apply(p.Normal.Mul(p.Offset))
	centre, half := surface, 0.5
	if around.Min[0] <= around.Max[0] {
		c := around.Center()
		centre = c.Sub(n.Mul(n.Dot(c.Sub(surface))))
		half = math.Max(1.5*around.Size().Len()/2, 1e-3)
	}
	tile = roundSize(2 * half / 6)
	k := int(math.Ceil(half / tile))
	u := n.Cross(shapes.Vec3{1, 0, 0})
	if u.Len() < 0.5 {
		u = n.Cross(shapes.Vec3{0, 1, 0})
	}
	u = u.Normalize()
	v := n.Cross(u)
	for i := -k; i < k; i++ {
		for j := -k; j < k; j++ {
			o := centre.Add(u.Mul(float64(i) * tile)).Add(v.Mul(float64(j) * tile))
			a, b, c, d := o, o.Add(u.Mul(tile)), o.Add(u.Mul(tile)).Add(v.Mul(tile)), o.Add(v.Mul(tile))
			odd := (i + j) & 1
			tiles[odd] = append(tiles[odd], Tri{a, b, c}, Tri{a, c, d})
		}
	}
	return tiles, tile
}

// roundSize rounds x > 0 down to 1, 2 or 5 times a power of ten.
func roundSize(x float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(x)))
	for _, m := range []float64{5, 2, 1} {
		if m*p <= x {
			return m * p
		}
	}
	return p
}
