// Package view makes a run visible: it records every body's shape and the
// poses of the moving ones at the sample times, and writes them as a glTF
// 2.0 binary animation (animation.glb) and as shaded pictures of the first
// and last states (start.png, end.png).
//
// Shapes are turned into triangles here (primitives tessellated, hulls
// fanned, compound pieces placed, planes cut to a finite patch around the
// other bodies; a mesh part that bounds a solid is drawn as its mesh,
// although contact uses its convex hull); nothing here takes part in the
// simulation.
package view
