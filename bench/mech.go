package bench

import (
	"testing"

	"clatter/engine"
	"clatter/shapes"
)

func init() {
	Register(Benchmark{Name: "Chain100", Fn: Chain100})
}

// chainWorld is a chain of n links of 5 cm, each hinged to the next about
// y and the first to the ground, released horizontal so that it swings and
// folds onto itself (contacts between links that are not neighbours).
func chainWorld(b *testing.B, n int) (*engine.World, []engine.JointID) {
	cfg := engine.DefaultConfig()
	cfg.NoSleep = true
	cfg.NoEvents = true
	w, err := engine.NewWorld(cfg)
	if err != nil {
		b.Fatal(err)
	}
	const l = 0.05
	y := shapes.Vec3{0, 1, 0}
	prev := engine.Ground
	var js []engine.JointID
	for i := 0; i < n; i++ {
		id, err := w.AddBody(engine.BodyDef{Name: "link", Shape: shapes.Box{Half: shapes.Vec3{l / 2, 0.005, 0.005}}, Density: 7800,
			Position: shapes.Vec3{l * (float64(i) + 0.5), 0, 0}})
		if err != nil {
			b.Fatal(err)
		}
		j, err := w.AddJoint(engine.JointDef{Kind: engine.Revolute, A: id, B: prev, Anchor: shapes.Vec3{l * float64(i), 0, 0}, Axis: y})
		if err != nil {
			b.Fatal(err)
		}
		js = append(js, j)
		prev = id
	}
	return w, js
}

// Chain100 is one 1 ms step of a swinging chain of 100 hinged links (the
// mechanisms target: under 0.5 ms), 8 velocity iterations, no sleeping;
// it reports the largest joint error at the end, in nm.
func Chain100(b *testing.B) {
	w, js := chainWorld(b, 100)
	for i := 0; i < 200; i++ { // into the swing
		if err := w.Step(1e-3); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if err := w.Step(1e-3); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	worst := 0.0
	for _, j := range js {
		l, _ := w.JointError(j)
		worst = max(worst, l)
	}
	b.ReportMetric(worst*1e9, "nm-joint-error")
}
