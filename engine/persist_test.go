package engine

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// persistPile is a bin (floor and four walls 0.3 m apart) with parts
// dropped into it in layers: boxes, cylinders and hulls, never asleep, so
// that every resting pair is queried each step. The narrow phase runs full
// queries only (persistence off) until the caller turns it on.
func persistPile(t *testing.T, parts int) (*World, []BodyID) {
	t.Helper()
	rng := rand.New(rand.NewPCG(13, 14))
	w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.5, Restitution: 0.2})
	for _, n := range []shapes.Vec3{{1, 0, 0}, {-1, 0, 0}, {0, 1, 0}, {0, -1, 0}} {
		mustAdd(t, w, BodyDef{Name: "wall", Kind: Static, Shape: shapes.Plane{Normal: n}, Material: mat, Position: n.Mul(-0.15)})
	}
	var ids []BodyID
	for i := 0; i < parts; i++ {
		pos := shapes.Vec3{-0.1 + 0.067*float64(i%4), -0.1 + 0.067*float64((i/4)%4), 0.04 + 0.07*float64(i/16)}
		q := mgl64.QuatRotate(rng.Float64()*math.Pi, shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize())
		var s shapes.Shape
		switch i % 3 {
		case 0:
			s = shapes.Box{Half: shapes.Vec3{0.03, 0.02, 0.015}}
		case 1:
			s = shapes.Cylinder{Radius: 0.02, HalfLength: 0.02}
		default:
			s = randomHull(t, rng, 20, shapes.Vec3{0.03, 0.03, 0.02})
		}
		ids = append(ids, mustAdd(t, w, BodyDef{Name: "part", Shape: s, Density: 1000, Material: mat, Position: pos, Orientation: q}))
	}
	w.collision.det.SetPersistence(0)
	return w, ids
}

// TestPersistentPileSamePhysics: a settled pile of mixed parts run on with
// persistent manifolds stays where the same pile run on with a full query
// for every pair stays, body by body, while most of its touching pairs are
// answered from their kept points.
func TestPersistentPileSamePhysics(t *testing.T) {
	// pileTol: a refreshed point lies within persistFraction (0.1) of the
	// slop of a fresh one (collide/persist.go), so a body's supports can
	// hold it that much higher or lower; the pile is at most three layers
	// deep, and the differences of the layers add: 0.3 of the slop (60 um).
	const dt, settle, more = 1e-3, 1.0, 0.3
	fresh, ids := persistPile(t, 32)
	kept, _ := persistPile(t, 32)
	pileTol := 3 * 0.1 * fresh.cfg.Slop
	run(t, fresh, dt, settle, nil)
	run(t, kept, dt, settle, nil)
	start := make([]shapes.Vec3, len(ids))
	for i, id := range ids {
		start[i] = fresh.Position(id)
		if kept.Position(id) != start[i] {
			t.Fatalf("body %d: the two worlds differ before persistence is on", id)
		}
	}
	kept.collision.det.SetPersistence(kept.cfg.Slop)
	kept.collision.det.ResetStats()
	run(t, fresh, dt, more, nil)
	run(t, kept, dt, more, nil)
	worst, moved := 0.0, 0.0
	for i, id := range ids {
		worst = math.Max(worst, kept.Position(id).Sub(fresh.Position(id)).Len())
		moved = math.Max(moved, fresh.Position(id).Sub(start[i]).Len())
	}
	t.Logf("largest difference %.3g mm; largest motion of the fresh pile %.3g mm", worst*1e3, moved*1e3)
	if worst > pileTol {
		t.Errorf("a body rests %.3g mm from where fresh queries leave it, want below %.3g mm", worst*1e3, pileTol*1e3)
	}
	st := kept.collision.det.Stats()
	steps := int(math.Round(more / dt))
	t.Logf("%d queries answered by kept points in %d steps (%.1f a step)", st.Persisted, steps, float64(st.Persisted)/float64(steps))
	// At least one pair per body and step on average: the pile's resting
	// contacts (every part touches the floor, a wall or another part)
	// are answered from memory most of the time.
	if st.Persisted < len(ids)*steps {
		t.Errorf("only %d queries answered by kept points in %d steps of %d resting parts", st.Persisted, steps, len(ids))
	}
}

