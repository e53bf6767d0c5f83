package mesh

import (
	"errors"
	"fmt"
	"math"

	"clatter/shapes"
)

// WeldTolerance is the distance, as a fraction of the diagonal of a mesh's
// bounding box, within which corners merge into one vertex. STL stores
// float32, whose rounding is about 6e-8 of a part's size, so copies of one
// corner written by different facets land well inside it, while real
// features of a part (1e-4 of its size and more) stay far outside it.
const WeldTolerance = 1e-6

// maxCorners bounds the triangle corners a mesh may have: vertex indices are
// int32.
const maxCorners = math.MaxInt32

// Mesh is a welded triangle mesh: every corner shared by several triangles is
// one vertex, and no triangle has two equal corners.
type Mesh struct {
	// Name identifies the mesh in errors and warnings, usually its file name.
	Name      string
	Vertices  []shapes.Vec3
	Triangles [][3]int32
	// Stats records what construction did to the input.
	Stats Stats
}

// Stats records what reading and welding did.
type Stats struct {
	// Facets is the number of triangles in the input.
	Facets int
	// Degenerate counts the triangles dropped because two of their corners
	// welded into one vertex (zero area). Triangles whose three distinct
	// corners are merely collinear are kept: they link the edges of their
	// neighbours and add nothing to the mass properties.
	Degenerate int
	// Tolerance is the weld distance that was used, in the mesh's units.
	Tolerance float64
}

// FromSoup builds a mesh from unindexed triangles, welding their corners.
// Each triangle winds counter-clockwise seen from outside.
func FromSoup(name string, soup [][3]shapes.Vec3) (*Mesh, error) {
	if len(soup) > maxCorners/3 {
		return nil, fmt.Errorf("%s: %d triangles are more than a mesh can index", name, len(soup))
	}
	coords := make([]float64, 0, 9*len(soup))
	for i, t := range soup {
		for _, p := range t {
			if !finite(p) {
				return nil, fmt.Errorf("%s: triangle %d has a corner that is not a finite number: %v", name, i+1, p)
			}
			coords = append(coords, p[0], p[1], p[2])
		}
	}
	return build(name, coords, 1, nil)
}

// FromIndexed builds a mesh from vertices and triangles that index them,
// welding vertices closer than the tolerance and dropping collapsed
// triangles. The inputs are not modified.
func FromIndexed(name string, verts []shapes.Vec3, tris [][3]int32) (*Mesh, error) {
	if len(verts) > maxCorners {
		return nil, fmt.Errorf("%s: %d vertices are more than a mesh can index", name, len(verts))
	}
	coords := make([]float64, 0, 3*len(verts))
	for i, p := range verts {
		if !finite(p) {
			return nil, fmt.Errorf("%s: vertex %d is not a finite point: %v", name, i, p)
		}
		coords = append(coords, p[0], p[1], p[2])
	}
	for i, t := range tris {
		for _, v := range t {
			if v < 0 || int(v) >= len(verts) {
				return nil, fmt.Errorf("%s: triangle %d refers to vertex %d, but there are %d vertices", name, i+1, v, len(verts))
			}
		}
	}
	return build(name, coords, 1, tris)
}

// build welds the points in coords (x, y, z each, multiplied by scale) and
// assembles the triangles: tris indexes the points, or nil for a soup in
// which points 3i, 3i+1, 3i+2 form triangle i.
func build[F float32 | float64](name string, coords []F, scale float64, tris [][3]int32) (*Mesh, error) {
	facets := len(tris)
	if tris == nil {
		facets = len(coords) / 9
	}
	if facets == 0 {
		return nil, fmt.Errorf("%s: no triangles", name)
	}
	verts, remap, tol := weld(coords, scale, WeldTolerance)
	m := &Mesh{Name: name, Stats: Stats{Facets: facets, Tolerance: tol}}
	m.Triangles = make([][3]int32, 0, facets)
	for i := 0; i < facets; i++ {
		var t [3]int32
		if tris == nil {
			t = [3]int32{remap[3*i], remap[3*i+1], remap[3*i+2]}
		} else {
			t = [3]int32{remap[tris[i][0]], remap[tris[i][1]], remap[tris[i][2]]}
		}
		if t[0] == t[1] || t[1] == t[2] || t[2] == t[0] {
			m.Stats.Degenerate++
			continue
		}
		m.Triangles = append(m.Triangles, t)
	}
	if len(m.Triangles) == 0 {
		return nil, fmt.Errorf("%s: all %d triangles have zero area (their corners coincide)", name, facets)
	}
	m.Vertices = compact(verts, m.Triangles)
	return m, nil
}

