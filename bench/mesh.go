package bench

import (
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
// seeded random orientation and stepped at 1 ms until settled (at most 5 s),
// run as DropTrial runs its trials (one world, reset between them).
func DropTrialMesh(b *testing.B) {
	part := capPart(b)
	props := part.Mass(900)
	rng := rand.New(rand.NewPCG(7, 7))
	dropTrials(b, rng, func(w *engine.World, q mgl64.Quat) {
		mat, _ := w.AddMaterial(engine.Material{Name: "polypropylene", Friction: 0.4, Restitution: 0.3})
		w.AddBody(engine.BodyDef{Name: "tray", Kind: engine.Static, Shape: shapes.Box{Half: shapes.Vec3{0.15, 0.15, 0.005}}, Material: mat, Position: shapes.Vec3{0, 0, -0.005}})
		w.AddBody(engine.BodyDef{Name: "cap", Shape: part.Hull, Props: &props, Material: mat, Position: shapes.Vec3{0, 0, 0.1}, Orientation: q})
	})
}
