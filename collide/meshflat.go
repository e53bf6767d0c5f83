package collide

// A box or hull face lying on a mesh triangle. When the part's face that
// is most anti-parallel to the triangle lies flat on it (within featSin)
// and crosses none of the triangle's edges that end the surface there
// (free, convex or concave edges, as opposed to the seams inside a flat or
// smooth region), its contact with the triangle is the face's corners over
// the triangle, as on a plane: the points that clipping the face against
// the triangle as reference (Sutherland and Hodgman 1974) keeps once the
// seams' crossings are dropped, with the same feature ids, found without
// the separating-axis test and the clipping. A resting or sliding part
// takes this path on every triangle under it; a tilted one, or one over a
// crease, takes the general one.

// faceOnFlat leaves in d.cand the contact points of polytope p (set from
// the part) with triangle tv (triangle t of m) when the face lies flat on
// it, and reports whether it did; the normal from the part toward the
// triangle is then the triangle's normal reversed.
func (d *Detector) faceOnFlat(p *polytope, tv *view, m *Mesh, t int, margin float64) bool {
	n := tv.triN
	// The triangles of a flat share their normal: one search for all.
	k := d.flat.find(&n) // meshnormal.go
	if k < 0 {
		k = d.flat.put(&n, incidentFace(p, n))
	}
	fi := d.flat.val[k]
	if -p.planes[fi].n.Dot(n) < featCos {
		return false
	}
	ad := &m.adj[t]
	tol := clipTolerance * (tv.size + p.size)
	verts := p.faces[fi].Verts
	// Every corner inside the side planes of the edges that end the
	// surface; the seams' side planes only select the corners over t.
	var over [16]bool
	if len(verts) > len(over) {
		return false
	}
	for i := range verts {
		over[i] = true
	}
	for e := 0; e < 3; e++ {
		sn := ad.side[e] // the side plane's normal, as clipping computes it
		if sn == (vec3{}) {
			return false
		}
		sd := dot(&sn, &tv.tri[e])
		seam := ad.kind[e] == edgeFlat || ad.smooth[e]
		for i, vi := range verts {
			if dot(&sn, &p.verts[vi])-sd > tol {
				if !seam {
					return false
				}
				over[i] = false
			}
		}
	}
	d.cand = d.cand[:0]
	rd := n.Dot(tv.tri[0])
	for i, vi := range verts {
		if !over[i] {
			continue
		}
		x := p.verts[vi]
		sep := n.Dot(x) - rd
		if sep > margin {
			continue
		}
		d.cand = append(d.cand, candPoint{p: x.Sub(n.Mul(0.5 * sep)), sep: sep, id: faceID(true, 0, fi, codeV(i), 0)})
	}
	return true
}

// dot is a.Dot(b) for vectors passed by pointer: the same sum in the same
// order, without the copies of both vectors the compiler makes for Dot in
// this loop.
func dot(a, b *vec3) float64 { return a[0]*b[0] + a[1]*b[1] + a[2]*b[2] }
