package collide

// Face clipping: the incident polygon (the face of the other shape most
// anti-parallel to the reference face) is clipped by the side planes of the
// reference face, one plane after another, by the method of I. E. Sutherland
// and G. W. Hodgman, "Reentrant polygon clipping", CACM 17(1), 1974. The
// points that remain below the reference plane plus the margin are contact
// points.
//
// Every point keeps the two features that made it, so that its id survives
// small motions: an incident vertex, or the crossing of an incident edge (or
// of an earlier clipping plane) with a side plane of the reference face. The
// clipper tracks, for each edge of the polygon being clipped, the feature the
// edge lies on.

// Feature codes of one point, one byte each: incident vertex k, incident edge
// k (from vertex k to k+1), side plane k of the reference face.
func codeV(k int) uint8 { return uint8(1 + k%63) }
func codeE(k int) uint8 { return uint8(64 + k%64) }
func codeP(k int) uint8 { return uint8(128 + k%128) }

type clipVert struct {
	p      vec3
	c1, c2 uint8 // the features that made the point (c2 = 0 for a vertex)
	next   uint8 // the feature that the edge to the following point lies on
}

// Feature ids, 32 bits: bit 31 set when the reference face is B's; bits
// 24-30 the reference face; bits 16-23 the incident face; bits 8-15 and 0-7
// the point's two feature codes, larger first. A pure incident vertex has a
// zero low byte. Ids wrap (modulo the field sizes) on hulls with more faces
// or longer faces, which only risks a missed warm start, never a wrong
// contact.
func faceID(flip bool, ref, inc int, c1, c2 uint8) uint32 {
	if c1 < c2 {
		c1, c2 = c2, c1
	}
	id := uint32(ref%128)<<24 | uint32(inc%256)<<16 | uint32(c1)<<8 | uint32(c2)
	if flip {
		id |= 1 << 31
	}
	return id
}

// edgeID names an edge-edge contact (a single point).
func edgeID(ea, eb int) uint32 { return 0x7F<<24 | uint32(ea%256)<<16 | uint32(eb%256)<<8 }

// clipPolygon clips the convex polygon in by the half-space sn.x <= sd + tol,
// appending the result to out.
func clipPolygon(in, out []clipVert, sn vec3, sd float64, code uint8, tol float64) []clipVert {
	n := len(in)
	for i := 0; i < n; i++ {
		p, q := in[i], in[(i+1)%n]
		dp, dq := sn.Dot(p.p)-sd, sn.Dot(q.p)-sd
		pin, qin := dp <= tol, dq <= tol
		if pin {
			out = append(out, p)
		}
		if pin != qin {
			t := dp / (dp - dq)
			x := clipVert{p: p.p.Add(q.p.Sub(p.p).Mul(t)), c1: p.next, c2: code, next: p.next}
			if pin {
				x.next = code // the polygon now runs along the side plane
			}
			out = append(out, x)
		}
	}
	return out
}

// clipTolerance is the slack of the side planes, a fraction of the shapes'
// size: incident vertices that lie on a side plane within it (a box resting
// flush with the edge of another) stay vertices. Rounding alone needs 1e-10;
// 1e-5 (a micrometre on parts of 0.1 m) also keeps the ids of flush corners
// through the sub-micrometre sway of a resting stack, which would otherwise
// clip every such corner into two edge crossings one step and back the
// next, and costs a point at most that far outside the reference face.
const clipTolerance = 1e-5

// clipFaces clips incident face nf of inc against reference face rf of ref
// and appends the contact points to d.cand. flip tells that the reference
// face belongs to B.
func (d *Detector) clipFaces(ref *polytope, rf int, inc *polytope, nf int, flip bool, margin float64) {
	rp := ref.planes[rf]
	rv := ref.faces[rf].Verts
	iv := inc.faces[nf].Verts
	tol := clipTolerance * (ref.size + inc.size)
	poly := d.clip0[:0]
	for k, vi := range iv {
		poly = append(poly, clipVert{p: inc.verts[vi], c1: codeV(k), next: codeE(k)})
	}
	out := d.clip1[:0]
	for k := range rv {
		a := ref.verts[rv[k]]
		b := ref.verts[rv[(k+1)%len(rv)]]
		sn, l := unit(b.Sub(a).Cross(rp.n))
		if l == 0 {
			continue
		}
		sd := sn.Dot(a)
		if !inc.flat && sn.Dot(inc.pos)+inc.size <= sd {
			// All of inc lies inside the plane (its points are within
			// size of pos): the clip would copy the polygon unchanged.
			continue
		}
		out = clipPolygon(poly, out[:0], sn, sd, codeP(k), tol)
		poly, out = out, poly
		if len(poly) == 0 {
			break
		}
	}
	for i := range poly {
		c := &poly[i]
		sep := rp.n.Dot(c.p) - rp.d
		if sep > margin {
			continue
		}
		d.cand = append(d.cand, candPoint{p: c.p.Sub(rp.n.Mul(0.5 * sep)), sep: sep, id: faceID(flip, rf, nf, c.c1, c.c2)})
	}
	d.clip0, d.clip1 = poly[:0], out[:0]
}

