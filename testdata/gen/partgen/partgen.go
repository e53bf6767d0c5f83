// Package partgen builds the STL test parts and broken files of testdata.
// The command in the parent directory writes them; tests compare the
// committed files with Files byte for byte, so the two never drift.
//
// Every part is built from exact geometry in millimetres (inches for the
// inch file), rounded to float32 only when written, as STL stores it.
package partgen

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"math"

	"github.com/hschendel/stl"
)

// Dimensions of the parts, in millimetres.
const (
	// CubeEdge: cube.stl spans [0, 20]^3.
	CubeEdge = 20.0

	// BoxX, BoxY, BoxZ: box.stl (ASCII) and box_in.stl (the same box in
	// inches) span [0, 40] x [0, 20] x [0, 10]; open.stl is this box without
	// its top face.
	BoxX, BoxY, BoxZ = 40.0, 20.0, 10.0

	// Cylinder: a regular CylinderSides-gon of circumradius CylinderRadius
	// about the z axis, extruded from z = 0 to CylinderHeight.
	CylinderRadius = 10.0
	CylinderHeight = 30.0
	CylinderSides  = 48

	// Nut: a regular hexagon NutAcrossFlats wide (circumradius
	// NutAcrossFlats/sqrt(3)), corners on the x axis, from z = 0 to
	// NutHeight, with a hole that is a regular NutHoleSides-gon of
	// circumradius NutHoleRadius, corners at multiples of 360/NutHoleSides
	// degrees from the x axis.
	NutAcrossFlats = 17.0
	NutHeight      = 8.0
	NutHoleRadius  = 5.0
	NutHoleSides   = 36

	// Bracket: an L of a base [0, BracketLength] x [0, BracketWidth] x
	// [0, BracketThick] and an upright [0, BracketThick] x [0, BracketWidth]
	// x [BracketThick, BracketHeight].
	BracketLength = 40.0
	BracketWidth  = 20.0
	BracketThick  = 5.0
	BracketHeight = 35.0

	// Cup: an open-topped cup about the z axis, regular CupSides-gons of
	// circumradius CupOuter outside and CupInner inside, from z = 0 to
	// CupHeight, the cavity from z = CupFloor up.
	CupOuter  = 15.0
	CupInner  = 13.0
	CupHeight = 25.0
	CupFloor  = 2.0
	CupSides  = 32
)

// mmPerInch is exact by the definition of the inch (0.0254 m).
const mmPerInch = 25.4

// File is one generated file; Path is relative to testdata, with slashes.
type File struct {
	Path string
	Data []byte
}

