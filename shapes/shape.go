package shapes

// Convex is a convex shape in its local frame. Support returns a point of the
// shape farthest along d (d need not be unit length; for d = 0 any point of
// the shape). All of the narrow phase's general algorithms (GJK, EPA) work
// through Support alone.
type Convex interface {
	Support(d Vec3) Vec3
	// Bounds is the local axis-aligned bounding box.
	Bounds() AABB
	// Mass gives volume, centre of mass and inertia for a uniform density.
	Mass(density float64) Mass
}

// Shape is anything a body can be made of: a Convex, a *Compound, a static
// Plane or a static *TriMesh. Package collide dispatches on the concrete type.
type Shape interface {
	Bounds() AABB
}
