package partgen

import "math"

// Round parts: surfaces of revolution, finely tessellated, for the support
// search and resting tests and for the moulded cap.

// Dimensions of cap.stl, in millimetres: a moulded screw cap, open at the
// bottom, with a filleted top edge and CapRibs ribs around its skirt.
const (
	CapRadius    = 15.0 // outer radius of the skirt, without ribs
	CapHeight    = 12.0
	CapFillet    = 2.5 // outer fillet between top and skirt
	CapWall      = 1.5 // skirt and top thickness
	CapInFillet  = 1.0 // inner fillet between cavity roof and wall
	CapRibs      = 24
	CapRibHeight = 0.6 // how far a rib stands off the skirt
	CapColumns   = 96  // columns around the axis: four per rib
)

// revolve turns the profile prof (r, z), whose first and last points lie on
// the axis (r = 0), about the z axis in n columns. The profile runs so that
// the solid lies to its right seen from +y looking along -y with z up (down
// the outside from the top, like a meridian from the north pole), which
// makes the triangles face outward. radial(i, k) is added to the radius of
// profile point i in column k. The result has 2n(len(prof)-2) triangles.
func revolve(prof [][2]float64, n int, radial func(i, k int) float64) *Mesh {
	s := &Mesh{}
	m := len(prof)
	top := s.vert(0, 0, prof[0][1])
	rings := make([][]int, m)
	for i := 1; i < m-1; i++ {
		rings[i] = make([]int, n)
		for k := 0; k < n; k++ {
			a := 2 * math.Pi * float64(k) / float64(n)
			r := prof[i][0]
			if radial != nil {
				r += radial(i, k)
			}
			rings[i][k] = s.vert(r*math.Cos(a), r*math.Sin(a), prof[i][1])
		}
	}
	bottom := s.vert(0, 0, prof[m-1][1])
	for k := 0; k < n; k++ {
		j := (k + 1) % n
		s.tri(top, rings[1][k], rings[1][j])
		for i := 1; i+1 < m-1; i++ {
			s.quad(rings[i][k], rings[i+1][k], rings[i+1][j], rings[i][j])
		}
		s.tri(bottom, rings[m-2][j], rings[m-2][k])
	}
	return s
}

// arc appends to prof the points of a quarter-circle-like arc about centre
// c of radius r from angle a0 to a1 (radians, from the +r axis toward +z),
// in steps segments, leaving out its first point.
func arc(prof [][2]float64, c [2]float64, r, a0, a1 float64, steps int) [][2]float64 {
	for s := 1; s <= steps; s++ {
		a := a0 + (a1-a0)*float64(s)/float64(steps)
		prof = append(prof, [2]float64{c[0] + r*math.Cos(a), c[1] + r*math.Sin(a)})
	}
	return prof
}

// UVSphere is a sphere of radius r about the origin in nu columns and nv
// rows of latitude, with a vertex at each pole.
func UVSphere(nu, nv int, r float64) *Mesh {
	prof := [][2]float64{{0, r}}
	prof = arc(prof, [2]float64{0, 0}, r, math.Pi/2, -math.Pi/2, nv)
	prof[len(prof)-1][0] = 0 // exactly on the axis
	return revolve(prof, nu, nil)
}

// FilletCylinder is a cylinder of radius r from z = 0 to h in n columns,
// both edges rounded with fillets of radius f in steps segments each.
func FilletCylinder(n int, r, h, f float64, steps int) *Mesh {
	prof := [][2]float64{{0, h}, {r - f, h}}
	prof = arc(prof, [2]float64{r - f, h - f}, f, math.Pi/2, 0, steps)
	prof = append(prof, [2]float64{r, f})
	prof = arc(prof, [2]float64{r - f, f}, f, 0, -math.Pi/2, steps)
	prof = append(prof, [2]float64{0, 0})
	return revolve(prof, n, nil)
}

// Cap is the geometry of cap.stl: a moulded screw cap of CapColumns*52 =
// 4992 triangles, open at the bottom. Down the outside: the flat top, the
// outer fillet, the ribbed skirt; up the inside: the wall, the inner fillet
// and the roof of the cavity.
func Cap() *Mesh { return CapMesh(CapColumns, 8, true) }

// CapMesh is the cap in columns columns with the outer fillet in steps
// segments (and the inner one in half as many, at least one), ribbed or
// plain: CapMesh(16, 1, false) is a coarse model of the same part.
func CapMesh(columns, steps int, ribbed bool) *Mesh {
	const (
		R, H, f, w, fi = CapRadius, CapHeight, CapFillet, CapWall, CapInFillet
		ri             = R - w // inner radius of the skirt
	)
	prof := [][2]float64{{0, H}, {(R - f) / 3, H}, {2 * (R - f) / 3, H}, {R - f, H}}
	prof = arc(prof, [2]float64{R - f, H - f}, f, math.Pi/2, 0, steps)
	skirtFrom := len(prof) // the ribbed rows start below the fillet
	for _, z := range []float64{0.8, 0.6, 0.4, 0.2, 0} {
		prof = append(prof, [2]float64{R, z * (H - f)})
	}
	skirtTo := len(prof)
	prof = append(prof, [2]float64{ri, 0})
	for _, z := range []float64{0.25, 0.5, 0.75} {
		prof = append(prof, [2]float64{ri, z * (H - w - fi)})
	}
	prof = append(prof, [2]float64{ri, H - w - fi})
	prof = arc(prof, [2]float64{ri - fi, H - w - fi}, fi, 0, math.Pi/2, max(1, steps/2))
	prof = append(prof, [2]float64{(ri - fi) / 2, H - w}, [2]float64{0, H - w})
	rib := func(i, k int) float64 {
		if !ribbed || i < skirtFrom || i >= skirtTo {
			return 0
		}
		if k%4 == 1 || k%4 == 2 { // two columns up, two down: columns/4 ribs
			return CapRibHeight
		}
		return 0
	}
	return revolve(prof, columns, rib)
}