// Files returns every generated file, in a fixed order.
func Files() ([]File, error) {
	var out []File
	cube := Cube()
	box := Box()
	cubeBin, err := binarySTL("cube 20 mm", cube)
	if err != nil {
		return nil, err
	}
	boxIn := box.scaled(1 / mmPerInch)
	noTop := Box()
	noTop.T = noTop.T[:10] // the last two triangles are the +z face

	steps := []struct {
		path string
		data func() ([]byte, error)
	}{
		{"parts/cube.stl", func() ([]byte, error) { return cubeBin, nil }},
		{"parts/box.stl", func() ([]byte, error) { return asciiSTL("box", box) }},
		{"parts/box_in.stl", func() ([]byte, error) { return binarySTL("box 40x20x10 mm in inches", boxIn) }},
		{"parts/cylinder.stl", func() ([]byte, error) { return binarySTL("cylinder 48-gon r10 h30 mm", Cylinder()) }},
		{"parts/nut.stl", func() ([]byte, error) { return binarySTL("hex nut 17 AF 8 mm, hole r5", Nut()) }},
		{"parts/bracket.stl", func() ([]byte, error) { return binarySTL("L bracket 40x20x35 mm", Bracket()) }},
		{"parts/cup.stl", func() ([]byte, error) { return binarySTL("cup r15/r13 h25 mm", Cup()) }},
		{"feeder/bowl.stl", func() ([]byte, error) { return binarySTL("helical track bowl r60, 1/2 turn, 12 mm rise", Bowl()) }},
		{"parts/cap.stl", func() ([]byte, error) { return binarySTL("moulded cap r15 h12 mm, 24 ribs", Cap()) }},
		{"broken/empty.stl", func() ([]byte, error) { return []byte{}, nil }},
		{"broken/truncated.stl", func() ([]byte, error) {
			// Cut inside the eighth triangle.
			return bytes.Clone(cubeBin[:84+7*50+20]), nil
		}},
		{"broken/wrong_count.stl", func() ([]byte, error) {
			b := bytes.Clone(cubeBin)
			binary.LittleEndian.PutUint32(b[80:84], 11) // the file holds 12
			return b, nil
		}},
		{"broken/flat.stl", func() ([]byte, error) { return binarySTL("flat square, both sides", Flat()) }},
		{"broken/nan.stl", func() ([]byte, error) {
			b := bytes.Clone(cubeBin)
			// x of the second corner of the fifth triangle: header, four
			// triangles, the normal and the first corner.
			binary.LittleEndian.PutUint32(b[84+4*50+12+12:], 0x7fc00000) // a quiet NaN
			return b, nil
		}},
		{"broken/noend.stl", func() ([]byte, error) {
			b, err := asciiSTL("cube", cube)
			if err != nil {
				return nil, err
			}
			i := bytes.LastIndex(b, []byte("endsolid"))
			return b[:i], nil
		}},
		{"broken/notriangles.stl", func() ([]byte, error) { return asciiSTL("empty", &Mesh{}) }},
		{"broken/open.stl", func() ([]byte, error) { return binarySTL("box without its top", noTop) }},
		{"broken/inward.stl", func() ([]byte, error) { return binarySTL("cube facing inward", Cube().flipped()) }},
	}
	for _, s := range steps {
		d, err := s.data()
		if err != nil {
			return nil, fmt.Errorf("partgen: %s: %w", s.path, err)
		}
		out = append(out, File{Path: s.path, Data: d})
	}
	return out, nil
}

// Mesh is the exact geometry of a part, in millimetres: corners, and
// triangles that index them, counter-clockwise seen from outside.
type Mesh struct {
	V [][3]float64
	T [][3]int
}

func (s *Mesh) vert(x, y, z float64) int {
	s.V = append(s.V, [3]float64{x, y, z})
	return len(s.V) - 1
}

func (s *Mesh) tri(a, b, c int) { s.T = append(s.T, [3]int{a, b, c}) }

// quad adds the quadrilateral a, b, c, d (counter-clockwise seen from
// outside) as two triangles.
func (s *Mesh) quad(a, b, c, d int) {
	s.tri(a, b, c)
	s.tri(a, c, d)
}

func (s *Mesh) scaled(f float64) *Mesh {
	out := &Mesh{T: s.T}
	for _, p := range s.V {
		out.V = append(out.V, [3]float64{p[0] * f, p[1] * f, p[2] * f})
	}
	return out
}

func (s *Mesh) flipped() *Mesh {
	out := &Mesh{V: s.V}
	for _, t := range s.T {
		out.T = append(out.T, [3]int{t[0], t[2], t[1]})
	}
	return out
}

// box adds the box [x0, x1] x [y0, y1] x [z0, z1], its +z face last.
func box(x0, y0, z0, x1, y1, z1 float64) *Mesh {
	s := &Mesh{}
	var c [8]int
	for i := range c {
		x, y, z := x0, y0, z0
		if i&1 != 0 {
			x = x1
		}
		if i&2 != 0 {
			y = y1
		}
		if i&4 != 0 {
			z = z1
		}
		c[i] = s.vert(x, y, z)
	}
	s.quad(c[0], c[4], c[6], c[2]) // -x
	s.quad(c[1], c[3], c[7], c[5]) // +x
	s.quad(c[0], c[1], c[5], c[4]) // -y
	s.quad(c[2], c[6], c[7], c[3]) // +y
	s.quad(c[0], c[2], c[3], c[1]) // -z
	s.quad(c[4], c[5], c[7], c[6]) // +z
	return s
}

// Cube is the geometry of cube.stl.
func Cube() *Mesh { return box(0, 0, 0, CubeEdge, CubeEdge, CubeEdge) }

// Box is the geometry of box.stl.
func Box() *Mesh { return box(0, 0, 0, BoxX, BoxY, BoxZ) }

