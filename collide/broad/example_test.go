package broad_test

import (
	"fmt"
	"math"

	"clatter/collide/broad"
	"clatter/shapes"
)

func Example() {
	box := func(x, z float64) shapes.AABB {
		return shapes.AABB{Min: shapes.Vec3{x, 0, z}, Max: shapes.Vec3{x + 1, 1, z + 1}}
	}
	inf := math.Inf(1)
	floor := shapes.AABB{Min: shapes.Vec3{-inf, -inf, -inf}, Max: shapes.Vec3{inf, inf, 0}}

	s := broad.New()
	s.Insert(0, floor, broad.Static)
	s.Insert(1, box(0, 0), broad.Dynamic)   // resting on the floor
	s.Insert(2, box(0.5, 1), broad.Dynamic) // on top of body 1
	s.Insert(3, box(5, 2), broad.Dynamic)   // in the air, alone
	fmt.Println(s.Pairs(nil))

	// Body 2 is put to sleep on body 1, which still moves; body 3 falls.
	s.SetAsleep(2, true)
	s.Move(3, box(5, 0))
	fmt.Println(s.Pairs(nil))

	// Body 1 sleeps too: the sleeping pair is no longer reported.
	s.SetAsleep(1, true)
	fmt.Println(s.Pairs(nil))
	// Output:
	// [[0 1] [1 2]]
	// [[0 1] [0 3] [1 2]]
	// [[0 3]]
}
