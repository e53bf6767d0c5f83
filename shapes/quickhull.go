package shapes

import (
	"errors"
	"fmt"
	"math"
	"sort"
)

// ErrDegenerate is returned (wrapped) when the points do not span a solid:
// fewer than four points that are not all on one plane.
var ErrDegenerate = errors.New("the part is flat or degenerate: fewer than four points off one plane")

// Relative tolerances of the hull, as fractions of the size of the point set
// (the sum of the extents along x, y and z). Points this close to a face plane
// count as on it; float32 STL coordinates carry rounding of about 6e-8 of the
// part size, so 1e-7 keeps their near-coplanar points off the hull while real
// features of a part (0.1 percent or more) always survive.
const (
	hullPlaneTol = 1e-7
	// hullMergeTol merges neighbouring triangles into one polygon face when
	// every vertex lies within this fraction of the size of the group's plane.
	hullMergeTol = 1e-6
)

// NewHull builds the convex hull of a point cloud by Quickhull (C. B. Barber,
// D. P. Dobkin and H. Huhdanpaa, "The Quickhull algorithm for convex hulls",
// ACM TOMS 22(4), 1996), then merges coplanar triangles into polygon faces
// with outward normals, drops vertices that are not corners, and records edge
// and vertex adjacency.
//
// Faces are sorted by their normal's dominant axis (x, y, z), positive before
// negative, so the hull of a box lists +x, -x, +y, -y, +z, -z.
func NewHull(points []Vec3) (*Hull, error) {
	for i, p := range points {
		for _, c := range p {
			if math.IsNaN(c) || math.IsInf(c, 0) {
				return nil, fmt.Errorf("shapes: point %d is not finite: %v", i, p)
			}
		}
	}
	if len(points) < 4 {
		return nil, fmt.Errorf("shapes: %d points: %w", len(points), ErrDegenerate)
	}
	b := EmptyAABB()
	for _, p := range points {
		b = b.Extend(p)
	}
	ext := b.Size()
	size := ext[0] + ext[1] + ext[2]
	if !(size > 0) {
		return nil, fmt.Errorf("shapes: all points coincide: %w", ErrDegenerate)
	}
	// Work about the centre of the bounds so that parts far from their file
	// origin keep full precision.
	center := b.Center()
	local := make([]Vec3, len(points))
	for i, p := range points {
		local[i] = p.Sub(center)
	}
	var lastErr error
	// A rare tolerance failure (a horizon that is not one loop) is retried
	// with a larger tolerance.
	for _, scale := range []float64{1, 10, 100} {
		qh := quickhull{pts: local, tol: hullPlaneTol * scale * size}
		tris, err := qh.run()
		if err != nil {
			if errors.Is(err, ErrDegenerate) {
				return nil, fmt.Errorf("shapes: %w", err)
			}
			lastErr = err
			continue
		}
		h := assembleHull(local, points, tris, hullMergeTol*scale*size)
		if len(h.Faces) < 4 || len(h.Vertices) < 4 {
			// Thinner than the merge tolerance: the faces collapsed into one plane.
			return nil, fmt.Errorf("shapes: thinner than %.1g of its size: %w", hullMergeTol*scale, ErrDegenerate)
		}
		h.bounds = EmptyAABB()
		for _, v := range h.Vertices {
			h.bounds = h.bounds.Extend(v)
		}
		return h, nil
	}
	return nil, fmt.Errorf("shapes: convex hull failed: %v", lastErr)
}

// qhFace is a triangle of the hull under construction. Edge i runs from
// v[i] to v[(i+1)%3]; adj[i] is the face across it.
type qhFace struct {
	v       [3]int
	adj     [3]int
	normal  Vec3
	offset  float64
	outside []int
	dead    bool
	visit   int
}

type quickhull struct {
	pts   []Vec3
	tol   float64
	faces []qhFace
	stamp int
	// Scratch of addEye, reused from point to point.
	visible    []int
	horizon    [][2]int // directed edges (from, to) seen from the new faces
	horizonAdj []int    // the surviving face across each horizon edge
}

func (q *quickhull) dist(f *qhFace, p Vec3) float64 { return f.normal.Dot(p) - f.offset }

func (q *quickhull) newFace(a, b, c int) int {
	pa, pb, pc := q.pts[a], q.pts[b], q.pts[c]
	n := pb.Sub(pa).Cross(pc.Sub(pa))
	l := n.Len()
	if l > 0 {
		n = n.Mul(1 / l)
	}
	// Offset from the centroid of the three corners: less rounding bias.
	off := n.Dot(pa.Add(pb).Add(pc).Mul(1.0 / 3))
	q.faces = append(q.faces, qhFace{v: [3]int{a, b, c}, adj: [3]int{-1, -1, -1}, normal: n, offset: off})
	return len(q.faces) - 1
}

