package bvh

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"clatter/shapes"
)

// Build parameters.
const (
	// numBins is the number of candidate split planes per axis plus one.
	// Wald (2007) reports that 16 bins give trees about as good as
	// evaluating every triangle boundary (from memory).
	numBins = 16
	// maxLeaf is the largest leaf the heuristic may choose to keep; larger
	// sets are split even when the heuristic prefers not to.
	maxLeaf = 8
	// costTraverse and costTriangle weigh a visit of an inner node against
	// a triangle's box test in the heuristic; both are one box-box test.
	costTraverse = 1.0
	costTriangle = 1.0
	// medianDepth is the depth from which nodes are split at the object
	// median, so that the depth stays below medianDepth + 31 whatever the
	// triangles (the heuristic alone can make long thin chains).
	medianDepth = 28
	// stackSize bounds the traversal stack: the depth limit plus the two
	// children of the last node.
	stackSize = medianDepth + 31 + 2
)

// ErrBadMesh is returned (wrapped, with the triangle or vertex and what to
// fix) for meshes that cannot be indexed.
var ErrBadMesh = errors.New("bad triangle mesh")

type node struct {
	box shapes.AABB
	// For a leaf (count > 0): the leaf's triangles are tris[first :
	// first+count]. For an inner node (count == 0): the children are
	// nodes[first] and nodes[first+1].
	first, count int32
}

// Tree is a bounding volume hierarchy over the triangles of one mesh.
type Tree struct {
	mesh  *shapes.TriMesh
	nodes []node
	tris  []int32       // triangle indices, leaf by leaf
	boxes []shapes.AABB // boxes[k] bounds triangle tris[k]
	depth int
}

// Build returns the hierarchy of the triangles of m. The mesh must not be
// changed afterwards. Degenerate triangles (repeated or collinear corners)
// are fine; indices out of range and non-finite vertices are errors. A mesh
// without triangles gives an empty tree.
func Build(m *shapes.TriMesh) (*Tree, error) {
	if m == nil {
		return nil, fmt.Errorf("bvh: %w: nil mesh", ErrBadMesh)
	}
	if len(m.Triangles) > math.MaxInt32/2 {
		return nil, fmt.Errorf("bvh: %w: %d triangles, at most %d supported", ErrBadMesh, len(m.Triangles), math.MaxInt32/2)
	}
	for i, v := range m.Vertices {
		for k := 0; k < 3; k++ {
			if math.IsNaN(v[k]) || math.IsInf(v[k], 0) {
				return nil, fmt.Errorf("bvh: %w: vertex %d is %v, not finite; check the mesh file or its transform", ErrBadMesh, i, v)
			}
		}
	}
	n := len(m.Triangles)
	b := &builder{items: make([]item, n), nodes: make([]node, 0, max(1, 2*n-1))}
	for i, tri := range m.Triangles {
		box := shapes.EmptyAABB()
		for _, vi := range tri {
			if vi < 0 || int(vi) >= len(m.Vertices) {
				return nil, fmt.Errorf("bvh: %w: triangle %d refers to vertex %d, but the mesh has %d vertices (0 to %d)",
					ErrBadMesh, i, vi, len(m.Vertices), len(m.Vertices)-1)
			}
			box = box.Extend(m.Vertices[vi])
		}
		b.items[i] = item{box: box, cent: box.Center(), tri: int32(i)}
	}
	if n > 0 {
		b.nodes = append(b.nodes, node{})
		b.build(0, 0, n, 1)
	}
	t := &Tree{mesh: m, nodes: b.nodes, depth: b.depth, tris: make([]int32, n), boxes: make([]shapes.AABB, n)}
	for k, it := range b.items {
		t.tris[k], t.boxes[k] = it.tri, it.box
	}
	return t, nil
}

// item is a triangle during the build. The items themselves are permuted,
// rather than indices into side tables, so that every pass reads memory in
// order.
type item struct {
	box  shapes.AABB
	cent shapes.Vec3 // centre of box
	tri  int32
}

type builder struct {
	items []item // permuted into leaf order as the build proceeds
	nodes []node
	depth int
}

type bin struct {
	box shapes.AABB
	n   int
}

