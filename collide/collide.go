package collide

import (
	"math"

	"clatter/shapes"
)

// Point is one contact point of a manifold.
type Point struct {
	// Position is the world point midway between the two surfaces.
	Position shapes.Vec3
	// Separation is the signed gap along the manifold normal: negative when
	// the shapes penetrate, positive for a speculative point still apart.
	Separation float64
	// ID names the pair of features that made the point (faces, edges,
	// vertices, clipping planes). It stays the same while the same features
	// touch, so that impulses can be carried over from one step to the next.
	ID uint32
}

// Manifold is the contact between one convex piece of A and one of B.
type Manifold struct {
	// Normal is the world unit normal pointing from A toward B.
	Normal shapes.Vec3
	Points [4]Point
	Count  int
	// SubA and SubB name the piece of a compound or the triangle of a mesh
	// on each side (0 for a plain shape). The contacts of a convex piece
	// with mesh triangles that share one normal (a flat region, triangles
	// joined by coplanar edges) make one manifold, named by the region's
	// smallest triangle index, so that it keeps its name while a part
	// slides across the tessellation.
	SubA, SubB int32
	// PatchCenter (world) and PatchRadius describe the contact patch the
	// points sample: its centre and its effective friction radius, the mean
	// distance from the centre over the patch (patch.go); PatchRadius is 0
	// for a point contact.
	PatchCenter shapes.Vec3
	PatchRadius float64
}

// Stats counts the queries of a Detector, how often the iterative
// methods fell back, and how often CollidePair's memory answered: a capped GJK returns the best distance found so far, a
// capped EPA the best face found so far (a lower bound on the depth), and a
// failed EPA (the Minkowski difference is flat) leaves the pair to the
// shape's face normal or to the GJK direction.
type Stats struct {
	GJKCalls, GJKCapped            int
	EPACalls, EPACapped, EPAFailed int
	// Remembered counts the CollidePair queries that the axis remembered
	// from the pair's last query proved apart.
	Remembered int
	// Bounded counts those of them proved by the bound on how far the gap
	// the axis measured at an earlier step can have closed since
	// (apartbound.go), without measuring the axis again.
	Bounded int
	// Persisted counts the CollidePair queries answered by refreshing the
	// pair's persistent points (persist.go).
	Persisted int
}

// A Detector is the narrow phase. It holds scratch space so that queries
// allocate nothing once the buffers have grown; use one per world (it is not
// safe for concurrent use).
type Detector struct {
	smp, smp2 simplex // GJK's simplex, and the buffer it reduces into

	epaW, epaA, epaB []vec3
	epaFaces         []epaFace
	epaEdges         []epaEdge
	epaKilled        []int32
	epaBroken        bool

	polyP, polyQ polytope
	cylP         cylPolytope // a cylinder's partner (cylpoly.go)
	clip0, clip1 []clipVert
	featA, featB feature
	cand         []candPoint
	sel          [4]int

	tris      []int32
	meshMem   meshMemory       // triangles near recently queried parts (meshmem.go)
	flat      normalMemo[int]  // a part's face lying on a mesh flat (meshflat.go)
	low       normalMemo[vec3] // a part's lowest point along a mesh normal (mesh.go)
	meshCands []meshCand
	groups    []meshGroup

	// planeConvex's walk over a hull's lowest vertices (hullCap): marks of
	// visited vertices by stamp, and the vertices to visit.
	capMark  []uint32
	capStamp uint32
	capWalk  []int32
	capTop   hullTop     // where planeConvex's last climb to a hull's lowest vertex ended
	restFace []candPoint // keepRestingPatch's points of the resting face

	planeSide planeMemo // the last plane's half-space in the world (planememo.go)

	// The contact patch (patch.go): a cylinder cap hint and scratch points.
	disc                discHint
	patchPts, patchHull []pt2
	tangents            basisMemo // the axes of the last contact normal (basismemo.go)

	hullIdx hullIndexes // indexes of large hulls (hullindex.go)
	// lastIncident is the incident face a query last found on an indexed
	// hull, where the next search starts (boxhulltree.go).
	lastIncident struct {
		x    *hullIndex
		face int
	}
	cache   pairCache
	faceCos []vec3  // box-hull test: cosines of the hull's face normals with the box axes
	faceSgn []uint8 // and their signs (boxhullscan.go)

	stats Stats

	// allAxes turns the box-hull early-out off (boxhullrest.go): tests
	// compare it with every axis tried.
	allAxes bool

	persist persistMem // persistent manifolds (persist.go)
	warm    warmMem    // pairs' last GJK simplices (gjkwarm.go)
	room    apartRoom  // the room the last CollidePair query's bound left (apartroom.go)
}

