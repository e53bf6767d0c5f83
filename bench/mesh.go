package bench

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/engine"
	"clatter/shapes"
	"clatter/shapes/mesh"
	"clatter/testdata/gen/partgen"

	"github.com/go-gl/mathgl/mgl64"
)

func init() {
	Register(Benchmark{Name: "DropTrialMesh", Fn: DropTrialMesh, Baseline: "DropTrial"})
}

// capPart is the moulded cap of cap.stl (4992 triangles), built from its
// exact geometry in metres, with the mass properties of its solid.
func capPart(b *testing.B) *mesh.Part {
	g := partgen.Cap()
	m := &mesh.Mesh{Name: "cap"}
	for _, p := range g.V {
		m.Vertices = append(m.Vertices, shapes.Vec3{p[0], p[1], p[2]}.Mul(1e-3))
	}
	for _, t := range g.T {
		m.Triangles = append(m.Triangles, [3]int32{int32(t[0]), int32(t[1]), int32(t[2])})
	}
	p, err := mesh.NewPart(m)
	if err != nil {
		b.Fatal(err)
	}
	return p
}

// DropTrialMesh is one trial of a drop study of a real part: the moulded
// cap of about 5000 triangles dropped 0.1 m onto a tray (a static box) at a
// seeded random orientation and stepped at 1 ms until settled (at most 5 s).
// It reports the steps per trial beside the time.
func DropTrialMesh(b *testing.B) {
	part := capPart(b)
	props := part.Mass(900)
	rng := rand.New(rand.NewPCG(7, 7))
	b.ReportAllocs()
	b.ResetTimer()
	var cpu cpuClock // cputime.go
	cpu.start()
	defer func() { cpu.stop(); cpu.report(b) }()
	steps := 0
	for i := 0; i < b.N; i++ {
		cfg := engine.DefaultConfig()
		cfg.NoEvents = true
		w, _ := engine.NewWorld(cfg)
		mat, _ := w.AddMaterial(engine.Material{Name: "polypropylene", Friction: 0.4, Restitution: 0.3})
		w.AddBody(engine.BodyDef{Name: "tray", Kind: engine.Static, Shape: shapes.Box{Half: shapes.Vec3{0.15, 0.15, 0.005}}, Material: mat, Position: shapes.Vec3{0, 0, -0.005}})
		q := mgl64.QuatRotate(rng.Float64()*2*math.Pi, shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize())
		w.AddBody(engine.BodyDef{Name: "cap", Shape: part.Hull, Props: &props, Material: mat, Position: shapes.Vec3{0, 0, 0.1}, Orientation: q})
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