// build fills node ni with the triangles items[start:end].
func (b *builder) build(ni int32, start, end, depth int) {
	b.depth = max(b.depth, depth)
	its := b.items[start:end]
	bounds, cb := shapes.EmptyAABB(), shapes.EmptyAABB()
	for k := range its {
		bounds = union(bounds, its[k].box)
		cb = extend(cb, its[k].cent)
	}
	b.nodes[ni].box = bounds
	n := end - start
	if n == 1 {
		b.leaf(ni, start, end)
		return
	}
	ext := cb.Size()
	mid := -1
	if depth < medianDepth {
		axis, split, cost := bestSplit(its, bounds, cb)
		switch {
		case axis < 0 && n <= maxLeaf: // all centres coincide
			b.leaf(ni, start, end)
			return
		case axis < 0:
			// Any split is as good as another; fall through to the median.
		case cost >= float64(n)*costTriangle && n <= maxLeaf:
			b.leaf(ni, start, end)
			return
		default:
			nb := binsFor(n)
			mid = start + partition(its, axis, cb.Min[axis], binScale(ext[axis], nb), nb, split)
		}
	}
	if mid < 0 {
		mid = start + median(its, ext)
	}
	first := int32(len(b.nodes))
	b.nodes = append(b.nodes, node{}, node{})
	b.nodes[ni].first, b.nodes[ni].count = first, 0
	b.build(first, start, mid, depth+1)
	b.build(first+1, mid, end, depth+1)
}

func (b *builder) leaf(ni int32, start, end int) {
	// Ascending within a leaf: deterministic and kind to the final sort.
	slices.SortFunc(b.items[start:end], func(x, y item) int { return int(x.tri - y.tri) })
	b.nodes[ni].first, b.nodes[ni].count = int32(start), int32(end-start)
}

// binsFor is the number of bins for a node of n triangles: numBins, or
// fewer for small nodes, where the fixed cost of the bins would dominate.
func binsFor(n int) int { return min(numBins, n) }

// binScale maps a centre offset along an axis of centroid extent ext to one
// of nb bins; the factor just below one keeps the largest centre in the last
// bin (Wald 2007, section 3.2).
func binScale(ext float64, nb int) float64 { return float64(nb) * (1 - 1e-6) / ext }

func binOf(c, lo, scale float64, nb int) int {
	return min(nb-1, max(0, int((c-lo)*scale)))
}

// bestSplit evaluates the surface area heuristic at the bin boundaries of
// each axis along which the centres spread, and returns the best axis, the
// number of bins left of the split and the cost; axis -1 if the centres all
// coincide.
func bestSplit(its []item, bounds, cb shapes.AABB) (axis, split int, cost float64) {
	ext := cb.Size()
	// For triangles all on one line the areas vanish; the lengths of the
	// boxes stand in for them.
	lengths := halfArea(bounds) == 0
	parent := measure(bounds, lengths)
	nb := binsFor(len(its))
	axis, cost = -1, math.Inf(1)
	for ax := 0; ax < 3; ax++ {
		scale := binScale(ext[ax], nb)
		if !(ext[ax] > 0) || math.IsInf(scale, 0) {
			continue // no spread, or too little to bin (subnormal extent)
		}
		var bins [numBins]bin
		for i := range bins[:nb] {
			bins[i].box = shapes.EmptyAABB()
		}
		lo := cb.Min[ax]
		for k := range its {
			i := binOf(its[k].cent[ax], lo, scale, nb)
			bins[i].n++
			bins[i].box = union(bins[i].box, its[k].box)
		}
		// Right-to-left sweep: cost share of the right side of each split.
		var right [numBins]float64
		box, cnt := shapes.EmptyAABB(), 0
		for k := nb - 1; k > 0; k-- {
			if bins[k].n > 0 {
				box, cnt = union(box, bins[k].box), cnt+bins[k].n
				right[k] = measure(box, lengths) * float64(cnt)
			} else if k < nb-1 {
				right[k] = right[k+1]
			}
		}
		box, cnt = shapes.EmptyAABB(), 0
		for k := 0; k < nb-1; k++ {
			if bins[k].n == 0 {
				continue // same split as the previous boundary
			}
			box, cnt = union(box, bins[k].box), cnt+bins[k].n
			if cnt == len(its) {
				break
			}
			c := costTraverse + (measure(box, lengths)*float64(cnt)+right[k+1])/parent*costTriangle
			if c < cost {
				axis, split, cost = ax, k+1, c
			}
		}
	}
	return axis, split, cost
}

// measure is the half surface area of a box, or the sum of its edge lengths
// when areas vanish.
func measure(b shapes.AABB, lengths bool) float64 {
	s := b.Size()
	if lengths {
		return s[0] + s[1] + s[2]
	}
	return s[0]*s[1] + s[1]*s[2] + s[2]*s[0]
}