// initialSimplex picks four well-spread points: the two extreme points
// farthest apart along an axis, the point farthest from their line and the
// point farthest from that plane.
func (q *quickhull) initialSimplex() ([4]int, error) {
	var s [4]int
	var minI, maxI [3]int
	for i, p := range q.pts {
		for k := 0; k < 3; k++ {
			if p[k] < q.pts[minI[k]][k] {
				minI[k] = i
			}
			if p[k] > q.pts[maxI[k]][k] {
				maxI[k] = i
			}
		}
	}
	best := -1.0
	for k := 0; k < 3; k++ {
		if d := q.pts[maxI[k]].Sub(q.pts[minI[k]]).LenSqr(); d > best {
			best, s[0], s[1] = d, minI[k], maxI[k]
		}
	}
	if best <= q.tol*q.tol {
		return s, ErrDegenerate
	}
	a, dir := q.pts[s[0]], q.pts[s[1]].Sub(q.pts[s[0]]).Normalize()
	best = -1
	for i, p := range q.pts {
		v := p.Sub(a)
		if d := v.Sub(dir.Mul(v.Dot(dir))).LenSqr(); d > best {
			best, s[2] = d, i
		}
	}
	if best <= q.tol*q.tol {
		return s, ErrDegenerate
	}
	n := q.pts[s[1]].Sub(a).Cross(q.pts[s[2]].Sub(a)).Normalize()
	best = -1
	for i, p := range q.pts {
		if d := math.Abs(p.Sub(a).Dot(n)); d > best {
			best, s[3] = d, i
		}
	}
	if best <= q.tol {
		return s, ErrDegenerate
	}
	return s, nil
}

func (q *quickhull) run() ([][3]int, error) {
	if err := q.startTetrahedron(); err != nil {
		return nil, err
	}
	// Outside points only ever go to newly appended faces, so faces before
	// the cursor never need another look.
	cursor := 0
	for iter := 0; ; iter++ {
		if iter > 4*len(q.pts)+16 {
			return nil, errors.New("quickhull did not terminate")
		}
		fi := -1
		for ; cursor < len(q.faces); cursor++ {
			if !q.faces[cursor].dead && len(q.faces[cursor].outside) > 0 {
				fi = cursor
				break
			}
		}
		if fi < 0 {
			break
		}
		if err := q.addEye(fi); err != nil {
			return nil, err
		}
		if len(q.faces) > 64*len(q.pts)+64 {
			return nil, errors.New("quickhull created too many faces")
		}
	}
	var tris [][3]int
	for _, f := range q.faces {
		if !f.dead {
			tris = append(tris, f.v)
		}
	}
	return tris, nil
}

// startTetrahedron makes the four faces of the initial simplex, oriented
// outward, and gives them the other points outside them.
func (q *quickhull) startTetrahedron() error {
	s, err := q.initialSimplex()
	if err != nil {
		return err
	}
	// Orient the tetrahedron outward: s[3] must lie below face (0,1,2).
	p0, p1, p2, p3 := q.pts[s[0]], q.pts[s[1]], q.pts[s[2]], q.pts[s[3]]
	if p1.Sub(p0).Cross(p2.Sub(p0)).Dot(p3.Sub(p0)) > 0 {
		s[1], s[2] = s[2], s[1]
	}
	a, b, c, d := s[0], s[1], s[2], s[3]
	f0 := q.newFace(a, b, c)
	f1 := q.newFace(a, d, b)
	f2 := q.newFace(b, d, c)
	f3 := q.newFace(c, d, a)
	q.link(f0, 0, f1) // a-b
	q.link(f0, 1, f2) // b-c
	q.link(f0, 2, f3) // c-a
	q.link(f1, 1, f2) // d-b
	q.link(f2, 1, f3) // d-c
	q.link(f3, 1, f1) // d-a
	used := map[int]bool{a: true, b: true, c: true, d: true}
	all := make([]int, 0, len(q.pts))
	for i := range q.pts {
		if !used[i] {
			all = append(all, i)
		}
	}
	q.assign(all, []int{f0, f1, f2, f3})
	return nil
}

