package engine

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"clatter/shapes"
)

// The lengths the engine judges by besides the solver's slop: how deep a
// drive may press into a part before it counts as jammed, and how far
// bodies may start inside each other. By dimensional analysis (the
// scaling probe, scale_test.go) a case s times larger, its times s^(1/2)
// times longer, is the same case; a fixed length in these judgements makes
// a 1 mm part behave unlike the same part at 10 cm. They follow the slop of
// the contact (slop.go), which is at most a hundredth of a small part's
// radius.

// sizeFactors are the part sizes of these tests: 1 mm to 10 m.
var sizeFactors = []float64{1e-3, 1e-2, 0.1, 1, 10}

// jamMaxDepth is how deep, as a fraction of the part's size, a drive may
// have pressed into a part when the jam is reported: five slops of at most
// 1 percent of the part's radius (0.87 sizes for a cube) and one step of
// the ram's travel (0.004 sizes here), 0.047 sizes. A tenth keeps the
// report before anything a user would see as a crushed part; the fixed
// 1 mm of five default slops was a whole 1 mm part.
const jamMaxDepth = 0.1

// jamLate bounds how late the jam may come, as a fraction of the time the
// ram takes to close the gap: the press is shared between the ram's and
// the wall's contact and the position pass pushes part of it out each
// step, so the ram travels a few of the depths before one is predicted that
// deep (measured at most 0.066 late, 1 mm cube at 1 ms; 0.0004 at 10 m).
// With a fixed 1 mm of press a 1 mm cube never jammed.
const jamLate = 0.1

// TestJamAtEverySize drives a ram at a cube of size s in front of a fixed
// wall closer than the cube is wide: no motion of a rigid cube satisfies
// both contacts (geometry), so the run must stop with a jam naming the
// cube, the ram and the wall, at every size, before the ram has pressed a
// tenth of the cube's size into it.
func TestJamAtEverySize(t *testing.T) {
	for _, s := range sizeFactors {
		for _, stepped := range []struct {
			name string
			dt   float64
		}{{"step scaled", 1e-3 * math.Sqrt(s/0.05)}, {"step 1 ms", 1e-3}} {
			t.Run(fmt.Sprintf("size %g m, %s", s, stepped.name), func(t *testing.T) {
				// ramScene's 50 mm cube, scaled by k, and its speed 0.2 m/s
				// at 50 mm scaled as the speeds, sqrt(k).
				k := s / 0.05
				v := 0.2 * math.Sqrt(k)
				w, box := scaledRamScene(t, k, v)
				var err error
				for i := 0; float64(i)*stepped.dt < 0.5*k/v && err == nil; i++ {
					err = w.Step(stepped.dt)
				}
				var je *JamError
				if !errors.As(err, &je) {
					t.Fatalf("got %v, want a jam error", err)
				}
				if je.Body != box || len(je.By) != 2 || je.By[0] != "ram" || je.By[1] != "wall" {
					t.Errorf("jam names %q held by %q, want box held by ram and wall", je.Name, je.By)
				}
				if d := je.Depth / s; !(d <= jamMaxDepth) {
					t.Errorf("the ram pressed %.3g of the cube's size into it before the jam, want at most %g", d, jamMaxDepth)
				}
				// Geometry: the ram's face travels 0.125 k to the cube and
				// 0.025 k more to press it against the wall, at 0.75
				// sqrt(k) s, the same time in units of sqrt(k) at every size.
				closed := 0.15 * k / v
				if r := je.Time / closed; !(r >= 1-stepped.dt/closed && r <= 1+jamLate) {
					t.Errorf("jam at %.4g s, %.4g times the %.4g s at which the ram closed the gap, want 1 to %g", je.Time, r, closed, 1+jamLate)
				}
			})
		}
	}
}

