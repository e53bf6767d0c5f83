package resting_test

import (
	"fmt"
	"math"

	"clatter/shapes"
	"clatter/shapes/resting"
)

// A block 100 x 60 x 40 mm, in metres, with its centre of mass at the centre.
func ExampleOfShape() {
	block := shapes.Box{Half: shapes.Vec3{0.05, 0.03, 0.02}}
	faces, err := resting.OfShape(block, shapes.Vec3{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, f := range faces {
		fmt.Printf("face %d %+v: p = %.4f, tips at %.1f deg\n", i, f.Normal, f.Probability, f.TipAngleRad*180/math.Pi)
	}
	// Lying on the -z face, gravity points along -z in the part's frame.
	fmt.Println("resting on face", resting.FaceDown(faces, shapes.Vec3{0, 0, -9.80665}))
	// Output:
	// face 0 [1 0 0]: p = 0.0612, tips at 21.8 deg
	// face 1 [-1 0 0]: p = 0.0612, tips at 21.8 deg
	// face 2 [0 1 0]: p = 0.1578, tips at 33.7 deg
	// face 3 [0 -1 0]: p = 0.1578, tips at 33.7 deg
	// face 4 [0 0 1]: p = 0.2810, tips at 56.3 deg
	// face 5 [0 0 -1]: p = 0.2810, tips at 56.3 deg
	// resting on face 5
}
