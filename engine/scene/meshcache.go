package scene

import (
	"clatter/shapes"
	"clatter/shapes/mesh"
)

// A study reads its scene again for each case (With), with one value
// changed; the shapes made from mesh files depend only on the file and the
// keys of the shape, never on a varied number, so the scenes of one study
// share them: a part's hull, its solid's mass properties and a fixture's
// triangles are made once a study instead of once a case and worker.
// Neither a mesh.Part nor a TriMesh is changed once made, so sharing them
// is sharing values. (With is called by one goroutine at a time, as the
// cache of file contents beside it assumes.)

// meshKey is what a mesh shape is made from: the file (its resolved path,
// and its name as written, which the part's messages carry), the file's
// length unit, and whether it is kept as triangles or as a part.
type meshKey struct {
	path, file string
	unit       mesh.Unit
	triangles  bool
}

// madeMesh is a shape made from a mesh file: a fixture's triangles or a
// part.
type madeMesh struct {
	tri  *shapes.TriMesh
	part *mesh.Part
}

// madeMesh returns the shape made from key before, if any.
func (s *Scene) madeMesh(key meshKey) (madeMesh, bool) {
	m, ok := s.meshes[key]
	return m, ok
}

// keepMesh records the shape made from key for the scenes of With.
func (s *Scene) keepMesh(key meshKey, m madeMesh) {
	if s.meshes != nil {
		s.meshes[key] = m
	}
}
