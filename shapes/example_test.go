package shapes_test

import (
	"fmt"
	"math"

	"clatter/shapes"
)

// A hull from a cloud of points: the corners of a 0.1 x 0.2 x 0.3 m block
// and points inside it, which the hull drops. Its mass properties at the
// density of water are the block's: m = rho a b c = 6 kg and
// I_x = m (b^2 + c^2) / 12, I_y = m (a^2 + c^2) / 12, I_z = m (a^2 + b^2) / 12
// (a solid rectangular block, in any dynamics handbook).
func ExampleNewHull() {
	var pts []shapes.Vec3
	for _, x := range []float64{-0.05, 0.05} {
		for _, y := range []float64{-0.1, 0.1} {
			for _, z := range []float64{-0.15, 0.15} {
				pts = append(pts, shapes.Vec3{x, y, z})
			}
		}
	}
	pts = append(pts, shapes.Vec3{0, 0, 0}, shapes.Vec3{0.01, -0.02, 0.1})
	h, err := shapes.NewHull(pts)
	if err != nil {
		fmt.Println(err)
		return
	}
	m := h.Mass(1000) // kg/m^3

	// Rounded to the printed digits; + 0 turns -0 into 0.
	r := func(v float64) float64 { return math.Round(v*1e3)/1e3 + 0 }
	c := m.Center
	fmt.Printf("%d vertices, %d faces, %d edges\n", len(h.Vertices), len(h.Faces), len(h.Edges))
	fmt.Printf("volume %.4f m3, mass %.3f kg, centre (%.3f, %.3f, %.3f) m\n", m.Volume, m.Mass, r(c[0]), r(c[1]), r(c[2]))
	fmt.Printf("inertia diagonal %.4f %.4f %.4f kg m2\n", m.Inertia.At(0, 0), m.Inertia.At(1, 1), m.Inertia.At(2, 2))
	// Output:
	// 8 vertices, 6 faces, 12 edges
	// volume 0.0060 m3, mass 6.000 kg, centre (0.000, 0.000, 0.000) m
	// inertia diagonal 0.0650 0.0500 0.0250 kg m2
}
