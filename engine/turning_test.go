package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// turntableMaxDrift is how far a block that friction holds on a turntable
// may leave the table's material point it started on, m: a tenth of a
// millimetre over the run, where the tangent-line error this test guards
// against moved it 7 mm at 1 ms and 110 mm at 1/60 s in 5 s (r (w dt)^2 / 2
// a step); what remains is the solver's tolerance and the position pass.
const turntableMaxDrift = 1e-4

// turntableMinSlide is how far outward a block must have moved when
// friction cannot hold it (mu g < r w^2), m: 5 cm in 2 s, where an
// unconstrained block (no friction at all) would leave the 0.5 m table.
const turntableMinSlide = 0.05

func TestTurntableHoldsBlock(t *testing.T) {
	// A block on a table turning at w about a vertical axis, at radius r,
	// turns with it as long as static friction supplies the centripetal
	// force: m r w^2 <= mu m g (Meriam and Kraige, Engineering Mechanics:
	// Dynamics, particle kinetics in normal and tangential coordinates).
	// Held, the block stays on the table's material point it started on;
	// not held, it slides outward.
	const seconds = 5.0
	for _, c := range []struct {
		name     string
		r, w, mu float64
		dt       float64
		held     bool
	}{
		{"held 1 ms", 0.3, 3, 0.8, 1e-3, true},
		{"held 1/60 s", 0.3, 3, 0.8, 1.0 / 60, true},
		{"held 1/30 s", 0.15, 5, 0.9, 1.0 / 30, true},
		{"held small r fast", 0.05, 10, 0.6, 1e-3, true}, // r w^2 = 5 m/s^2 < 5.9
		{"slides 1 ms", 0.3, 6, 0.5, 1e-3, false},        // r w^2 = 10.8 m/s^2 > 4.9
		{"slides 1/60 s", 0.3, 6, 0.5, 1.0 / 60, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			w := newTestWorld(t, DefaultConfig())
			mat, err := w.AddMaterial(Material{Friction: c.mu})
			if err != nil {
				t.Fatal(err)
			}
			tab := mustAdd(t, w, BodyDef{Name: "table", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.5, 0.5, 0.05}},
				Material: mat, Position: shapes.Vec3{0, 0, -0.05}})
			w.SetVelocity(tab, shapes.Vec3{}, shapes.Vec3{0, 0, c.w})
			const h = 0.02
			blk := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{h, h, h}}, Density: 1000, Material: mat,
				Position: shapes.Vec3{c.r, 0, h}, Velocity: shapes.Vec3{0, c.w * c.r, 0}, Spin: shapes.Vec3{0, 0, c.w}})
			run(t, w, c.dt, seconds, nil)
			if c.held != (c.r*c.w*c.w <= c.mu*g0) {
				t.Fatal("case inconsistent with the friction condition")
			}
			p := w.Position(blk)
			rNow := math.Hypot(p[0], p[1])
			if !c.held {
				if rNow-c.r < turntableMinSlide {
					t.Errorf("r w^2 = %.3g > mu g = %.3g, but the block moved out only %.3g m", c.r*c.w*c.w, c.mu*g0, rNow-c.r)
				}
				return
			}
			// Where the table's material point under the block is now: the
			// start point turned by the table's angle.
			q := w.Orientation(tab)
			want := q.Rotate(shapes.Vec3{c.r, 0, 0})
			if d := math.Hypot(p[0]-want[0], p[1]-want[1]); d > turntableMaxDrift {
				t.Errorf("block %.3g m from the table point it started on (radius %.6f, started %.3f), want below %g",
					d, rNow, c.r, turntableMaxDrift)
			}
		})
	}
}

// tiltMaxDrift is how far a block that friction holds on a tilting table
// may leave the table's material point it started on, m: 50 um. Turning
// with the table, the block is left off by an amount that grows as the
// step squared (6 um at 1/60 s, 25 um at 1/30 s, measured), while the
// tangent-line error put it 0.13 mm off at 1 ms, 2.1 mm at 1/60 s and
// 4.2 mm at 1/30 s.
const tiltMaxDrift = 5e-5

func TestTiltingTableHoldsBlock(t *testing.T) {
	// A table turning at 1 rad/s about a horizontal axis through its centre
	// carries a block 0.5 m from the axis up to 0.5 rad (28.6 degrees),
	// short of the friction angle atan(0.9) = 42 degrees even with the
	// centripetal and tangential accelerations (0.5 m/s^2 at most): the
	// block turns with the table, on the circle of its material point
	// (rotation about a fixed axis; Meriam and Kraige, Engineering
	// Mechanics: Dynamics).
	const h, r, wy, seconds = 0.02, 0.5, -1.0, 0.5
	for _, dt := range []float64{1e-3, 1.0 / 60, 1.0 / 30} {
		w := newTestWorld(t, DefaultConfig())
		mat, err := w.AddMaterial(Material{Friction: 0.9})
		if err != nil {
			t.Fatal(err)
		}
		tab := mustAdd(t, w, BodyDef{Name: "table", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{0.6, 0.3, 0.02}},
			Material: mat, Position: shapes.Vec3{0, 0, -0.02}})
		w.SetVelocity(tab, shapes.Vec3{}, shapes.Vec3{0, wy, 0}) // +x rises
		blk := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{h, h, h}}, Density: 1000, Material: mat,
			Position: shapes.Vec3{r, 0, h}})
		run(t, w, dt, seconds, nil)
		q := w.Orientation(tab)
		want := w.Position(tab).Add(q.Rotate(shapes.Vec3{r, 0, 0.02 + h}))
		if d := w.Position(blk).Sub(want).Len(); d > tiltMaxDrift {
			t.Errorf("dt %.4g: block %.3g m from the table point it started on, want below %g", dt, d, tiltMaxDrift)
		}
	}
}
