package mesh_test

import (
	"fmt"
	"math"
	"path/filepath"
	"testing"

	"clatter/shapes"
	"clatter/shapes/mesh"
	"clatter/testdata/gen/partgen"
)

// Tolerances of the mass checks, relative to the reference value (for
// tensors, to the largest principal moment).
const (
	// exactTol: parts with integer millimetre corners are exact in float32
	// and float64 alike, so only the float64 rounding of the polynomial
	// integrals remains, some 1e-15 per term over tens of terms.
	exactTol = 1e-12
	// float32Tol: STL rounds each coordinate to float32, a relative change
	// of up to 2^-24 = 6e-8; the moments are of degree five in the
	// coordinates, which amplifies that a few times. 1e-6 is still about
	// 3000 times smaller than the gap between a 48-gon and a circle that the
	// prism check must resolve.
	float32Tol = 1e-6
	// float64Tol: meshes generated in float64 (no STL rounding), whose
	// corners come from math.Cos and math.Sin.
	float64Tol = 1e-11
)

// density is a plastic's, 1050 kg/m^3; any positive value would do.
const density = 1050.0

const mm = 1e-3

func dir(name string) string { return filepath.Join("..", "..", "testdata", name) }

func relErr(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

// massErr is the largest relative difference between two sets of mass
// properties: volume and mass relative to themselves, the centre relative to
// the part's size, the inertia relative to its largest diagonal entry.
func massErr(got, want shapes.Mass, size float64) float64 {
	e := math.Max(relErr(got.Volume, want.Volume), relErr(got.Mass, want.Mass))
	e = math.Max(e, got.Center.Sub(want.Center).Len()/size)
	scale := math.Max(math.Abs(want.Inertia.At(0, 0)), math.Max(math.Abs(want.Inertia.At(1, 1)), math.Abs(want.Inertia.At(2, 2))))
	for i := 0; i < 9; i++ {
		e = math.Max(e, math.Abs(got.Inertia[i]-want.Inertia[i])/scale)
	}
	return e
}

// boxRef is the rectangular block from the handbook formulas written out:
// I_x = m (b^2 + c^2) / 12 and so on (any dynamics or
// strength-of-materials handbook), independent of shapes.Box.
func boxRef(x0, y0, z0, x1, y1, z1, rho float64) shapes.Mass {
	a, b, c := x1-x0, y1-y0, z1-z0
	v := a * b * c
	m := rho * v
	return shapes.Mass{
		Volume: v, Mass: m,
		Center:  shapes.Vec3{(x0 + x1) / 2, (y0 + y1) / 2, (z0 + z1) / 2},
		Inertia: shapes.Mat3{m * (b*b + c*c) / 12, 0, 0, 0, m * (a*a + c*c) / 12, 0, 0, 0, m * (a*a + b*b) / 12},
	}
}

// prismRef is a regular n-gon prism of circumradius r about the z axis,
// from z0 to z0 + h: area n r^2 sin(2 pi/n) / 2; about the axis
// I_z = m r^2 (2 + cos(2 pi/n)) / 6 (integrating the n triangles). A regular polygon
// with n >= 3 has equal second moments about every in-plane axis through its
// centre, so by the perpendicular-axis theorem each is half the polar one,
// and I_x = I_y = m (r^2 (2 + cos(2 pi/n)) / 12 + h^2 / 12).
func prismRef(n int, r, z0, h, rho float64) shapes.Mass {
	th := 2 * math.Pi / float64(n)
	v := float64(n) * r * r * math.Sin(th) / 2 * h
	m := rho * v
	iz := m * r * r * (2 + math.Cos(th)) / 6
	ix := iz/2 + m*h*h/12
	return shapes.Mass{Volume: v, Mass: m, Center: shapes.Vec3{0, 0, z0 + h/2}, Inertia: shapes.Mat3{ix, 0, 0, 0, ix, 0, 0, 0, iz}}
}

// negate turns a solid into a hole for shapes.Combine: the parallel-axis
// theorem is linear in the mass, so a union with a negative part subtracts.
func negate(m shapes.Mass) shapes.Mass {
	return shapes.Mass{Volume: -m.Volume, Mass: -m.Mass, Center: m.Center, Inertia: m.Inertia.Mul(-1)}
}

func scaleMM(m shapes.Mass, rho float64) shapes.Mass {
	// references are built in mm at density rho per mm^3; convert to SI
	return shapes.Mass{Volume: m.Volume * 1e-9, Mass: m.Mass, Center: m.Center.Mul(mm), Inertia: m.Inertia.Mul(1e-6)}
}

func loadSolid(t *testing.T, file string, unit mesh.Unit) *mesh.Part {
	t.Helper()
	p, err := mesh.LoadPart(dir(file), unit)
	if err != nil {
		t.Fatal(err)
	}
	if !p.Solid || len(p.Warnings) > 0 {
		t.Fatalf("%s: want a closed solid without warnings, got solid=%v %q", file, p.Solid, p.Warnings)
	}
	return p
}

// TestPartMass checks the committed parts against handbook formulas.
// References are in millimetres with the density per mm^3, then converted.
func TestPartMass(t *testing.T) {
	rhoMM := density * 1e-9 // kg/mm^3
	hexR := partgen.NutAcrossFlats / math.Sqrt(3)
	cases := []struct {
		file string
		unit mesh.Unit
		want shapes.Mass // in mm
		size float64     // mm
		tol  float64
		src  string
	}{
		{"parts/cube.stl", mesh.Millimetre, boxRef(0, 0, 0, 20, 20, 20, rhoMM), 20, exactTol,
			"box m(b^2+c^2)/12"},
		{"parts/box.stl", mesh.Millimetre, boxRef(0, 0, 0, partgen.BoxX, partgen.BoxY, partgen.BoxZ, rhoMM), 40, exactTol,
			"box m(b^2+c^2)/12, ASCII file"},
		{"parts/box_in.stl", mesh.Inch, boxRef(0, 0, 0, partgen.BoxX, partgen.BoxY, partgen.BoxZ, rhoMM), 40, float32Tol,
			"box m(b^2+c^2)/12, file in inches"},
		{"parts/cylinder.stl", mesh.Millimetre, prismRef(partgen.CylinderSides, partgen.CylinderRadius, 0, partgen.CylinderHeight, rhoMM), 30, float32Tol,
			"regular n-gon prism m R^2 (2+cos(2pi/n))/6"},
		{"parts/bracket.stl", mesh.Millimetre, shapes.Combine(
			boxRef(0, 0, 0, partgen.BracketLength, partgen.BracketWidth, partgen.BracketThick, rhoMM),
			boxRef(0, 0, partgen.BracketThick, partgen.BracketThick, partgen.BracketWidth, partgen.BracketHeight, rhoMM)),
			40, exactTol, "two boxes by the parallel-axis theorem"},
		{"parts/nut.stl", mesh.Millimetre, shapes.Combine(
			prismRef(6, hexR, 0, partgen.NutHeight, rhoMM),
			negate(prismRef(partgen.NutHoleSides, partgen.NutHoleRadius, 0, partgen.NutHeight, rhoMM))),
			17, float32Tol, "hexagonal prism minus the hole's prism"},
		{"parts/cup.stl", mesh.Millimetre, shapes.Combine(
			prismRef(partgen.CupSides, partgen.CupOuter, 0, partgen.CupHeight, rhoMM),
			negate(prismRef(partgen.CupSides, partgen.CupInner, partgen.CupFloor, partgen.CupHeight-partgen.CupFloor, rhoMM))),
			30, float32Tol, "outer prism minus the cavity's prism"},
	}
	for _, c := range cases {
		p := loadSolid(t, c.file, c.unit)
		got := p.Mass(density)
		want := scaleMM(c.want, rhoMM)
		if e := massErr(got, want, c.size*mm); e > c.tol {
			t.Errorf("%s (%s): relative error %.3g > %.g\n got  %+v\n want %+v", c.file, c.src, e, c.tol, got, want)
		} else {
			t.Logf("%-20s %-44s relative error %.2g", c.file, c.src, e)
		}
	}
}

// TestPrincipalBracket checks Part.Principal on a part whose axes are not
// the file's: the eigen-equation I a = lambda a for each returned axis
// against the inertia tensor of the composite reference, and the moments
// against the reference's own eigenvalues from the characteristic
// polynomial's trigonometric solution (Smith, CACM 4(4), 1961).
func TestPrincipalBracket(t *testing.T) {
	p := loadSolid(t, "parts/bracket.stl", mesh.Millimetre)
	moments, axes, err := p.Principal(density)
	if err != nil {
		t.Fatal(err)
	}
	in := p.Mass(density).Inertia
	want := symEigen3(in)
	for k := 0; k < 3; k++ {
		if e := relErr(moments[k], want[k]); e > exactTol*10 {
			t.Errorf("moment %d: %g, want %g (Smith's formula)", k, moments[k], want[k])
		}
		a := axes.Col(k)
		if e := in.Mul3x1(a).Sub(a.Mul(moments[k])).Len() / moments[2]; e > exactTol*10 {
			t.Errorf("axis %d %v is not an eigenvector: residual %g", k, a, e)
		}
	}
	if d := axes.Det(); math.Abs(d-1) > 1e-12 {
		t.Errorf("axes are not a rotation: det %g", d)
	}
}

// symEigen3 returns the eigenvalues of a symmetric 3x3 matrix, ascending, by
// O. K. Smith, "Eigenvalues of a symmetric 3x3 matrix", CACM 4(4), 1961.
func symEigen3(a shapes.Mat3) [3]float64 {
	p1 := a.At(0, 1)*a.At(0, 1) + a.At(0, 2)*a.At(0, 2) + a.At(1, 2)*a.At(1, 2)
	q := (a.At(0, 0) + a.At(1, 1) + a.At(2, 2)) / 3
	p2 := (a.At(0, 0)-q)*(a.At(0, 0)-q) + (a.At(1, 1)-q)*(a.At(1, 1)-q) + (a.At(2, 2)-q)*(a.At(2, 2)-q) + 2*p1
	p := math.Sqrt(p2 / 6)
	b := a.Sub(shapes.Mat3{q, 0, 0, 0, q, 0, 0, 0, q}).Mul(1 / p)
	r := math.Max(-1, math.Min(1, b.Det()/2))
	phi := math.Acos(r) / 3
	e1 := q + 2*p*math.Cos(phi)
	e3 := q + 2*p*math.Cos(phi+2*math.Pi/3)
	return [3]float64{e3, 3*q - e1 - e3, e1}
}

func fromPartgen(t *testing.T, name string, g *partgen.Mesh, scale float64) *mesh.Mesh {
	t.Helper()
	verts := make([]shapes.Vec3, len(g.V))
	for i, v := range g.V {
		verts[i] = shapes.Vec3{v[0], v[1], v[2]}.Mul(scale)
	}
	tris := make([][3]int32, len(g.T))
	for i, tr := range g.T {
		tris[i] = [3]int32{int32(tr[0]), int32(tr[1]), int32(tr[2])}
	}
	m, err := mesh.FromIndexed(name, verts, tris)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// TestPrismConvergesToCylinder: a tessellated n-gon prism matches the exact
// regular-polygon prism formula tightly for every n, and its I_z tends to
// the solid cylinder's m r^2 / 2 (any dynamics handbook) as n grows, with
// relative gap (1 - cos(2 pi/n)) / 3, which falls by 2 (1 + cos(2 pi/n)) per
// doubling of n: 3.7 from n = 6, tending to 4.
func TestPrismConvergesToCylinder(t *testing.T) {
	const r, h = 0.01, 0.03
	prev := math.Inf(1)
	for _, n := range []int{6, 12, 24, 48, 96, 192, 384} {
		m := fromPartgen(t, fmt.Sprintf("prism%d", n), partgen.Prism(n, r/mm, h/mm), mm)
		got, err := m.Mass(density)
		if err != nil {
			t.Fatal(err)
		}
		if e := massErr(got, prismRef(n, r, 0, h, density), r); e > float64Tol {
			t.Errorf("n=%d: differs from the n-gon prism formula by %.3g > %g", n, e, float64Tol)
		}
		cyl := got.Mass * r * r / 2
		gap := relErr(got.Inertia.At(2, 2), cyl)
		t.Logf("n=%4d  I_z/(m r^2/2) - 1 = %.3e", n, -gap)
		if gap > prev/3.5 {
			t.Errorf("n=%d: gap to m r^2/2 %.3g did not shrink 3.5-fold from %.3g", n, gap, prev)
		}
		prev = gap
	}
	if prev > 1e-4 {
		t.Errorf("384-gon still %.3g from m r^2/2", prev)
	}
}

// icosphere returns the triangle soup of an icosahedron subdivided level
// times and projected onto the sphere of radius r, outward.
func icosphere(level int, r float64) [][3]shapes.Vec3 {
	g := (1 + math.Sqrt(5)) / 2
	v := []shapes.Vec3{{-1, g, 0}, {1, g, 0}, {-1, -g, 0}, {1, -g, 0}, {0, -1, g}, {0, 1, g}, {0, -1, -g}, {0, 1, -g}, {g, 0, -1}, {g, 0, 1}, {-g, 0, -1}, {-g, 0, 1}}
	idx := [][3]int{{0, 11, 5}, {0, 5, 1}, {0, 1, 7}, {0, 7, 10}, {0, 10, 11}, {1, 5, 9}, {5, 11, 4}, {11, 10, 2}, {10, 7, 6}, {7, 1, 8},
		{3, 9, 4}, {3, 4, 2}, {3, 2, 6}, {3, 6, 8}, {3, 8, 9}, {4, 9, 5}, {2, 4, 11}, {6, 2, 10}, {8, 6, 7}, {9, 8, 1}}
	soup := make([][3]shapes.Vec3, len(idx))
	for i, t := range idx {
		soup[i] = [3]shapes.Vec3{v[t[0]].Normalize(), v[t[1]].Normalize(), v[t[2]].Normalize()}
	}
	for l := 0; l < level; l++ {
		next := make([][3]shapes.Vec3, 0, 4*len(soup))
		for _, t := range soup {
			a, b, c := t[0].Add(t[1]).Normalize(), t[1].Add(t[2]).Normalize(), t[2].Add(t[0]).Normalize()
			next = append(next, [3]shapes.Vec3{t[0], a, c}, [3]shapes.Vec3{t[1], b, a}, [3]shapes.Vec3{t[2], c, b}, [3]shapes.Vec3{a, b, c})
		}
		soup = next
	}
	for i := range soup {
		for k := range soup[i] {
			soup[i][k] = soup[i][k].Mul(r)
		}
	}
	return soup
}

// TestIcosphereConvergesToSphere: the mass properties of ever finer
// icospheres approach the solid sphere's, I = 2/5 m r^2 and V = 4/3 pi r^3
// (any dynamics handbook), the error falling about fourfold per subdivision
// (it goes as the square of the edge length, which halves). Welding the
// unindexed soup must give the icosphere's 10 * 4^k + 2 vertices (Euler's
// formula for a triangulated sphere with 20 * 4^k faces).
func TestIcosphereConvergesToSphere(t *testing.T) {
	const r = 0.02
	prevI, prevV := math.Inf(1), math.Inf(1)
	for level := 0; level <= 5; level++ {
		soup := icosphere(level, r)
		m, err := mesh.FromSoup(fmt.Sprintf("icosphere%d", level), soup)
		if err != nil {
			t.Fatal(err)
		}
		if want := 10*(1<<(2*level)) + 2; len(m.Vertices) != want {
			t.Fatalf("level %d: %d vertices after welding, want %d", level, len(m.Vertices), want)
		}
		got, err := m.Mass(density)
		if err != nil {
			t.Fatal(err)
		}
		eV := relErr(got.Volume, 4.0/3*math.Pi*r*r*r)
		var eI float64
		for k := 0; k < 3; k++ {
			eI = math.Max(eI, relErr(got.Inertia.At(k, k), 0.4*got.Mass*r*r))
		}
		t.Logf("level %d: %6d triangles  volume error %.3e  I/(2/5 m r^2) error %.3e", level, len(m.Triangles), eV, eI)
		if level > 0 && (eI > prevI/3 || eV > prevV/3) {
			t.Errorf("level %d: errors %.3g, %.3g did not shrink at least threefold from %.3g, %.3g", level, eI, eV, prevI, prevV)
		}
		prevI, prevV = eI, eV
	}
	if prevI > 2e-3 || prevV > 2e-3 {
		t.Errorf("finest icosphere still %.3g (inertia), %.3g (volume) from the sphere", prevI, prevV)
	}
}

// TestUnitsScale: the box written in inches and read with Inch is the box
// written in millimetres and read with Millimetre, and reading a file with
// another unit scales volume by the cube and inertia by the fifth power of
// the ratio (dimensional analysis).
func TestUnitsScale(t *testing.T) {
	mmPart := loadSolid(t, "parts/box.stl", mesh.Millimetre)
	inPart := loadSolid(t, "parts/box_in.stl", mesh.Inch)
	if e := massErr(inPart.Mass(density), mmPart.Mass(density), 40*mm); e > float32Tol {
		t.Errorf("box in inches differs from box in mm by %.3g", e)
	}
	cm := loadSolid(t, "parts/box.stl", mesh.Centimetre)
	a, b := mmPart.Mass(density), cm.Mass(density)
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"volume", b.Volume, a.Volume * 1e3},
		{"centre x", b.Center[0], a.Center[0] * 10},
		{"I_xx", b.Inertia.At(0, 0), a.Inertia.At(0, 0) * 1e5},
		{"I_zz", b.Inertia.At(2, 2), a.Inertia.At(2, 2) * 1e5},
	} {
		if e := relErr(c.got, c.want); e > exactTol {
			t.Errorf("cm vs mm %s: %g, want %g", c.what, c.got, c.want)
		}
	}
}

func TestParseUnit(t *testing.T) {
	cases := []struct {
		in   string
		want mesh.Unit
		ok   bool
	}{
		{"m", 1, true},
		{"cm", 0.01, true},
		{"mm", 0.001, true},
		{"in", 0.0254, true}, // exact by definition (1959)
		{"ft", 0, false},
		{"MM", 0, false},
		{"", 0, false},
	}
	for _, c := range cases {
		u, err := mesh.ParseUnit(c.in)
		if (err == nil) != c.ok || u != c.want {
			t.Errorf("ParseUnit(%q) = %v, %v; want %v, ok %v", c.in, u, err, c.want, c.ok)
		}
		if c.ok && u.String() != c.in {
			t.Errorf("%v.String() = %q, want %q", u, u.String(), c.in)
		}
	}
}
