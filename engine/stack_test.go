package engine

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// maxStackDrift is the requirement for stacks: every box within 1 mm of
// where it started after 10 s.
const maxStackDrift = 1e-3

// standStack runs boxes set on the floor for 10 s and checks drift and sleep.
func standStack(t *testing.T, name string, starts []shapes.Vec3, half float64) {
	t.Helper()
	w, mat := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.6})
	ids := make([]BodyID, len(starts))
	for i, p := range starts {
		ids[i] = mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{half, half, half}}, Density: 500, Material: mat, Position: p})
	}
	run(t, w, 1e-3, 10, nil)
	for i, id := range ids {
		if d := w.Position(id).Sub(starts[i]).Len(); d > maxStackDrift {
			t.Errorf("%s: box %d drifted %.3g m", name, i, d)
		}
		if w.Awake(id) {
			t.Errorf("%s: box %d still awake after 10 s", name, i)
		}
	}
	if ok, _ := w.Settled(); !ok {
		t.Errorf("%s: never settled", name)
	}
}

func TestTowerStands(t *testing.T) {
	// A tower of 10 boxes of 10 cm stands (statics: each box rests fully on
	// the one below) for 10 s, drifts under 1 mm and falls asleep.
	const h = 0.05
	var starts []shapes.Vec3
	for i := 0; i < 10; i++ {
		starts = append(starts, shapes.Vec3{0, 0, h + 2*h*float64(i)})
	}
	standStack(t, "tower", starts, h)
}

func TestPyramidStands(t *testing.T) {
	// A 10-row pyramid of 10 cm boxes, each row offset by half a box (the
	// statics of a masonry pyramid: every box's weight falls inside its
	// supports), stands for 10 s, drifts under 1 mm and falls asleep.
	const h = 0.05
	var starts []shapes.Vec3
	for row := 0; row < 10; row++ {
		n := 10 - row
		for i := 0; i < n; i++ {
			x := (float64(i) - float64(n-1)/2) * 2 * h * 1.01
			starts = append(starts, shapes.Vec3{x, 0, h + 2*h*float64(row)})
		}
	}
	standStack(t, "pyramid", starts, h)
}

func TestEnergyNeverGrows(t *testing.T) {
	// In undriven scenes with e <= 1 the total (kinetic plus potential)
	// energy never rises: contact impulses with e <= 1 dissipate, friction
	// dissipates, and position correction by pseudo-velocities adds no
	// kinetic energy. 0.5 percent of the start: the requirement, for the
	// potential energy added when penetration is pushed out.
	const tol = 0.005
	rng := rand.New(rand.NewPCG(21, 22))
	w, mat := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.5, Restitution: 0.5})
	// A bin of four walls around the floor.
	for _, n := range []shapes.Vec3{{1, 0, 0}, {-1, 0, 0}, {0, 1, 0}, {0, -1, 0}} {
		mustAdd(t, w, BodyDef{Name: "wall", Kind: Static, Shape: shapes.Plane{Normal: n}, Material: mat, Position: n.Mul(-0.25)})
	}
	// 100 parts in four layers (200 with CLATTER_LONG): enough to fill the
	// bin's floor and pile up, at half the cost.
	parts := 100
	if longRuns {
		parts = 200
	}
	for i := 0; i < parts; i++ {
		pos := shapes.Vec3{-0.2 + 0.1*float64(i%5), -0.2 + 0.1*float64((i/5)%5), 0.05 + 0.1*float64(i/25)}
		q := mgl64.QuatRotate(rng.Float64()*math.Pi, shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize())
		var s shapes.Shape
		switch i % 4 {
		case 0:
			s = shapes.Box{Half: shapes.Vec3{0.03, 0.02, 0.015}}
		case 1:
			s = shapes.Sphere{Radius: 0.025}
		case 2:
			s = shapes.Cylinder{Radius: 0.02, HalfLength: 0.02}
		default:
			s = randomHull(t, rng, 20, shapes.Vec3{0.03, 0.03, 0.02})
		}
		mustAdd(t, w, BodyDef{Name: "part", Shape: s, Density: 1000, Material: mat, Position: pos, Orientation: q})
	}
	e0 := w.Energy()
	// The floor is at z = 0, so e0 is the potential energy above it.
	scale := e0
	worst := math.Inf(-1)
	run(t, w, 1e-3, 2, func() {
		worst = math.Max(worst, w.Energy()-e0)
	})
	if worst > tol*scale {
		t.Fatalf("energy rose %.4g J above its start (%.4g J available)", worst, scale)
	}
}
