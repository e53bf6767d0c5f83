package resting

import (
	"errors"
	"fmt"
	"math"

	"clatter/shapes"
)

// Face is the resting analysis of one face of a part.
//
// Flat faces have an outward Normal and a zero Axis. The curved side of a
// cylinder or capsule is reported as one face with a zero Normal and the unit
// Axis of the surface: its outward normals are all directions perpendicular
// to Axis (see OfShape).
type Face struct {
	// Normal is the outward unit normal in the part's frame (zero for a
	// curved face).
	Normal shapes.Vec3
	// Axis is the axis of a curved face (zero for a flat face).
	Axis shapes.Vec3
	// Area of the face.
	Area float64
	// Height is the height of the centre of mass above the support when the
	// part stands on this face: its distance from the face's plane (for a
	// curved face, the least height as the part rolls on it).
	Height float64
	// Stable reports that the part can stand on the face: the centre of mass
	// projects strictly inside it. A projection on the boundary, within a
	// relative tolerance of 1e-9 of the part's size, is a balance that any
	// disturbance upsets, and counts as unstable.
	Stable bool
	// TipAngleRad is, for a stable face, the tilt of the support in radians
	// at which the part tips over the nearest edge of the face:
	// min over the edges e of atan(r_e / Height), with r_e the distance of the
	// projected centre of mass from the line of e. Zero for an unstable face.
	TipAngleRad float64
	// Direct is the face's own capture share: the solid angle, seen from the
	// centre of mass, of the gravity directions whose ray pierces the face,
	// divided by 4 pi.
	Direct float64
	// Probability is the quasi-static probability of coming to rest on the
	// face: its Direct share plus the shares of the unstable faces that roll
	// onto it. Zero for an unstable face; the stable faces' sum is 1.
	Probability float64
	// RollsTo is the index of the stable face the part ends on when placed
	// on this face: the face itself when it is stable.
	RollsTo int
}

// Curved reports whether f is the curved side of a cylinder or capsule.
func (f Face) Curved() bool { return f.Axis != (shapes.Vec3{}) }

// Errors that OfHull and OfShape wrap with their context; test with errors.Is.
var (
	// ErrDegenerate: the hull is not a closed convex solid with valid faces.
	ErrDegenerate = errors.New("degenerate hull")
	// ErrOutside: the centre of mass is not strictly inside the part.
	ErrOutside = errors.New("centre of mass not inside the part")
	// ErrUnsupported: the shape has no resting analysis (static shapes,
	// compounds with curved pieces).
	ErrUnsupported = errors.New("shape not supported")
)

// Relative tolerances, as fractions of the part's size (the diagonal of its
// vertices' bounds).
const (
	// insideTol: the centre of mass must lie at least this far inside every
	// face plane. Far below any real part's wall thickness, far above the
	// rounding of the plane offsets (about 1e-16).
	insideTol = 1e-9
	// stableTol: a projected centre of mass closer than this to a face's
	// boundary is a balance on the edge, not a stable rest (see Face.Stable).
	stableTol = 1e-9
	// closureTol: the faces' solid angles seen from the centre of mass must
	// sum to 4 pi within this fraction. A closed surface around an interior
	// point gives 4 pi to rounding (about 1e-15); an open surface or one the
	// point is outside of is off by a finite amount.
	closureTol = 1e-9
	// angleTol: cosines within this of zero count as zero in the roll's event
	// tests (unit vectors, so absolute).
	angleTol = 1e-12
)

// analysis holds a hull and its centre of mass with the adjacency that the
// roll needs; everything indexed by int, no maps in the results.
type analysis struct {
	verts []shapes.Vec3
	faces []shapes.Face
	c     shapes.Vec3
	size  float64
	// across[f][i] is the face on the other side of edge i of face f
	// (from Verts[i] to Verts[i+1]).
	across [][]int
	// nbrs[v] are the vertices joined to v by an edge, ascending.
	nbrs [][]int32
	// vfaces[v] are the faces around vertex v, ascending.
	vfaces [][]int
	// height and foot of the centre of mass for every face.
	height []float64
	foot   []shapes.Vec3
	stable []bool
	// rollsTo[f] is the stable face that a roll from face f ends on, once
	// known (-1 before); passed lists the faces the current roll went over.
	rollsTo []int
	passed  []int
}

