package mesh_test

import (
	"fmt"
	"path/filepath"

	"clatter/shapes/mesh"
)

// A part from an STL file in millimetres: its mass properties in SI units,
// and the warnings to show the user.
func ExampleLoadPart() {
	p, err := mesh.LoadPart(filepath.Join("..", "..", "testdata", "parts", "bracket.stl"), mesh.Millimetre)
	if err != nil {
		fmt.Println(err)
		return
	}
	// The base (4000 mm3 centred at x 20, z 2.5) and the upright (3000 mm3 at
	// x 2.5, z 20) put the centre of mass at x = 12.5, z = 10.
	m := p.Mass(1050) // kg/m^3
	fmt.Printf("solid %v, %d triangles, hull of %d faces\n", p.Solid, len(p.Mesh.Triangles), len(p.Hull.Faces))
	fmt.Printf("volume %.1f cm3, mass %.2f g\n", m.Volume*1e6, m.Mass*1e3)
	fmt.Printf("centre of mass (%.2f, %.2f, %.2f) mm\n", m.Center[0]*1e3, m.Center[1]*1e3, m.Center[2]*1e3)
	fmt.Println("warnings:", len(p.Warnings))
	// Output:
	// solid true, 20 triangles, hull of 7 faces
	// volume 7.0 cm3, mass 7.35 g
	// centre of mass (12.50, 10.00, 10.00) mm
	// warnings: 0
}

// An open mesh still makes a part, with the hull's mass properties and a
// warning that says why.
func ExampleNewPart_open() {
	m, err := mesh.LoadSTL(filepath.Join("..", "..", "testdata", "broken", "open.stl"), mesh.Millimetre)
	if err != nil {
		fmt.Println(err)
		return
	}
	m.Name = "open.stl"
	p, err := mesh.NewPart(m)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(p.Solid)
	fmt.Println(p.Warnings[0])
	// Output:
	// false
	// open.stl: mesh is open (4 boundary edges); mass properties taken from its convex hull
}
