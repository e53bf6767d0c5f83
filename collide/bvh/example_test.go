package bvh_test

import (
	"fmt"
	"math"

	"clatter/collide/bvh"
	"clatter/shapes"
)

func Example() {
	// A ramp of two triangles rising from z = 0 at x = 0 to z = 1 at x = 2.
	m := &shapes.TriMesh{
		Vertices:  []shapes.Vec3{{0, 0, 0}, {2, 0, 1}, {2, 1, 1}, {0, 1, 0}},
		Triangles: [][3]int32{{0, 1, 2}, {0, 2, 3}},
	}
	t, err := bvh.Build(m)
	if err != nil {
		fmt.Println(err)
		return
	}
	part := shapes.AABB{Min: shapes.Vec3{1.5, 0.8, 0.7}, Max: shapes.Vec3{1.8, 0.9, 0.8}}
	fmt.Println(t.Query(nil, part))

	h, ok := t.Raycast(shapes.Vec3{1, 0.25, 5}, shapes.Vec3{0, 0, -1}, math.Inf(1))
	fmt.Println(ok, h.Triangle, h.T)
	// Output:
	// [0 1]
	// true 0 4.5
}