// OfHull analyses every face of the convex hull h for a part whose centre of
// mass is com, in the hull's frame. The result has one Face per h.Faces, in
// the same order.
//
// Only h.Vertices and h.Faces are used (normals unit and outward, vertices
// counter-clockwise seen from outside, each edge shared by two faces), so
// hand-built hulls work as well as those of shapes.NewHull.
//
// Errors wrap ErrDegenerate (a hull that is not a closed solid, or whose
// faces are malformed) or ErrOutside (a centre of mass on or outside the
// hull's surface).
func OfHull(h *shapes.Hull, com shapes.Vec3) ([]Face, error) {
	a, err := newAnalysis(h, com)
	if err != nil {
		return nil, err
	}
	out := make([]Face, len(a.faces))
	var total float64
	for fi, f := range a.faces {
		omega := a.solidAngle(fi)
		total += omega
		out[fi] = Face{
			Normal:  f.Normal,
			Area:    a.area(fi),
			Height:  a.height[fi],
			Stable:  a.stable[fi],
			Direct:  omega / (4 * math.Pi),
			RollsTo: fi,
		}
		if a.stable[fi] {
			out[fi].TipAngleRad = a.tipAngle(fi)
		}
	}
	// A closed surface around an interior point subtends 4 pi; an open hull,
	// a wrongly wound face or an outside point does not (the signed solid
	// angles of a closed surface sum to 0 for a point outside it).
	if math.Abs(total-4*math.Pi) > closureTol*4*math.Pi {
		if math.Abs(total) < 0.5 {
			return nil, fmt.Errorf("resting: centre of mass %v: faces subtend %g sr, not 4 pi: %w", com, total, ErrOutside)
		}
		return nil, fmt.Errorf("resting: faces subtend %g sr from the centre of mass, not 4 pi: the hull is not closed or a face is wound inward: %w", total, ErrDegenerate)
	}
	anyStable := false
	for _, s := range a.stable {
		anyStable = anyStable || s
	}
	if !anyStable {
		// The face nearest the centre of mass is always stable for a convex
		// solid, so this means a degenerate, paper-thin hull.
		return nil, fmt.Errorf("resting: no face of the hull is stable within the tolerance: %w", ErrDegenerate)
	}
	for fi := range out {
		if a.stable[fi] {
			continue
		}
		to, err := a.roll(fi)
		if err != nil {
			return nil, err
		}
		out[fi].RollsTo = to
	}
	for fi := range out {
		out[out[fi].RollsTo].Probability += out[fi].Direct
	}
	return out, nil
}

func newAnalysis(h *shapes.Hull, com shapes.Vec3) (*analysis, error) {
	size, err := hullSize(h, com)
	if err != nil {
		return nil, err
	}
	nv, nf := len(h.Vertices), len(h.Faces)
	a := &analysis{
		verts:  h.Vertices,
		faces:  h.Faces,
		c:      com,
		size:   size,
		across: make([][]int, nf),
		nbrs:   make([][]int32, nv),
		vfaces: make([][]int, nv),
		height: make([]float64, nf),
		foot:   make([]shapes.Vec3, nf),
		stable: make([]bool, nf),
	}
	owner, err := edgeOwners(h)
	if err != nil {
		return nil, err
	}
	if err := a.linkEdges(owner); err != nil {
		return nil, err
	}
	if err := a.placeFeet(); err != nil {
		return nil, err
	}
	return a, nil
}

