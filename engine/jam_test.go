package engine

import (
	"errors"
	"testing"

	"clatter/shapes"
)

// ramScene is a ram (kinematic, 0.1 m wide) driven along +x at speed v
// toward a 50 mm cube on the floor, with a fixed wall 25 mm beyond the cube
// unless open. It returns the world and the cube's id.
func ramScene(t *testing.T, v float64, open bool) (*World, BodyID) {
	t.Helper()
	w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.5})
	if !open {
		mustAdd(t, w, BodyDef{Name: "wall", Kind: Static, Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.2, 0.1}}, Material: mat, Position: shapes.Vec3{0.3, 0, 0.1}})
	}
	box := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.025, 0.025, 0.025}}, Density: 500, Material: mat, Position: shapes.Vec3{0.2, 0, 0.025}})
	ram := mustAdd(t, w, BodyDef{Name: "ram", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.05, 0.1, 0.05}}, Material: mat, Position: shapes.Vec3{0, 0, 0.051}})
	stroke := 0.4
	table := &PoseTable{Times: []float64{0, stroke / v}, Relative: true,
		Poses: []shapes.Pose{{Orientation: shapes.Quat{W: 1}}, {Position: shapes.Vec3{stroke, 0, 0}, Orientation: shapes.Quat{W: 1}}}}
	if err := w.SetMotion(ram, table); err != nil {
		t.Fatal(err)
	}
	return w, box
}

func TestRamJamStops(t *testing.T) {
	// The ram closes the gap to the wall below the cube's width: no motion
	// of a rigid cube satisfies both contacts (geometry), so the run must
	// stop with an error naming the cube, the ram and the wall, and the
	// cube must never have been thrown: its speed stays below the ram's
	// (a pushed rigid body moves with its pusher at most).
	for _, c := range []struct{ v, dt float64 }{{0.2, 1e-3}, {0.05, 1.0 / 240}, {1, 1e-3}} {
		w, box := ramScene(t, c.v, false)
		var err error
		fastest := 0.0
		for i := 0; i < int(0.5/c.v/c.dt) && err == nil; i++ {
			err = w.Step(c.dt)
			fastest = max(fastest, w.Velocity(box).Len())
		}
		var je *JamError
		if !errors.As(err, &je) {
			t.Fatalf("v %g dt %.4g: got %v, want a jam error", c.v, c.dt, err)
		}
		if je.Name != "box" || len(je.By) != 2 || je.By[0] != "ram" || je.By[1] != "wall" {
			t.Errorf("v %g: jam names %q held by %q, want box held by ram and wall", c.v, je.Name, je.By)
		}
		// 1.5: the pushed cube may overshoot the ram's speed briefly while
		// the contact forms (its penetration is pushed out), never by more.
		if fastest > 1.5*c.v {
			t.Errorf("v %g: the cube reached %.3g m/s", c.v, fastest)
		}
	}
}

func TestRamPushesFreely(t *testing.T) {
	// Without the wall the ram pushes the cube along: no error, the guard
	// stays on and allows for the ram's work, and the cube ends ahead of
	// the ram's face, having moved with it (kinematics of a pushed body).
	const v, dt = 0.2, 1e-3
	w, box := ramScene(t, v, true)
	run(t, w, dt, 1.5, nil)
	// The ram's face starts at x = 0.05 and travels v t = 0.3 m; the cube's
	// centre is then 25 mm ahead of it, or farther if it slid on.
	if x := w.Position(box)[0]; x < 0.05+0.3+0.025-maxRestMove {
		t.Errorf("cube at x = %.4f m, behind the ram's face", x)
	}
}
