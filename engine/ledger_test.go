package engine

import (
	"errors"
	"math"
	"testing"

	"clatter/shapes"
)

// ledgerCatchWithin is how long, in simulated seconds, a run that gains
// energy at the injected rates below may go on before the guard stops it:
// at 10 parts per million a step the energy grows by ledgerFraction (5
// percent) in some 5000 steps, 5 s at 1 ms; twice that leaves room. (The
// ball's kinetic energy averages a third of its total over a flight, so
// its fault adds four times as much.)
const ledgerCatchWithin = 10.0

func TestLedgerStopsSlowGain(t *testing.T) {
	// Energy is conserved by a free body and by a ball bouncing with e = 1
	// (any dynamics text); an injected fault that adds a few parts per
	// million of kinetic energy a step, far below the per-step guard's
	// threshold (half the kinetic energy), adds up to any amount over a
	// long run. The ledger must stop the run with an error that names the
	// body, before ledgerCatchWithin.
	const dt = 1e-3
	for _, c := range []struct {
		name  string
		build func(t *testing.T) (*World, BodyID)
		fault func(w *World, id BodyID)
	}{
		{"spinning body speeds up", func(t *testing.T) (*World, BodyID) {
			w := newTestWorld(t, Config{NoSleep: true}) // no gravity
			id := mustAdd(t, w, BodyDef{Name: "spinner", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.03, 0.01}}, Density: 1000,
				Spin: shapes.Vec3{0, 0, 10}})
			return w, id
		}, func(w *World, id BodyID) {
			w.b.spin[id] = w.b.spin[id].Mul(1 + 5e-6) // +10 ppm of energy a step
		}},
		{"bouncing ball gains height", func(t *testing.T) (*World, BodyID) {
			w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.3, Restitution: 1})
			id := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.02}, Density: 1000, Material: mat,
				Position: shapes.Vec3{0, 0, 0.5}})
			return w, id
		}, func(w *World, id BodyID) {
			w.b.vel[id] = w.b.vel[id].Mul(1 + 2e-5) // +40 ppm of the kinetic energy a step
		}},
		{"resting block pushed up", func(t *testing.T) (*World, BodyID) {
			w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.5})
			id := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.05, 0.05}}, Density: 1000, Material: mat,
				Position: shapes.Vec3{0, 0, 0.05}})
			return w, id
		}, func(w *World, id BodyID) {
			// An unseen upward push of 1.2 g dt a step, as a contact that
			// pressed a little too hard would give: the block leaves its
			// floor and rises at 0.2 g, with energy nothing gave it.
			w.b.vel[id][2] += 1.2 * g0 * 1e-3
		}},
	} {
		t.Run(c.name, func(t *testing.T) {
			w, id := c.build(t)
			w.ledger.fault = func(w *World) { c.fault(w, id) }
			var err error
			for n := 0; n < int(ledgerCatchWithin/dt) && err == nil; n++ {
				err = w.Step(dt)
			}
			var de *DivergenceError
			if !errors.As(err, &de) {
				t.Fatalf("ran %g s gaining energy (from %.4g J) without an error: %v", w.Time(), w.Energy(), err)
			}
			if de.Body != id {
				t.Errorf("error names body %d (%s), want %d", de.Body, de.Name, id)
			}
			t.Logf("stopped at t = %.3f s: %v", w.Time(), err)
		})
	}
}

func TestLedgerQuietOnLongValidRuns(t *testing.T) {
	// Long runs that are right must not trip the ledger: free tumbling
	// about the intermediate axis (the symplectic splitting's energy error
	// stays bounded; Dullweber, Leimkuhler and McLachlan 1997), a ball
	// bouncing with e = 1 (energy conserved), a block held by friction on a
	// turntable (a drive), and a resting pyramid, each at a fine and a
	// coarse step.
	for _, dt := range []float64{1e-3, 1.0 / 60} {
		for _, c := range []struct {
			name    string
			seconds float64
			build   func(t *testing.T) *World
		}{
			{"tumbling body", 60, func(t *testing.T) *World {
				w := newTestWorld(t, Config{NoSleep: true})
				mustAdd(t, w, BodyDef{Name: "tumbler", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.03, 0.01}}, Density: 1000,
					Spin: shapes.Vec3{0.01, 8, 0.01}})
				return w
			}},
			{"elastic ball", 30, func(t *testing.T) *World {
				w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.3, Restitution: 1})
				mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.02}, Density: 1000, Material: mat,
					Position: shapes.Vec3{0, 0, 1}})
				return w
			}},
			{"turntable", 30, func(t *testing.T) *World {
				w := newTestWorld(t, DefaultConfig())
				mat, _ := w.AddMaterial(Material{Friction: 0.8})
				tab := mustAdd(t, w, BodyDef{Name: "table", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.5, 0.5, 0.05}},
					Material: mat, Position: shapes.Vec3{0, 0, -0.05}})
				w.SetVelocity(tab, shapes.Vec3{}, shapes.Vec3{0, 0, 3})
				mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{0.02, 0.02, 0.02}}, Density: 1000, Material: mat,
					Position: shapes.Vec3{0.3, 0, 0.02}, Velocity: shapes.Vec3{0, 0.9, 0}, Spin: shapes.Vec3{0, 0, 3}})
				return w
			}},
			{"resting pyramid", 20, func(t *testing.T) *World {
				w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.6})
				addPyramid(t, w, mat)
				return w
			}},
		} {
			t.Run(c.name, func(t *testing.T) {
				w := c.build(t)
				for n := 0; n < int(math.Round(c.seconds/dt)); n++ {
					if err := w.Step(dt); err != nil {
						t.Fatalf("dt %.4g: %v", dt, err)
					}
				}
			})
		}
	}
}
