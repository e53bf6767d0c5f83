package scene_test

import (
	"fmt"
	"log"

	"clatter/engine/scene"
)

// A block slides to a stop on a level floor. Coulomb friction stops it
// after v0^2 / (2 mu g) = 1.5^2 / (2 * 0.3 * 9.80665) = 382 mm (any
// dynamics text); the example prints the distance to the millimetre.
func Example() {
	const file = `
units = { length = "mm", mass = "g" }

[world]
step = 0.001

[material.steel]
friction = 0.3

[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "steel"

[[body]]
name = "block"
shape = { box = [40, 40, 20] }
material = "steel"
density = "7.8 g/cm3"
position = [0, 0, 10]
velocity = ["1.5 m/s", 0, 0]
`
	s, err := scene.Parse([]byte(file), "slide.toml", scene.Options{})
	if err != nil {
		log.Fatal(err)
	}
	w, ids, err := s.Build()
	if err != nil {
		log.Fatal(err)
	}
	block := ids[s.BodyIndex("block")]
	for w.Time() < 1 {
		if err := w.Step(s.World.Step); err != nil {
			log.Fatal(err)
		}
	}
	x := s.Units.FromSI(w.Position(block)[0], scene.Length)
	fmt.Printf("the block slid %.0f %s\n", x, s.Units.Length)
	// Output: the block slid 382 mm
}
