package collide_test

import (
	"fmt"
	"math"
	"sort"

	"clatter/collide"
	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// A 0.2 m cube resting 1 mm deep in a floor (the half-space z <= 0): one
// manifold with the normal from the floor toward the cube and a point at
// each corner of the cube's bottom face, each 1 mm deep and midway between
// the two surfaces.
func ExampleDetector_Collide() {
	floor := shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}
	cube := shapes.Box{Half: shapes.Vec3{0.1, 0.1, 0.1}}
	atOrigin := shapes.Pose{Orientation: mgl64.QuatIdent()}
	onFloor := shapes.Pose{Position: shapes.Vec3{0, 0, 0.099}, Orientation: mgl64.QuatIdent()}

	d := collide.NewDetector()
	ms := d.Collide(nil, floor, atOrigin, cube, onFloor, 0)
	r := func(v float64) float64 { return math.Round(v*1e4)/1e4 + 0 } // + 0: no "-0"
	for _, m := range ms {
		fmt.Printf("normal (%g, %g, %g), %d points\n", r(m.Normal[0]), r(m.Normal[1]), r(m.Normal[2]), m.Count)
		var lines []string
		for _, p := range m.Points[:m.Count] {
			lines = append(lines, fmt.Sprintf("(%g, %g, %g) separation %g m", r(p.Position[0]), r(p.Position[1]), r(p.Position[2]), r(p.Separation)))
		}
		sort.Strings(lines) // the order of the points is the detector's own
		for _, l := range lines {
			fmt.Println(l)
		}
	}
	// Output:
	// normal (0, 0, 1), 4 points
	// (-0.1, -0.1, -0.0005) separation -0.001 m
	// (-0.1, 0.1, -0.0005) separation -0.001 m
	// (0.1, -0.1, -0.0005) separation -0.001 m
	// (0.1, 0.1, -0.0005) separation -0.001 m
}