// hullSize checks that h is a hull of finite vertices, enough of them and
// of its faces for a solid, and com a finite point, and returns the
// diagonal of h's bounding box.
func hullSize(h *shapes.Hull, com shapes.Vec3) (float64, error) {
	if h == nil {
		return 0, fmt.Errorf("resting: nil hull: %w", ErrDegenerate)
	}
	if !finite(com) {
		return 0, fmt.Errorf("resting: centre of mass %v is not finite: %w", com, ErrOutside)
	}
	nv, nf := len(h.Vertices), len(h.Faces)
	if nv < 4 || nf < 4 {
		return 0, fmt.Errorf("resting: hull has %d vertices and %d faces, a solid needs at least 4 of each: %w", nv, nf, ErrDegenerate)
	}
	b := shapes.EmptyAABB()
	for i, v := range h.Vertices {
		if !finite(v) {
			return 0, fmt.Errorf("resting: hull vertex %d %v is not finite: %w", i, v, ErrDegenerate)
		}
		b = b.Extend(v)
	}
	size := b.Size().Len()
	if !(size > 0) {
		return 0, fmt.Errorf("resting: hull has no extent: %w", ErrDegenerate)
	}
	return size, nil
}

// edgeOwners checks h's faces (polygons of valid vertices, unit normals,
// consistent winding) and maps each directed edge to the face that runs
// along it; the map is only looked up, never iterated, so results keep a
// deterministic order.
func edgeOwners(h *shapes.Hull) (map[[2]int32]int, error) {
	nv := len(h.Vertices)
	owner := make(map[[2]int32]int, 4*len(h.Faces))
	for fi, f := range h.Faces {
		n := len(f.Verts)
		if n < 3 {
			return nil, fmt.Errorf("resting: face %d has %d vertices: %w", fi, n, ErrDegenerate)
		}
		if l := f.Normal.Len(); !(math.Abs(l-1) < 1e-6) {
			return nil, fmt.Errorf("resting: face %d normal %v is not unit length: %w", fi, f.Normal, ErrDegenerate)
		}
		for i, v := range f.Verts {
			if v < 0 || int(v) >= nv {
				return nil, fmt.Errorf("resting: face %d vertex index %d out of range [0, %d): %w", fi, v, nv, ErrDegenerate)
			}
			w := f.Verts[(i+1)%n]
			if v == w {
				return nil, fmt.Errorf("resting: face %d repeats vertex %d: %w", fi, v, ErrDegenerate)
			}
			key := [2]int32{v, w}
			if g, dup := owner[key]; dup {
				return nil, fmt.Errorf("resting: edge %d->%d runs the same way in faces %d and %d (inconsistent winding): %w", v, w, g, fi, ErrDegenerate)
			}
			owner[key] = fi
		}
	}
	return owner, nil
}

// linkEdges sets the face across each edge, the faces around each vertex
// and the neighbours of each vertex, from the edges' owners.
func (a *analysis) linkEdges(owner map[[2]int32]int) error {
	for fi, f := range a.faces {
		n := len(f.Verts)
		a.across[fi] = make([]int, n)
		for i, v := range f.Verts {
			w := f.Verts[(i+1)%n]
			g, ok := owner[[2]int32{w, v}]
			if !ok {
				return fmt.Errorf("resting: edge %d->%d of face %d has no face on its other side (the hull is not closed): %w", v, w, fi, ErrDegenerate)
			}
			a.across[fi][i] = g
			a.vfaces[v] = appendUnique(a.vfaces[v], fi)
			if v < w {
				a.nbrs[v] = append(a.nbrs[v], w)
				a.nbrs[w] = append(a.nbrs[w], v)
			}
		}
	}
	for v := range a.nbrs {
		sortInt32(a.nbrs[v])
	}
	return nil
}

// placeFeet sets the height and foot of the centre of mass over every face
// and whether the face is stable; the centre must lie inside every face.
func (a *analysis) placeFeet() error {
	com := a.c
	for fi, f := range a.faces {
		d := f.Offset - f.Normal.Dot(com)
		if !(d > insideTol*a.size) {
			return fmt.Errorf("resting: centre of mass %v lies %g from the plane of face %d (normal %v), not inside: %w", com, -d, fi, f.Normal, ErrOutside)
		}
		a.height[fi] = d
		a.foot[fi] = com.Add(f.Normal.Mul(d))
		a.stable[fi] = a.minInward(fi) > stableTol*a.size
	}
	return nil
}

