package collide

import "clatter/shapes"

// boxHullEdgeGap is hintGap for the edge hint of a box and a hull (either
// order): box edge h.i (boxEdges) against hull edge h.j, the axis the
// box-hull separating-axis test (boxhull.go) last separated them by. The
// axis is the cross product of the two edges, each turning with its shape;
// the gap is that between the shapes' extents along it, oriented from A's
// centre toward B's. Any unit axis along which the extents are apart
// bounds the distance from below (the separating-axis theorem; Gottschalk,
// Lin and Manocha, "OBBTree", SIGGRAPH 1996, and Ericson, "Real-Time
// Collision Detection", 2005, sec. 5.2.1), so this proves the pair apart
// as the test's own edge loop would, from two support points, where the
// test tries all the box's faces, the hull's faces and the edge pairs
// again. ok is false for other pairs, for indexes out of range and for
// edges nearly parallel.
func boxHullEdgeGap(h *pairHint, a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose) (float64, bool) {
	_, okA := a.(shapes.Box)
	hull, okB := b.(*shapes.Hull)
	pbox, phull := &pa, &pb
	if !okA || !okB {
		_, okB = b.(shapes.Box)
		hull, okA = a.(*shapes.Hull)
		pbox, phull = &pb, &pa
	}
	if !okA || !okB || hull == nil || h.i < 0 || int(h.i) >= len(boxEdges) || h.j < 0 || int(h.j) >= len(hull.Edges) {
		return 0, false
	}
	e := hull.Edges[h.j]
	de := phull.Orientation.Rotate(hull.Vertices[e.V[1]].Sub(hull.Vertices[e.V[0]]))
	var u vec3
	u[boxEdgeAxis[h.i]] = 1
	ax := pbox.Orientation.Rotate(u).Cross(de)
	l := ax.Len()
	if !(l > 2*satParallel*de.Len()) {
		return 0, false
	}
	n := ax.Mul(1 / l)
	if n.Dot(pb.Position.Sub(pa.Position)) < 0 {
		n = n.Mul(-1)
	}
	return -extent(b, pb, n.Mul(-1), &h.vb) - extent(a, pa, n, &h.va), true
}
