package engine

import (
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// supportFallTol is how far the block may be from where the reference puts
// it, m: semi-implicit Euler lags free fall by g t dt / 2 (2.5 mm at
// t = 0.5 s and dt = 1 ms), and a block resting on the lowered support
// sits within the slop (0.2 mm) of it; 3 mm covers both and is far below
// the 50 mm the support moves.
const supportFallTol = 3e-3

func TestSleeperFallsWhenStaticSupportMoves(t *testing.T) {
	// A block asleep on a static support; the program then lowers the
	// support by d or takes it away (World.SetPose). Without support the
	// block falls freely, z = z0 - g t^2 / 2 (Galileo; any dynamics text),
	// until it lands on the lowered support, where it rests at z0 - d.
	const (
		h, d, dt, after = 0.05, 0.05, 1e-3, 0.5
	)
	slab := shapes.Box{Half: shapes.Vec3{0.5, 0.5, 0.05}}
	for _, c := range []struct {
		name  string
		shape shapes.Shape
		at    shapes.Vec3 // the support's position
		to    shapes.Vec3 // where the program puts it
		wantZ float64
	}{
		{"slab lowered", slab, shapes.Vec3{0, 0, -0.05}, shapes.Vec3{0, 0, -0.05 - d}, h - d},
		{"slab taken away", slab, shapes.Vec3{0, 0, -0.05}, shapes.Vec3{5, 0, -0.05}, h - g0*after*after/2},
		{"floor plane lowered", shapes.Plane{Normal: shapes.Vec3{0, 0, 1}}, shapes.Vec3{}, shapes.Vec3{0, 0, -d}, h - d},
	} {
		t.Run(c.name, func(t *testing.T) {
			w := newTestWorld(t, DefaultConfig())
			sup := mustAdd(t, w, BodyDef{Name: "support", Kind: Static, Shape: c.shape, Position: c.at})
			blk := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{h, h, h}}, Density: 1000,
				Position: shapes.Vec3{0, 0, h}})
			run(t, w, dt, 1, nil)
			if w.Awake(blk) {
				t.Fatal("the block did not fall asleep in 1 s: the case tests nothing")
			}
			w.SetPose(sup, c.to, mgl64.QuatIdent())
			run(t, w, dt, after, nil)
			if z := w.Position(blk)[2]; z > c.wantZ+supportFallTol || z < c.wantZ-supportFallTol {
				t.Errorf("block at z = %.4f m %g s after its support moved, want %.4f", z, after, c.wantZ)
			}
		})
	}
}

func TestStaticPlacedOnSleeperWakesIt(t *testing.T) {
	// A program places a static wall where it overlaps a sleeping block by
	// 5 mm: the block must wake and be pushed out of the wall (a body at
	// rest stays at rest only without an unbalanced force; Newton's first
	// law), ending clear of it.
	const h, dt = 0.05, 1e-3
	w, _ := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.5})
	wall := mustAdd(t, w, BodyDef{Name: "wall", Kind: Static, Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.5, 0.5}},
		Position: shapes.Vec3{2, 0, 0.5}})
	blk := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{h, h, h}}, Density: 1000,
		Position: shapes.Vec3{0, 0, h}})
	run(t, w, dt, 1, nil)
	if w.Awake(blk) {
		t.Fatal("the block did not fall asleep in 1 s: the case tests nothing")
	}
	const overlap = 5e-3
	w.SetPose(wall, shapes.Vec3{h + 0.05 - overlap, 0, 0.5}, mgl64.QuatIdent())
	run(t, w, dt, 0.5, nil)
	if x, limit := w.Position(blk)[0], -overlap+supportFallTol/10; x > limit {
		t.Errorf("block at x = %.4f m half a second after the wall overlapped it by %g m, want it pushed out (x <= %.4f)", x, overlap, limit)
	}
}
