package collide

import (
	"math"

	"clatter/shapes"
)

// restBand is how flat, as a fraction of the face's width, a face must lie
// for the hull to count as resting on it: every corner of the face within
// this depth of the deepest point, a tilt under 1e-3 rad. A part at rest on
// a face tilts far less, while one rocking, rolling or tipping over the
// face's rim is tilted more within a step or two.
const restBand = 1e-3

// restSpan is the least fraction of the area spanned by all the points
// within the margin that the resting face must span. A face with a fine rim
// beside it spans most of it (the top of cap.stl: (12.5/13)^2 = 0.92 of
// it); a narrow facet of a finely tessellated cylinder lying on its side
// spans a tenth or less, and needs the speculative points of the facets
// beside it to keep it from rolling over them unchecked.
const restSpan = 0.5

// keepRestingPatch keeps in d.cand only the corners of a hull's resting face
// when the hull lies flat on it: the face of h most nearly facing down (l,
// in the hull's frame) holds the deepest point and all its corners are
// within restBand of it. The points beside the face (the rings of a fine
// fillet or chamfer, a few micrometres to tenths of a millimetre higher)
// are speculative contacts that carry no load, but their wider spread would
// win them places among the four that reduce keeps, leaving the face
// supported at one point: the part then rocks for ever between the face and
// its rim, its contact points changing every step. A part tilted on a rim,
// rolling or tipping keeps every point, and so does a part on a narrow
// facet of a round side: the face must span at least restSpan of the area
// that all the points span (n is the contact normal in the world).
func (d *Detector) keepRestingPatch(h *shapes.Hull, l, n vec3) {
	pts := d.cand
	if len(pts) <= 4 || len(h.Faces) == 0 {
		return
	}
	fi, best := 0, math.Inf(-1)
	for i := range h.Faces {
		if c := h.Faces[i].Normal.Dot(l); c > best {
			fi, best = i, c
		}
	}
	f := h.Faces[fi]
	if len(f.Verts) < 3 || len(f.Verts) >= len(pts) {
		return
	}
	// Mark the face's corners with a fresh stamp of the cap walk's marks.
	d.capStamp++
	if d.capStamp == 0 {
		clear(d.capMark)
		d.capStamp = 1
	}
	for _, v := range f.Verts {
		d.capMark[v] = d.capStamp
	}
	deep, deepOn := math.Inf(1), false
	for _, p := range pts {
		if p.sep < deep {
			deep, deepOn = p.sep, d.capMark[p.id] == d.capStamp
		}
	}
	if !deepOn {
		return // the face is not the lowest part of the hull
	}
	band := restBand * faceWidth(h, f)
	k := 0
	for _, p := range pts {
		if d.capMark[p.id] == d.capStamp && p.sep <= deep+band {
			k++
		}
	}
	if k != len(f.Verts) {
		return // the face is tilted out of the band: rocking or tipping
	}
	all := d.spannedArea(pts, n)
	face := d.restFace[:0]
	for _, p := range pts {
		if d.capMark[p.id] == d.capStamp {
			face = append(face, p)
		}
	}
	d.restFace = face
	if d.spannedArea(face, n) >= restSpan*all {
		d.cand = append(d.cand[:0], face...)
	}
}

// spannedArea is the area of the triangle of the first three points that
// reduce keeps of pts in the plane normal to n (zero for points on a line).
func (d *Detector) spannedArea(pts []candPoint, n vec3) float64 {
	sel := d.reduce(pts, n)
	if len(sel) < 3 {
		return 0
	}
	a, b, c := pts[sel[0]].p, pts[sel[1]].p, pts[sel[2]].p
	return 0.5 * math.Abs(b.Sub(a).Cross(c.Sub(a)).Dot(n))
}

// faceWidth is the largest distance of a corner of f from its first one:
// between one and two times the face's diameter.
func faceWidth(h *shapes.Hull, f shapes.Face) float64 {
	p0 := h.Vertices[f.Verts[0]]
	w := 0.0
	for _, v := range f.Verts[1:] {
		w = math.Max(w, h.Vertices[v].Sub(p0).Len())
	}
	return w
}