// inward is the unit vector in the plane of face f, perpendicular to its edge
// i and pointing into the face: n x e for an edge e running counter-clockwise
// seen from outside.
func (a *analysis) inward(f, i int) shapes.Vec3 {
	fc := a.faces[f]
	p, q := a.edge(f, i)
	m := fc.Normal.Cross(q.Sub(p))
	if l := m.Len(); l > 0 {
		return m.Mul(1 / l)
	}
	return m
}

// edge returns the end points of edge i of face f.
func (a *analysis) edge(f, i int) (shapes.Vec3, shapes.Vec3) {
	vs := a.faces[f].Verts
	return a.verts[vs[i]], a.verts[vs[(i+1)%len(vs)]]
}

// minInward is the least signed distance of the projected centre of mass
// from the lines of the face's edges, positive inside.
func (a *analysis) minInward(f int) float64 {
	best := math.Inf(1)
	for i := range a.faces[f].Verts {
		p, _ := a.edge(f, i)
		best = math.Min(best, a.inward(f, i).Dot(a.foot[f].Sub(p)))
	}
	return best
}

// tipAngle is min over edges of atan(r_e / d): tilting the support about the
// line of edge e by that angle brings the centre of mass vertically over it.
func (a *analysis) tipAngle(f int) float64 {
	return math.Atan2(a.minInward(f), a.height[f])
}

// area of the planar polygon f, by the shoelace sum projected on its normal.
func (a *analysis) area(f int) float64 {
	fc := a.faces[f]
	o := a.verts[fc.Verts[0]]
	var s float64
	for i := 1; i+1 < len(fc.Verts); i++ {
		p := a.verts[fc.Verts[i]].Sub(o)
		q := a.verts[fc.Verts[i+1]].Sub(o)
		s += p.Cross(q).Dot(fc.Normal)
	}
	return s / 2
}

// solidAngle is the signed solid angle of face f seen from the centre of
// mass: the area of its central projection onto the unit sphere, the capture
// region of the face. The polygon is fanned into triangles from its first
// vertex and each triangle's solid angle taken by the formula of
// A. Van Oosterom and J. Strackee, "The solid angle of a plane triangle",
// IEEE Trans. Biomedical Engineering 30(2), 1983:
//
//	tan(Omega/2) = a.(b x c) / (|a||b||c| + (a.b)|c| + (a.c)|b| + (b.c)|a|)
//
// exact up to rounding, with atan2 giving the right branch for large angles.
func (a *analysis) solidAngle(f int) float64 {
	fc := a.faces[f]
	r0 := a.verts[fc.Verts[0]].Sub(a.c)
	l0 := r0.Len()
	var s float64
	for i := 1; i+1 < len(fc.Verts); i++ {
		r1 := a.verts[fc.Verts[i]].Sub(a.c)
		r2 := a.verts[fc.Verts[i+1]].Sub(a.c)
		l1, l2 := r1.Len(), r2.Len()
		num := r0.Dot(r1.Cross(r2))
		den := l0*l1*l2 + r0.Dot(r1)*l2 + r0.Dot(r2)*l1 + r1.Dot(r2)*l0
		s += 2 * math.Atan2(num, den)
	}
	return s
}

func finite(v shapes.Vec3) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

func appendUnique(s []int, x int) []int {
	for _, y := range s {
		if y == x {
			return s
		}
	}
	return append(s, x)
}

// sortInt32 sorts a short slice in place (insertion sort: vertex degrees are small).
func sortInt32(s []int32) {
	for i := 1; i < len(s); i++ {
		for j := i; j > 0 && s[j] < s[j-1]; j-- {
			s[j], s[j-1] = s[j-1], s[j]
		}
	}
}
