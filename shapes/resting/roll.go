package resting

import (
	"fmt"
	"math"

	"clatter/shapes"
)

// Where a part that stands on an unstable face ends up.
//
// Let u be the gravity direction in the part's frame. Standing on the support,
// the centre of mass c is at the height h(u) = max over vertices v of
// (v - c).u, the support function of the hull about c, and the quasi-static
// part (no momentum, no slip: the model of Wiegley, Rao and Goldberg) moves u
// down the steepest descent of h on the unit sphere until a local minimum,
// a stable face, is reached. A face of the hull is a point of that sphere (its
// normal), an edge an arc between the normals of its two faces, a vertex the
// spherical polygon of directions that make it the lowest point.
//
// At any u, let P be the contact set (the face, edge or vertex lowest along
// u), p the foot of c on the support plane, and q the point of P nearest p.
// The derivative of h in a tangent direction t is max over x in P of
// (x - p).t, so the steepest descent is t = p - q: the gravity direction tips
// toward the side where the centre of mass overhangs its contact, about the
// contact point nearest the overhang. This gives three moves:
//
//   - On a face F (u = its normal): if p lies strictly inside F the face is
//     stable. If q lies inside an edge e, the part turns about e; the foot of
//     c on the line of e stays put while u follows the arc of e, h decreases
//     all the way, and the part lands on the face across e. If q is a vertex
//     v, the part pivots about v (the vertex move).
//   - Pivoting about a vertex v, h = (v - c).u and its steepest descent keeps
//     u on one great circle, turning away from v - c. The move ends where
//     the circle leaves the spherical polygon of v: across the arc of an edge
//     (v, x) (the edge move) or, exactly at a corner, on a face.
//   - On the arc of an edge (a, b): if q lies inside the edge, u runs along
//     the arc to whichever of the edge's two faces lies on the side of p - q;
//     if q is an end point, the part pivots about that vertex.
//
// The height strictly decreases along the way, so in exact arithmetic the
// chain ends; the loop still stops after a bounded number of moves. The
// path from a face depends on nothing but the face, so every face the roll
// passes flat over ends where it ends, and a roll that reaches a face whose
// end is known stops there: finely faceted parts, where chains are long, cost
// about one pass over the faces rather than one per unstable face.
//
// A foot p on the boundary of an unstable face (a balance, within stableTol)
// gives no direction p - q; the part then turns over that edge, or for a
// vertex pivots along the bisector of its two edges' outward normals, the
// direction any small push would send it.

// roll follows the descent from face start to the stable face it ends on.
func (a *analysis) roll(start int) (int, error) {
	if a.rollsTo == nil {
		a.rollsTo = make([]int, len(a.faces))
		for i := range a.rollsTo {
			a.rollsTo[i] = -1
		}
	}
	a.passed = a.passed[:0]
	end, err := a.descend(start)
	if err != nil {
		return 0, err
	}
	for _, f := range a.passed {
		a.rollsTo[f] = end
	}
	return end, nil
}

// The three places a roll can be: flat on a face, turning about an edge
// (along its arc), pivoting about a vertex.
const (
	rollOnFace = iota
	rollOnEdge
	rollOnVertex
)

// rollState is where a roll is.
type rollState struct {
	state int
	start int         // the face the roll began on
	f     int         // current face
	u, t  shapes.Vec3 // current gravity direction; pivot direction
	v, w  int32       // pivot vertex; edge (v, w)
	from  int32       // vertex the edge move came from
}

// descend is roll without the bookkeeping of known ends.
func (a *analysis) descend(start int) (int, error) {
	r := rollState{state: rollOnFace, start: start, f: start, from: -1}
	steps := 4*(len(a.faces)+len(a.verts)) + 16
	tolLen := stableTol * a.size
	for step := 0; step < steps; step++ {
		switch r.state {
		case rollOnFace:
			if end, done := a.faceMove(&r, tolLen); done {
				return end, nil
			}
		case rollOnVertex:
			if err := a.vertexMove(&r); err != nil {
				return 0, err
			}
		case rollOnEdge:
			if err := a.edgeMove(&r, tolLen); err != nil {
				return 0, err
			}
		}
	}
	return 0, fmt.Errorf("resting: the roll from face %d did not settle within %d moves (numerically degenerate hull?): %w", start, steps, ErrDegenerate)
}