// scaledRamScene is ramScene (jam_test.go) with every length times k: a
// ram 2k wide driven along +x at v toward a cube of 0.05 k, with a wall
// 0.025 k beyond it.
func scaledRamScene(t *testing.T, k, v float64) (*World, BodyID) {
	t.Helper()
	w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.5})
	box3 := func(x, y, z float64) shapes.Shape { return shapes.Box{Half: shapes.Vec3{x * k, y * k, z * k}} }
	mustAdd(t, w, BodyDef{Name: "wall", Kind: Static, Shape: box3(0.05, 0.2, 0.1), Material: mat, Position: shapes.Vec3{0.3 * k, 0, 0.1 * k}})
	box := mustAdd(t, w, BodyDef{Name: "box", Shape: box3(0.025, 0.025, 0.025), Density: 500, Material: mat, Position: shapes.Vec3{0.2 * k, 0, 0.025 * k}})
	ram := mustAdd(t, w, BodyDef{Name: "ram", Kind: Kinematic, Shape: box3(0.05, 0.1, 0.05), Material: mat, Position: shapes.Vec3{0, 0, 0.051 * k}})
	stroke := 0.4 * k
	table := &PoseTable{Times: []float64{0, stroke / v}, Relative: true,
		Poses: []shapes.Pose{{Orientation: shapes.Quat{W: 1}}, {Position: shapes.Vec3{stroke, 0, 0}, Orientation: shapes.Quat{W: 1}}}}
	if err := w.SetMotion(ram, table); err != nil {
		t.Fatal(err)
	}
	return w, box
}

// startOverlap is the overlap, as a fraction of a part's size, that a
// scene must refuse at every size: 5 percent of a part is inside its
// support, five times the most a resting contact sinks (its slop, at most
// 1 percent of the radius).
const startOverlap = 0.05

// TestStartOverlapAtEverySize sets a cube of size s into its floor by 5
// percent of its size, which CheckOverlaps must refuse at every size (the
// fixed 0.2 mm let a 1 mm cube start a fifth of its size inside), and lets
// a cube set down on the floor settle, whose resting pose it must accept
// at every size and step: the sink of resting contact is not an overlap.
func TestStartOverlapAtEverySize(t *testing.T) {
	for _, s := range sizeFactors {
		t.Run(fmt.Sprintf("size %g m", s), func(t *testing.T) {
			w, mat := floorWorld(t, Config{}, 0, Material{Friction: 0.5})
			hh := 0.5 * s
			mustAdd(t, w, BodyDef{Name: "cube", Shape: shapes.Box{Half: shapes.Vec3{hh, hh, hh}}, Density: 1000, Material: mat,
				Position: shapes.Vec3{0, 0, hh - startOverlap*s}})
			var oe *OverlapError
			if err := w.CheckOverlaps(); !errors.As(err, &oe) {
				t.Fatalf("a cube %g of its size inside the floor: got %v, want an overlap error", startOverlap, err)
			}
			// overlapDepthTol: the depth reported is the narrow phase's,
			// exact for a face on a plane to rounding.
			const overlapDepthTol = 1e-9
			if !(math.Abs(oe.Depth-startOverlap*s) <= overlapDepthTol*s) {
				t.Errorf("depth %.6g m, want %.6g", oe.Depth, startOverlap*s)
			}
		})
		for _, dt := range restSteps {
			t.Run(fmt.Sprintf("size %g m, settled at %.3g s", s, dt), func(t *testing.T) {
				w, mat := floorWorld(t, Config{}, 0, Material{Friction: 0.5, Restitution: 0.5})
				hh := 0.5 * s
				mustAdd(t, w, BodyDef{Name: "cube", Shape: shapes.Box{Half: shapes.Vec3{hh, hh, hh}}, Density: 1000, Material: mat,
					Position: shapes.Vec3{0, 0, hh + 0.01*s}})
				run(t, w, dt, max(10*dt, 2*math.Sqrt(s/g0)), nil)
				if err := w.CheckOverlaps(); err != nil {
					t.Errorf("the settled cube: %v", err)
				}
			})
		}
	}
}

// restSteps are the steps of the rest tests, coarse to fine.
var restSteps = []float64{1.0 / 30, 1.0 / 60, 1e-3, 1e-4}

