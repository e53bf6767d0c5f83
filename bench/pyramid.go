package bench

import (
	"testing"

	"clatter/engine"
	"clatter/shapes"
)

func init() {
	Register(Benchmark{Name: "PyramidAwake", Fn: PyramidAwake})
}

// PyramidAwake is one 1 ms step of a pyramid of ten rows of 10 cm boxes
// (55 boxes, each on the two below it, gaps of a millimetre between
// neighbours) kept awake on a floor: one island of some 220 points whose
// loads the contact solver's banded direct solve holds (contact/band.go).
// It is set down, stepped 0.2 s untimed, and each op is then one more step
// of the standing pyramid, whose warm start already holds it.
func PyramidAwake(b *testing.B) {
	const rows, half, gap = 10, 0.05, 0.01
	cfg := engine.DefaultConfig()
	cfg.NoEvents, cfg.NoSleep = true, true
	w := &engine.World{}
	if err := w.Reset(cfg); err != nil {
		b.Fatal(err)
	}
	mat, _ := w.AddMaterial(engine.Material{Name: "wood", Friction: 0.6})
	w.AddBody(engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat})
	box := shapes.Box{Half: shapes.Vec3{half, half, half}}
	for row := 0; row < rows; row++ {
		n := rows - row
		for i := 0; i < n; i++ {
			x := (float64(i) - float64(n-1)/2) * 2 * half * (1 + gap)
			p := shapes.Vec3{x, 0, half * float64(2*row+1)}
			if _, err := w.AddBody(engine.BodyDef{Name: "box", Shape: box, Density: 500, Material: mat, Position: p}); err != nil {
				b.Fatal(err)
			}
		}
	}
	for i := 0; i < 200; i++ {
		if err := w.Step(1e-3); err != nil {
			b.Fatal(err)
		}
	}
	stepTimed(b, w, 1e-3)
}
