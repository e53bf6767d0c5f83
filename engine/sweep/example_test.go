package sweep_test

import (
	"context"
	"fmt"
	"log"
	"os"

	"clatter/engine/scene"
	"clatter/engine/sweep"
)

// A 10 x 20 x 40 mm box let go flat, its largest face down, 2 mm above a
// floor, with its position jittered from trial to trial: a box that lands
// flat from so small a height stays on the face it fell on.
const flatDrop = `units = { length = "mm", mass = "g" }
[world]
step = 0.001
duration = 1.0
rest_time = 0.1
[material.abs]
friction = 0.4
restitution = 0.3
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "abs"
[[body]]
name = "box"
shape = { box = [40, 20, 10] }
material = "abs"
density = "1.05 g/cm3"
position = [0, 0, 7]
[sweep]
trials = 6
seed = 1
group_faces = true
[sweep.randomize]
position = { box = [5, 5, 0] }
`

// Example runs a small study on one worker into a temporary folder,
// finishes it, and prints how many trials ran and the fraction of them that
// came to rest on each pair of opposite faces (group_faces): every trial
// rests on face 4, the pair of 40 x 20 mm faces, which also has the largest
// quasi-static probability (it subtends the largest solid angle from the
// centre of mass).
func Example() {
	st, err := sweep.New([]byte(flatDrop), "flat.toml", scene.Options{})
	if err != nil {
		log.Fatal(err)
	}
	dir, err := os.MkdirTemp("", "sweep-example")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	info, err := st.Run(context.Background(), sweep.Options{Dir: dir, Workers: 1, Version: "example"})
	if err != nil {
		log.Fatal(err)
	}
	res, err := sweep.Finish(dir)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("trials run: %d, settled: %d\n", info.Ran, res.Settled)
	for _, r := range res.Rows {
		fmt.Printf("face %d: %d of %d (%.2f), quasi-static %.2f\n", r.Face, r.Count, r.Trials, r.Fraction, r.QuasiStatic)
	}
	// Output:
	// trials run: 6, settled: 6
	// face 0: 0 of 6 (0.00), quasi-static 0.07
	// face 2: 0 of 6 (0.00), quasi-static 0.26
	// face 4: 6 of 6 (1.00), quasi-static 0.67
}
