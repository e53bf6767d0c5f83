// Package shapes holds the geometry of one body: convex shapes (sphere, box,
// capsule, cylinder, convex hull), compounds of convex pieces, static planes
// and triangle meshes, and their mass properties. The resting-face analysis
// of a part on a flat support lives in package shapes/resting, STL import and
// triangle-mesh solids in package shapes/mesh.
//
// Every shape lives in its own local frame. Convex shapes answer support
// queries (the farthest point along a direction), which is all the narrow
// phase in package collide needs; hulls additionally keep their polygon faces
// and edge adjacency for the separating-axis test and face clipping.
//
// Units: shapes are unit-free; the engine uses SI throughout.
//
// This package imports no other package of the project.
package shapes
