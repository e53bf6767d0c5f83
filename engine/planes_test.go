package engine

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"clatter/collide"
	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// TestPlanePairsMissNoContact checks the direct plane test against brute
// force: every plane and body whose narrow-phase query (collide.Detector,
// run on the pair outright) finds a contact point within the pair's margin
// must be among the step's candidate pairs. The planes are tilted, offset
// and added before and after the bodies; one moves.
func TestPlanePairsMissNoContact(t *testing.T) {
	cfg := DefaultConfig()
	cfg.NoSleep = true
	w := newTestWorld(t, cfg)
	rng := rand.New(rand.NewPCG(4, 2))
	addPlane := func(n shapes.Vec3, at shapes.Vec3, kind Kind, v shapes.Vec3) {
		mustAdd(t, w, BodyDef{Name: "plane", Kind: kind, Shape: shapes.Plane{Normal: n.Normalize(), Offset: 0.01},
			Position: at, Velocity: v})
	}
	addPlane(shapes.Vec3{0, 0, 1}, shapes.Vec3{}, Static, shapes.Vec3{})
	addPlane(shapes.Vec3{1, 0.3, 0.2}, shapes.Vec3{-0.3, 0, 0}, Static, shapes.Vec3{})
	for i := 0; i < 150; i++ {
		q := mgl64.QuatRotate(rng.Float64()*math.Pi, shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize())
		var s shapes.Shape = shapes.Box{Half: shapes.Vec3{0.02, 0.015, 0.01}}
		if i%2 == 1 {
			s = shapes.Cylinder{Radius: 0.012, HalfLength: 0.015}
		}
		p := shapes.Vec3{rng.Float64()*0.6 - 0.3, rng.Float64()*0.6 - 0.3, rng.Float64() * 0.3}
		v := shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		mustAdd(t, w, BodyDef{Name: "part", Shape: s, Density: 800, Position: p, Orientation: q, Velocity: v})
	}
	addPlane(shapes.Vec3{-1, 0, 0.1}, shapes.Vec3{0.3, 0, 0}, Static, shapes.Vec3{})
	addPlane(shapes.Vec3{0, -1, 0}, shapes.Vec3{0, 0.3, 0}, Kinematic, shapes.Vec3{0, -0.5, 0})
	det := collide.NewDetector()
	c := &w.collision
	found, possible := 0, 0
	for step := 0; step < 40; step++ {
		if err := w.Step(1e-3); err != nil {
			t.Fatal(err)
		}
		for _, p := range c.planes.ids {
			for i, k := range w.b.kind {
				if k != Dynamic {
					continue
				}
				possible++
				a, b := p, BodyID(i)
				if a > b {
					a, b = b, a
				}
				margin := c.margin[i] + c.margin[p]
				mf := det.Collide(nil, w.b.shape[a], c.pose[a], w.b.shape[b], c.pose[b], margin)
				if len(mf) == 0 {
					continue
				}
				found++
				if _, ok := slices.BinarySearchFunc(c.pairs, [2]int32{int32(a), int32(b)}, cmpPair); !ok {
					t.Fatalf("step %d: plane %d and body %d touch within the margin %g but are not a candidate pair", step, p, i, margin)
				}
			}
		}
	}
	// The test proves something only if some bodies touch the planes and
	// the direct test leaves most plane pairs out.
	planePairs := 0
	for _, pr := range c.pairs {
		if slices.Contains(c.planes.ids, BodyID(pr[0])) || slices.Contains(c.planes.ids, BodyID(pr[1])) {
			planePairs++
		}
	}
	if found == 0 {
		t.Fatal("no body touched a plane: the scene tests nothing")
	}
	if planePairs*4 > len(c.planes.ids)*150 {
		t.Errorf("%d plane pairs of %d possible: the direct test should leave most out", planePairs, len(c.planes.ids)*150)
	}
	t.Logf("%d contacts with planes in %d plane-body queries", found, possible)
}