// faceMove is the move from face r.f: it reports the end of the roll if
// the face is stable or its end known, else turns over an edge onto the
// face across it or starts a pivot about a vertex.
func (a *analysis) faceMove(r *rollState, tolLen float64) (end int, done bool) {
	f := r.f
	if a.stable[f] {
		return f, true
	}
	if end := a.rollsTo[f]; end >= 0 {
		return end, true
	}
	a.passed = append(a.passed, f)
	fc := a.faces[f]
	p := a.foot[f]
	best, bi, bs := a.nearestOnBoundary(f, p)
	x, y := a.edge(f, bi)
	el := y.Sub(x).Len()
	q := x.Add(y.Sub(x).Mul(bs))
	n := len(fc.Verts)
	switch {
	case bs*el > tolLen && (1-bs)*el > tolLen:
		// Inside an edge: over the edge onto the face across it.
		r.f = a.across[f][bi]
		return 0, false
	case bs*el <= tolLen:
		r.v = fc.Verts[bi]
		if best > tolLen {
			r.t = p.Sub(q)
		} else {
			// Balanced on vertex bi: the bisector of the outward
			// normals of edges bi-1 and bi.
			r.t = a.inward(f, (bi+n-1)%n).Add(a.inward(f, bi)).Mul(-1)
		}
	default:
		r.v = fc.Verts[(bi+1)%n]
		if best > tolLen {
			r.t = p.Sub(q)
		} else {
			r.t = a.inward(f, bi).Add(a.inward(f, (bi+1)%n)).Mul(-1)
		}
	}
	r.u = fc.Normal
	r.state = rollOnVertex
	return 0, false
}

// nearestOnBoundary returns the point of face f's boundary nearest the
// foot p (the foot is outside, or within tolLen of the boundary): its
// distance, its edge and its parameter along the edge.
func (a *analysis) nearestOnBoundary(f int, p shapes.Vec3) (best float64, bi int, bs float64) {
	best = math.Inf(1)
	for i := range a.faces[f].Verts {
		x, y := a.edge(f, i)
		s := segParam(x, y, p)
		if d := p.Sub(x.Add(y.Sub(x).Mul(s))).Len(); d < best {
			best, bi, bs = d, i, s
		}
	}
	return best, bi, bs
}

// vertexMove pivots about vertex r.v, turning u along the great circle
// toward r.t until it leaves the polygon of the vertex: onto the arc of an
// edge, or exactly through a corner onto a face.
func (a *analysis) vertexMove(r *rollState) error {
	u, v := r.u, r.v
	tt := r.t.Sub(u.Mul(r.t.Dot(u)))
	if l := tt.Len(); l > 0 {
		tt = tt.Mul(1 / l)
	} else {
		// Balanced on the vertex itself: take the nearest face around it.
		r.f = a.nearestFaceAt(v, u)
		r.state = rollOnFace
		return nil
	}
	hitS, hits, nh, blocked := a.leaveVertex(v, u, tt)
	if blocked >= 0 {
		r.w, r.from, r.state = blocked, v, rollOnEdge
		return nil
	}
	if nh == 0 {
		return fmt.Errorf("resting: roll from face %d: vertex %d has no edges: %w", r.start, v, ErrDegenerate)
	}
	r.u = u.Mul(math.Cos(hitS)).Add(tt.Mul(math.Sin(hitS))).Normalize()
	if nh > 1 {
		// Exactly through a corner of the polygon: onto that face.
		r.f = a.nearestFaceAt(v, r.u)
		r.state = rollOnFace
		return nil
	}
	r.w, r.from, r.state = hits[0], v, rollOnEdge
	return nil
}

