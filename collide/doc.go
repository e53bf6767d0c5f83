// Package collide finds which pairs of bodies touch and where: a
// sweep-and-prune broad phase over world bounds, a narrow phase (GJK and EPA
// for general convex pairs, exact fast paths and separating-axis tests for the
// common ones), contact manifolds of up to four points with feature ids, and
// bounding volume hierarchies over static triangle meshes.
//
// It imports package shapes and nothing above it.
package collide
