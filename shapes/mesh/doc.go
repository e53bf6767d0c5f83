// Package mesh turns triangle meshes, read from STL files or given as
// triangle soups, into parts a body can be made of.
//
// A Mesh is welded on construction: corners closer than WeldTolerance of the
// part's size become one vertex, and triangles whose corners collapse are
// dropped. Its Topology tells whether it bounds a solid: closed (every edge
// shared by exactly two triangles) and consistently oriented (each edge run
// once in each direction).
//
// A Part pairs the convex hull of a mesh, the shape used for contact, with
// the mass properties of the true solid when the mesh bounds one. When it
// does not (an open or inconsistent mesh), the part falls back to the hull's
// mass properties and says so in its Warnings. Fixtures that must keep their
// concave shape use Mesh.TriMesh, a static triangle mesh.
//
// LoadSTL reads binary and ASCII STL through github.com/hschendel/stl, with a
// length Unit that converts the file's numbers to metres. Broken files (empty,
// truncated, a triangle count that disagrees with the size, ASCII without
// "endsolid", coordinates that are not finite, no triangles, no thickness)
// are errors that name the file and the cause.
package mesh