// clipToPolygon clips an incident polygon (points pts, radius rad of a
// rounded incident shape) against a reference polygon ref with outward
// normal rn, appending contact points to d.cand. The reference belongs to A
// unless flip. baseRef and baseInc tag the features in the ids.
func (d *Detector) clipToPolygon(ref []vec3, rn vec3, inc []vec3, rad float64, flip bool, baseRef, baseInc int, margin, scale float64) {
	rd := rn.Dot(ref[0])
	tol := clipTolerance * scale
	poly := d.clip0[:0]
	if len(inc) == 2 {
		d.clipSegmentTo(ref, rn, rd, inc[0], inc[1], rad, flip, baseRef, baseInc, margin, tol)
		return
	}
	for k, p := range inc {
		poly = append(poly, clipVert{p: p, c1: codeV(k), next: codeE(k)})
	}
	out := d.clip1[:0]
	for k := range ref {
		a, b := ref[k], ref[(k+1)%len(ref)]
		sn, l := unit(b.Sub(a).Cross(rn))
		if l == 0 {
			continue
		}
		out = clipPolygon(poly, out[:0], sn, sn.Dot(a), codeP(k), tol)
		poly, out = out, poly
		if len(poly) == 0 {
			break
		}
	}
	for i := range poly {
		c := &poly[i]
		d.addRefPoint(c.p, rn, rd, rad, flip, baseRef, baseInc, c.c1, c.c2, margin)
	}
	d.clip0, d.clip1 = poly[:0], out[:0]
}

// addRefPoint appends the contact of incident core point p (radius rad)
// against the reference plane rn.x = rd.
func (d *Detector) addRefPoint(p, rn vec3, rd, rad float64, flip bool, baseRef, baseInc int, c1, c2 uint8, margin float64) {
	s := p.Sub(rn.Mul(rad)) // the incident surface point nearest the reference
	sep := rn.Dot(s) - rd
	if sep > margin {
		return
	}
	d.cand = append(d.cand, candPoint{p: s.Sub(rn.Mul(0.5 * sep)), sep: sep, id: faceID(flip, baseRef, baseInc, c1, c2)})
}

// clipSegmentTo clips segment p0-p1 against the side planes of polygon ref.
func (d *Detector) clipSegmentTo(ref []vec3, rn vec3, rd float64, p0, p1 vec3, rad float64, flip bool, baseRef, baseInc int, margin, tol float64) {
	t0, t1 := 0.0, 1.0
	var k0, k1 uint8 // clipping plane that moved each end (0: none)
	dir := p1.Sub(p0)
	for k := range ref {
		a, b := ref[k], ref[(k+1)%len(ref)]
		sn, l := unit(b.Sub(a).Cross(rn))
		if l == 0 {
			continue
		}
		d0 := sn.Dot(p0) - sn.Dot(a) - tol
		dd := sn.Dot(dir)
		// Points p0 + t dir are inside where d0 + t dd <= 0.
		if dd == 0 {
			if d0 > 0 {
				return
			}
			continue
		}
		t := -d0 / dd
		if dd > 0 {
			if t < t1 {
				t1, k1 = t, codeP(k)
			}
		} else if t > t0 {
			t0, k0 = t, codeP(k)
		}
		if t0 > t1 {
			return
		}
	}
	e := codeE(0)
	if k0 == 0 {
		d.addRefPoint(p0, rn, rd, rad, flip, baseRef, baseInc, codeV(0), 0, margin)
	} else {
		d.addRefPoint(p0.Add(dir.Mul(t0)), rn, rd, rad, flip, baseRef, baseInc, e, k0, margin)
	}
	if t1 > t0 {
		if k1 == 0 {
			d.addRefPoint(p1, rn, rd, rad, flip, baseRef, baseInc, codeV(1), 0, margin)
		} else {
			d.addRefPoint(p0.Add(dir.Mul(t1)), rn, rd, rad, flip, baseRef, baseInc, e, k1, margin)
		}
	}
}
