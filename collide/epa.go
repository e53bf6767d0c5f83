package collide

import "math"

// EPA, the expanding polytope algorithm: G. van den Bergen, "Proximity
// queries and penetration depth computation on 3D game objects", Game
// Developers Conference proceedings 2001, and "Collision Detection in
// Interactive 3D Environments", Morgan Kaufmann 2003, section 4.3.8. When GJK
// finds the origin inside D = A - B, a polytope inside D that contains the
// origin is grown toward the boundary of D: the face closest to the origin is
// replaced by the support point along its normal until that face lies on the
// boundary. Its distance is the penetration depth and its normal the
// direction of least translation.

const (
	epaMaxIter  = 96
	epaMaxFaces = 512
	// epaRelTol: a face is final when the support point along its normal lies
	// within this fraction of the size of D beyond it. Polytopes converge
	// exactly (the support points are vertices of D), so the bound is only
	// rounding.
	epaRelTol = 1e-10
	// epaCurvedTol is the same bound when a shape is curved (cylinder,
	// rounded sphere or capsule, any other convex): the polytope approaches
	// a curved boundary only quadratically in its face size. 1e-7 of the
	// size is a nanometre on a centimetre part.
	epaCurvedTol = 1e-7
)

func (v *view) curved(full bool) bool {
	return v.kind == kCylinder || v.kind == kConvex || (full && v.rad > 0)
}

type epaFace struct {
	v     [3]int32
	adj   [3]int32 // face across edge k (from v[k] to v[k+1])
	n     vec3     // outward unit normal
	dist  float64
	alive bool
}

// epaEdge is a horizon edge: edge k of the surviving face f.
type epaEdge struct{ f, k int32 }

// epaResult is the penetration of two views.
type epaResult struct {
	normal vec3 // from A toward B: moving B by depth*normal separates them
	depth  float64
	pa, pb vec3 // deepest points of A in B and of B in A
	ok     bool // false when D is flat (no volume) and no depth was found
	capped bool
}

func (d *Detector) epaSupport(a, b *view, full bool, dir vec3) (w, pa, pb vec3) {
	if full {
		pa, pb = a.supportFull(dir), b.supportFull(dir.Mul(-1))
	} else {
		pa, pb = a.support(dir), b.support(dir.Mul(-1))
	}
	return pa.Sub(pb), pa, pb
}

func (d *Detector) epaAddFace(i, j, k int32) bool {
	w := d.epaW
	n := w[j].Sub(w[i]).Cross(w[k].Sub(w[i]))
	l := n.Len()
	if !(l > 0) {
		return false
	}
	n = n.Mul(1 / l)
	d.epaFaces = append(d.epaFaces, epaFace{v: [3]int32{i, j, k}, adj: [3]int32{-1, -1, -1}, n: n, dist: n.Dot(w[i]), alive: true})
	return true
}

// epaLink records that faces f and g share the edge from a to b (as it runs
// in f).
func (d *Detector) epaLink(f int32, a, b int32) {
	for g := range d.epaFaces {
		h := &d.epaFaces[g]
		if !h.alive || int32(g) == f {
			continue
		}
		for k := 0; k < 3; k++ {
			if h.v[k] == b && h.v[(k+1)%3] == a {
				h.adj[k] = f
				fv := &d.epaFaces[f]
				for e := 0; e < 3; e++ {
					if fv.v[e] == a && fv.v[(e+1)%3] == b {
						fv.adj[e] = int32(g)
					}
				}
				return
			}
		}
	}
}

// epaSilhouette removes face f if it sees w and recurses over its
// neighbours; edges toward faces that do not see w are the horizon. from is
// the face it was entered from (or -1).
func (d *Detector) epaSilhouette(f int32, w vec3, depth int) {
	g := &d.epaFaces[f]
	if !g.alive {
		return
	}
	g.alive = false
	d.epaKilled = append(d.epaKilled, f)
	for k := int32(0); k < 3; k++ {
		h := g.adj[k]
		if h < 0 {
			d.epaBroken = true
			continue
		}
		hf := &d.epaFaces[h]
		if !hf.alive {
			continue
		}
		if depth < 64 && hf.n.Dot(w.Sub(d.epaW[hf.v[0]])) > 0 {
			d.epaSilhouette(h, w, depth+1)
			continue
		}
		// h survives: find its edge shared with g.
		for e := int32(0); e < 3; e++ {
			if hf.adj[e] == f {
				d.epaEdges = append(d.epaEdges, epaEdge{h, e})
			}
		}
	}
}

