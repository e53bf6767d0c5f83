package engine

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// TestRoundPartsRestOnRoundParts lays round parts on round parts, so that
// both shapes of every contact touch along a curved surface: a cylinder
// and a capsule lying across two fixed ones (each contact the common
// perpendicular of two crossed axes) and a ball on three fixed balls, kept
// awake for 20 s with restitution 0.9. Across the rods the part is in
// neutral equilibrium along them, the ball on the three in stable
// equilibrium (Meriam and Kraige, "Engineering Mechanics: Statics",
// chapter 3): set down at rest, neither moves. A refresh of these contacts
// from the material points of the last full query lets the contact lag
// the parts as they turn by rounding, which pushes them on
// (collide/rollboth.go); maxRatioCreep (1 um) bounds the motion.
func TestRoundPartsRestOnRoundParts(t *testing.T) {
	const r = 0.02
	alongX := mgl64.QuatRotate(math.Pi/2, shapes.Vec3{0, 1, 0})
	alongY := mgl64.QuatRotate(math.Pi/2, shapes.Vec3{1, 0, 0})
	type placed struct {
		s  shapes.Shape
		at shapes.Vec3
		q  shapes.Quat
	}
	rods := func(s shapes.Shape) []placed {
		return []placed{{s, shapes.Vec3{0, -0.04, r}, alongX}, {s, shapes.Vec3{0, 0.04, r}, alongX}}
	}
	// The ball of radius r on three of radius r touching each other:
	// centres a 2r-sided triangle, the top one 2r from each, sqrt(8/3) r
	// above their plane.
	var balls []placed
	for k := 0; k < 3; k++ {
		a := 2 * math.Pi * float64(k) / 3
		balls = append(balls, placed{shapes.Sphere{Radius: r}, shapes.Vec3{2 * r / math.Sqrt(3) * math.Cos(a), 2 * r / math.Sqrt(3) * math.Sin(a), r}, mgl64.QuatIdent()})
	}
	cyl := shapes.Cylinder{Radius: r, HalfLength: 0.06}
	capsule := shapes.Capsule{Radius: r, HalfLength: 0.06}
	cases := []struct {
		name  string
		under []placed
		top   placed
	}{
		{"cylinder across cylinders", rods(cyl), placed{cyl, shapes.Vec3{0, 0, 3 * r}, alongY}},
		{"capsule across capsules", rods(capsule), placed{capsule, shapes.Vec3{0, 0, 3 * r}, alongY}},
		{"ball on three balls", balls, placed{shapes.Sphere{Radius: r}, shapes.Vec3{0, 0, r + math.Sqrt(8.0/3)*r}, mgl64.QuatIdent()}},
	}
	for _, c := range cases {
		for _, dt := range []float64{1.0 / 60, 1e-3} {
			t.Run(fmt.Sprintf("%s at %.3g s", c.name, dt), func(t *testing.T) {
				cfg := DefaultConfig()
				cfg.NoSleep = true
				w, mat := floorWorld(t, cfg, 0, Material{Friction: 0.5, Restitution: 0.9})
				for i, u := range c.under {
					mustAdd(t, w, BodyDef{Name: fmt.Sprintf("under%d", i), Kind: Static, Shape: u.s, Material: mat, Position: u.at, Orientation: u.q})
				}
				id := mustAdd(t, w, BodyDef{Name: "top", Shape: c.top.s, Density: 3000, Material: mat, Position: c.top.at, Orientation: c.top.q})
				run(t, w, dt, 20, nil)
				if d := w.Position(id).Sub(c.top.at); d.Len() > maxRatioCreep {
					t.Errorf("%s moved %.3g m (%.3g, %.3g, %.3g), want at most %.3g", c.name, d.Len(), d[0], d[1], d[2], maxRatioCreep)
				}
			})
		}
	}
}