// NewDetector returns a Detector with its buffers sized for common shapes.
func NewDetector() *Detector {
	d := &Detector{}
	d.epaW = make([]vec3, 0, 64)
	d.epaA = make([]vec3, 0, 64)
	d.epaB = make([]vec3, 0, 64)
	d.epaFaces = make([]epaFace, 0, 160)
	d.epaEdges = make([]epaEdge, 0, 64)
	d.epaKilled = make([]int32, 0, 64)
	d.clip0 = make([]clipVert, 0, 32)
	d.clip1 = make([]clipVert, 0, 32)
	d.cand = make([]candPoint, 0, 32)
	d.tris = make([]int32, 0, 64)
	d.capWalk = make([]int32, 0, 32)
	d.meshCands = make([]meshCand, 0, 64)
	d.groups = make([]meshGroup, 0, 8)
	d.polyP.init()
	d.polyQ.init()
	d.featA.pts = make([]vec3, 0, 16)
	d.featB.pts = make([]vec3, 0, 16)
	return d
}

// Stats returns the counters accumulated since the Detector was made or
// last reset.
func (d *Detector) Stats() Stats { return d.stats }

// ResetStats zeroes the counters.
func (d *Detector) ResetStats() { d.stats = Stats{} }

// frame is the computation frame of a query: frame coordinates x map to the
// world as pos + rot x.
type frame struct {
	rot mat3
	pos vec3
}

func poseFrame(p shapes.Pose) frame {
	return frame{rot: shapes.RotationMatrix(p.Orientation), pos: p.Position}
}

// relative returns the pose of q expressed in frame f.
func (f frame) relative(q frame) (mat3, vec3) {
	return mulTM(f.rot, q.rot), mulT(f.rot, q.pos.Sub(f.pos))
}

// Collide appends to dst the manifolds between shape a at pose pa and shape
// b at pose pb whose separation is below margin. A margin greater than zero
// yields speculative points for shapes still apart but closer than margin.
//
// Shapes are the convex ones of package shapes (Sphere, Box, Capsule,
// Cylinder, *Hull, or any other shapes.Convex through GJK and EPA), a
// *shapes.Compound, a static shapes.Plane, or a static *Mesh (made once by
// NewMesh). A pair of two statics yields nothing, and so does an unknown
// shape (a raw *shapes.TriMesh must be wrapped by NewMesh).
func (d *Detector) Collide(dst []Manifold, a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose, margin float64) []Manifold {
	if !(margin >= 0) || math.IsInf(margin, 0) {
		margin = 0
	}
	if !finitePose(pa) || !finitePose(pb) {
		return dst // a body with a broken pose touches nothing
	}
	return d.collide(dst, a, poseFrame(pa), 0, b, poseFrame(pb), 0, margin)
}

func (d *Detector) collide(dst []Manifold, a shapes.Shape, fa frame, subA int32, b shapes.Shape, fb frame, subB int32, margin float64) []Manifold {
	if c, ok := a.(*shapes.Compound); ok && c != nil {
		bb := worldBounds(b, fb).Grow(margin)
		for i, p := range c.Pieces {
			if p.Shape == nil {
				continue
			}
			pf := fa.mul(p.Pose)
			if !worldBounds(p.Shape, pf).Overlaps(bb) {
				continue
			}
			dst = d.collide(dst, p.Shape, pf, int32(i), b, fb, subB, margin)
		}
		return dst
	}
	if c, ok := b.(*shapes.Compound); ok && c != nil {
		ab := worldBounds(a, fa).Grow(margin)
		for i, p := range c.Pieces {
			if p.Shape == nil {
				continue
			}
			pf := fb.mul(p.Pose)
			if !worldBounds(p.Shape, pf).Overlaps(ab) {
				continue
			}
			dst = d.collide(dst, a, fa, subA, p.Shape, pf, int32(i), margin)
		}
		return dst
	}
	if pl, ok := asPlane(a); ok {
		return d.planeConvex(dst, pl, fa, b, fb, margin, true, subA, subB)
	}
	if pl, ok := asPlane(b); ok {
		return d.planeConvex(dst, pl, fb, a, fa, margin, false, subA, subB)
	}
	if m, ok := a.(*Mesh); ok {
		return d.meshConvex(dst, m, fa, b, fb, margin, true, subA, subB)
	}
	if m, ok := b.(*Mesh); ok {
		return d.meshConvex(dst, m, fb, a, fa, margin, false, subA, subB)
	}
	return d.convexConvex(dst, a, fa, subA, b, fb, subB, margin)
}

