package bench

import (
	"testing"

	"clatter/engine"
	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

func init() {
	Register(
		Benchmark{Name: "CartonDropRigid", Fn: CartonDropRigid},
		Benchmark{Name: "CartonDropCushion", Fn: CartonDropCushion, Baseline: "CartonDropRigid"},
	)
}

// CartonDropRigid is one trial of a carton drop: a 12 kg carton of
// 400 x 300 x 250 mm, tilted 20 degrees about two axes so that it lands
// on a corner, dropped 610 mm onto a rigid floor and stepped at 1 ms until
// settled.
func CartonDropRigid(b *testing.B) { cartonDrop(b, 0) }

// CartonDropCushion is CartonDropRigid on a compliant floor of 200 N/mm
// (a cushioned drop, whose contacts are sub-stepped).
func CartonDropCushion(b *testing.B) { cartonDrop(b, 200e3) }

func cartonDrop(b *testing.B, k float64) {
	b.ReportAllocs()
	steps := 0
	for i := 0; i < b.N; i++ {
		cfg := engine.DefaultConfig()
		cfg.NoEvents = true
		w, _ := engine.NewWorld(cfg)
		floor, _ := w.AddMaterial(engine.Material{Name: "floor", Friction: 0.5, Restitution: 0.3, Stiffness: engine.Stiffness{Linear: k}})
		w.AddBody(engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: floor})
		q := mgl64.QuatRotate(0.35, shapes.Vec3{1, 1, 0}.Normalize())
		w.AddBody(engine.BodyDef{Name: "carton", Shape: shapes.Box{Half: shapes.Vec3{0.2, 0.15, 0.125}}, Mass: 12, Material: floor,
			Position: shapes.Vec3{0, 0, 0.61 + 0.3}, Orientation: q})
		for n := 0; n < 5000; n++ {
			if err := w.Step(1e-3); err != nil {
				b.Fatal(err)
			}
			if ok, _ := w.Settled(); ok {
				break
			}
		}
		steps += w.Steps()
	}
	b.ReportMetric(float64(steps)/float64(b.N), "steps/trial")
}
