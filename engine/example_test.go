package engine_test

import (
	"fmt"
	"math"

	"clatter/engine"
	"clatter/shapes"
)

// A steel ball of radius 5 cm dropped from 1 m onto a floor with a
// coefficient of restitution of 0.5. It strikes at sqrt(2 g h) = 4.43 m/s
// after sqrt(2 h / g) = 0.45 s and rebounds to e^2 h = 0.25 m (Newton's law
// of restitution, in any dynamics text); then it bounces lower and lower
// and comes to rest.
func Example() {
	w, err := engine.NewWorld(engine.DefaultConfig()) // standard gravity along -z
	if err != nil {
		fmt.Println(err)
		return
	}
	steel, err := w.AddMaterial(engine.Material{Name: "steel", Friction: 0.3, Restitution: 0.5})
	if err != nil {
		fmt.Println(err)
		return
	}
	const r, h = 0.05, 1.0
	if _, err := w.AddBody(engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: steel}); err != nil {
		fmt.Println(err)
		return
	}
	ball, err := w.AddBody(engine.BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: 7800, Material: steel, Position: shapes.Vec3{0, 0, r + h}})
	if err != nil {
		fmt.Println(err)
		return
	}

	const dt = 0.5e-3 // s
	impacts, apex := 0, 0.0
	for w.Time() < 5 {
		if err := w.Step(dt); err != nil {
			fmt.Println(err)
			return
		}
		for _, e := range w.Events() {
			if e.Kind == engine.Impact {
				impacts++
				if impacts == 1 {
					fmt.Printf("first impact at %.2f s at %.1f m/s\n", e.Time, e.Speed)
				}
			}
		}
		if impacts == 1 {
			apex = math.Max(apex, w.Position(ball)[2]-r)
		}
		if settled, _ := w.Settled(); settled {
			break
		}
	}
	settled, _ := w.Settled()
	fmt.Printf("rebound to %.2f m\n", apex)
	fmt.Printf("settled %v, resting on the floor at z = %.3f m\n", settled, w.Position(ball)[2])
	// Output:
	// first impact at 0.45 s at 4.4 m/s
	// rebound to 0.25 m
	// settled true, resting on the floor at z = 0.050 m
}
