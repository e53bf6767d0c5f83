package bench

import (
	"testing"

	"clatter/engine"
	"clatter/shapes"
)

func init() {
	Register(Benchmark{Name: "Sleep1000", Fn: Sleep1000})
}

// Sleep1000 is one 1 ms step of a world where 1000 boxes rest asleep in 200
// stacks of five on a floor while one part falls beside them: the step's
// cost should follow the one awake body, not the sleeping thousand.
func Sleep1000(b *testing.B) {
	w, part := sleepWorld(b)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if i%400 == 0 {
			// Lift the falling part back up before it lands, so it never rests.
			w.SetPose(part, shapes.Vec3{2, 0, 2}, shapes.Quat{W: 1})
			w.SetVelocity(part, shapes.Vec3{}, shapes.Vec3{0, 0, 3})
		}
		if err := w.Step(1e-3); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	for id := 0; id < w.NumBodies(); id++ {
		if engine.BodyID(id) != part && w.KindOf(engine.BodyID(id)) == engine.Dynamic && w.Awake(engine.BodyID(id)) {
			b.Fatalf("body %d woke up: the benchmark no longer measures a sleeping world", id)
		}
	}
}

// sleepWorld builds the stacks, steps until they all sleep, and adds the
// falling part.
func sleepWorld(b *testing.B) (*engine.World, engine.BodyID) {
	cfg := engine.DefaultConfig()
	cfg.NoEvents = true
	w, err := engine.NewWorld(cfg)
	if err != nil {
		b.Fatal(err)
	}
	add := func(d engine.BodyDef) engine.BodyID {
		id, err := w.AddBody(d)
		if err != nil {
			b.Fatal(err)
		}
		return id
	}
	add(engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}})
	const half = 0.01
	box := shapes.Box{Half: shapes.Vec3{half, half, half}}
	for i := 0; i < 200; i++ {
		x, y := 0.05*float64(i%20), 0.05*float64(i/20)
		for k := 0; k < 5; k++ {
			add(engine.BodyDef{Name: "box", Shape: box, Density: 1000, Position: shapes.Vec3{x, y, half * float64(2*k+1)}})
		}
	}
	for n := 0; ; n++ {
		if n == 5000 {
			b.Fatal("the stacks did not fall asleep in 5 s")
		}
		if err := w.Step(1e-3); err != nil {
			b.Fatal(err)
		}
		if asleep(w) {
			break
		}
	}
	part := add(engine.BodyDef{Name: "part", Shape: box, Density: 1000, Position: shapes.Vec3{2, 0, 2}})
	// A few steps grow the buffers that the new body needs.
	for n := 0; n < 5; n++ {
		if err := w.Step(1e-3); err != nil {
			b.Fatal(err)
		}
	}
	return w, part
}

// asleep reports whether every dynamic body sleeps.
func asleep(w *engine.World) bool {
	for id := 0; id < w.NumBodies(); id++ {
		if w.KindOf(engine.BodyID(id)) == engine.Dynamic && w.Awake(engine.BodyID(id)) {
			return false
		}
	}
	return true
}
