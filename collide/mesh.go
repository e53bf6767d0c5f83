package collide

import (
	"math"
	"slices"
	"sort"

	"clatter/collide/bvh"
	"clatter/shapes"
)

// Mesh is a static triangle mesh prepared for contact: its triangles'
// normals, the adjacency and convexity of their edges (for internal-edge
// correction), and a bounding volume hierarchy over the triangles. Build it
// once with NewMesh and pass it to Collide as the shape of a static body.
type Mesh struct {
	tri     *shapes.TriMesh
	bounds  shapes.AABB
	normals []vec3   // unit normal per triangle (zero for a skipped one)
	adj     []triAdj // per triangle
	tree    *bvh.Tree
	// remap maps the tree's triangle indices to the mesh's when triangles
	// were skipped (nil otherwise).
	remap   []int32
	skipped int
}

// Edge kinds for internal-edge correction.
const (
	edgeFree    uint8 = iota // no neighbour (or more than one): any normal is valid
	edgeConvex               // a ridge: normals between the two faces are valid
	edgeFlat                 // coplanar neighbour: only the face normal is valid
	edgeConcave              // a valley: only the face normals are valid
)

// triAdj describes the three edges of a triangle; edge i runs from
// corner i to corner i+1.
type triAdj struct {
	kind  [3]uint8
	side  [3]vec3    // outward unit normal of edge i in the triangle's plane
	angle [3]float64 // for a convex edge: the angle from this normal to the neighbour's, toward side
	// smooth marks an edge whose neighbour is within the merge angle
	// (meshGroupAngle): the two share a manifold, so points clipped at
	// the edge are seams inside it.
	smooth [3]bool
	snapV  [3]bool // corner i: every mesh edge at it is flat or concave
	// region is the smallest triangle index of the flat region (triangles
	// joined by flat edges) this triangle belongs to.
	region int32
}

// meshFlatAngle: neighbouring triangles within this angle (radians) count as
// coplanar. STL files store float32 coordinates, whose rounding tilts the
// triangles of a tessellated flat by about 1e-7 of their size; 1e-5 leaves
// a wide margin while any real crease of a fixture is far larger.
const meshFlatAngle = 1e-5

// NewMesh prepares m for contact. Triangles with an index out of range or no
// area are skipped (never reported); Skipped tells how many. The mesh is
// referenced, not copied: do not change it afterwards.
func NewMesh(m *shapes.TriMesh) *Mesh {
	me := &Mesh{tri: m, bounds: shapes.EmptyAABB()}
	if m == nil {
		return me
	}
	nt := len(m.Triangles)
	me.normals = make([]vec3, nt)
	me.adj = make([]triAdj, nt)
	valid := make([]bool, nt)
	for i, t := range m.Triangles {
		ok := true
		for _, k := range t {
			if k < 0 || int(k) >= len(m.Vertices) || !finite(m.Vertices[k]) {
				ok = false
			}
		}
		if !ok {
			me.skipped++
			continue
		}
		a, b, c := m.Triangle(i)
		n, l := unit(b.Sub(a).Cross(c.Sub(a)))
		if !(l > 0) || math.IsNaN(l) || math.IsInf(l, 0) {
			me.skipped++
			continue
		}
		valid[i] = true
		me.normals[i] = n
		me.bounds = me.bounds.Extend(a).Extend(b).Extend(c)
		p := [3]vec3{a, b, c}
		for e := 0; e < 3; e++ {
			s, _ := unit(p[(e+1)%3].Sub(p[e]).Cross(n))
			me.adj[i].side[e] = s
		}
	}
	me.buildAdjacency(valid)
	// The hierarchy over the valid triangles only.
	src := m
	if me.skipped > 0 {
		// Unreferenced non-finite vertices would still fail the build.
		src = &shapes.TriMesh{Vertices: make([]vec3, len(m.Vertices))}
		for i, v := range m.Vertices {
			if finite(v) {
				src.Vertices[i] = v
			}
		}
		for i, t := range m.Triangles {
			if valid[i] {
				src.Triangles = append(src.Triangles, t)
				me.remap = append(me.remap, int32(i))
			}
		}
	}
	if tree, err := bvh.Build(src); err == nil {
		me.tree = tree
	}
	return me
}

// finite reports whether every component of v is finite: c - c is 0 for
// a finite c and NaN for an infinite or NaN one, and a sum with a NaN is
// NaN. One test instead of six calls: the query of every touching pair
// tests both poses.
func finite(v vec3) bool {
	s := (v[0] - v[0]) + (v[1] - v[1]) + (v[2] - v[2])
	return s == s
}