// addEye adds to the hull the outside point of face fi farthest from it
// (the eye): it removes the faces the eye sees, closes the hole with a fan
// of faces from the eye to the horizon, and gives those the orphaned
// outside points.
func (q *quickhull) addEye(fi int) error {
	f := &q.faces[fi]
	eye, bestD := -1, -1.0
	for _, p := range f.outside {
		if dd := q.dist(f, q.pts[p]); dd > bestD {
			eye, bestD = p, dd
		}
	}
	q.findHorizon(fi, q.pts[eye])
	newFaces, err := q.fan(eye)
	if err != nil {
		return err
	}
	var orphans []int
	for _, g := range q.visible {
		q.faces[g].dead = true
		orphans = append(orphans, q.faces[g].outside...)
		q.faces[g].outside = nil
	}
	q.assign(orphans, newFaces)
	return nil
}

// findHorizon sets q.visible to the faces the point ep sees, by a flood
// fill from fi, and q.horizon to the directed edges (from, to) between
// them and the rest, seen from the new faces, with q.horizonAdj the
// surviving face across each.
func (q *quickhull) findHorizon(fi int, ep Vec3) {
	q.stamp++
	q.visible = q.visible[:0]
	q.horizon = q.horizon[:0]
	q.horizonAdj = q.horizonAdj[:0]
	stack := []int{fi}
	q.faces[fi].visit = q.stamp
	for len(stack) > 0 {
		g := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		q.visible = append(q.visible, g)
		for e := 0; e < 3; e++ {
			n := q.faces[g].adj[e]
			if q.faces[n].visit == q.stamp {
				continue
			}
			if q.dist(&q.faces[n], ep) > q.tol {
				q.faces[n].visit = q.stamp
				stack = append(stack, n)
			}
		}
	}
	for _, g := range q.visible {
		for e := 0; e < 3; e++ {
			n := q.faces[g].adj[e]
			if q.faces[n].visit != q.stamp {
				q.horizon = append(q.horizon, [2]int{q.faces[g].v[e], q.faces[g].v[(e+1)%3]})
				q.horizonAdj = append(q.horizonAdj, n)
			}
		}
	}
}

// fan makes a face from each horizon edge to the eye and links the faces
// to the surviving ones and to each other. It returns the new faces.
func (q *quickhull) fan(eye int) ([]int, error) {
	// The horizon must be one simple loop: each vertex starts exactly one edge.
	startAt := make(map[int]int, len(q.horizon))
	for i, h := range q.horizon {
		if _, dup := startAt[h[0]]; dup {
			return nil, errors.New("horizon is not a simple loop")
		}
		startAt[h[0]] = i
	}
	newFaces := make([]int, len(q.horizon))
	for i, h := range q.horizon {
		nf := q.newFace(h[0], h[1], eye)
		newFaces[i] = nf
		// Edge 0 (h0 -> h1) borders the surviving face.
		n := q.horizonAdj[i]
		for e := 0; e < 3; e++ {
			if q.faces[n].v[e] == h[1] && q.faces[n].v[(e+1)%3] == h[0] {
				q.faces[n].adj[e] = nf
			}
		}
		q.faces[nf].adj[0] = n
	}
	for i, h := range q.horizon {
		// Edge 1 (h1 -> eye) borders the new face whose horizon edge starts at h1.
		j, ok := startAt[h[1]]
		if !ok {
			return nil, errors.New("horizon is not closed")
		}
		q.faces[newFaces[i]].adj[1] = newFaces[j]
		q.faces[newFaces[j]].adj[2] = newFaces[i]
	}
	return newFaces, nil
}

func (q *quickhull) link(f int, e int, g int) {
	a, b := q.faces[f].v[e], q.faces[f].v[(e+1)%3]
	q.faces[f].adj[e] = g
	for k := 0; k < 3; k++ {
		if q.faces[g].v[k] == b && q.faces[g].v[(k+1)%3] == a {
			q.faces[g].adj[k] = f
			return
		}
	}
	panic("shapes: quickhull internal error: faces do not share an edge")
}

// assign gives each point to the face it lies farthest outside of; points
// within the tolerance of every face are inside and dropped.
func (q *quickhull) assign(points []int, faces []int) {
	for _, p := range points {
		best, bf := q.tol, -1
		for _, f := range faces {
			if d := q.dist(&q.faces[f], q.pts[p]); d > best {
				best, bf = d, f
			}
		}
		if bf >= 0 {
			q.faces[bf].outside = append(q.faces[bf].outside, p)
		}
	}
}

