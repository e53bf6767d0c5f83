package engine

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// TestRoundPartsRestOnParts lays a ball, a capsule and a cylinder on its
// side on a box that rests on a floor, kept awake for 20 s with
// restitution 0.9. A round body on a level face is in neutral equilibrium
// and, set down at rest, stays at rest (Newton's first law; J. L. Meriam
// and L. G. Kraige, "Engineering Mechanics: Statics", chapter 3): nothing
// pushes it along. Before the persistent manifolds left rolling contacts
// to the full query (collide/roll.go), the ball started rolling from
// rounding and left the box within 10 s at 1 ms, and the capsule crept
// 4 mm in 30 s at 1/30 s. maxRatioCreep (1 um) bounds the motion. At
// 1/30 s the ball also crept, 3 um in 20 s and faster later, from another
// cause: the box rested tilted below the slop, which the position pass
// left alone until it levelled a face lying flat (contact/level.go;
// TestBallStaysOnLevelBox runs 300 s).
func TestRoundPartsRestOnParts(t *testing.T) {
	side := mgl64.QuatRotate(math.Pi/2, shapes.Vec3{0, 1, 0})
	parts := []struct {
		name  string
		shape shapes.Shape
		q     shapes.Quat
		r     float64 // half its height lying down
	}{
		{"ball", shapes.Sphere{Radius: 0.02}, mgl64.QuatIdent(), 0.02},
		{"capsule", shapes.Capsule{Radius: 0.02, HalfLength: 0.05}, side, 0.02},
		{"cylinder on its side", shapes.Cylinder{Radius: 0.02, HalfLength: 0.05}, side, 0.02},
	}
	for _, p := range parts {
		for _, dt := range []float64{1.0 / 30, 1.0 / 60, 1e-3} {
			t.Run(fmt.Sprintf("%s at %.3g s", p.name, dt), func(t *testing.T) {
				cfg := DefaultConfig()
				cfg.NoSleep = true
				w, mat := floorWorld(t, cfg, 0, Material{Friction: 0.5, Restitution: 0.9})
				box := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.05, 0.02}}, Density: 3000,
					Material: mat, Position: shapes.Vec3{0, 0, 0.02}})
				start := shapes.Vec3{0, 0, 0.04 + p.r}
				id := mustAdd(t, w, BodyDef{Name: p.name, Shape: p.shape, Density: 3000, Material: mat,
					Position: start, Orientation: p.q})
				run(t, w, dt, 20, nil)
				if d := w.Position(id).Sub(start); d.Len() > maxRatioCreep {
					t.Errorf("%s moved %.3g m (%.3g, %.3g, %.3g), want at most %.3g", p.name, d.Len(), d[0], d[1], d[2], maxRatioCreep)
				}
				if d := w.Position(box).Sub(shapes.Vec3{0, 0, 0.02}); d.Len() > maxRatioCreep {
					t.Errorf("box moved %.3g m, want at most %.3g", d.Len(), maxRatioCreep)
				}
			})
		}
	}
}