// epa computes the penetration of a and b starting from the simplex that
// GJK left in d.smp.
func (d *Detector) epa(a, b *view, full bool) epaResult {
	d.stats.EPACalls++
	s := &d.smp
	d.epaW, d.epaA, d.epaB = d.epaW[:0], d.epaA[:0], d.epaB[:0]
	d.epaFaces = d.epaFaces[:0]
	for i := 0; i < s.n; i++ {
		d.epaW = append(d.epaW, s.w[i])
		d.epaA = append(d.epaA, s.a[i])
		d.epaB = append(d.epaB, s.b[i])
	}
	var res epaResult
	if !d.epaTetra(a, b, full) {
		d.stats.EPAFailed++
		return res
	}
	w := d.epaW
	scale := 0.0
	for i := range w {
		scale = math.Max(scale, w[i].Len())
	}
	tol := epaRelTol * scale
	if a.curved(full) || b.curved(full) {
		tol = epaCurvedTol * scale
	}
	// The tetrahedron's faces, oriented outward from its centroid.
	c := w[0].Add(w[1]).Add(w[2]).Add(w[3]).Mul(0.25)
	for _, f := range [4][3]int32{{0, 1, 2}, {0, 3, 1}, {0, 2, 3}, {1, 3, 2}} {
		i, j, k := f[0], f[1], f[2]
		if w[j].Sub(w[i]).Cross(w[k].Sub(w[i])).Dot(c.Sub(w[i])) > 0 {
			j, k = k, j
		}
		if !d.epaAddFace(i, j, k) {
			d.stats.EPAFailed++
			return res
		}
	}
	for f := range d.epaFaces {
		for k := 0; k < 3; k++ {
			d.epaLink(int32(f), d.epaFaces[f].v[k], d.epaFaces[f].v[(k+1)%3])
		}
	}
	best := -1
	for it := 0; ; it++ {
		best = -1
		for i := range d.epaFaces {
			f := &d.epaFaces[i]
			if f.alive && (best < 0 || f.dist < d.epaFaces[best].dist) {
				best = i
			}
		}
		if best < 0 {
			d.stats.EPAFailed++
			return res
		}
		if it == epaMaxIter || len(d.epaFaces)+64 > epaMaxFaces {
			res.capped = true
			d.stats.EPACapped++
			break
		}
		f := d.epaFaces[best]
		wn, pa, pb := d.epaSupport(a, b, full, f.n)
		if f.n.Dot(wn)-f.dist <= tol {
			break
		}
		// Remove the faces that see the new point, flooding from the closest
		// face over the adjacency, and keep the horizon.
		d.epaEdges = d.epaEdges[:0]
		d.epaKilled = d.epaKilled[:0]
		d.epaBroken = false
		d.epaSilhouette(int32(best), wn, 0)
		if d.epaBroken || !d.epaHorizonIsLoop() {
			// Rounding made the visible set inconsistent: keep the best face
			// found so far (it is still a valid lower bound on the depth).
			for _, i := range d.epaKilled {
				d.epaFaces[i].alive = true
			}
			d.stats.EPACapped++
			res.capped = true
			break
		}
		nv := int32(len(d.epaW))
		d.epaW = append(d.epaW, wn)
		d.epaA = append(d.epaA, pa)
		d.epaB = append(d.epaB, pb)
		first := int32(len(d.epaFaces))
		okAll := true
		for _, e := range d.epaEdges {
			h := &d.epaFaces[e.f]
			a, b := h.v[e.k], h.v[(e.k+1)%3]
			if !d.epaAddFace(b, a, nv) {
				okAll = false
				break
			}
			nf := int32(len(d.epaFaces) - 1)
			d.epaFaces[nf].adj[0] = e.f
			d.epaFaces[e.f].adj[e.k] = nf
		}
		if !okAll {
			for _, i := range d.epaKilled {
				d.epaFaces[i].alive = true
			}
			for i := first; i < int32(len(d.epaFaces)); i++ {
				d.epaFaces[i].alive = false
			}
			res.capped = true
			d.stats.EPACapped++
			break
		}
		// Link the new faces to each other: face j runs b_j -> a_j -> w, so
		// its edge a_j -> w meets the face whose edge w -> b_k has b_k == a_j.
		for i := first; i < int32(len(d.epaFaces)); i++ {
			for j := first; j < int32(len(d.epaFaces)); j++ {
				if d.epaFaces[j].v[0] == d.epaFaces[i].v[1] {
					d.epaFaces[i].adj[1] = j
					d.epaFaces[j].adj[2] = i
				}
			}
		}
	}
	f := d.epaFaces[best]
	// Barycentric coordinates of the closest point of the face.
	w = d.epaW
	p := f.n.Mul(f.dist)
	i, j, k := f.v[0], f.v[1], f.v[2]
	u, v, t := barycentric(p, w[i], w[j], w[k])
	res.pa = d.epaA[i].Mul(u).Add(d.epaA[j].Mul(v)).Add(d.epaA[k].Mul(t))
	res.pb = d.epaB[i].Mul(u).Add(d.epaB[j].Mul(v)).Add(d.epaB[k].Mul(t))
	// Face normals of D point outward; the origin is inside, so moving B by
	// +depth*n (which moves D by -depth*n) brings the face to the origin.
	res.normal = f.n
	res.depth = math.Max(f.dist, 0)
	res.ok = true
	return res
}