// leaveVertex finds where the pivot about v, from u toward the unit
// tangent tt, leaves the polygon of v: the angle hitS and the neighbours
// hits (nh of them) whose edges' arcs it crosses there, or the neighbour
// blocked (-1 if none) whose arc it already lies on and follows.
func (a *analysis) leaveVertex(v int32, u, tt shapes.Vec3) (hitS float64, hits [4]int32, nh int, blocked int32) {
	pv := a.verts[v]
	// Stay in the polygon of v: (v - x).u >= 0 for every neighbour x.
	// Along u(s) = cos(s) u + sin(s) tt, (v - x).u(s) = A cos s + B sin s
	// falls to zero at s = atan2(A, -B), in (0, pi] when A >= 0.
	hitS = math.Inf(1)
	blocked, blockedB := int32(-1), math.Inf(1)
	for _, x := range a.nbrs[v] {
		g := pv.Sub(a.verts[x])
		g = g.Mul(1 / g.Len())
		A, B := g.Dot(u), g.Dot(tt)
		if A <= angleTol && B <= angleTol {
			// Already on the arc of edge (v, x) and not moving off it
			// into the polygon of v: the descent follows that arc.
			if B < blockedB {
				blocked, blockedB = x, B
			}
			continue
		}
		s := math.Atan2(math.Max(A, 0), -B)
		switch {
		case s < hitS-angleTol:
			hitS, nh = s, 0
			hits[nh], nh = x, 1
		case s <= hitS+angleTol && nh < len(hits):
			hits[nh] = x
			nh++
		}
	}
	return hitS, hits, nh, blocked
}

// edgeMove turns about edge (r.v, r.w): onto a pivot about an end the foot
// has reached, or along the arc to the face on the side of the overhang.
func (a *analysis) edgeMove(r *rollState, tolLen float64) error {
	v, w := r.v, r.w
	pa, pb := a.verts[v], a.verts[w]
	h := pa.Add(pb).Mul(0.5).Sub(a.c).Dot(r.u)
	p := a.c.Add(r.u.Mul(h))
	s := segParam(pa, pb, p)
	el := pb.Sub(pa).Len()
	q := pa.Add(pb.Sub(pa).Mul(s))
	switch {
	case s*el <= tolLen && v != r.from:
		r.t, r.state = p.Sub(pa), rollOnVertex
		return nil
	case (1-s)*el <= tolLen && w != r.from:
		r.v, r.t, r.state = w, p.Sub(pb), rollOnVertex
		return nil
	}
	// Along the arc toward the face on the side of p - q.
	f1, f2 := a.edgeFaces(v, w)
	if f1 < 0 || f2 < 0 {
		return fmt.Errorf("resting: roll from face %d: vertices %d and %d share no edge: %w", r.start, v, w, ErrDegenerate)
	}
	d := p.Sub(q)
	if a.faces[f2].Normal.Dot(d) > a.faces[f1].Normal.Dot(d) {
		f1 = f2
	}
	r.f, r.state = f1, rollOnFace
	return nil
}

// segParam is the parameter in [0, 1] of the point of segment xy nearest p.
func segParam(x, y, p shapes.Vec3) float64 {
	e := y.Sub(x)
	ee := e.Dot(e)
	if ee == 0 {
		return 0
	}
	return math.Max(0, math.Min(1, p.Sub(x).Dot(e)/ee))
}

// edgeFaces returns the faces that run along v -> w and w -> v.
func (a *analysis) edgeFaces(v, w int32) (int, int) {
	f1, f2 := -1, -1
	for _, fi := range a.vfaces[v] {
		vs := a.faces[fi].Verts
		for i, x := range vs {
			y := vs[(i+1)%len(vs)]
			if x == v && y == w {
				f1 = fi
			}
			if x == w && y == v {
				f2 = fi
			}
		}
	}
	return f1, f2
}

// nearestFaceAt returns the face around vertex v whose normal is closest to u.
func (a *analysis) nearestFaceAt(v int32, u shapes.Vec3) int {
	best, bf := math.Inf(-1), a.vfaces[v][0]
	for _, fi := range a.vfaces[v] {
		if d := a.faces[fi].Normal.Dot(u); d > best {
			best, bf = d, fi
		}
	}
	return bf
}