// union is the smallest box containing a and b, computed per component so
// that an empty box (EmptyAABB) is its identity. (shapes.AABB.Union extends
// by the corners of its argument, which turns a union with an empty box
// infinite.) Inputs are finite, so plain comparisons do.
func union(a, b shapes.AABB) shapes.AABB {
	for k := 0; k < 3; k++ {
		if b.Min[k] < a.Min[k] {
			a.Min[k] = b.Min[k]
		}
		if b.Max[k] > a.Max[k] {
			a.Max[k] = b.Max[k]
		}
	}
	return a
}

func extend(a shapes.AABB, v shapes.Vec3) shapes.AABB {
	for k := 0; k < 3; k++ {
		if v[k] < a.Min[k] {
			a.Min[k] = v[k]
		}
		if v[k] > a.Max[k] {
			a.Max[k] = v[k]
		}
	}
	return a
}

func halfArea(b shapes.AABB) float64 { return measure(b, false) }

// partition moves the items whose centre falls in a bin below split to the
// front and returns how many there are.
func partition(its []item, axis int, lo, scale float64, nb, split int) int {
	i, j := 0, len(its)-1
	for i <= j {
		if binOf(its[i].cent[axis], lo, scale, nb) < split {
			i++
		} else {
			its[i], its[j] = its[j], its[i]
			j--
		}
	}
	return i
}

// median sorts the items along the axis of largest centroid extent (ties by
// triangle index, so the result is deterministic) and returns the middle.
func median(its []item, ext shapes.Vec3) int {
	axis := 0
	if ext[1] > ext[axis] {
		axis = 1
	}
	if ext[2] > ext[axis] {
		axis = 2
	}
	slices.SortFunc(its, func(x, y item) int {
		cx, cy := x.cent[axis], y.cent[axis]
		switch {
		case cx < cy:
			return -1
		case cx > cy:
			return 1
		}
		return int(x.tri - y.tri)
	})
	return len(its) / 2
}

// Len is the number of triangles.
func (t *Tree) Len() int { return len(t.tris) }

// Mesh is the mesh the tree was built over.
func (t *Tree) Mesh() *shapes.TriMesh { return t.mesh }

// Bounds is the box around every triangle (EmptyAABB for an empty mesh).
func (t *Tree) Bounds() shapes.AABB {
	if len(t.nodes) == 0 {
		return shapes.EmptyAABB()
	}
	return t.nodes[0].box
}

// Query appends to dst, in ascending order, the index (into the mesh's
// Triangles) of every triangle whose bounding box overlaps box (touching
// counts), and returns the extended slice. It allocates only if dst must
// grow.
func (t *Tree) Query(dst []int32, box shapes.AABB) []int32 {
	if len(t.nodes) == 0 || !t.nodes[0].box.Overlaps(box) {
		return dst
	}
	start := len(dst)
	var stack [stackSize]int32
	sp := 1 // stack[0] = 0, the root
	for sp > 0 {
		sp--
		nd := &t.nodes[stack[sp]]
		if nd.count > 0 {
			for k := nd.first; k < nd.first+nd.count; k++ {
				if t.boxes[k].Overlaps(box) {
					dst = append(dst, t.tris[k])
				}
			}
			continue
		}
		if t.nodes[nd.first+1].box.Overlaps(box) {
			stack[sp] = nd.first + 1
			sp++
		}
		if t.nodes[nd.first].box.Overlaps(box) {
			stack[sp] = nd.first
			sp++
		}
	}
	slices.Sort(dst[start:])
	return dst
}

// Hit is where a ray meets a triangle.
type Hit struct {
	Triangle int32   // index into the mesh's Triangles
	T        float64 // the point is origin + T*dir
	// U and V are barycentric coordinates: the point is (1-U-V)*a + U*b +
	// V*c for the triangle's corners a, b, c.
	U, V float64
}

// slabGrow widens the far end of a slab interval so that rounding in the
// ray-box test cannot reject a box the ray touches: 1 + 2*gamma(3) with
// gamma(n) = n*eps/(1-n*eps), eps = 2^-53 (Ize, "Robust BVH ray traversal",
// JCGT 2(2), 2013).
var slabGrow = 1 + 2*(3*0x1p-53)/(1-3*0x1p-53)

type ray struct {
	o, d, inv shapes.Vec3
	flat      [3]bool // d[k] == 0
}