// Flat is a 20 mm square at z = 0 covered on both sides: closed and
// consistently oriented, yet without thickness.
func Flat() *Mesh {
	s := &Mesh{}
	a, b, c, d := s.vert(0, 0, 0), s.vert(20, 0, 0), s.vert(20, 20, 0), s.vert(0, 20, 0)
	s.quad(a, b, c, d)
	s.quad(a, d, c, b)
	return s
}

// polygon returns the corners of a regular n-gon of circumradius r,
// counter-clockwise, the first on the x axis.
func polygon(n int, r float64) [][2]float64 {
	p := make([][2]float64, n)
	for i := range p {
		a := 2 * math.Pi * float64(i) / float64(n)
		p[i] = [2]float64{r * math.Cos(a), r * math.Sin(a)}
	}
	return p
}

// ring adds the polygon at height z and returns its vertex indices.
func (s *Mesh) ring(p [][2]float64, z float64) []int {
	idx := make([]int, len(p))
	for i, q := range p {
		idx[i] = s.vert(q[0], q[1], z)
	}
	return idx
}

// wall joins ring lo to ring hi above it; rings counter-clockwise seen from
// +z give a wall facing away from the axis, clockwise ones a wall facing it.
func (s *Mesh) wall(lo, hi []int) {
	n := len(lo)
	for i := range lo {
		j := (i + 1) % n
		s.quad(lo[i], lo[j], hi[j], hi[i])
	}
}

// disk fans ring r (counter-clockwise seen from +z) from centre c; up
// chooses whether it faces +z or -z.
func (s *Mesh) disk(c int, r []int, up bool) {
	n := len(r)
	for i := range r {
		j := (i + 1) % n
		if up {
			s.tri(c, r[i], r[j])
		} else {
			s.tri(c, r[j], r[i])
		}
	}
}

// Cylinder is the geometry of cylinder.stl: a regular-polygon prism.
func Cylinder() *Mesh { return Prism(CylinderSides, CylinderRadius, CylinderHeight) }

// Prism is a regular n-gon of circumradius r about the z axis, from z = 0 to
// h, its caps fanned from their centres.
func Prism(n int, r, h float64) *Mesh {
	s := &Mesh{}
	p := polygon(n, r)
	lo, hi := s.ring(p, 0), s.ring(p, h)
	s.wall(lo, hi)
	s.disk(s.vert(0, 0, 0), lo, false)
	s.disk(s.vert(0, 0, h), hi, true)
	return s
}

// Nut is the geometry of nut.stl: a hexagonal prism with a polygonal hole.
// Each of the six sectors between two hexagon corners and the hole's
// corners below them is triangulated by two fans and one middle triangle.
func Nut() *Mesh {
	s := &Mesh{}
	hex := polygon(6, NutAcrossFlats/math.Sqrt(3))
	hole := polygon(NutHoleSides, NutHoleRadius)
	per := NutHoleSides / 6
	var cap [][3]int // in the order: hexagon corners 0..5, then hole corners
	for k := 0; k < 6; k++ {
		c0, c1 := k, (k+1)%6
		h := func(j int) int { return 6 + j%NutHoleSides }
		for j := k * per; j < k*per+per/2; j++ {
			cap = append(cap, [3]int{c0, h(j + 1), h(j)})
		}
		cap = append(cap, [3]int{c0, c1, h(k*per + per/2)})
		for j := k*per + per/2; j < (k+1)*per; j++ {
			cap = append(cap, [3]int{c1, h(j + 1), h(j)})
		}
	}
	for _, z := range []float64{0, NutHeight} {
		outer, inner := s.ring(hex, z), s.ring(hole, z)
		idx := append(append([]int{}, outer...), inner...)
		for _, t := range cap {
			if z == 0 {
				s.tri(idx[t[0]], idx[t[2]], idx[t[1]])
			} else {
				s.tri(idx[t[0]], idx[t[1]], idx[t[2]])
			}
		}
	}
	// Rings were added bottom outer, bottom inner, top outer, top inner.
	bo, bi := seq(0, 6), seq(6, NutHoleSides)
	to, ti := seq(6+NutHoleSides, 6), seq(12+NutHoleSides, NutHoleSides)
	s.wall(bo, to)
	s.wall(reverse(bi), reverse(ti))
	return s
}

