package collide

import (
	"math"
)

// Contact features for the general convex path: once GJK or EPA has given
// the contact normal, each shape offers the part of its surface that is
// extreme along the normal (a point, a segment, or a polygon), and the two
// are clipped against each other into a manifold.

const (
	// featSin: a segment or face counts as lying across the normal when its
	// direction is within this sine of perpendicular (about 1.1 degrees).
	// Points of such a feature that are farther away than the margin drop
	// out, so a wide tolerance only costs clipping work, while a narrow one
	// would lose the second point of a capsule or cylinder lying nearly flat.
	featSin = 0.02
	// cylRefPoints is the number of rim points of a cylinder cap that serves
	// as the reference face; an incident cap gives four, so that a cap on a
	// face keeps its points without reduction (stable ids).
	cylRefPoints = 16
	// cylFlatSin: below this sine of tilt a cap's rim points are laid out
	// from the cylinder's own x axis (stable ids while resting flat); above
	// it the first rim point is the exact deepest point of the rim.
	cylFlatSin = 1e-4
)

var featCos = math.Sqrt(1 - featSin*featSin)

// rimCos4 and rimCos16 hold the cosine and sine of the angles 2 pi k / n of
// the rim points of a cylinder cap (n = 4 and cylRefPoints).
var rimCos4, rimCos16 = rimTable(4), rimTable(cylRefPoints)

func rimTable(n int) [][2]float64 {
	t := make([][2]float64, n)
	for k := range t {
		th := 2 * math.Pi * float64(k) / float64(n)
		t[k] = [2]float64{math.Cos(th), math.Sin(th)}
	}
	return t
}

// feature is the extreme part of a shape along a direction, in the frame.
// Points lie on the core; the rounding radius rad is added by the caller.
type feature struct {
	pts    []vec3
	normal vec3 // outward normal of a polygon feature
	base   int  // shape-specific feature number, for ids
	rad    float64
	scale  float64
	// set marks a set of separate points (a tilted cylinder's rim points),
	// not a polygon: each point is a contact of its own.
	set bool
}

func (f *feature) reset(rad, scale float64) {
	f.pts = f.pts[:0]
	f.normal = vec3{}
	f.base = 0
	f.rad = rad
	f.scale = scale
	f.set = false
}

func (f *feature) polygon() bool { return len(f.pts) >= 3 && !f.set }

// extreme fills f with the feature of v farthest along unit frame direction n.
func (v *view) extreme(n vec3, f *feature) {
	f.reset(v.rad, v.size)
	switch v.kind {
	case kSphere:
		f.pts = append(f.pts, v.pos)
	case kCapsule:
		ax := v.axis()
		c := ax.Dot(n)
		top, bot := v.pos.Add(ax.Mul(v.half[2])), v.pos.Sub(ax.Mul(v.half[2]))
		switch {
		case math.Abs(c) <= featSin:
			f.pts = append(f.pts, bot, top)
			f.base = 2
		case c > 0:
			f.pts = append(f.pts, top)
			f.base = 1
		default:
			f.pts = append(f.pts, bot)
		}
	case kBox:
		l := mulT(v.rot, n)
		i := argmaxAbs(l)
		if math.Abs(l[i]) >= featCos {
			fi := 2 * i
			if l[i] < 0 {
				fi++
			}
			for _, k := range boxFaces[fi].Verts {
				f.pts = append(f.pts, v.pos.Add(mul(v.rot, boxVertex(v.half, int(k)))))
			}
			f.normal = mul(v.rot, boxFaces[fi].Normal)
			f.base = fi
			return
		}
		vi := 0
		for a := 0; a < 3; a++ {
			if l[a] >= 0 {
				vi |= 1 << a
			}
		}
		f.pts = append(f.pts, v.pos.Add(mul(v.rot, boxVertex(v.half, vi))))
		f.base = 8 + vi
		// The edge of this vertex most nearly across n.
		k := 0
		for a := 1; a < 3; a++ {
			if math.Abs(l[a]) < math.Abs(l[k]) {
				k = a
			}
		}
		if math.Abs(l[k]) <= featSin*l.Len() {
			vj := vi ^ (1 << k)
			f.pts = append(f.pts, v.pos.Add(mul(v.rot, boxVertex(v.half, vj))))
			f.base = 16 + vi&vj + 8*k
		}
	case kHull:
		h := v.hull
		l := mulT(v.rot, n)
		best, bi := math.Inf(-1), -1
		for i := range h.Faces {
			if c := h.Faces[i].Normal.Dot(l); c > best {
				best, bi = c, i
			}
		}
		if bi >= 0 && best >= featCos {
			for _, k := range h.Faces[bi].Verts {
				f.pts = append(f.pts, v.pos.Add(mul(v.rot, h.Vertices[k])))
			}
			f.normal = mul(v.rot, h.Faces[bi].Normal)
			f.base = bi
			return
		}
		vi := h.SupportIndex(l)
		p := h.Vertices[vi]
		f.pts = append(f.pts, v.pos.Add(mul(v.rot, p)))
		f.base = 64 + vi
		if vi < len(h.Neighbors) {
			bj, bs := -1, featSin
			for _, j := range h.Neighbors[vi] {
				e, el := unit(h.Vertices[j].Sub(p))
				if el == 0 {
					continue
				}
				if s := math.Abs(e.Dot(l)); s <= bs {
					bj, bs = int(j), s
				}
			}
			if bj >= 0 {
				f.pts = append(f.pts, v.pos.Add(mul(v.rot, h.Vertices[bj])))
				f.base = 128 + (vi+bj)%128
			}
		}
	case kCylinder:
		v.cylinderExtreme(n, f, false)
	case kTriangle:
		c := n.Dot(v.triN)
		switch {
		case c >= featCos:
			f.pts = append(f.pts, v.tri[0], v.tri[1], v.tri[2])
			f.normal = v.triN
		case c <= -featCos:
			f.pts = append(f.pts, v.tri[0], v.tri[2], v.tri[1])
			f.normal = v.triN.Mul(-1)
			f.base = 1
		default:
			bi, best := 0, v.tri[0].Dot(n)
			for i := 1; i < 3; i++ {
				if d := v.tri[i].Dot(n); d > best {
					bi, best = i, d
				}
			}
			f.pts = append(f.pts, v.tri[bi])
			f.base = 2 + bi
			bj, bs := -1, featSin
			for _, j := range [2]int{(bi + 1) % 3, (bi + 2) % 3} {
				e, _ := unit(v.tri[j].Sub(v.tri[bi]))
				if s := math.Abs(e.Dot(n)); s <= bs {
					bj, bs = j, s
				}
			}
			if bj >= 0 {
				f.pts = append(f.pts, v.tri[bj])
				f.base = 5 + bi + bj
			}
		}
	default:
		f.pts = append(f.pts, v.support(n))
	}
}