// Bounds of TestBouncyRestsAtEverySize, in the part's own units.
const (
	// restJitter: the largest speed of a part at rest, over g dt, the
	// speed one step of gravity gives. A contact with restitution that
	// bounced a part at rest would return a good part of g dt at once;
	// what the solver leaves is its convergence, measured at most 1e-6 g dt.
	restJitter = 1e-4
	// restCreep: how far a part at rest may move, over its size: a
	// micrometre on a 1 cm part (measured at most 1.2e-5 of a 1 mm cube
	// on a cube at 1/60 s, a step 1.7 times the cube's sqrt(L/g)).
	restCreep = 1e-4
)

// TestBouncyRestsAtEverySize sets bodies down at rest on a floor (a cube,
// a ball, a cube on a cube) with restitution 0.5 to 0.9, kept awake, at
// sizes from 1 mm to 10 m and steps from 1/30 s to 0.1 ms. A body at rest
// has no approach speed, and Newton's law of restitution returns e times
// the approach speed (W. Goldsmith, "Impact", 1960, chapter 1): zero.
// Each must stay at rest, without jitter or creep, for 20 sqrt(L/g) (at
// least 1 s).
func TestBouncyRestsAtEverySize(t *testing.T) {
	if testing.Short() {
		t.Skip("some 200 runs of up to 200000 steps")
	}
	for _, layout := range []string{"cube", "ball", "cube on cube"} {
		for _, e := range []float64{0.5, 0.9} {
			for _, s := range []float64{1e-3, 1e-2, 1, 10} {
				for _, dt := range restSteps {
					name := fmt.Sprintf("%s, e %g, size %g m, step %.3g s", layout, e, s, dt)
					speed, move := restAwake(t, layout, e, s, dt)
					if !(speed <= restJitter*g0*dt) {
						t.Errorf("%s: speed up to %.3g m/s, want at most %.3g (%g g dt)", name, speed, restJitter*g0*dt, restJitter)
					}
					if !(move <= restCreep*s) {
						t.Errorf("%s: moved %.3g m, want at most %.3g (%g of its size)", name, move, restCreep*s, restCreep)
					}
				}
			}
		}
	}
}

// restAwake sets layout down at rest with restitution e at size s, steps
// it at dt for 20 sqrt(s/g) (at least 1 s) with sleep off, and returns the
// top body's largest speed and farthest move from where it was set.
func restAwake(t *testing.T, layout string, e, s, dt float64) (speed, move float64) {
	t.Helper()
	w, mat := floorWorld(t, Config{NoSleep: true}, 0, Material{Friction: 0.5, Restitution: e})
	hh := 0.5 * s
	cube := shapes.Box{Half: shapes.Vec3{hh, hh, hh}}
	var shape shapes.Shape = cube
	start := shapes.Vec3{0, 0, hh}
	switch layout {
	case "ball":
		shape = shapes.Sphere{Radius: hh}
	case "cube on cube":
		mustAdd(t, w, BodyDef{Name: "base", Shape: cube, Density: 1000, Material: mat, Position: start})
		start[2] = 3 * hh
	}
	id := mustAdd(t, w, BodyDef{Name: "top", Shape: shape, Density: 1000, Material: mat, Position: start})
	run(t, w, dt, max(1, 20*math.Sqrt(s/g0)), func() {
		speed = max(speed, w.Velocity(id).Len())
		move = max(move, w.Position(id).Sub(start).Len())
	})
	return speed, move
}

// similarSpread: with the step scaled as the times, a case at any size is
// the same case as at 1 m, and its dimensionless results differ only by
// the rounding of lengths that are not binary multiples of each other and
// by the slop, which is 1 percent of the radius below 2 cm and a smaller
// part of larger parts (contact/slop.go). Measured: third rebounds of a
// ball at e = 0.5 within 3e-6 of the 1 m ball's, a stack of five's top
// within 2e-5 of the size. A bounce from within the slop that left at e
// times the approach (contact/gapbounce.go) rose 6 percent high at 1 mm.
const similarSpread = 1e-3