// TestPersistentTowerHeight: a tower of ten 50 mm cubes stands at the height
// of its cubes stacked (geometry: the top cube's centre at 19 half-edges),
// the same with persistent manifolds as with full queries.
func TestPersistentTowerHeight(t *testing.T) {
	// towerTol: each of the ten interfaces rests within the slop (the
	// depth the position pass leaves alone), 2 mm for the tower; between
	// the two runs the same interfaces differ by at most the refreshed
	// points' error, persistFraction of the slop each, so a tenth of that
	// (sameTol), which a refresh with stale separations would exceed.
	const h, n, dt, seconds = 0.025, 10, 1e-3, 2.0
	var top [2]float64
	var slop float64
	for k, on := range []bool{false, true} {
		w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.6})
		var id BodyID
		for i := 0; i < n; i++ {
			id = mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{h, h, h}}, Density: 500, Material: mat, Position: shapes.Vec3{0, 0, h + 2*h*float64(i)}})
		}
		if !on {
			w.collision.det.SetPersistence(0)
		}
		run(t, w, dt, seconds, nil)
		top[k], slop = w.Position(id)[2], w.cfg.Slop
		// Three in four of the ten pairs' queries at least: the tower
		// stands still, so only the age limit calls for full queries.
		if q := n * int(seconds/dt); on && w.collision.det.Stats().Persisted < 3*q/4 {
			t.Errorf("only %d of %d queries answered by kept points", w.collision.det.Stats().Persisted, q)
		}
	}
	towerTol := n * slop
	sameTol := n * 0.1 * slop
	want := (2*n - 1) * h
	for k, z := range top {
		if math.Abs(z-want) > towerTol {
			t.Errorf("run %d: top cube at %.6f m, stacked cubes give %.6f m", k, z, want)
		}
	}
	t.Logf("top cube: full queries %.7f m, persistent %.7f m", top[0], top[1])
	if d := math.Abs(top[1] - top[0]); d > sameTol {
		t.Errorf("top cube %.3g mm apart with and without persistence, want below %.3g mm", d*1e3, sameTol*1e3)
	}
}

// TestPersistentSlidingBox: a box sliding to a stop on the floor gets a
// full query every step while it slides (it moves far beyond a tenth of
// the slop per step) and refreshed points once it rests, and stops where
// Coulomb friction stops it, d = v^2 / (2 mu g) (any mechanics text), the
// same with persistence as without.
func TestPersistentSlidingBox(t *testing.T) {
	// stopTol: 1 percent of the distance; semi-implicit Euler at 1 ms is
	// off by about v dt / 2 = 0.5 mm of the 170 mm (0.3 percent).
	// sameTol: the runs differ only once the box rests, by the refreshed
	// points' error, a tenth of the slop.
	const v0, mu, dt, seconds = 1.0, 0.3, 1e-3, 0.6
	want := v0 * v0 / (2 * mu * StandardGravity)
	var stop [2]float64
	var slop float64
	for k, on := range []bool{false, true} {
		w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: mu})
		slop = w.cfg.Slop
		id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.02, 0.02, 0.01}}, Density: 800, Material: mat, Position: shapes.Vec3{0, 0, 0.01}, Velocity: shapes.Vec3{v0, 0, 0}})
		if !on {
			w.collision.det.SetPersistence(0)
		}
		slid, rested := 0, 0
		run(t, w, dt, seconds, func() {
			n := w.collision.det.Stats().Persisted
			w.collision.det.ResetStats()
			if w.Velocity(id).Len()*dt > 0.2*w.cfg.Slop {
				slid += n
			} else {
				rested += n
			}
		})
		stop[k] = w.Position(id)[0]
		t.Logf("persistence %v: stopped after %.6f m (Coulomb %.6f m); refreshed %d sliding, %d resting", on, stop[k], want, slid, rested)
		if on && (slid != 0 || rested < int(0.1/dt)) {
			t.Errorf("%d refreshed queries while sliding (want 0), %d at rest", slid, rested)
		}
		if math.Abs(stop[k]-want) > 0.01*want {
			t.Errorf("persistence %v: stopped after %.5f m, Coulomb friction gives %.5f m", on, stop[k], want)
		}
	}
	if d := math.Abs(stop[1] - stop[0]); d > 0.1*slop {
		t.Errorf("stopped %.3g mm apart with and without persistence", d*1e3)
	}
}