// Bounds implements shapes.Shape: the local bounds of the mesh.
func (m *Mesh) Bounds() shapes.AABB { return m.bounds }

// Skipped is the number of triangles left out (bad indices, no area).
func (m *Mesh) Skipped() int { return m.skipped }

// TriMesh returns the mesh it was made from.
func (m *Mesh) TriMesh() *shapes.TriMesh { return m.tri }

// buildAdjacency welds corners by exact position, pairs the triangles on
// each edge and classifies the edges.
func (m *Mesh) buildAdjacency(valid []bool) {
	verts := m.tri.Vertices
	// Weld: a canonical index per vertex position.
	order := make([]int32, len(verts))
	for i := range order {
		order[i] = int32(i)
	}
	less := func(a, b vec3) bool {
		for k := 0; k < 3; k++ {
			if a[k] != b[k] {
				return a[k] < b[k]
			}
		}
		return false
	}
	sort.Slice(order, func(i, j int) bool {
		a, b := verts[order[i]], verts[order[j]]
		if a == b {
			return order[i] < order[j]
		}
		return less(a, b)
	})
	canon := make([]int32, len(verts))
	for i, v := range order {
		if i > 0 && verts[order[i-1]] == verts[v] {
			canon[v] = canon[order[i-1]]
		} else {
			canon[v] = v
		}
	}
	type half struct {
		lo, hi int32 // canonical corner ids, lo < hi
		t      int32
		e      int8
		fwd    bool // the triangle runs lo -> hi
	}
	var hs []half
	for i, t := range m.tri.Triangles {
		if !valid[i] {
			continue
		}
		for e := 0; e < 3; e++ {
			a, b := canon[t[e]], canon[t[(e+1)%3]]
			if a == b {
				continue
			}
			h := half{lo: a, hi: b, t: int32(i), e: int8(e), fwd: true}
			if a > b {
				h.lo, h.hi, h.fwd = b, a, false
			}
			hs = append(hs, h)
		}
	}
	sort.Slice(hs, func(i, j int) bool {
		if hs[i].lo != hs[j].lo {
			return hs[i].lo < hs[j].lo
		}
		if hs[i].hi != hs[j].hi {
			return hs[i].hi < hs[j].hi
		}
		return hs[i].t < hs[j].t
	})
	// A corner snaps only if no free or convex edge meets it.
	cornerSnap := make([]bool, len(verts))
	for i := range cornerSnap {
		cornerSnap[i] = true
	}
	for i := 0; i < len(hs); {
		j := i
		for j < len(hs) && hs[j].lo == hs[i].lo && hs[j].hi == hs[i].hi {
			j++
		}
		if j-i == 2 && hs[i].fwd != hs[i+1].fwd {
			for k := 0; k < 2; k++ {
				me, nb := hs[i+k], hs[i+1-k]
				ad := &m.adj[me.t]
				n, nn := m.normals[me.t], m.normals[nb.t]
				s := ad.side[me.e]
				ang := math.Atan2(nn.Dot(s), nn.Dot(n))
				ad.smooth[me.e] = math.Abs(ang) < meshGroupAngle
				switch {
				case ang > meshFlatAngle:
					ad.kind[me.e] = edgeConvex
					ad.angle[me.e] = ang
				case ang < -meshFlatAngle:
					ad.kind[me.e] = edgeConcave
				default:
					ad.kind[me.e] = edgeFlat
				}
			}
		}
		// Free, non-manifold and convex edges keep their corners' normals.
		for k := i; k < j; k++ {
			if m.adj[hs[k].t].kind[hs[k].e] == edgeFree || m.adj[hs[k].t].kind[hs[k].e] == edgeConvex {
				cornerSnap[hs[k].lo], cornerSnap[hs[k].hi] = false, false
			}
		}
		i = j
	}
	for i, t := range m.tri.Triangles {
		if !valid[i] {
			continue
		}
		for e := 0; e < 3; e++ {
			m.adj[i].snapV[e] = cornerSnap[canon[t[e]]]
		}
	}
	// Flat regions by union-find over flat edges; the root is the smallest index.
	parent := make([]int32, len(m.adj))
	for i := range parent {
		parent[i] = int32(i)
	}
	find := func(x int32) int32 {
		for parent[x] != x {
			parent[x] = parent[parent[x]]
			x = parent[x]
		}
		return x
	}
	for i := 0; i+1 < len(hs); i++ {
		a, b := hs[i], hs[i+1]
		if a.lo == b.lo && a.hi == b.hi && m.adj[a.t].kind[a.e] == edgeFlat && m.adj[b.t].kind[b.e] == edgeFlat {
			ra, rb := find(a.t), find(b.t)
			if ra < rb {
				parent[rb] = ra
			} else if rb < ra {
				parent[ra] = rb
			}
		}
	}
	for i := range m.adj {
		m.adj[i].region = find(int32(i))
	}
}

