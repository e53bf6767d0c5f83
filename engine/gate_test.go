package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

func TestGateTimesAFall(t *testing.T) {
	// A ball let go at rest falls h in sqrt(2 h / g) (free fall, any
	// mechanics textbook): a horizontal gate h below it counts it once,
	// at that time. Semi-implicit Euler runs ahead of the exact fall by
	// about half a step, and the crossing is interpolated within a step,
	// so fallTimeTol is one step. A gate whose disc misses the ball (its
	// radius ends 10 cm from the ball's path) counts nothing.
	const dt, h = 1e-3, 0.5
	const fallTimeTol = dt
	w := newTestWorld(t, Config{Gravity: shapes.Vec3{0, 0, -g0}, NoSleep: true})
	ball := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000, Position: shapes.Vec3{0, 0, h}})
	for _, g := range []Gate{
		{Name: "below", At: shapes.Vec3{0, 0, 0}, Normal: shapes.Vec3{0, 0, -2}},
		{Name: "aside", At: shapes.Vec3{0.2, 0, 0}, Normal: shapes.Vec3{0, 0, -1}, Radius: 0.1},
		{Name: "up", At: shapes.Vec3{0, 0, 0}, Normal: shapes.Vec3{0, 0, 1}},
	} {
		if _, err := w.AddGate(g); err != nil {
			t.Fatal(err)
		}
	}
	var got []Crossing
	for w.Time() < 0.5 {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		got = append(got, w.Crossings()...)
	}
	want := math.Sqrt(2 * h / g0)
	if len(got) != 1 || got[0].Gate != 0 || got[0].Body != ball || math.Abs(got[0].Time-want) > fallTimeTol || math.Abs(got[0].Position[2]) > 1e-12 {
		t.Fatalf("crossings %+v, want one of gate 0 at %.5f s on the plane", got, want)
	}
}

func TestBadGates(t *testing.T) {
	w := newTestWorld(t, DefaultConfig())
	for _, g := range []Gate{
		{Name: "zero", Normal: shapes.Vec3{}},
		{Name: "nan", Normal: shapes.Vec3{math.NaN(), 0, 1}},
		{Name: "radius", Normal: shapes.Vec3{1, 0, 0}, Radius: -1},
	} {
		if _, err := w.AddGate(g); err == nil {
			t.Errorf("gate %q accepted", g.Name)
		}
	}
}

func TestGatesAllocateNothing(t *testing.T) {
	// Parts sliding through a gate on a floor: once the first crossings
	// have sized the slice, counting them allocates nothing.
	w := newTestWorld(t, Config{Gravity: shapes.Vec3{0, 0, -g0}, NoSleep: true, NoEvents: true})
	mustAdd(t, w, BodyDef{Name: "floor", Kind: Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}})
	for i := 0; i < 8; i++ {
		mustAdd(t, w, BodyDef{Name: "p", Shape: shapes.Box{Half: shapes.Vec3{0.01, 0.01, 0.01}}, Density: 1000,
			Position: shapes.Vec3{-0.02 - 0.05*float64(i), 0.1 * float64(i), 0.01}, Velocity: shapes.Vec3{3, 0, 0}})
	}
	for x := -0.2; x <= 0.2; x += 0.05 {
		if _, err := w.AddGate(Gate{Name: "g", At: shapes.Vec3{x, 0, 0}, Normal: shapes.Vec3{1, 0, 0}}); err != nil {
			t.Fatal(err)
		}
	}
	step := func() {
		if err := w.Step(1e-3); err != nil {
			t.Fatal(err)
		}
		w.Crossings()
	}
	for i := 0; i < 50; i++ {
		step()
	}
	if a := testing.AllocsPerRun(200, step); a != 0 {
		t.Errorf("%g allocations per step", a)
	}
}

func TestGateCountsFromTheFirstStep(t *testing.T) {
	// A ball 0.1 mm before a gate moving at 1 m/s crosses it in the first
	// 1 ms step, at 0.1 ms: counted, though the gate was added just now.
	w := newTestWorld(t, Config{NoSleep: true})
	mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000, Position: shapes.Vec3{-1e-4, 0, 0}, Velocity: shapes.Vec3{1, 0, 0}})
	if _, err := w.AddGate(Gate{Name: "g", Normal: shapes.Vec3{1, 0, 0}}); err != nil {
		t.Fatal(err)
	}
	if err := w.Step(1e-3); err != nil {
		t.Fatal(err)
	}
	// Exact: no gravity, constant velocity; the interpolation is linear.
	if c := w.Crossings(); len(c) != 1 || math.Abs(c[0].Time-1e-4) > 1e-12 {
		t.Errorf("crossings %+v, want one at 1e-4 s", c)
	}
}
