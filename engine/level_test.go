package engine

import (
	"fmt"
	"testing"

	"clatter/shapes"
)

// maxLevelCreep is how far a ball resting on a box on a floor may move in
// the 300 s of TestBallStaysOnLevelBox, as a fraction of its slop: a
// twentieth, so that creep at a growing speed, which left the box near
// 290 s at 1/30 s, shows long before it becomes visible, while the
// nanometres that rounding moves a resting part stay far below.
const maxLevelCreep = 0.05

// TestBallStaysOnLevelBox lays a 2 cm ball on a 10 cm box resting on a
// floor, kept awake for 300 s (15 times longer than
// TestRoundPartsRestOnParts) at coarse and fine steps. Statics: a ball on
// a level face is in neutral equilibrium and has no force to roll it (J. L.
// Meriam and L. G. Kraige, "Engineering Mechanics: Statics", chapter 3), so
// neither the ball nor the box may move. Before the position pass levelled
// a face lying flat (contact/level.go), the box kept a tilt below the slop
// that the first steps' solve left, the ball rolled down it, and the
// loaded corners sank further: at 1/30 s the ball crept 0.14 mm in 120 s
// and left the box near 290 s.
func TestBallStaysOnLevelBox(t *testing.T) {
	for _, dt := range []float64{1.0 / 30, 1.0 / 60, 1e-3} {
		t.Run(fmt.Sprintf("%.3g s", dt), func(t *testing.T) {
			cfg := DefaultConfig()
			cfg.NoSleep = true
			w, mat := floorWorld(t, cfg, 0, Material{Friction: 0.5, Restitution: 0.9})
			boxStart := shapes.Vec3{0, 0, 0.02}
			box := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.05, 0.02}}, Density: 3000,
				Material: mat, Position: boxStart})
			start := shapes.Vec3{0, 0, 0.06}
			ball := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.02}, Density: 3000, Material: mat,
				Position: start})
			tol := maxLevelCreep * w.pairSlop(ball, box)
			worst := 0.0
			run(t, w, dt, 300, func() { worst = max(worst, w.Position(ball).Sub(start).Len()) })
			if worst > tol {
				d := w.Position(ball).Sub(start)
				t.Errorf("ball moved up to %.3g m (at the end %.3g, %.3g, %.3g), want at most %.3g", worst, d[0], d[1], d[2], tol)
			}
			if d := w.Position(box).Sub(boxStart); d.Len() > tol {
				t.Errorf("box moved %.3g m, want at most %.3g", d.Len(), tol)
			}
		})
	}
}