// assembleHull merges coplanar triangles into polygons, removes vertices
// that are not corners of the polyhedron and builds the adjacency.
// Geometry is computed on the centred points pts; the hull's vertices are
// the caller's original points orig, exactly.
func assembleHull(pts, orig []Vec3, tris [][3]int, mergeTol float64) *Hull {
	a := newTriangles(pts, tris)
	groups := a.groupCoplanar(mergeTol)
	h, remap := hullOfLoops(a.boundaryLoops(groups), orig)
	sortFaces(h.Faces)
	buildAdjacency(h)
	buildClimbGraph(h, tris, len(pts), remap, 2*mergeTol)
	return h
}

// hullEdge is a directed edge between two points.
type hullEdge struct{ a, b int }

// hullTriangles are the triangles of a hull with their adjacency, unit
// normals and areas, and the group of coplanar triangles each falls in.
type hullTriangles struct {
	pts    []Vec3
	tris   [][3]int
	owner  map[hullEdge]int // directed edge -> its triangle
	normal []Vec3
	area   []float64
	group  []int
}

func newTriangles(pts []Vec3, tris [][3]int) *hullTriangles {
	nt := len(tris)
	a := &hullTriangles{pts: pts, tris: tris, owner: make(map[hullEdge]int, 3*nt),
		normal: make([]Vec3, nt), area: make([]float64, nt)}
	for i, t := range tris {
		for e := 0; e < 3; e++ {
			a.owner[hullEdge{t[e], t[(e+1)%3]}] = i
		}
	}
	for i, t := range tris {
		n := pts[t[1]].Sub(pts[t[0]]).Cross(pts[t[2]].Sub(pts[t[0]]))
		a.area[i] = n.Len()
		if a.area[i] > 0 {
			a.normal[i] = n.Mul(1 / a.area[i])
		}
	}
	return a
}

// groupCoplanar groups the triangles that lie within mergeTol of one
// plane, growing groups from the largest triangles first: each group keeps
// the plane of its seed, so a finely curved surface never merges into one
// bent "face". It returns the members of each group.
func (a *hullTriangles) groupCoplanar(mergeTol float64) [][]int {
	nt := len(a.tris)
	order := make([]int, nt)
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(i, j int) bool { return a.area[order[i]] > a.area[order[j]] })
	a.group = make([]int, nt)
	for i := range a.group {
		a.group[i] = -1
	}
	var groups [][]int
	for _, seed := range order {
		if a.group[seed] >= 0 {
			continue
		}
		groups = append(groups, a.growGroup(seed, len(groups), mergeTol))
	}
	return groups
}

// growGroup makes group g of the seed triangle and its neighbours, and
// theirs, that lie within mergeTol of the seed's plane.
func (a *hullTriangles) growGroup(seed, g int, mergeTol float64) []int {
	n := a.normal[seed]
	off := n.Dot(a.pts[a.tris[seed][0]])
	members := []int{seed}
	a.group[seed] = g
	for k := 0; k < len(members); k++ {
		t := a.tris[members[k]]
		for e := 0; e < 3; e++ {
			o, ok := a.owner[hullEdge{t[(e+1)%3], t[e]}]
			if !ok || a.group[o] >= 0 || a.normal[o].Dot(n) < 0.5 {
				continue
			}
			flat := true
			for _, v := range a.tris[o] {
				if math.Abs(n.Dot(a.pts[v])-off) > mergeTol {
					flat = false
					break
				}
			}
			if flat {
				a.group[o] = g
				members = append(members, o)
			}
		}
	}
	return members
}

// hullLoop is the boundary of a group of coplanar triangles, with its
// polygon's normal.
type hullLoop struct {
	verts  []int
	normal Vec3
}

// boundaryLoops returns the boundary loop of each group: the directed
// edges whose twin lies in another group.
func (a *hullTriangles) boundaryLoops(groups [][]int) []hullLoop {
	loops := make([]hullLoop, 0, len(groups))
	for g, members := range groups {
		next := make(map[int]int)
		start := -1
		for _, m := range members {
			t := a.tris[m]
			for e := 0; e < 3; e++ {
				v, w := t[e], t[(e+1)%3]
				if o, ok := a.owner[hullEdge{w, v}]; ok && a.group[o] == g {
					continue
				}
				next[v] = w
				if start < 0 || v < start {
					start = v
				}
			}
		}
		var vs []int
		for v, n := start, 0; n <= len(next); n++ {
			vs = append(vs, v)
			v = next[v]
			if v == start {
				break
			}
		}
		loops = append(loops, hullLoop{verts: vs, normal: newellNormal(a.pts, vs)})
	}
	return loops
}