// edgeLean: a candidate normal leans across an edge of the triangle when its
// component along the edge's outward side normal exceeds this (a sine).
const edgeLean = 1e-9

// correct applies internal-edge correction to nT, a candidate contact normal
// of triangle t pointing from the triangle toward the convex shape. A normal
// that leans across an edge is valid only where the triangle's own surface
// ends there: at a free edge, or within the ridge of a convex edge (between
// this face's normal and the neighbour's). At a flat or concave edge, or a
// corner where only such edges meet, the contact belongs to the face: the
// triangle's normal is returned and snapped reports true.
func (m *Mesh) correct(t int, nT vec3) (vec3, bool) {
	n := m.normals[t]
	if nT.Dot(n) >= 1-1e-15 {
		return n, nT != n
	}
	ad := &m.adj[t]
	var lean [3]bool
	cnt := 0
	for e := 0; e < 3; e++ {
		if nT.Dot(ad.side[e]) > edgeLean {
			lean[e] = true
			cnt++
		}
	}
	if cnt == 0 {
		return n, true
	}
	if cnt >= 2 {
		// A corner: the one shared by two leaning edges.
		for c := 0; c < 3; c++ {
			if lean[c] && lean[(c+2)%3] && ad.snapV[c] {
				return n, true
			}
		}
	}
	for e := 0; e < 3; e++ {
		if !lean[e] {
			continue
		}
		switch ad.kind[e] {
		case edgeFree:
		case edgeConvex:
			if math.Atan2(nT.Dot(ad.side[e]), nT.Dot(n)) > ad.angle[e]+meshFlatAngle {
				return n, true
			}
		default:
			return n, true
		}
	}
	return nT, false
}

// meshGroup gathers the points of one normal for one convex piece (the
// triangles of a flat region, or the edge contacts of a ridge); it is named
// by the smallest region among its triangles.
type meshGroup struct {
	n      vec3 // from the convex toward the mesh, in the mesh frame
	sum    vec3 // sum of the members' normals
	mixed  bool // members with different normals (n is their mean)
	region int32
}

// meshCand is a candidate point of a group.
type meshCand struct {
	candPoint
	g int
}

// meshGroupCos: triangle contacts whose normals agree to this cosine share
// a manifold. Coplanar neighbours agree exactly and keep their normal; the
// triangles of a tessellated curved surface (a dished tray) differ by a
// small angle, and 0.02 rad (about 1.1 degrees) merges them into one
// manifold with their mean normal instead of one per triangle, while a real
// crease of a fixture stays two.
const meshGroupAngle = 0.02

var meshGroupCos = math.Cos(meshGroupAngle)