// cylinderExtreme: the side segment when the axis is within featSin of
// perpendicular to n; a cap polygon when it is within featSin of n (four
// rim points laid out from the cylinder's x axis while the cap is flat
// within cylFlatSin, else from the exact deepest rim point; finer when the
// cap is the reference face); otherwise the set of rim points of both caps
// laid out from their deepest points, as on a plane (the deepest point is
// the pivot when the cylinder tips, and the others take over as it settles).
func (v *view) cylinderExtreme(n vec3, f *feature, ref bool) {
	ax := v.axis()
	c := ax.Dot(n)
	h := v.half[2]
	radial := n.Sub(ax.Mul(c))
	u, rl := unit(radial)
	f.pts = f.pts[:0]
	switch {
	case math.Abs(c) <= featSin && rl > 0:
		side := v.pos.Add(u.Mul(v.cylR))
		f.pts = append(f.pts, side.Sub(ax.Mul(h)), side.Add(ax.Mul(h)))
		f.base = 4
	case math.Abs(c) >= featCos || ref:
		capN := ax
		if c < 0 {
			capN = ax.Mul(-1)
		}
		center := v.pos.Add(capN.Mul(h))
		mode, np := 0, 4
		if rl <= cylFlatSin {
			u = col(v.rot, 0)
			mode = 1
		}
		if ref {
			mode, np = 2, cylRefPoints
		}
		w := capN.Cross(u) // u, w, capN right-handed: counter-clockwise seen from outside
		cs := rimCos4
		if np == cylRefPoints {
			cs = rimCos16
		}
		for k := 0; k < np; k++ {
			f.pts = append(f.pts, center.Add(u.Mul(v.cylR*cs[k][0])).Add(w.Mul(v.cylR*cs[k][1])))
		}
		f.normal = capN
		f.base = 2*mode + b2i(c < 0)
	default:
		w := ax.Cross(u)
		for cp := 0; cp < 2; cp++ {
			center := v.pos.Add(ax.Mul(h * float64(1-2*cp)))
			for k := 0; k < 4; k++ {
				cu, cw := [4]float64{1, 0, -1, 0}[k], [4]float64{0, 1, 0, -1}[k]
				f.pts = append(f.pts, center.Add(u.Mul(v.cylR*cu)).Add(w.Mul(v.cylR*cw)))
			}
		}
		f.set = true
		f.base = 6
	}
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}