func finitePose(p shapes.Pose) bool {
	q := &p.Orientation
	w := q.W - q.W // NaN unless q.W is finite (see finite)
	return finite(p.Position) && finite(q.V) && w == w
}

func asPlane(s shapes.Shape) (shapes.Plane, bool) {
	switch p := s.(type) {
	case shapes.Plane:
		return p, true
	case *shapes.Plane:
		if p != nil {
			return *p, true
		}
	}
	return shapes.Plane{}, false
}

// mul places a piece pose inside frame f.
func (f frame) mul(p shapes.Pose) frame {
	r := shapes.RotationMatrix(p.Orientation)
	return frame{rot: mulMM(f.rot, r), pos: f.pos.Add(mul(f.rot, p.Position))}
}

func mulMM(a, b mat3) mat3 {
	var out mat3
	for c := 0; c < 3; c++ {
		v := mul(a, col(b, c))
		out[3*c], out[3*c+1], out[3*c+2] = v[0], v[1], v[2]
	}
	return out
}

// worldBounds returns the world box of s placed at f (unbounded for planes).
func worldBounds(s shapes.Shape, f frame) shapes.AABB {
	if _, ok := asPlane(s); ok {
		return s.Bounds()
	}
	b := s.Bounds()
	c := f.pos.Add(mul(f.rot, b.Center()))
	h := b.Size().Mul(0.5)
	var e vec3
	for i := 0; i < 3; i++ {
		e[i] = math.Abs(f.rot[i])*h[0] + math.Abs(f.rot[3+i])*h[1] + math.Abs(f.rot[6+i])*h[2]
	}
	return shapes.AABB{Min: c.Sub(e), Max: c.Add(e)}
}

// candPoint is a contact point in the computation frame before reduction.
type candPoint struct {
	p   vec3 // midway between the surfaces
	sep float64
	id  uint32
}

// emit reduces d.cand to at most four points and appends one manifold, its
// normal n (frame, from A to B) and points mapped to the world by f.
func (d *Detector) emit(dst []Manifold, f frame, n vec3, subA, subB int32) []Manifold {
	if len(d.cand) == 0 {
		return dst
	}
	pc, pr := d.patch(n) // from all the candidates, before reduce keeps four
	m := Manifold{Normal: mul(f.rot, n), SubA: subA, SubB: subB, PatchCenter: f.pos.Add(mul(f.rot, pc)), PatchRadius: pr}
	sel := d.reduce(d.cand, n)
	for _, i := range sel {
		c := d.cand[i]
		m.Points[m.Count] = Point{Position: f.pos.Add(mul(f.rot, c.p)), Separation: c.sep, ID: c.id}
		m.Count++
	}
	return append(dst, m)
}

