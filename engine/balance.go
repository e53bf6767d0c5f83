package engine

import (
	"math"

	"clatter/shapes"
)

// Balance says whether a body stands balanced on an edge or a corner of
// its shape: at rest there, any disturbance tips it over.
type Balance uint8

const (
	// NotBalanced: the body lies on a face, leans on something, is round,
	// or its shape has no edges and corners (only polyhedra are examined).
	NotBalanced Balance = iota
	// OnEdge: its lowest points are one edge and its centre of mass is
	// above that edge.
	OnEdge
	// OnCorner: its lowest point is one corner and its centre of mass is
	// above that corner.
	OnCorner
)

func (b Balance) String() string {
	switch b {
	case OnEdge:
		return "edge"
	case OnCorner:
		return "corner"
	}
	return "none"
}

// balanceTolerance (rad) is how far the line from a body's lowest edge or
// corner to its centre of mass may lean from the vertical, and how far a
// line of lowest points may tilt, for the body to count as balanced there.
// It is the resting faces' angle tolerance (resting.FaceDownTolerance,
// 0.05 rad): far above the tilt contact slop leaves (0.5 mm across 20 mm
// is 0.025 rad), and a body whose centre of mass leans further than this
// from its only support could not be at rest.
const balanceTolerance = 0.05

// Balanced reports whether a body stands balanced on an edge or a corner:
// the points of its shape lowest along gravity are one corner, or lie on
// one line (an edge), and its centre of mass is within balanceTolerance of
// the vertical through them. It looks at the pose only; whether the body
// is at rest and touches something is the caller's to check. Shapes with
// curved surfaces are not examined (NotBalanced).
func (w *World) Balanced(id BodyID) Balance {
	g := w.cfg.Gravity
	corners := polyCorners(w.b.shape[id])
	if len(corners) == 0 || !(g.Len() > 0) {
		return NotBalanced
	}
	down := g.Normalize()
	pose := w.ShapePose(id)
	// The corners in the world, and the lowest one.
	low := math.Inf(-1)
	for i, c := range corners {
		corners[i] = pose.Apply(c)
		low = math.Max(low, corners[i].Dot(down))
	}
	tol := math.Sin(balanceTolerance) * w.b.radius[id]
	var lowest []shapes.Vec3
	for _, c := range corners {
		if low-c.Dot(down) <= tol {
			lowest = append(lowest, c.Sub(down.Mul(c.Dot(down)))) // onto the horizontal plane
		}
	}
	com := w.b.pos[id]
	height := low - com.Dot(down) // of the centre of mass above the lowest point
	off := com.Sub(down.Mul(com.Dot(down)))
	reach := math.Tan(balanceTolerance) * height
	// The two lowest points farthest apart span the support.
	p, q := lowest[0], lowest[0]
	for _, a := range lowest {
		for _, b := range lowest {
			if a.Sub(b).Len() > p.Sub(q).Len() {
				p, q = a, b
			}
		}
	}
	if p.Sub(q).Len() <= tol {
		if off.Sub(p).Len() <= reach {
			return OnCorner
		}
		return NotBalanced
	}
	u := q.Sub(p).Normalize()
	across := func(x shapes.Vec3) float64 { d := x.Sub(p); return d.Sub(u.Mul(d.Dot(u))).Len() }
	for _, a := range lowest {
		if across(a) > tol {
			return NotBalanced // a face: the lowest points span an area
		}
	}
	if across(off) <= reach {
		return OnEdge
	}
	return NotBalanced
}

// polyCorners returns the corners of a polyhedral shape in its own frame (a
// new slice), or nil for a shape with curved surfaces.
func polyCorners(s shapes.Shape) []shapes.Vec3 {
	switch sh := s.(type) {
	case shapes.Box:
		var cs []shapes.Vec3
		for i := 0; i < 8; i++ {
			c := sh.Half
			for k := 0; k < 3; k++ {
				if i&(1<<k) != 0 {
					c[k] = -c[k]
				}
			}
			cs = append(cs, c)
		}
		return cs
	case *shapes.Box:
		return polyCorners(*sh)
	case *shapes.Hull:
		return append([]shapes.Vec3(nil), sh.Vertices...)
	case *shapes.Compound:
		var cs []shapes.Vec3
		for _, p := range sh.Pieces {
			pc := polyCorners(p.Shape)
			if pc == nil {
				return nil
			}
			for _, c := range pc {
				cs = append(cs, p.Pose.Apply(c))
			}
		}
		return cs
	}
	return nil
}
