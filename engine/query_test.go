package engine

import (
	"testing"

	"clatter/shapes"
)

func TestTouching(t *testing.T) {
	// Geometry decides: a 20 mm cube standing on the floor (its centre at
	// its half height) and a second cube standing on it touch; a ball
	// 0.5 m above the floor touches nothing. Sleeping is off, so the pairs
	// are examined every step, with and without events.
	for _, noEvents := range []bool{false, true} {
		cfg := DefaultConfig()
		cfg.NoSleep = true
		cfg.NoEvents = noEvents
		w, err := NewWorld(cfg)
		if err != nil {
			t.Fatal(err)
		}
		add := func(d BodyDef) BodyID {
			id, err := w.AddBody(d)
			if err != nil {
				t.Fatal(err)
			}
			return id
		}
		floor := add(BodyDef{Name: "floor", Kind: Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}})
		cube := shapes.Box{Half: shapes.Vec3{0.01, 0.01, 0.01}}
		low := add(BodyDef{Name: "low", Shape: cube, Density: 1000, Position: shapes.Vec3{0, 0, 0.01}})
		high := add(BodyDef{Name: "high", Shape: cube, Density: 1000, Position: shapes.Vec3{0, 0, 0.03}})
		ball := add(BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000, Position: shapes.Vec3{1, 0, 0.5}})
		for i := 0; i < 20; i++ {
			if err := w.Step(1e-3); err != nil {
				t.Fatal(err)
			}
		}
		for _, c := range []struct {
			id   BodyID
			want bool
		}{{floor, true}, {low, true}, {high, true}, {ball, false}} {
			if got := w.Touching(c.id); got != c.want {
				t.Errorf("events off %v: %s touching %v, want %v", noEvents, w.Name(c.id), got, c.want)
			}
		}
	}
}
