package engine

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"
)

// maxFlatLandingTurn bounds the speed that a spin gives the corners of a
// box landing flat, against its impact speed: a thousandth. A central
// impact of a face on a face turns nothing (the impulse's line passes
// through both centres of mass: J. L. Meriam and L. G. Kraige,
// "Engineering Mechanics: Dynamics", impact chapter), so what is left is
// the solve's rounding, some 1e-6 (measured). A deferred impact lost at one
// corner of the landing face bounced the other three alone and turned a
// 1 g box at 28 rad/s, its corners at 1.2 times the impact speed.
const maxFlatLandingTurn = 1e-3

// TestFlatLandingOnHeavyBox drops a light box flat, from a fifth of its
// size, onto a heavy box resting on the floor, with restitution 0.93:
// central impact, so it must bounce straight up without turning (Meriam
// and Kraige, "Dynamics", impact chapter) and come to rest where it was
// dropped. The four corners of its
// face stop it together at the gap in the step before the bounce, and a
// solve may load three of them and leave the fourth at zero.
func TestFlatLandingOnHeavyBox(t *testing.T) {
	const s, e, drop = 0.043, 0.93, 0.2 * 0.043
	h := 0.29 * s
	for _, c := range []struct {
		ratio float64 // light box's mass over the heavy one's
		dt    float64
	}{
		{1e-3, 1e-3}, {1e-2, 1e-3}, {1e-1, 1e-3}, {1e-3, 1.0 / 120}, {1e-3, 1e-4},
	} {
		t.Run(fmt.Sprintf("1:%g at %.3g s", 1/c.ratio, c.dt), func(t *testing.T) {
			cfg := DefaultConfig()
			cfg.NoSleep = true
			w, mat := floorWorld(t, cfg, 0, Material{Friction: 0.5, Restitution: e})
			mustAdd(t, w, BodyDef{Name: "heavy", Shape: shapes.Box{Half: shapes.Vec3{0.5 * s, 0.37 * s, h}}, Mass: 1, Material: mat, Position: shapes.Vec3{0, 0, h}})
			rest := 2*h + 0.7*h
			half := shapes.Vec3{0.31 * s, 0.27 * s, 0.7 * h}
			light := mustAdd(t, w, BodyDef{Name: "light", Shape: shapes.Box{Half: half}, Mass: c.ratio, Material: mat, Position: shapes.Vec3{0, 0, rest + drop}})
			corner := math.Hypot(half[0], half[1])
			hit := math.Sqrt(2 * g0 * drop) // impact speed
			turn := 0.0
			run(t, w, c.dt, 1, func() {
				sp := w.Spin(light)
				turn = max(turn, math.Hypot(sp[0], sp[1])*corner/hit)
			})
			if turn > maxFlatLandingTurn {
				t.Errorf("its corners turned at %.3g of the impact speed, want at most %g (central impact: no turn)", turn, maxFlatLandingTurn)
			}
			if p := w.Position(light); math.Hypot(p[0], p[1]) > 1e-3*s {
				t.Errorf("it ended %.3g m from where it was dropped, want at most %.3g m", math.Hypot(p[0], p[1]), 1e-3*s)
			}
		})
	}
}
