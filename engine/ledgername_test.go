package engine

import (
	"errors"
	"math"
	"testing"

	"clatter/shapes"
)

func TestLedgerNamesGainingBody(t *testing.T) {
	// Energy is conserved by a free spinning body, a flywheel on a
	// frictionless revolute joint and a ball bouncing with e = 1 (any
	// dynamics text). A fault injected into one slow body pumps its energy
	// up beside a faster body that keeps its own: the ledger must stop the
	// run naming the body that gained, not the one that moves with the
	// most energy, within ledgerCatchWithin.
	const dt = 1e-3
	for _, c := range []struct {
		name  string
		build func(t *testing.T) (w *World, gainer, fast BodyID)
		fault func(w *World, id BodyID)
	}{
		{"drifting part beside a spinner", func(t *testing.T) (*World, BodyID, BodyID) {
			w := newTestWorld(t, Config{NoSleep: true}) // no gravity
			fast := mustAdd(t, w, BodyDef{Name: "spinner", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.03, 0.01}}, Density: 1000,
				Spin: shapes.Vec3{0, 0, 30}})
			slow := mustAdd(t, w, BodyDef{Name: "drifter", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000,
				Position: shapes.Vec3{1, 0, 0}, Velocity: shapes.Vec3{0, 0.1, 0}})
			return w, slow, fast
		}, func(w *World, id BodyID) {
			w.b.vel[id] = w.b.vel[id].Mul(1 + 1e-3)
		}},
		{"bouncing ball beside a flywheel", func(t *testing.T) (*World, BodyID, BodyID) {
			w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.3, Restitution: 1})
			fast := mustAdd(t, w, BodyDef{Name: "flywheel", Shape: shapes.Cylinder{Radius: 0.1, HalfLength: 0.02}, Density: 7800,
				Material: mat, Position: shapes.Vec3{1, 0, 0.5}, Spin: shapes.Vec3{0, 0, 5}})
			mustJoint(t, w, JointDef{Name: "axle", Kind: Revolute, A: fast, B: Ground, Anchor: shapes.Vec3{1, 0, 0.5}, Axis: shapes.Vec3{0, 0, 1}})
			ball := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.02}, Density: 1000, Material: mat,
				Position: shapes.Vec3{0, 0, 0.3}})
			return w, ball, fast
		}, func(w *World, id BodyID) {
			w.b.vel[id] = w.b.vel[id].Mul(1 + 2e-4)
		}},
	} {
		t.Run(c.name, func(t *testing.T) {
			w, gainer, fast := c.build(t)
			w.ledger.fault = func(w *World) { c.fault(w, gainer) }
			var err error
			for n := 0; n < int(ledgerCatchWithin/dt) && err == nil; n++ {
				err = w.Step(dt)
			}
			var de *DivergenceError
			if !errors.As(err, &de) {
				t.Fatalf("ran %g s gaining energy without an error: %v", w.Time(), err)
			}
			if w.kinetic(fast) <= w.kinetic(gainer) {
				t.Fatalf("case does not test the naming: %s has %.3g J, %s %.3g J", w.Name(fast), w.kinetic(fast), w.Name(gainer), w.kinetic(gainer))
			}
			if de.Body != gainer {
				t.Errorf("error names body %d (%s), want %d (%s): %v", de.Body, de.Name, gainer, w.Name(gainer), err)
			}
			if !(de.Time < ledgerCatchWithin) || math.IsNaN(de.Time) {
				t.Errorf("stopped at t = %g s", de.Time)
			}
		})
	}
}
