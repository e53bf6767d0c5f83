package engine_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/engine"
	"clatter/shapes"
	"clatter/shapes/mesh"
	"clatter/shapes/resting"
	"clatter/testdata/gen/partgen"

	"github.com/go-gl/mathgl/mgl64"
)

// Finely tessellated parts on a floor: they must neither sink (the lowest
// point of a hull found exactly) nor rock for ever between the faces of a
// fine rim.

// fineMeshPart makes a part of a generated mesh in millimetres, with the
// mass properties of its solid.
func fineMeshPart(t *testing.T, name string, g *partgen.Mesh) *mesh.Part {
	t.Helper()
	m := &mesh.Mesh{Name: name}
	for _, p := range g.V {
		m.Vertices = append(m.Vertices, shapes.Vec3{p[0], p[1], p[2]}.Mul(1e-3))
	}
	for _, tr := range g.T {
		m.Triangles = append(m.Triangles, [3]int32{int32(tr[0]), int32(tr[1]), int32(tr[2])})
	}
	p, err := mesh.NewPart(m)
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Warnings) > 0 || !p.Solid {
		t.Fatalf("%s: %v", name, p.Warnings)
	}
	return p
}

// lowestZ is the height of the lowest hull vertex of body id, by a scan
// over all of them: the reference the support search must match.
func lowestZ(w *engine.World, id engine.BodyID, h *shapes.Hull) float64 {
	pose := w.ShapePose(id)
	low := math.Inf(1)
	for _, v := range h.Vertices {
		low = math.Min(low, pose.Apply(v)[2])
	}
	return low
}

func TestFineMeshDoesNotSink(t *testing.T) {
	sphere := fineMeshPart(t, "UV sphere 100 x 100", partgen.UVSphere(100, 100, 10))
	cyl := fineMeshPart(t, "filleted cylinder", partgen.FilletCylinder(128, 10, 30, 2, 12))
	tilted := mgl64.QuatRotate(0.3, shapes.Vec3{1, 1, 0}.Normalize())
	// The tilted sphere sank 17 to 19 mm when the climb stopped at a dead
	// end of the merged polar faces; the cylinder on its end sank 0.2 to
	// 1.9 mm while rocking between its end face and the fillet beside it.
	cases := []struct {
		name string
		part *mesh.Part
		q    shapes.Quat
	}{
		{"UV sphere", sphere, mgl64.QuatIdent()},
		{"UV sphere tilted", sphere, tilted},
		{"cylinder on its end", cyl, mgl64.QuatIdent()},
		// On its side it rocked end over end and sank 9.7 mm at 1/60 s
		// (0.26 mm at 1 ms): the contact points kept the far end's
		// neighbouring facets, not its lowest vertex.
		{"cylinder on its side", cyl, mgl64.QuatRotate(math.Pi/2, shapes.Vec3{1, 0, 0})},
	}
	const run = 3.0 // s: several seconds of rest, rolling or rocking
	for _, c := range cases {
		for _, dt := range []float64{1.0 / 60, 1e-3} {
			cfg := engine.DefaultConfig()
			cfg.NoSleep = true // keep stepping the resting body
			w, err := engine.NewWorld(cfg)
			if err != nil {
				t.Fatal(err)
			}
			mat, _ := w.AddMaterial(engine.Material{Name: "steel", Friction: 0.5, Restitution: 0})
			if _, err := w.AddBody(engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat}); err != nil {
				t.Fatal(err)
			}
			props := c.part.Mass(7850)
			id, err := w.AddBody(engine.BodyDef{Name: "part", Shape: c.part.Hull, Props: &props, Material: mat, Orientation: c.q})
			if err != nil {
				t.Fatal(err)
			}
			// Place the lowest point on the floor.
			w.SetPose(id, w.Position(id).Sub(shapes.Vec3{0, 0, lowestZ(w, id, c.part.Hull)}), w.Orientation(id))
			sink := 0.0
			for w.Time() < run {
				if err := w.Step(dt); err != nil {
					t.Fatalf("%s, dt %.4g: %v", c.name, dt, err)
				}
				sink = math.Max(sink, -lowestZ(w, id, c.part.Hull))
			}
			// The slop is the penetration the solver leaves alone on
			// purpose; anything deeper is the floor losing the part.
			if sink > w.Config().Slop {
				t.Errorf("%s, dt %.4g s: sank %.3g mm, more than the slop %.3g mm", c.name, dt, sink*1e3, w.Config().Slop*1e3)
			}
		}
	}
}

