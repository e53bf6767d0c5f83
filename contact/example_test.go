package contact_test

import (
	"fmt"

	"clatter/contact"
	"clatter/shapes"
)

// A ball of 1 kg and radius 0.1 m falls onto a static floor at 2 m/s with
// restitution 0.5: one step of the solve.
func Example() {
	i := 2.0 / 5 * 1 * 0.1 * 0.1 // solid sphere, 2 m r^2 / 5
	bodies := []contact.Body{
		{Position: shapes.Vec3{0, 0, -1}}, // static floor: zero inverse mass and inertia
		{
			InvMass:    1,
			InvInertia: shapes.Mat3{1 / i, 0, 0, 0, 1 / i, 0, 0, 0, 1 / i},
			Position:   shapes.Vec3{0, 0, 0.1},
			V:          shapes.Vec3{0, 0, -2},
		},
	}
	points := []contact.Point{{
		A: 0, B: 1,
		Position: shapes.Vec3{0, 0, 0}, Normal: shapes.Vec3{0, 0, 1},
		Friction: 0.4, Restitution: 0.5,
		Key: 1, // stable while the same features touch
	}}
	solver := contact.NewSolver(contact.DefaultSettings())

	// Each step: forces into V and W, narrow phase into points, then:
	const dt = 1e-3
	rep, err := solver.Solve(dt, bodies, points, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	// ... then integrate positions with V+Vp and W+Wp and drop Vp, Wp.
	fmt.Printf("rebound %.2f m/s after an impact at %.2f m/s (%d impact)\n",
		bodies[1].V[2], points[0].ImpactSpeed, rep.Impacts)
	// Output: rebound 1.00 m/s after an impact at 2.00 m/s (1 impact)
}
