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
	Register(
		Benchmark{Name: "Pile1000", Fn: Pile1000},
		Benchmark{Name: "Pile200", Fn: Pile200},
		Benchmark{Name: "DropTrial", Fn: DropTrial},
	)
}

// randomPart returns the hull of a seeded cloud of points: a part of about
// 40 hull vertices and 3 cm across.
func randomPart(rng *rand.Rand, vertices int) *shapes.Hull {
	pts := make([]shapes.Vec3, vertices)
	for i := range pts {
		d := shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()
		pts[i] = shapes.Vec3{d[0] * 0.015, d[1] * 0.012, d[2] * 0.008}
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		panic(err) // points on an ellipsoid always span a solid
	}
	return h
}

// pileParts returns the three hulls of the pile, drawn from rng (seeded
// as in buildPile).
func pileParts(rng *rand.Rand) []*shapes.Hull {
	return []*shapes.Hull{randomPart(rng, 40), randomPart(rng, 40), randomPart(rng, 40)}
}

// buildPile drops n mixed convex bodies into a bin and lets them come to
// rest with sleeping off: 1500 steps of 1 ms with this engine. Its result
// is stored in testdata (pilefile.go); the benchmarks load it from there.
func buildPile(b testing.TB, n int) *engine.World {
	w, mat, add := binWorld(b, 0.25, 0.25)
	rng := rand.New(rand.NewPCG(1000, 1))
	parts := pileParts(rng)
	for i := 0; i < n; i++ {
		pos := shapes.Vec3{-0.2 + 0.04*float64(i%11), -0.2 + 0.04*float64((i/11)%11), 0.03 + 0.04*float64(i/121)}
		q := mgl64.QuatRotate(rng.Float64()*math.Pi, shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize())
		add(engine.BodyDef{Name: "part", Shape: mixedPart(i, parts), Density: 1050, Material: mat, Position: pos, Orientation: q})
	}
	for i := 0; i < 1500; i++ {
		if err := w.Step(1e-3); err != nil {
			b.Fatal(err)
		}
	}
	return w
}

// Pile1000 is one 1 ms step of 1000 resting mixed convex bodies in a bin
// (boxes, cylinders and 40-vertex hulls), 8 velocity iterations, no
// sleeping. The pile is the one stored in testdata (see storedPile), so
// that the figure measures the step alone, not also how this engine
// builds a pile.
func Pile1000(b *testing.B) { pile(b, 1000) }

// Pile200 is Pile1000 with a pile of 200 bodies: the same kinds of contact
// at a fifth of the cost, for profiling.
func Pile200(b *testing.B) { pile(b, 200) }

func pile(b *testing.B, n int) {
	w := storedPile(b, n)
	stepTimed(b, w, 1e-3)
}

// stepTimed times b.N steps of dt of world w, one op each: the steps of a
// scene already built and settled, its setup left out of the timing.
func stepTimed(b *testing.B, w *engine.World, dt float64) {
	b.ReportAllocs()
	b.ResetTimer()
	var cpu cpuClock // cputime.go
	cpu.start()
	defer func() { cpu.stop(); cpu.report(b) }()
	for i := 0; i < b.N; i++ {
		if err := w.Step(dt); err != nil {
			b.Fatal(err)
		}
	}
}

// DropTrial is one trial of a drop study, run as a study's worker runs it:
// a 40-vertex part dropped 0.2 m onto a floor at a random orientation and
// stepped at 1 ms until settled. What is reused from trial to trial, as in
// a study: the part's hull and its mass properties (worked out once, as a
// study reads a scene's shapes once) and the world, emptied by World.Reset before each trial and built
// again (its body arrays, broad and narrow phase, pair memory buffers and
// solver keep their memory). Each trial still adds its material and
// bodies and starts from a world that behaves as a new one.
func DropTrial(b *testing.B) {
	rng := rand.New(rand.NewPCG(7, 7))
	part := randomPart(rng, 40)
	props := part.Mass(1050)
	dropTrials(b, rng, func(w *engine.World, q mgl64.Quat) {
		mat, _ := w.AddMaterial(engine.Material{Name: "abs", Friction: 0.4, Restitution: 0.3})
		w.AddBody(engine.BodyDef{Name: "floor", Kind: engine.Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, Material: mat})
		w.AddBody(engine.BodyDef{Name: "part", Shape: part, Props: &props, Material: mat, Position: shapes.Vec3{0, 0, 0.2}, Orientation: q})
	})
}

// dropTrials runs b.N trials as a study's worker does: one world, emptied
// by World.Reset before each trial; place adds the trial's bodies with the
// part at orientation q, drawn from rng; the trial is stepped at 1 ms until
// settled (at most 5 s). It reports the steps per trial and the CPU time.
func dropTrials(b *testing.B, rng *rand.Rand, place func(w *engine.World, q mgl64.Quat)) {
	b.ReportAllocs()
	b.ResetTimer()
	var cpu cpuClock // cputime.go
	cpu.start()
	defer func() { cpu.stop(); cpu.report(b) }()
	steps := 0
	w := &engine.World{}
	for i := 0; i < b.N; i++ {
		cfg := engine.DefaultConfig()
		cfg.NoEvents = true
		if err := w.Reset(cfg); err != nil {
			b.Fatal(err)
		}
		place(w, mgl64.QuatRotate(rng.Float64()*2*math.Pi, shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize()))
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