// reduce chooses at most four of pts: the deepest, then the points that
// span the largest area in the contact plane (normal n), first among those
// about as deep (contactBand), then among all, so that the kept points
// support the contact like the whole patch. Ties (within rounding)
// go to the deeper point, then to the point farther from the patch centre
// (for the first point), then to the lexicographically smaller position in
// the contact plane, so the choice does not depend on the order of pts nor
// on motions far below the patch size.
func (d *Detector) reduce(pts []candPoint, n vec3) []int {
	sel := d.sel[:0]
	if len(pts) <= 4 {
		for i := range pts {
			sel = append(sel, i)
		}
		return sel
	}
	u, v := d.tangents.basis(n)
	proj := func(i int) (float64, float64) { return pts[i].p.Dot(u), pts[i].p.Dot(v) }
	var cx, cy float64
	minSep := math.Inf(1)
	for i := range pts {
		x, y := proj(i)
		cx += x
		cy += y
		minSep = math.Min(minSep, pts[i].sep)
	}
	cx /= float64(len(pts))
	cy /= float64(len(pts))
	ext := 0.0
	for i := range pts {
		x, y := proj(i)
		ext = math.Max(ext, math.Hypot(x-cx, y-cy))
	}
	// Tolerances relative to the patch size: tieL of lengths and tieA of
	// squared lengths and areas (rounding), and tieD of depths: points less
	// than 1e-4 of the patch apart in depth count as equally deep, so that a
	// face resting flat keeps the same points under tiny motions (depth
	// differences that small are far below the solver's slop).
	tieL := 1e-9 * (ext + math.Abs(minSep))
	tieA := 1e-9 * ext * ext
	tieD := 1e-4*ext + tieL
	// first reports whether point i should be preferred to point j when
	// their scores agree within tieA (then by depth, then by position).
	first := func(i, j int) bool {
		if math.Abs(pts[i].sep-pts[j].sep) > tieD {
			return pts[i].sep < pts[j].sep
		}
		xi, yi := proj(i)
		xj, yj := proj(j)
		if math.Abs(xi-xj) > tieL {
			return xi < xj
		}
		return yi < yj-tieL
	}
	better := func(i int, score float64, j int, best float64) bool {
		if j < 0 || score > best+tieA {
			return true
		}
		return score >= best-tieA && first(i, j)
	}
	// The deepest point; among equally deep ones the farthest from the centre.
	i0, far := -1, 0.0
	for i := range pts {
		if pts[i].sep > minSep+tieD {
			continue
		}
		x, y := proj(i)
		r := (x-cx)*(x-cx) + (y-cy)*(y-cy)
		if i0 < 0 || r > far+tieA || (r >= far-tieA && first(i, i0)) {
			i0, far = i, r
		}
	}
	sel = append(sel, i0)
	// The points that carry the contact come first: those within band of
	// the deepest in depth. A part lying along a line (a faceted pin on its
	// side) has its two lowest vertices at the line's ends and, a little
	// higher, the neighbouring facets' vertices, slightly farther apart: by
	// spread alone these would be kept instead of the far end's lowest
	// vertex, and the part would rest on one end and rock end over end.
	// Points outside the band fill places the band leaves empty, first
	// those that penetrate: a part that landed tilted and deep (a small
	// cube after a fast spinning impact at a coarse step) has a second deep
	// corner well below the band, which spread alone would leave out for
	// shallower corners, and the part would stay sunk on it for ever.
	band := minSep + math.Max(tieD, contactBand*ext)
	inBand := func(i int) bool { return pts[i].sep <= band }
	inside := func(i int) bool { return pts[i].sep <= 0 }
	all := func(int) bool { return true }
	tiers := [...]func(int) bool{inBand, inside, all}
	x0, y0 := proj(i0)
	i1, best := -1, 0.0
	for _, ok := range tiers {
		for i := range pts {
			if i == i0 || !ok(i) {
				continue
			}
			x, y := proj(i)
			if dd := (x-x0)*(x-x0) + (y-y0)*(y-y0); better(i, dd, i1, best) {
				i1, best = i, dd
			}
		}
		if i1 >= 0 {
			break
		}
	}
	sel = append(sel, i1)
	x1, y1 := proj(i1)
	i2, sign := -1, 1.0
	best = 0
	for _, ok := range tiers {
		for i := range pts {
			if i == i0 || i == i1 || !ok(i) {
				continue
			}
			x, y := proj(i)
			a := cross2(x1-x0, y1-y0, x-x0, y-y0)
			if better(i, math.Abs(a), i2, best) {
				i2, best, sign = i, math.Abs(a), sgn(a)
			}
		}
		if best > tieA {
			break
		}
	}
	if best <= tieA {
		return sel // all points on one line
	}
	sel = append(sel, i2)
	x2, y2 := proj(i2)
	// The fourth point adds the most area outside the triangle.
	i3 := -1
	best = 0
	for _, ok := range tiers {
		for i := range pts {
			if i == i0 || i == i1 || i == i2 || !ok(i) {
				continue
			}
			x, y := proj(i)
			add := math.Max(-sign*cross2(x1-x0, y1-y0, x-x0, y-y0),
				math.Max(-sign*cross2(x2-x1, y2-y1, x-x1, y-y1), -sign*cross2(x0-x2, y0-y2, x-x2, y-y2)))
			if add > tieA && better(i, add, i3, best) {
				i3, best = i, add
			}
		}
		if i3 >= 0 {
			break
		}
	}
	if i3 >= 0 {
		sel = append(sel, i3)
	}
	return sel
}

// contactBand is the depth, as a fraction of the patch's extent, within
// which candidate points count as carrying the contact in reduce: far
// below the sag of a faceted round part's neighbouring facets (about 1
// percent of its length for 32 facets), far above rounding.
const contactBand = 1e-3
