package shapes

// Piece is one convex part of a compound, placed in the compound's frame.
type Piece struct {
	Shape Convex
	Pose  Pose
}

// Compound is a rigid union of convex pieces. Contact is found piece by
// piece; mass properties combine by the parallel-axis theorem.
type Compound struct {
	Pieces []Piece
}

// Bounds is the local bounding box of all pieces.
func (c *Compound) Bounds() AABB {
	b := EmptyAABB()
	for _, p := range c.Pieces {
		b = b.Union(p.Shape.Bounds().Transform(p.Pose))
	}
	return b
}

// Mass combines the pieces' mass properties (they are assumed not to overlap).
func (c *Compound) Mass(density float64) Mass {
	parts := make([]Mass, len(c.Pieces))
	for i, p := range c.Pieces {
		m := p.Shape.Mass(density)
		parts[i] = Mass{
			Volume:  m.Volume,
			Mass:    m.Mass,
			Center:  p.Pose.Apply(m.Center),
			Inertia: RotatedInertia(m.Inertia, p.Pose.Orientation),
		}
	}
	return Combine(parts...)
}