// meshConvex collides static mesh m (frame fm) with convex shape s (frame
// fs). meshIsA tells the pair's order.
func (d *Detector) meshConvex(dst []Manifold, m *Mesh, fm frame, s shapes.Shape, fs frame, margin float64, meshIsA bool, subA, subB int32) []Manifold {
	if m == nil || m.tri == nil {
		return dst
	}
	var v view
	rot, pos := fm.relative(fs)
	if !v.setConvex(s, rot, pos) {
		return dst
	}
	box := worldBounds(s, frame{rot: rot, pos: pos}).Grow(margin)
	d.tris = d.meshMem.candidates(m, box, d.tris[:0]) // meshmem.go
	if len(d.tris) == 0 {
		return dst
	}
	d.groups = d.groups[:0]
	d.meshCands = d.meshCands[:0]
	center := v.center()
	if v.kind == kBox || v.kind == kHull {
		d.polyP.set(&v) // the same for every triangle
	}
	d.flat.reset()
	d.low.reset()
	var tv view
	for _, ti := range d.tris {
		t := int(ti)
		n := m.normals[t]
		if n == (vec3{}) {
			continue
		}
		a, b, c := m.tri.Triangle(t)
		// One-sided: shapes behind the triangle's plane belong to the other
		// side of the fixture.
		if dotSub(&n, &center, &a) < 0 { // n.Dot(center.Sub(a))
			continue
		}
		// Beyond the margin from the triangle's plane: no contact.
		// The shape's lowest point along -n (triangles of a flat share it).
		k := d.low.find(&n) // meshnormal.go
		if k < 0 {
			k = d.low.put(&n, v.supportFull(n.Mul(-1)))
		}
		if dotSub(&n, &d.low.val[k], &a) > margin { // n.Dot(low.Sub(a))
			continue
		}
		tv.setTriangle(a, b, c, n)
		nPQ, ok := d.triContact(&v, &tv, m, t, margin)
		if !ok {
			continue
		}
		d.dropSeamPoints(m, t)
		if len(d.cand) == 0 {
			continue
		}
		d.addToGroup(nPQ, ti, m.adj[t].region)
	}
	// Emit one manifold per group.
	for gi, g := range d.groups {
		d.cand = d.cand[:0]
		for _, c := range d.meshCands {
			if c.g == gi {
				d.cand = append(d.cand, c.candPoint)
			}
		}
		d.dedupe(1e-9 * v.size)
		n := g.n
		if meshIsA {
			n = n.Mul(-1)
			dst = d.emit(dst, fm, n, g.region, subB)
		} else {
			dst = d.emit(dst, fm, n, subA, g.region)
		}
	}
	return dst
}

// addToGroup moves the points in d.cand (from triangle t, normal n) into
// the group of their normal, folding the triangle into the ids of points
// that belong to it.
func (d *Detector) addToGroup(n vec3, t, region int32) {
	gi := -1
	for i := range d.groups {
		if d.groups[i].n.Dot(n) >= meshGroupCos {
			gi = i
			break
		}
	}
	if gi < 0 {
		d.groups = append(d.groups, meshGroup{n: n, sum: n, region: region})
		gi = len(d.groups) - 1
	} else {
		g := &d.groups[gi]
		if n != g.n || g.mixed {
			g.mixed = true
			g.sum = g.sum.Add(n)
			g.n, _ = unit(g.sum)
		} else {
			g.sum = g.sum.Add(n)
		}
		if region < g.region {
			g.region = region
		}
	}
	for _, c := range d.cand {
		if !pureConvexID(c.id) {
			c.id = c.id&0x8000FFFF | uint32(1+int(t)%0x7FFE)<<16
		}
		d.meshCands = append(d.meshCands, meshCand{c, gi})
	}
}

// dedupe drops from d.cand the points that another triangle already gave
// (a corner of the shape over a shared edge, a sphere over a shared
// vertex): points within tol of each other, keeping the deeper. It sorts
// by x and compares near neighbours only.
func (d *Detector) dedupe(tol float64) {
	c := d.cand
	slices.SortFunc(c, func(a, b candPoint) int {
		switch {
		case a.p[0] < b.p[0]:
			return -1
		case a.p[0] > b.p[0]:
			return 1
		case a.id < b.id:
			return -1
		case a.id > b.id:
			return 1
		}
		return 0
	})
	k := 0
	for i := range c {
		dup := false
		for j := k - 1; j >= 0 && c[i].p[0]-c[j].p[0] <= tol; j-- {
			if c[j].p.Sub(c[i].p).Len() <= tol {
				if c[i].sep < c[j].sep {
					c[j] = c[i]
				}
				dup = true
				break
			}
		}
		if !dup {
			c[k] = c[i]
			k++
		}
	}
	d.cand = c[:k]
}

// dropSeamPoints removes the points that clipping against the triangle's
// flat (or smooth) edges made: with the neighbour they lie inside one
// surface, where a plane would have no point, and would only crowd the
// manifold (a box on a tessellated flat keeps its corners, as on a plane).
func (d *Detector) dropSeamPoints(m *Mesh, t int) {
	ad := &m.adj[t]
	k := 0
	for _, c := range d.cand {
		if c.id&(1<<31) != 0 {
			seam := false
			for _, code := range [2]uint32{c.id >> 8 & 0xFF, c.id & 0xFF} {
				if e := (code - 128) % 3; code >= 128 && (ad.kind[e] == edgeFlat || ad.smooth[e]) {
					seam = true
				}
			}
			if seam {
				continue
			}
		}
		d.cand[k] = c
		k++
	}
	d.cand = d.cand[:k]
}