// epaHorizonIsLoop checks that the horizon edges form one closed loop: each
// vertex starts exactly one edge and ends exactly one.
func (d *Detector) epaHorizonIsLoop() bool {
	e := d.epaEdges
	if len(e) < 3 {
		return false
	}
	end := func(x epaEdge, k int32) int32 { return d.epaFaces[x.f].v[(x.k+k)%3] }
	for i := range e {
		starts, ends := 0, 0
		for j := range e {
			// In the surviving face the edge runs a -> b; the new face runs b -> a.
			if end(e[j], 0) == end(e[i], 0) {
				starts++
			}
			if end(e[j], 1) == end(e[i], 0) {
				ends++
			}
		}
		if starts != 1 || ends != 1 {
			return false
		}
	}
	return true
}

// epaTetra grows the GJK simplex to a tetrahedron of positive volume by
// support points along directions away from its affine hull. It reports
// false when D has no volume (flat shapes in contact face to face).
func (d *Detector) epaTetra(a, b *view, full bool) bool {
	scale := 0.0
	for i := range d.epaW {
		scale = math.Max(scale, d.epaW[i].Len())
	}
	add := func(dirs []vec3, dist func(vec3) float64) bool {
		bestD, bi := 0.0, -1
		var bw, bpa, bpb vec3
		for i, dir := range dirs {
			w, pa, pb := d.epaSupport(a, b, full, dir)
			if dd := dist(w); dd > bestD {
				bestD, bi, bw, bpa, bpb = dd, i, w, pa, pb
			}
			scale = math.Max(scale, w.Len())
		}
		if bi < 0 || bestD <= 1e-12*scale {
			return false
		}
		d.epaW = append(d.epaW, bw)
		d.epaA = append(d.epaA, bpa)
		d.epaB = append(d.epaB, bpb)
		return true
	}
	for len(d.epaW) < 4 {
		w := d.epaW
		switch len(w) {
		case 0:
			w0, pa, pb := d.epaSupport(a, b, full, vec3{1, 0, 0})
			d.epaW = append(d.epaW, w0)
			d.epaA = append(d.epaA, pa)
			d.epaB = append(d.epaB, pb)
		case 1:
			dirs := [6]vec3{{1, 0, 0}, {-1, 0, 0}, {0, 1, 0}, {0, -1, 0}, {0, 0, 1}, {0, 0, -1}}
			if !add(dirs[:], func(p vec3) float64 { return p.Sub(w[0]).Len() }) {
				return false
			}
		case 2:
			e, _ := unit(w[1].Sub(w[0]))
			u := perpendicular(e)
			v := e.Cross(u)
			var dirs [8]vec3
			for k := 0; k < 8; k++ {
				th := float64(k) * math.Pi / 4
				dirs[k] = u.Mul(math.Cos(th)).Add(v.Mul(math.Sin(th)))
			}
			if !add(dirs[:], func(p vec3) float64 {
				q := p.Sub(w[0])
				return q.Sub(e.Mul(q.Dot(e))).Len()
			}) {
				return false
			}
		case 3:
			n, l := unit(w[1].Sub(w[0]).Cross(w[2].Sub(w[0])))
			if l == 0 {
				// Collinear: drop the middle point and search again.
				d.epaW, d.epaA, d.epaB = d.epaW[:2], d.epaA[:2], d.epaB[:2]
				return d.epaTetraFromSegment(a, b, full)
			}
			dirs := [2]vec3{n, n.Mul(-1)}
			if !add(dirs[:], func(p vec3) float64 { return math.Abs(p.Sub(w[0]).Dot(n)) }) {
				return false
			}
		}
	}
	w := d.epaW
	vol := det3(w[1].Sub(w[0]), w[2].Sub(w[0]), w[3].Sub(w[0]))
	return math.Abs(vol) > 1e-14*scale*scale*scale
}

