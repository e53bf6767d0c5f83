package engine

import (
	"errors"
	"math"
	"testing"

	"clatter/shapes"
)

// overlapTol is the error allowed on a measured starting overlap: the
// box-plane and box-box depths are exact up to rounding of metre-sized sums.
const overlapTol = 1e-12

func TestCheckOverlaps(t *testing.T) {
	// Depths by plain geometry: a 50 mm cube (half 25 mm) whose centre is z
	// above the floor sinks 25 mm - z into it; two such cubes with centres d
	// apart along x overlap by 50 mm - d.
	cube := shapes.Box{Half: shapes.Vec3{0.025, 0.025, 0.025}}
	cases := []struct {
		name   string
		a, b   shapes.Vec3 // cube centres; b unused when NaN
		joint  bool
		depth  float64 // 0: no error
		inner  string
		out    shapes.Vec3
		phrase string
	}{
		{name: "resting exactly", a: shapes.Vec3{0, 0, 0.025}, b: shapes.Vec3{math.NaN()}},
		{name: "within the slop", a: shapes.Vec3{0, 0, 0.025 - 1e-4}, b: shapes.Vec3{math.NaN()}},
		{name: "inside the floor", a: shapes.Vec3{0, 0, 0.0127}, b: shapes.Vec3{math.NaN()}, depth: 0.0123, inner: "a", out: shapes.Vec3{0, 0, 1},
			phrase: `body "a" starts 12.3 mm inside body "floor"; move it up by at least 12.3 mm`},
		{name: "side by side", a: shapes.Vec3{0, 0, 0.025}, b: shapes.Vec3{0.045, 0, 0.025}, depth: 0.005, inner: "b", out: shapes.Vec3{1, 0, 0},
			phrase: `body "b" starts 5.0 mm inside body "a"; move it along (1, 0, 0) by at least 5.0 mm`},
		{name: "jointed", a: shapes.Vec3{0, 0, 0.025}, b: shapes.Vec3{0.045, 0, 0.025}, joint: true},
	}
	for _, c := range cases {
		w, _ := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.5})
		a := mustAdd(t, w, BodyDef{Name: "a", Shape: cube, Density: 500, Position: c.a})
		if !math.IsNaN(c.b[0]) {
			b := mustAdd(t, w, BodyDef{Name: "b", Shape: cube, Density: 500, Position: c.b})
			if c.joint {
				if _, err := w.AddJoint(JointDef{Kind: Revolute, A: b, B: a, Anchor: shapes.Vec3{0.0225, 0, 0.025}, Axis: shapes.Vec3{0, 1, 0}}); err != nil {
					t.Fatal(err)
				}
			}
		}
		err := w.CheckOverlaps()
		var oe *OverlapError
		switch {
		case c.depth == 0 && err != nil:
			t.Errorf("%s: %v; want no error", c.name, err)
		case c.depth == 0:
		case !errors.As(err, &oe):
			t.Errorf("%s: error %v, want an *OverlapError", c.name, err)
		case math.Abs(oe.Depth-c.depth) > overlapTol || oe.InnerName != c.inner || oe.Out.Sub(c.out).Len() > overlapTol:
			t.Errorf("%s: %q moves %v by %.6g m; want %q, %v, %.6g m", c.name, oe.InnerName, oe.Out, oe.Depth, c.inner, c.out, c.depth)
		case oe.Error() != c.phrase:
			t.Errorf("%s: message\n%s\nwant\n%s", c.name, oe.Error(), c.phrase)
		}
	}
}