// Raycast returns the first triangle that the segment origin + t*dir, 0 <= t
// <= maxT, meets (either side of the triangle counts), with ties in t going
// to the lower triangle index. maxT may be +Inf. A zero or non-finite dir,
// or a NaN maxT, meets nothing.
func (t *Tree) Raycast(origin, dir shapes.Vec3, maxT float64) (Hit, bool) {
	best := Hit{Triangle: -1, T: maxT}
	if len(t.nodes) == 0 || !(maxT >= 0) || dir == (shapes.Vec3{}) {
		return best, false
	}
	r := ray{o: origin, d: dir}
	for k := 0; k < 3; k++ {
		if math.IsNaN(dir[k]) || math.IsInf(dir[k], 0) || math.IsNaN(origin[k]) || math.IsInf(origin[k], 0) {
			return best, false
		}
		r.flat[k] = dir[k] == 0
		r.inv[k] = 1 / dir[k]
	}
	if _, ok := r.slab(&t.nodes[0].box, maxT); !ok {
		return best, false
	}
	var stack [stackSize]int32
	sp := 1
	for sp > 0 {
		sp--
		nd := &t.nodes[stack[sp]]
		if nd.count > 0 {
			for k := nd.first; k < nd.first+nd.count; k++ {
				tri := t.tris[k]
				a, b, c := t.mesh.Triangle(int(tri))
				if h, ok := intersect(&r, a, b, c, best.T); ok && (h < best.T || best.Triangle < 0 || tri < best.Triangle) {
					best.T, best.Triangle = h, tri
				}
			}
			continue
		}
		l, rr := nd.first, nd.first+1
		tl, okl := r.slab(&t.nodes[l].box, best.T)
		tr, okr := r.slab(&t.nodes[rr].box, best.T)
		// Push the farther child first so the nearer is searched first and
		// shrinks best.T for the other.
		if okl && okr && tl < tr {
			l, rr, tl, tr = rr, l, tr, tl
		}
		if okl || okr {
			if okl && okr {
				stack[sp], stack[sp+1] = l, rr
				sp += 2
			} else if okl {
				stack[sp] = l
				sp++
			} else {
				stack[sp] = rr
				sp++
			}
		}
	}
	if best.Triangle < 0 {
		return Hit{Triangle: -1}, false
	}
	a, b, c := t.mesh.Triangle(int(best.Triangle))
	best.U, best.V = barycentric(&r, a, b, c)
	return best, true
}

// slab clips [0, maxT] to the box by the slab method (Kay and Kajiya, "Ray
// tracing complex scenes", SIGGRAPH 1986) and returns the entry distance.
func (r *ray) slab(b *shapes.AABB, maxT float64) (float64, bool) {
	t0, t1 := 0.0, maxT
	for k := 0; k < 3; k++ {
		if r.flat[k] {
			if r.o[k] < b.Min[k] || r.o[k] > b.Max[k] {
				return 0, false
			}
			continue
		}
		near := (b.Min[k] - r.o[k]) * r.inv[k]
		far := (b.Max[k] - r.o[k]) * r.inv[k]
		if near > far {
			near, far = far, near
		}
		far *= slabGrow
		t0 = max(t0, near)
		t1 = min(t1, far)
		if t0 > t1 {
			return 0, false
		}
	}
	return t0, true
}

// intersect is the ray-triangle test of Moller and Trumbore ("Fast, minimum
// storage ray/triangle intersection", J. Graphics Tools 2(1), 1997), both
// sides, for 0 <= t <= maxT. A triangle seen edge-on (det == 0) is missed.
func intersect(r *ray, a, b, c shapes.Vec3, maxT float64) (float64, bool) {
	e1, e2 := b.Sub(a), c.Sub(a)
	p := r.d.Cross(e2)
	det := e1.Dot(p)
	if det == 0 {
		return 0, false
	}
	inv := 1 / det
	s := r.o.Sub(a)
	u := s.Dot(p) * inv
	if u < 0 || u > 1 {
		return 0, false
	}
	q := s.Cross(e1)
	v := r.d.Dot(q) * inv
	if v < 0 || u+v > 1 {
		return 0, false
	}
	t := e2.Dot(q) * inv
	if t < 0 || t > maxT {
		return 0, false
	}
	return t, true
}

// barycentric recomputes u and v of the hit (Moller and Trumbore 1997).
func barycentric(r *ray, a, b, c shapes.Vec3) (u, v float64) {
	e1, e2 := b.Sub(a), c.Sub(a)
	p := r.d.Cross(e2)
	inv := 1 / e1.Dot(p)
	s := r.o.Sub(a)
	return s.Dot(p) * inv, r.d.Dot(s.Cross(e1)) * inv
}