// compact drops the vertices no triangle uses (corners of dropped triangles,
// unused input vertices), keeping the others in order, and renumbers tris.
func compact(verts []shapes.Vec3, tris [][3]int32) []shapes.Vec3 {
	newIndex := make([]int32, len(verts))
	for _, t := range tris {
		newIndex[t[0]], newIndex[t[1]], newIndex[t[2]] = 1, 1, 1
	}
	n := int32(0)
	for i, used := range newIndex {
		if used != 0 {
			verts[n] = verts[i]
			newIndex[i] = n
			n++
		}
	}
	if int(n) == len(verts) {
		return verts
	}
	for i := range tris {
		for k := range tris[i] {
			tris[i][k] = newIndex[tris[i][k]]
		}
	}
	return verts[:n:n]
}

// weld merges points closer than rel times the diagonal of their bounds.
// Points are visited in order; each joins the nearest earlier vertex within
// the tolerance (the lowest index on a tie) or becomes a new vertex, so the
// result depends only on the input. A hash grid of cells weldCell times the
// tolerance wide finds the candidates: a point's tolerance box overlaps at
// most two cells per axis, and only with probability 2/weldCell more than
// one, which keeps welding O(n) with about 1.4 cell look-ups per point.
func weld[F float32 | float64](coords []F, scale, rel float64) (verts []shapes.Vec3, remap []int32, tol float64) {
	n := len(coords) / 3
	remap = make([]int32, n)
	if n == 0 {
		return nil, remap, 0
	}
	at := func(i int) shapes.Vec3 {
		return shapes.Vec3{float64(coords[3*i]) * scale, float64(coords[3*i+1]) * scale, float64(coords[3*i+2]) * scale}
	}
	lo, hi := at(0), at(0)
	for i := 1; i < n; i++ {
		p := at(i)
		for k := 0; k < 3; k++ {
			if p[k] < lo[k] {
				lo[k] = p[k]
			}
			if p[k] > hi[k] {
				hi[k] = p[k]
			}
		}
	}
	tol = rel * hi.Sub(lo).Len()
	if !(tol > 0) || math.IsInf(tol, 0) {
		// All points coincide (or the bounds overflow): one vertex, exact matches only.
		tol = 0
		verts = []shapes.Vec3{at(0)}
		return verts, remap, 0
	}
	inv := 1 / (weldCell * tol)
	tol2 := tol * tol
	cells := newCellTable(n / 4)
	next := make([]int32, 0, n/4) // next[v]: the vertex after v in v's cell
	verts = make([]shapes.Vec3, 0, n/4)
	for i := 0; i < n; i++ {
		p := at(i)
		var c0, c1 [3]int32
		for k := 0; k < 3; k++ {
			c0[k] = int32(math.Floor((p[k] - lo[k] - tol) * inv))
			c1[k] = int32(math.Floor((p[k] - lo[k] + tol) * inv))
		}
		best, bestD := int32(-1), math.Inf(1)
		for x := c0[0]; x <= c1[0]; x++ {
			for y := c0[1]; y <= c1[1]; y++ {
				for z := c0[2]; z <= c1[2]; z++ {
					for v := cells.head([3]int32{x, y, z}); v >= 0; v = next[v] {
						d := verts[v].Sub(p).LenSqr()
						if d <= tol2 && (d < bestD || (d == bestD && v < best)) {
							best, bestD = v, d
						}
					}
				}
			}
		}
		if best < 0 {
			best = int32(len(verts))
			verts = append(verts, p)
			var home [3]int32
			for k := 0; k < 3; k++ {
				home[k] = int32(math.Floor((p[k] - lo[k]) * inv))
			}
			next = append(next, cells.push(home, best))
		}
		remap[i] = best
	}
	return verts, remap, tol
}

// weldCell is the width of a welding cell in tolerances. Vertices closer
// than the tolerance have merged, so a cell holds at most about weldCell^3
// of them, and in real meshes (corners 1e-4 of the size apart and more)
// one or none.
const weldCell = 16

// cellTable maps grid cells to the first vertex of their list, by open
// addressing with linear probing (a Go map costs several times more here).
// Key and value share a 16-byte slot, so that a probe touches one cache line.
type cellTable struct {
	slots []cellSlot
	used  int
}

type cellSlot struct {
	key  [3]int32
	head int32 // -1: empty
}

func newCellTable(hint int) *cellTable {
	size := 64
	for size < 2*hint {
		size *= 2
	}
	t := &cellTable{slots: make([]cellSlot, size)}
	for i := range t.slots {
		t.slots[i].head = -1
	}
	return t
}

