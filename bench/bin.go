package bench

import (
	"testing"

	"clatter/engine"
	"clatter/shapes"
)

// binWorld returns the world of the pile and pour benchmarks: sleeping and
// events off, 8 velocity iterations, one material (its index is mat), a
// floor at z = 0 and four walls at x = +-hx and y = +-hy; add adds a body
// or stops the benchmark.
func binWorld(b testing.TB, hx, hy float64) (w *engine.World, mat int, add func(engine.BodyDef)) {
	cfg := engine.DefaultConfig()
	cfg.NoSleep = true
	cfg.NoEvents = true
	cfg.VelocityIterations = 8
	w, err := engine.NewWorld(cfg)
	if err != nil {
		b.Fatal(err)
	}
	mat, _ = w.AddMaterial(engine.Material{Name: "abs", Friction: 0.4, Restitution: 0.3})
	add = func(d engine.BodyDef) {
		if _, err := w.AddBody(d); err != nil {
			b.Fatal(err)
		}
	}
	add(engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat})
	for _, wall := range []struct {
		n shapes.Vec3
		h float64
	}{{shapes.Vec3{1, 0, 0}, hx}, {shapes.Vec3{-1, 0, 0}, hx}, {shapes.Vec3{0, 1, 0}, hy}, {shapes.Vec3{0, -1, 0}, hy}} {
		add(engine.BodyDef{Name: "wall", Kind: engine.Static, Shape: shapes.Plane{Normal: wall.n}, Material: mat, Position: wall.n.Mul(-wall.h)})
	}
	return w, mat, add
}

// mixedPart is part i of a pile or a pour: a box, a cylinder and one of
// the hulls in turn.
func mixedPart(i int, hulls []*shapes.Hull) shapes.Shape {
	switch i % 3 {
	case 0:
		return shapes.Box{Half: shapes.Vec3{0.015, 0.01, 0.008}}
	case 1:
		return shapes.Cylinder{Radius: 0.01, HalfLength: 0.012}
	}
	return hulls[i%len(hulls)]
}