// pureConvexID tells whether a point of a triangle contact is made by
// features of the convex shape alone (then its id may be shared by every
// triangle it slides over): an incident vertex of the convex against the
// triangle's face, or a corner of the convex's reference face.
func pureConvexID(id uint32) bool {
	if id&(1<<31) != 0 { // the triangle is the reference
		return id&0xFF == 0 && (id>>8)&0xFF != 0 && (id>>8)&0xFF < 64
	}
	return id&0xFF >= 128
}

// triContact collides convex view v with triangle tv (triangle t of m),
// leaving points in d.cand and returning the normal from v toward the
// triangle.
func (d *Detector) triContact(v, tv *view, m *Mesh, t int, margin float64) (vec3, bool) {
	d.cand = d.cand[:0]
	n := tv.triN
	switch v.kind {
	case kSphere:
		c := v.pos
		q := closestPointTriangle(c, tv.tri[0], tv.tri[1], tv.tri[2])
		dv := c.Sub(q)
		dist := dv.Len()
		var nT vec3
		if dist > coreTouch*(v.size+tv.size) {
			nT = dv.Mul(1 / dist)
		} else {
			nT = n
		}
		nc, snapped := m.correct(t, nT)
		gap := dist
		if snapped {
			// Along the face normal the sphere must be over this triangle;
			// elsewhere the contact belongs to a neighbour.
			gap = n.Dot(c.Sub(tv.tri[0]))
			if !overTriangle(c, tv, tolOver*tv.size) {
				return vec3{}, false
			}
		}
		sep := gap - v.rad
		if sep > margin {
			return vec3{}, false
		}
		ps := c.Sub(nc.Mul(v.rad))
		d.cand = append(d.cand, candPoint{p: ps.Sub(nc.Mul(0.5 * sep)), sep: sep, id: 0})
		return nc.Mul(-1), true
	case kBox, kHull:
		p, q := &d.polyP, &d.polyQ             // p was set from v by the caller
		if d.faceOnFlat(p, tv, m, t, margin) { // meshflat.go
			return n.Mul(-1), len(d.cand) > 0
		}
		var r satResult
		var ok bool
		if v.kind == kBox {
			r, ok = satBoxTriangle(v, tv, margin)
		} else {
			if len(p.edges)*3 > satMaxEdgePairs {
				break
			}
			q.set(tv)
			r, ok = sat(p, q, margin)
		}
		if !ok {
			return vec3{}, false
		}
		if v.kind == kBox {
			q.set(tv)
		}
		if r.kind != satFaceQ {
			var nT vec3
			if r.kind == satFaceP {
				nT = p.planes[r.face].n.Mul(-1)
			} else {
				nT = r.axis.Mul(-1)
			}
			if _, snapped := m.correct(t, nT); snapped {
				r.kind, r.face = satFaceQ, 0
			}
		}
		nPQ := d.polyContact(p, q, r, margin)
		return nPQ, len(d.cand) > 0
	}
	r, ok := d.triNearest(v, tv, margin) // cylpoly.go
	if !ok {
		return vec3{}, false
	}
	_, snapped := m.correct(t, r.n.Mul(-1))
	if snapped || r.n.Mul(-1) == n { // (exactly the face normal: the same case)
		// The contact belongs to the face: the deepest point of the shape
		// toward the triangle, measured from its plane, and only where it
		// lies over this triangle.
		r.n = n.Mul(-1)
		r.pa = v.supportFull(r.n)
		r.sep = n.Dot(r.pa.Sub(tv.tri[0]))
		r.pb = r.pa.Sub(n.Mul(r.sep))
		if r.sep > margin {
			return vec3{}, false
		}
		if !overTriangle(r.pa, tv, tolOver*tv.size) {
			r.sep = math.Inf(1) // no fallback point off the triangle
		}
	}
	nc := d.featureContact(v, tv, r, margin)
	return nc, len(d.cand) > 0
}

// tolOver is the slack, a fraction of the triangle's size, of the test
// that a point lies over a triangle.
const tolOver = 1e-9

// overTriangle reports whether p projects onto triangle tv along its normal.
func overTriangle(p vec3, tv *view, tol float64) bool {
	for e := 0; e < 3; e++ {
		a, b := tv.tri[e], tv.tri[(e+1)%3]
		s, _ := unit(b.Sub(a).Cross(tv.triN))
		if s.Dot(p.Sub(a)) > tol {
			return false
		}
	}
	return true
}