// capSettleTime is the time, s, within which every drop of the moulded cap
// must come to rest: a 0.1 m drop takes 0.14 s and the coarse model of the
// cap settles within about 0.7 s; a part that rocks for ever never does.
const capSettleTime = 1.5

// capSettleRatio bounds the fine cap's longest settling time against the
// coarse model's over the same drops: tessellation should not change how
// long a part rattles by more than the drops' scatter (a factor under 2).
const capSettleRatio = 2.0

// dropCap drops part from 0.1 m at orientation q onto a floor plane or a
// tray (a static box), steps at 1 ms and returns when it settled (or +Inf)
// and the face it rests on, by the quasi-static analysis's numbering.
func dropCap(t *testing.T, part *mesh.Part, faces []resting.Face, q shapes.Quat, tray bool) (float64, int) {
	t.Helper()
	cfg := engine.DefaultConfig()
	cfg.NoEvents = true
	w, err := engine.NewWorld(cfg)
	if err != nil {
		t.Fatal(err)
	}
	mat, _ := w.AddMaterial(engine.Material{Name: "polypropylene", Friction: 0.4, Restitution: 0.3})
	floor := engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat}
	if tray {
		floor = engine.BodyDef{Name: "tray", Kind: engine.Static, Shape: shapes.Box{Half: shapes.Vec3{0.15, 0.15, 0.005}}, Material: mat, Position: shapes.Vec3{0, 0, -0.005}}
	}
	if _, err := w.AddBody(floor); err != nil {
		t.Fatal(err)
	}
	props := part.Mass(900)
	id, err := w.AddBody(engine.BodyDef{Name: "cap", Shape: part.Hull, Props: &props, Material: mat, Position: shapes.Vec3{0, 0, 0.1}, Orientation: q})
	if err != nil {
		t.Fatal(err)
	}
	for w.Time() < 2*capSettleTime {
		if err := w.Step(1e-3); err != nil {
			t.Fatal(err)
		}
		if ok, _ := w.Settled(); ok {
			break
		}
	}
	ok, at := w.Settled()
	if !ok {
		at = math.Inf(1)
	}
	down := w.ShapePose(id).Orientation.Conjugate().Rotate(shapes.Vec3{0, 0, -1})
	return at, resting.FaceDown(faces, down)
}

// TestMouldedCapSettles drops the moulded cap of cap.stl (4992 triangles)
// eight times at seeded random orientations onto a floor and onto a tray:
// each drop settles within capSettleTime, not much later than a coarse
// model of the cap dropped the same way, on a face the quasi-static
// analysis (package resting) finds stable.
func TestMouldedCapSettles(t *testing.T) {
	fine := fineMeshPart(t, "moulded cap", partgen.Cap())
	coarse := fineMeshPart(t, "coarse cap", partgen.CapMesh(16, 1, false))
	faces, err := resting.OfHull(fine.Hull, fine.Mass(1).Center)
	if err != nil {
		t.Fatal(err)
	}
	for _, tray := range []bool{false, true} {
		rng := rand.New(rand.NewPCG(12, 8))
		worstFine, worstCoarse := 0.0, 0.0
		for trial := 0; trial < 8; trial++ {
			axis := shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
			q := mgl64.QuatRotate(rng.Float64()*2*math.Pi, axis)
			at, face := dropCap(t, fine, faces, q, tray)
			atCoarse, _ := dropCap(t, coarse, nil, q, tray)
			worstFine, worstCoarse = math.Max(worstFine, at), math.Max(worstCoarse, atCoarse)
			switch {
			case !(at <= capSettleTime):
				t.Errorf("tray %v, drop %d: not settled within %g s", tray, trial, capSettleTime)
			case face < 0:
				t.Errorf("tray %v, drop %d: settled at %.3f s on no face", tray, trial, at)
			case !faces[face].Stable:
				t.Errorf("tray %v, drop %d: settled at %.3f s on face %d, which the quasi-static analysis finds unstable", tray, trial, at, face)
			}
		}
		if worstFine > capSettleRatio*worstCoarse {
			t.Errorf("tray %v: the fine cap's slowest drop settles at %.3f s, the coarse cap's at %.3f s", tray, worstFine, worstCoarse)
		}
	}
}
