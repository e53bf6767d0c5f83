package engine

import (
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// napPoseTol bounds how far a nap may leave a body from where the full
// steps would have: below napSpeed, the left-out rest of the wait moves a
// body by less than napFraction of the slop (1e-10 m at the default); ten
// times that leaves room for the rounding of the steps after a wake, which
// start from the napped pose instead of one a few 1e-11 m away.
const napPoseTol = 10 * napFraction * 1e-4

// napCase is a world (naps off for the reference) with the bodies to
// watch, stepped at 1 ms for steps, and an action at step actAt.
type napCase struct {
	name  string
	build func(t *testing.T, off bool) (w *World, watch []BodyID)
	act   func(t *testing.T, w *World) // at step actAt, if not nil; the body naps then
	actAt int
	steps int
}

func napBox(t *testing.T, off bool, tilt float64) (*World, BodyID) {
	w, mat := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.5, Restitution: 0.3})
	w.nap.off = off
	q := mgl64.QuatRotate(tilt, shapes.Vec3{1, 0.3, 0}.Normalize())
	id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{0.04, 0.03, 0.02}}, Density: 700,
		Material: mat, Position: shapes.Vec3{0, 0, 0.1}, Orientation: q})
	return w, id
}

var napCases = []napCase{{
	// A box dropped 6 cm at a tilt lands on an edge, rocks and settles:
	// the nap spares most of its rest time.
	name: "tilted drop",
	build: func(t *testing.T, off bool) (*World, []BodyID) {
		w, id := napBox(t, off, 0.4)
		return w, []BodyID{id}
	},
	steps: 2000,
}, {
	// A five-row pyramid of boxes rests as one island of fifteen bodies.
	name: "pyramid",
	build: func(t *testing.T, off bool) (*World, []BodyID) {
		w, mat := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.6})
		w.nap.off = off
		return w, addPyramid(t, w, mat) // sleep_test.go
	},
	steps: 3000,
}, {
	// A ball dropped onto the box while it naps: the box is woken by the
	// ball's pair and is struck as it would have been awake.
	name: "struck while napping",
	build: func(t *testing.T, off bool) (*World, []BodyID) {
		w, id := napBox(t, off, 0.4)
		return w, []BodyID{id}
	},
	act: func(t *testing.T, w *World) {
		box := BodyID(1)
		mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: 0.01}, Density: 1000,
			Position: w.Position(box).Add(shapes.Vec3{0.01, 0, 0.08})})
	},
	actAt: 400,
	steps: 2000,
}, {
	// A kick on the napping box.
	name: "kicked while napping",
	build: func(t *testing.T, off bool) (*World, []BodyID) {
		w, id := napBox(t, off, 0.4)
		return w, []BodyID{id}
	},
	act: func(t *testing.T, w *World) {
		if err := w.Kick(1, w.time, shapes.Vec3{0.02, 0, 0}, shapes.Vec3{}, true); err != nil {
			t.Fatal(err)
		}
	},
	actAt: 400,
	steps: 2000,
}, {
	// The floor lowered by 1 mm by hand while the box naps: the box must
	// fall onto it as it would have awake.
	name: "support lowered while napping",
	build: func(t *testing.T, off bool) (*World, []BodyID) {
		w, id := napBox(t, off, 0.4)
		return w, []BodyID{id}
	},
	act: func(t *testing.T, w *World) {
		w.SetPose(0, shapes.Vec3{0, 0, -1e-3}, mgl64.QuatIdent())
	},
	actAt: 400,
	steps: 2000,
}}

// TestNapSameAsFullSteps checks naps against the same worlds stepped in
// full (naps off, the reference): the same events at the same steps (rest
// declared when it was, the same Sleep events, no Wake for a napping body),
// the same Settled time, Awake true while a body naps, and final poses
// within napPoseTol. Each case must nap for some steps, or the test would
// not test naps.
func TestNapSameAsFullSteps(t *testing.T) {
	for _, tc := range napCases {
		t.Run(tc.name, func(t *testing.T) {
			type run struct {
				events  []Event
				pos     []shapes.Vec3
				settled float64
				napped  int
			}
			do := func(off bool) run {
				w, ids := tc.build(t, off)
				var r run
				for n := 0; n < tc.steps; n++ {
					if tc.act != nil && n == tc.actAt {
						if !off && !w.napping(ids[0]) {
							t.Fatalf("step %d: the body does not nap when acted on", n)
						}
						tc.act(t, w)
					}
					if err := w.Step(1e-3); err != nil {
						t.Fatal(err)
					}
					r.events = append(r.events, w.Events()...)
					for _, id := range ids {
						if w.napping(id) {
							r.napped++
							if !w.Awake(id) {
								t.Fatalf("step %d: body %d naps but Awake says it sleeps", n, id)
							}
						}
					}
				}
				for _, id := range ids {
					r.pos = append(r.pos, w.Position(id))
				}
				_, r.settled = w.Settled()
				return r
			}
			ref, got := do(true), do(false)
			if got.napped == 0 {
				t.Fatal("no body napped")
			}
			if ref.napped != 0 {
				t.Fatal("the reference napped")
			}
			if got.settled != ref.settled && !(math.IsNaN(got.settled) && math.IsNaN(ref.settled)) {
				t.Errorf("settled at %v s, full steps at %v s", got.settled, ref.settled)
			}
			if len(got.events) != len(ref.events) {
				t.Fatalf("%d events, full steps %d:\n%v\n%v", len(got.events), len(ref.events), got.events, ref.events)
			}
			for i, e := range got.events {
				r := ref.events[i]
				if e.Kind != r.Kind || e.Time != r.Time || e.A != r.A || e.B != r.B {
					t.Errorf("event %d: %v at %v s (%d, %d), full steps %v at %v s (%d, %d)", i, e.Kind, e.Time, e.A, e.B, r.Kind, r.Time, r.A, r.B)
				}
			}
			for i := range got.pos {
				if d := got.pos[i].Sub(ref.pos[i]).Len(); !(d <= napPoseTol) {
					t.Errorf("body %d ends %.3g m from where full steps leave it (tolerance %.3g)", i, d, napPoseTol)
				}
			}
			t.Logf("%d body-steps napped; final poses within %.3g m", got.napped, maxDist(got.pos, ref.pos))
		})
	}
}

func maxDist(a, b []shapes.Vec3) float64 {
	m := 0.0
	for i := range a {
		m = max(m, a[i].Sub(b[i]).Len())
	}
	return m
}