// epaTetraFromSegment is epaTetra restarted from two points whose third
// point was collinear; it searches the plane directions only once.
func (d *Detector) epaTetraFromSegment(a, b *view, full bool) bool {
	w := d.epaW
	e, l := unit(w[1].Sub(w[0]))
	if l == 0 {
		return false
	}
	u := perpendicular(e)
	v := e.Cross(u)
	best, bi := 0.0, -1
	var bw, bpa, bpb vec3
	for k := 0; k < 8; k++ {
		th := float64(k) * math.Pi / 4
		wk, pa, pb := d.epaSupport(a, b, full, u.Mul(math.Cos(th)).Add(v.Mul(math.Sin(th))))
		q := wk.Sub(w[0])
		if dd := q.Sub(e.Mul(q.Dot(e))).Len(); dd > best {
			best, bi, bw, bpa, bpb = dd, k, wk, pa, pb
		}
	}
	if bi < 0 || best <= 1e-12*l {
		return false
	}
	d.epaW = append(d.epaW, bw)
	d.epaA = append(d.epaA, bpa)
	d.epaB = append(d.epaB, bpb)
	n, _ := unit(w[1].Sub(w[0]).Cross(bw.Sub(w[0])))
	best, bi = 0, -1
	for k, dir := range [2]vec3{n, n.Mul(-1)} {
		wk, pa, pb := d.epaSupport(a, b, full, dir)
		if dd := math.Abs(wk.Sub(w[0]).Dot(n)); dd > best {
			best, bi, bw, bpa, bpb = dd, k, wk, pa, pb
		}
	}
	if bi < 0 || best <= 1e-12*l {
		return false
	}
	d.epaW = append(d.epaW, bw)
	d.epaA = append(d.epaA, bpa)
	d.epaB = append(d.epaB, bpb)
	return true
}

// barycentric returns the coordinates of p (in the plane of abc) with
// respect to triangle abc, clamped to the triangle.
func barycentric(p, a, b, c vec3) (u, v, w float64) {
	v0, v1, v2 := b.Sub(a), c.Sub(a), p.Sub(a)
	d00, d01, d11 := v0.Dot(v0), v0.Dot(v1), v1.Dot(v1)
	d20, d21 := v2.Dot(v0), v2.Dot(v1)
	den := d00*d11 - d01*d01
	if !(den > 0) {
		return 1, 0, 0
	}
	v = (d11*d20 - d01*d21) / den
	w = (d00*d21 - d01*d20) / den
	u = 1 - v - w
	if u < 0 || v < 0 || w < 0 {
		// Outside by rounding: use the closest point of the triangle.
		q := closestPointTriangle(p, a, b, c)
		v2 = q.Sub(a)
		d20, d21 = v2.Dot(v0), v2.Dot(v1)
		v = (d11*d20 - d01*d21) / den
		w = (d00*d21 - d01*d20) / den
		u = 1 - v - w
	}
	return u, v, w
}