func seq(from, n int) []int {
	out := make([]int, n)
	for i := range out {
		out[i] = from + i
	}
	return out
}

func reverse(a []int) []int {
	out := make([]int, len(a))
	for i, v := range a {
		out[len(a)-1-i] = v
	}
	return out
}

// Bracket is the geometry of bracket.stl: an L profile in the xz plane,
// extruded along y.
func Bracket() *Mesh {
	s := &Mesh{}
	// Counter-clockwise seen from -y (x right, z up), so that walls face out.
	prof := [][2]float64{{0, 0}, {BracketLength, 0}, {BracketLength, BracketThick},
		{BracketThick, BracketThick}, {BracketThick, BracketHeight}, {0, BracketHeight}}
	capTris := [][3]int{{0, 1, 2}, {0, 2, 3}, {0, 3, 4}, {0, 4, 5}}
	front := make([]int, len(prof)) // y = 0, seen from -y
	back := make([]int, len(prof))  // y = BracketWidth
	for i, q := range prof {
		front[i] = s.vert(q[0], 0, q[1])
	}
	for i, q := range prof {
		back[i] = s.vert(q[0], BracketWidth, q[1])
	}
	for _, t := range capTris {
		s.tri(front[t[0]], front[t[1]], front[t[2]]) // faces -y
		s.tri(back[t[0]], back[t[2]], back[t[1]])    // faces +y
	}
	n := len(prof)
	for i := range prof {
		j := (i + 1) % n
		s.quad(front[i], back[i], back[j], front[j])
	}
	return s
}

// Cup is the geometry of cup.stl: an outer prism, a rim, and a cavity
// open at the top.
func Cup() *Mesh {
	s := &Mesh{}
	po, pi := polygon(CupSides, CupOuter), polygon(CupSides, CupInner)
	outLo, outHi := s.ring(po, 0), s.ring(po, CupHeight)
	inLo, inHi := s.ring(pi, CupFloor), s.ring(pi, CupHeight)
	s.wall(outLo, outHi)
	s.wall(reverse(inLo), reverse(inHi))
	s.disk(s.vert(0, 0, 0), outLo, false)
	s.disk(s.vert(0, 0, CupFloor), inLo, true)
	for i := range outHi {
		j := (i + 1) % CupSides
		s.quad(outHi[i], outHi[j], inHi[j], inHi[i])
	}
	return s
}

// triangles returns the facets of s as the library's triangles, corners
// rounded to float32, normals from the exact geometry.
func triangles(s *Mesh) []stl.Triangle {
	out := make([]stl.Triangle, len(s.T))
	for i, t := range s.T {
		a, b, c := s.V[t[0]], s.V[t[1]], s.V[t[2]]
		u := [3]float64{b[0] - a[0], b[1] - a[1], b[2] - a[2]}
		w := [3]float64{c[0] - a[0], c[1] - a[1], c[2] - a[2]}
		n := [3]float64{u[1]*w[2] - u[2]*w[1], u[2]*w[0] - u[0]*w[2], u[0]*w[1] - u[1]*w[0]}
		l := math.Sqrt(n[0]*n[0] + n[1]*n[1] + n[2]*n[2])
		var tr stl.Triangle
		for k := 0; k < 3; k++ {
			if l > 0 {
				tr.Normal[k] = float32(n[k] / l)
			}
			tr.Vertices[0][k] = float32(a[k])
			tr.Vertices[1][k] = float32(b[k])
			tr.Vertices[2][k] = float32(c[k])
		}
		out[i] = tr
	}
	return out
}

func binarySTL(name string, s *Mesh) ([]byte, error) {
	var buf bytes.Buffer
	sol := stl.Solid{Name: name, Triangles: triangles(s)}
	err := sol.WriteAll(&buf)
	return buf.Bytes(), err
}

func asciiSTL(name string, s *Mesh) ([]byte, error) {
	var buf bytes.Buffer
	sol := stl.Solid{Name: name, Triangles: triangles(s), IsAscii: true}
	err := sol.WriteAll(&buf)
	return buf.Bytes(), err
}