// cellHash packs a cell and mixes it with the 64-bit finaliser of
// MurmurHash3 (A. Appleby), so that neighbouring cells spread over the
// table's low bits.
func cellHash(k [3]int32) uint64 {
	h := uint64(uint32(k[0])) ^ uint64(uint32(k[1]))<<21 ^ uint64(uint32(k[2]))<<42 ^ uint64(uint32(k[2]))>>22
	h ^= h >> 33
	h *= 0xff51afd7ed558ccd
	h ^= h >> 33
	h *= 0xc4ceb9fe1a85ec53
	h ^= h >> 33
	return h
}

// slot returns the slot of k, or the empty slot where it would go.
func (t *cellTable) slot(k [3]int32) *cellSlot {
	mask := len(t.slots) - 1
	i := int(cellHash(k)) & mask
	for {
		s := &t.slots[i]
		if s.head < 0 || s.key == k {
			return s
		}
		i = (i + 1) & mask
	}
}

// head returns the first vertex in cell k, or -1.
func (t *cellTable) head(k [3]int32) int32 { return t.slot(k).head }

// push makes v the first vertex of cell k and returns the previous first.
func (t *cellTable) push(k [3]int32, v int32) int32 {
	s := t.slot(k)
	old := s.head
	if old < 0 {
		if 2*(t.used+1) > len(t.slots) {
			t.grow()
			s = t.slot(k)
		}
		s.key = k
		t.used++
	}
	s.head = v
	return old
}

func (t *cellTable) grow() {
	old := t.slots
	t.slots = make([]cellSlot, 2*len(old))
	for i := range t.slots {
		t.slots[i].head = -1
	}
	for _, o := range old {
		if o.head >= 0 {
			*t.slot(o.key) = o
		}
	}
}

// Bounds is the bounding box of the vertices.
func (m *Mesh) Bounds() shapes.AABB {
	b := shapes.EmptyAABB()
	for _, v := range m.Vertices {
		b = b.Extend(v)
	}
	return b
}

// SignedVolume is the volume enclosed by the triangles, by the divergence
// theorem: positive when a closed mesh faces outward, negative when it faces
// inward. It is meaningful only for a closed, consistently oriented mesh.
func (m *Mesh) SignedVolume() float64 {
	if len(m.Triangles) == 0 {
		return 0
	}
	// About a vertex of the mesh, so that parts far from their origin keep
	// their precision.
	o := m.Vertices[m.Triangles[0][0]]
	var v float64
	for _, t := range m.Triangles {
		a, b, c := m.Vertices[t[0]].Sub(o), m.Vertices[t[1]].Sub(o), m.Vertices[t[2]].Sub(o)
		v += a.Dot(b.Cross(c))
	}
	return v / 6
}

// Flip reverses the winding of every triangle, turning inward-facing
// triangles outward and back.
func (m *Mesh) Flip() {
	for i := range m.Triangles {
		m.Triangles[i][1], m.Triangles[i][2] = m.Triangles[i][2], m.Triangles[i][1]
	}
}

// ErrNotSolid is returned (wrapped) by Mass when the mesh does not bound a
// solid: it is open, non-manifold or inconsistently oriented.
var ErrNotSolid = errors.New("mesh does not bound a solid")

// Mass returns the mass properties of the solid the mesh bounds at the given
// density (shapes.PolyhedronMass). It checks the topology first and refuses
// a mesh that is not closed and consistently oriented, saying why; an
// inward-facing closed mesh is refused too (see Flip).
func (m *Mesh) Mass(density float64) (shapes.Mass, error) {
	if top := m.Topology(); !top.Solid() {
		return shapes.Mass{}, fmt.Errorf("%s: %w: mesh is %s", m.Name, ErrNotSolid, top.Problem())
	}
	mp, err := shapes.PolyhedronMass(m.Vertices, m.Triangles, density)
	if err != nil {
		return shapes.Mass{}, fmt.Errorf("%s: %w", m.Name, err)
	}
	return mp, nil
}

// TriMesh returns the mesh as a static triangle mesh for fixtures, sharing
// its vertex and triangle slices. Its triangles keep the file's winding,
// counter-clockwise seen from the side the parts are on.
func (m *Mesh) TriMesh() *shapes.TriMesh {
	return &shapes.TriMesh{Vertices: m.Vertices, Triangles: m.Triangles}
}

func finite(p shapes.Vec3) bool {
	for _, c := range p {
		if math.IsNaN(c) || math.IsInf(c, 0) {
			return false
		}
	}
	return true
}
