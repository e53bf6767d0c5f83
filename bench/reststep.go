package bench

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/engine"
	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

func init() {
	Register(Benchmark{Name: "RestStep", Fn: RestStep})
}

// RestStep is one step of DropTrial's part lying still on its floor: the
// steps a drop trial spends while its rest timer runs out (a quarter of
// them). The part is dropped as in DropTrial, at the first orientation
// DropTrial draws, and stepped with sleeping off until settled; each op is
// then one more step of the resting part, with its manifold refreshed and
// a warm start that already solves it. Measured per step, the fixed cost
// of a step that a trial of some nine hundred steps averages away shows up
// on its own.
func RestStep(b *testing.B) {
	rng := rand.New(rand.NewPCG(7, 7))
	part := randomPart(rng, 40)
	props := part.Mass(1050)
	q := mgl64.QuatRotate(rng.Float64()*2*math.Pi, shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize())
	cfg := engine.DefaultConfig()
	cfg.NoEvents, cfg.NoSleep = true, true
	w := &engine.World{}
	if err := w.Reset(cfg); err != nil {
		b.Fatal(err)
	}
	mat, _ := w.AddMaterial(engine.Material{Name: "abs", Friction: 0.4, Restitution: 0.3})
	w.AddBody(engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat})
	w.AddBody(engine.BodyDef{Name: "part", Shape: part, Props: &props, Material: mat, Position: shapes.Vec3{0, 0, 0.2}, Orientation: q})
	for n := 0; ; n++ {
		if ok, _ := w.Settled(); ok {
			break
		}
		if n == 5000 {
			b.Fatal("the part did not settle in 5 s")
		}
		if err := w.Step(1e-3); err != nil {
			b.Fatal(err)
		}
	}
	stepTimed(b, w, 1e-3)
}
