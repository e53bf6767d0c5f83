package shapes

// Hull is a convex polyhedron with polygon faces, as built by NewHull.
type Hull struct {
	// Vertices are the corners of the hull, each an input point.
	Vertices []Vec3
	// Faces are the polygon faces after coplanar triangles were merged.
	Faces []Face
	// Edges are the unique edges, each between two faces.
	Edges []Edge
	// Neighbors lists, for each vertex, the vertices joined to it by an edge.
	Neighbors [][]int32

	bounds AABB
	climb  climbGraph // the support search's graph; empty for hulls built by hand
}

// Face is a planar convex polygon of a hull.
type Face struct {
	// Normal is the outward unit normal; points x of the face have Normal.x == Offset.
	Normal Vec3
	Offset float64
	// Verts index Hull.Vertices counter-clockwise seen from outside.
	Verts []int32
}

// Edge joins vertices V[0] and V[1]. F[0] is the face that runs V[0] -> V[1]
// in its counter-clockwise order, F[1] the face that runs V[1] -> V[0].
type Edge struct {
	V [2]int32
	F [2]int32
}

// Support implements Convex.
func (h *Hull) Support(d Vec3) Vec3 {
	return h.Vertices[h.SupportIndex(d)]
}

// Bounds implements Convex. A hull assembled by hand rather than by
// NewHull has no cached bounds; they are then computed on each call.
func (h *Hull) Bounds() AABB {
	if h.bounds == (AABB{}) {
		b := EmptyAABB()
		for _, v := range h.Vertices {
			b = b.Extend(v)
		}
		return b
	}
	return h.bounds
}

// Mass implements Convex: the polyhedral integrals over the faces, each
// fanned into triangles.
func (h *Hull) Mass(density float64) Mass {
	m, err := PolyhedronMass(h.Vertices, h.Triangles(), density)
	if err != nil {
		return Mass{}
	}
	return m
}

// Triangles fans each face into triangles, outward-facing.
func (h *Hull) Triangles() [][3]int32 {
	var tris [][3]int32
	for _, f := range h.Faces {
		for i := 1; i+1 < len(f.Verts); i++ {
			tris = append(tris, [3]int32{f.Verts[0], f.Verts[i], f.Verts[i+1]})
		}
	}
	return tris
}

// Size is the length of the diagonal of the hull's bounds, the scale that
// relative tolerances refer to.
func (h *Hull) Size() float64 { return h.Bounds().Size().Len() }
