// Package bvh is a bounding volume hierarchy over the triangles of a static
// triangle mesh (a tray, a bowl, a feeder track): built once, then asked many
// times per step which triangles may touch a part's box, or where a ray first
// meets the surface.
//
// The tree is a binary tree of axis-aligned boxes, built top down by the
// surface area heuristic evaluated on bins (Wald, "On fast construction of
// SAH-based bounding volume hierarchies", IEEE Symposium on Interactive Ray
// Tracing, 2007), and kept in one flat slice of nodes with the two children
// of a node side by side. Queries walk it with a fixed stack, append to the
// caller's slice, and allocate nothing.
//
// A Tree is read-only after Build and safe for concurrent queries, so the
// many worlds of a sweep may share one.
package bvh
