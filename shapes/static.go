package shapes

import "math"

// Plane is a static half-space {x : Normal . x <= Offset} in its local frame;
// Normal is unit length and points out of the solid, toward free space.
type Plane struct {
	Normal Vec3
	Offset float64
}

// Bounds of a plane are unbounded in every direction.
func (p Plane) Bounds() AABB {
	inf := math.Inf(1)
	return AABB{Min: Vec3{-inf, -inf, -inf}, Max: Vec3{inf, inf, inf}}
}

// TriMesh is a static triangle mesh kept as triangles, for fixtures such as
// trays, bowls and tracks. Triangles wind counter-clockwise seen from the
// side the parts are on.
type TriMesh struct {
	Vertices  []Vec3
	Triangles [][3]int32
}

// Bounds is the local bounding box of the mesh.
func (m *TriMesh) Bounds() AABB {
	b := EmptyAABB()
	for _, v := range m.Vertices {
		b = b.Extend(v)
	}
	return b
}

// Triangle returns the corners of triangle i.
func (m *TriMesh) Triangle(i int) (a, b, c Vec3) {
	t := m.Triangles[i]
	return m.Vertices[t[0]], m.Vertices[t[1]], m.Vertices[t[2]]
}