// TestSimilarAtEverySize drops a ball of diameter s from s with e = 0.5
// and follows it through three rebounds to rest, and stacks five cubes of
// size s, at sizes from 1 mm to 10 m with the step 1 ms at 1 m scaled as
// the times, s^(1/2). Each dimensionless result must match the analytic
// one and the result at 1 m: rebound heights e^(2n) of the drop height
// (Newton's law of restitution; W. Goldsmith, "Impact", 1960, chapter 1),
// the ball at rest on the floor, the stack straight and its top at 4.5
// sizes (statics of rigid cubes), by dimensional analysis the same at
// every size (scale_test.go).
func TestSimilarAtEverySize(t *testing.T) {
	type result struct {
		name, ref string
		want, tol float64
		got       float64
	}
	measure := func(s float64) []result {
		dt := scaleStep * math.Sqrt(s)
		var rs []result
		for n := 1; n <= 3; n++ {
			rs = append(rs, result{fmt.Sprintf("ball rebound %d / drop height", n), "e^(2n), Newton's law of restitution",
				math.Pow(0.25, float64(n)), scaleApexTol * math.Pow(0.25, float64(n)), ballApex(t, s, 1000, dt, 0.5, n)})
		}
		rs = append(rs, result{"ball at rest: height above the floor / size", "statics: resting on the floor, 0",
			0, scaleSinkTol, ballRestHeight(t, s, dt)})
		w, ids := stackOf(t, 5, s, dt)
		drift := 0.0
		for _, id := range ids {
			drift = max(drift, math.Hypot(w.Position(id)[0], w.Position(id)[1])/s)
		}
		rs = append(rs, result{"stack of 5: sideways drift / size", "statics: a straight stack stays straight", 0, scaleDriftTol, drift},
			result{"stack of 5: top sunk below 4.5 sizes / size", "statics: rigid cubes", 0, 5 * scaleSinkTol, (4.5*s - w.Position(ids[4])[2]) / s})
		return rs
	}
	ref := measure(1)
	for _, s := range sizeFactors {
		for k, r := range measure(s) {
			if !(math.Abs(r.got-r.want) <= r.tol) {
				t.Errorf("size %g m: %s = %.6g, want %.6g within %.3g (%s)", s, r.name, r.got, r.want, r.tol, r.ref)
			}
			if d := math.Abs(r.got - ref[k].got); !(d <= similarSpread*scaleOf(r.want)) {
				t.Errorf("size %g m: %s = %.6g, at 1 m %.6g: differs by %.3g (dimensional analysis: the same case)", s, r.name, r.got, ref[k].got, d)
			}
		}
	}
}

// scaleOf is the scale of a result whose analytic value is want: itself,
// or 1 for a result that should be 0 (a fraction of the size).
func scaleOf(want float64) float64 {
	if want == 0 {
		return 1
	}
	return math.Abs(want)
}

// ballRestHeight drops a ball of diameter s from s with e = 0.5, lets it
// come to rest and returns the height of its lowest point over s.
func ballRestHeight(t *testing.T, s, dt float64) float64 {
	w, mat := scaleWorld(t, 0, 0.3, 0.5)
	r := 0.5 * s
	id := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: 1000, Material: mat, Position: shapes.Vec3{0, 0, r + s}})
	settle(t, w, dt, 20*math.Sqrt(s)+2*DefaultRestTime)
	return (w.Position(id)[2] - r) / s
}

// stackOf sets n cubes of size s on each other, 1 percent apart, and lets
// them settle; it returns the world and the ids bottom first.
func stackOf(t *testing.T, n int, s, dt float64) (*World, []BodyID) {
	w, mat := scaleWorld(t, 0, 0.5, 0)
	hh := 0.5 * s
	var ids []BodyID
	for i := 0; i < n; i++ {
		ids = append(ids, mustAdd(t, w, BodyDef{Name: fmt.Sprint("cube", i), Shape: shapes.Box{Half: shapes.Vec3{hh, hh, hh}}, Density: 1000, Material: mat,
			Position: shapes.Vec3{0, 0, hh + float64(i)*1.01*s}}))
	}
	settle(t, w, dt, 5*math.Sqrt(s)+2*DefaultRestTime)
	return w, ids
}