// newellNormal is Newell's normal of the polygon vs, area-weighted and
// robust, normalised.
func newellNormal(pts []Vec3, vs []int) Vec3 {
	var nn Vec3
	for i := range vs {
		p, q := pts[vs[i]], pts[vs[(i+1)%len(vs)]]
		nn[0] += (p[1] - q[1]) * (p[2] + q[2])
		nn[1] += (p[2] - q[2]) * (p[0] + q[0])
		nn[2] += (p[0] - q[0]) * (p[1] + q[1])
	}
	return nn.Normalize()
}

// hullOfLoops makes the hull's vertices and faces from the loops. A corner
// of a polyhedron touches at least three faces; vertices on two faces only
// lie on a straight edge and are dropped. It returns the hull and the map
// from a point to its vertex.
func hullOfLoops(loops []hullLoop, orig []Vec3) (*Hull, map[int]int32) {
	faceCount := make(map[int]int)
	for _, l := range loops {
		for _, v := range l.verts {
			faceCount[v]++
		}
	}
	remap := make(map[int]int32)
	h := &Hull{}
	var corners []int
	for _, l := range loops {
		for _, v := range l.verts {
			if faceCount[v] >= 3 {
				if _, ok := remap[v]; !ok {
					remap[v] = -1
					corners = append(corners, v)
				}
			}
		}
	}
	sort.Ints(corners)
	for i, v := range corners {
		remap[v] = int32(i)
		h.Vertices = append(h.Vertices, orig[v])
	}
	for _, l := range loops {
		var f Face
		for _, v := range l.verts {
			if faceCount[v] >= 3 {
				f.Verts = append(f.Verts, remap[v])
			}
		}
		if len(f.Verts) < 3 {
			continue
		}
		f.Normal = l.normal
		var off float64
		for _, v := range f.Verts {
			off += f.Normal.Dot(h.Vertices[v])
		}
		f.Offset = off / float64(len(f.Verts))
		h.Faces = append(h.Faces, f)
	}
	return h, remap
}

// sortFaces orders faces by dominant normal axis, then positive before
// negative, then by how well aligned they are, then lexicographically, so the
// order does not depend on how the hull was built.
func sortFaces(faces []Face) {
	key := func(n Vec3) (int, int) {
		ax := 0
		for k := 1; k < 3; k++ {
			if math.Abs(n[k]) > math.Abs(n[ax])+1e-12 {
				ax = k
			}
		}
		s := 0
		if n[ax] < 0 {
			s = 1
		}
		return ax, s
	}
	sort.SliceStable(faces, func(i, j int) bool {
		ni, nj := faces[i].Normal, faces[j].Normal
		ai, si := key(ni)
		aj, sj := key(nj)
		if ai != aj {
			return ai < aj
		}
		if si != sj {
			return si < sj
		}
		if d := math.Abs(ni[ai]) - math.Abs(nj[aj]); math.Abs(d) > 1e-12 {
			return d > 0
		}
		for k := 0; k < 3; k++ {
			if math.Abs(ni[k]-nj[k]) > 1e-12 {
				return ni[k] < nj[k]
			}
		}
		return false
	})
}

// buildAdjacency fills Edges and Neighbors from the face loops.
func buildAdjacency(h *Hull) {
	type pair struct{ a, b int32 }
	index := make(map[pair]int)
	for fi, f := range h.Faces {
		n := len(f.Verts)
		for i := 0; i < n; i++ {
			a, b := f.Verts[i], f.Verts[(i+1)%n]
			if a < b {
				if k, ok := index[pair{a, b}]; ok {
					h.Edges[k].F[0] = int32(fi)
				} else {
					index[pair{a, b}] = len(h.Edges)
					h.Edges = append(h.Edges, Edge{V: [2]int32{a, b}, F: [2]int32{int32(fi), -1}})
				}
			} else {
				if k, ok := index[pair{b, a}]; ok {
					h.Edges[k].F[1] = int32(fi)
				} else {
					index[pair{b, a}] = len(h.Edges)
					h.Edges = append(h.Edges, Edge{V: [2]int32{b, a}, F: [2]int32{-1, int32(fi)}})
				}
			}
		}
	}
	h.Neighbors = make([][]int32, len(h.Vertices))
	for _, e := range h.Edges {
		h.Neighbors[e.V[0]] = append(h.Neighbors[e.V[0]], e.V[1])
		h.Neighbors[e.V[1]] = append(h.Neighbors[e.V[1]], e.V[0])
	}
}
