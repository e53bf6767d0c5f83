package collide

import (
	"math"
	"slices"

	"clatter/shapes"
)

// Convex shapes against a static half-space, by support points: every vertex
// of a box or hull within the margin of the plane is a contact point (the
// reduction then keeps four), a sphere gives its lowest point, a capsule the
// lowest points of its two end spheres, and a cylinder the points of its
// supporting feature (rolllines.go): rim points of both caps, laid out from
// the exact deepest point of each rim, all four where a cap faces the plane,
// only the deepest where the cylinder lies on its side.

var worldFrame = frame{rot: identity3}

// planeConvex collides plane pl at frame fp with convex shape s at fs. When
// planeIsA the plane is shape A of the pair (the normal then points out of
// the plane), otherwise B.
func (d *Detector) planeConvex(dst []Manifold, pl shapes.Plane, fp frame, s shapes.Shape, fs frame, margin float64, planeIsA bool, subA, subB int32) []Manifold {
	var v view
	if !d.capTop.view(&v, s, fs) {
		return dst
	}
	nw, dw, ok := d.planeSide.get(pl, fp)
	if !ok {
		return dst
	}
	d.cand = d.cand[:0]
	d.disc = discHint{}
	add := func(p vec3, id uint32) {
		sep := nw.Dot(p) - dw
		if sep <= margin {
			d.cand = append(d.cand, candPoint{p: p.Sub(nw.Mul(0.5 * sep)), sep: sep, id: id})
		}
	}
	down := nw.Mul(-1)
	switch v.kind {
	case kSphere:
		add(v.pos.Add(down.Mul(v.rad)), 0)
	case kCapsule:
		ax := v.axis().Mul(v.half[2])
		add(v.pos.Sub(ax).Add(down.Mul(v.rad)), 0)
		add(v.pos.Add(ax).Add(down.Mul(v.rad)), 1)
	case kBox:
		// Cull by the box's extent along the normal before looking at corners.
		l := mulT(v.rot, nw)
		ext := math.Abs(l[0])*v.half[0] + math.Abs(l[1])*v.half[1] + math.Abs(l[2])*v.half[2]
		if nw.Dot(v.pos)-dw-ext > margin {
			return dst
		}
		for i := 0; i < 8; i++ {
			add(v.pos.Add(mul(v.rot, boxVertex(v.half, i))), uint32(i))
		}
	case kHull:
		l := mulT(v.rot, down)
		si := d.capTop.lowest(v.hull, l)
		lo := v.pos.Add(mul(v.rot, v.hull.Vertices[si]))
		if nw.Dot(lo)-dw > margin {
			return dst
		}
		// Vertices clearly beyond the margin are skipped by their height in
		// the hull's frame (one dot product); the others are measured in the
		// world as before. tol covers the two sums' different rounding.
		h0 := nw.Dot(v.pos) - dw
		tol := 1e-9 * (v.size + math.Abs(h0))
		if len(v.hull.Neighbors) != len(v.hull.Vertices) {
			for i := range v.hull.Vertices {
				p := &v.hull.Vertices[i]
				if h0-l.Dot(*p) > margin+tol {
					continue
				}
				add(v.pos.Add(mul(v.rot, *p)), uint32(i))
			}
			break
		}
		for _, i := range d.hullCap(v.hull, l, si, h0, margin+tol, 1e-4*v.size) {
			add(v.pos.Add(mul(v.rot, v.hull.Vertices[i])), uint32(i))
		}
		d.keepRestingPatch(v.hull, l, nw)
	case kCylinder:
		ax := v.axis()
		c := down.Dot(ax)
		// Cull by the cylinder's extent along the normal (its lowest point).
		if ext := v.half[2]*math.Abs(c) + v.cylR*math.Sqrt(math.Max(0, 1-c*c)); nw.Dot(v.pos)-dw-ext > margin {
			return dst
		}
		u, rl := unit(down.Sub(ax.Mul(c)))
		mode := uint32(0)
		if rl <= cylFlatSin {
			u, mode = col(v.rot, 0), 8
		}
		w := ax.Cross(u)
		d.disc = discHint{r: v.cylR, n: 4} // a cap lying flat is a disc (patch.go)
		for cp := 0; cp < 2; cp++ {
			center := v.pos.Add(ax.Mul(v.half[2] * float64(1-2*cp)))
			for k := 0; k < rimPoints(rl, math.Abs(c)); k++ {
				cu, cw := [4]float64{1, 0, -1, 0}[k], [4]float64{0, 1, 0, -1}[k]
				add(center.Add(u.Mul(v.cylR*cu)).Add(w.Mul(v.cylR*cw)), mode+uint32(4*cp+k))
			}
		}
	default:
		add(v.supportFull(down), 0)
	}
	n := nw
	if !planeIsA {
		n = n.Mul(-1)
	}
	return d.emit(dst, worldFrame, n, subA, subB)
}

// hullTop remembers the hull vertex that the last climb ended on. A part
// on a plane turns little between steps, so its lowest vertex is the same or
// a neighbour of the last one: the climb starting there (Hull.SupportFrom)
// looks at one or two vertices' neighbours instead of walking across the
// hull from vertex 0, the temporal coherence of Lin and Canny, "A fast
// algorithm for incremental distance calculation", IEEE ICRA 1991. Any start
// finds the same height along l; only within a tie to rounding may the
// vertex differ; the cap walked from it is then the same, and the cull
// could differ only for a part whose tied lowest vertices lie exactly at
// the margin's edge, to rounding.
type hullTop struct {
	h *shapes.Hull
	i int
	// sized is the hull whose view size (setConvex) is size (planememo.go).
	sized *shapes.Hull
	size  float64
}

// lowest returns the index of h's vertex farthest along l.
func (t *hullTop) lowest(h *shapes.Hull, l vec3) int {
	start := 0
	if t.h == h && t.i < len(h.Vertices) {
		start = t.i
	}
	t.h, t.i = h, h.SupportFrom(l, start)
	return t.i
}

// hullCap returns, in increasing order, the indices of the vertices p of h
// with h0 - l.p <= lim (planeConvex's test, rounded the same), by a walk over
// the hull's triangulation (Hull.Adjacent) from top, the vertex highest along
// l. On a convex
// polytope every vertex has a path of edges to the highest one along which
// l.p never decreases, so the walk finds them all while looking only at the
// cap and its rim. It passes through vertices down to slack below the cap,
// which covers rounding and the hull's merge tolerance (faces that are not
// quite planar).
func (d *Detector) hullCap(h *shapes.Hull, l vec3, top int, h0, lim, slack float64) []int32 {
	if len(d.capMark) < len(h.Vertices) {
		d.capMark = make([]uint32, len(h.Vertices))
		d.capStamp = 0
	}
	d.capStamp++
	if d.capStamp == 0 { // wrapped: clear the marks of long ago
		clear(d.capMark)
		d.capStamp = 1
	}
	mark, stamp := d.capMark, d.capStamp
	walk := append(d.capWalk[:0], int32(top))
	mark[top] = stamp
	n := 0 // the cap found so far, kept at the front of walk
	for k := 0; k < len(walk); k++ {
		i := walk[k]
		for _, j := range h.Adjacent(int(i)) {
			if mark[j] != stamp && h0-l.Dot(h.Vertices[j]) <= lim+slack {
				mark[j] = stamp
				walk = append(walk, j)
			}
		}
		if !(h0-l.Dot(h.Vertices[i]) > lim) {
			walk[n] = i // n <= k: this entry has been visited
			n++
		}
	}
	d.capWalk = walk
	slices.Sort(walk[:n])
	return walk[:n]
}
