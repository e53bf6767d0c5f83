package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// restingPile is a five-row pyramid of 10 cm boxes (5, 4, 3, 2, 1; each row
// offset by half a box, the statics of a masonry pyramid) on a floor, run
// until every box sleeps. It returns the world, the boxes and the step.
// pileRows is the number of rows of the test pile.
const pileRows = 5

func restingPile(t *testing.T, dt float64) (*World, []BodyID, float64) {
	t.Helper()
	w, mat := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.6})
	ids := addPyramid(t, w, mat)
	for n := 0; n < int(3/dt) && w.anyAwake(ids); n++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
	}
	if w.anyAwake(ids) {
		t.Fatal("the pile did not fall asleep within 3 s")
	}
	return w, ids, dt
}

// addPyramid adds restingPile's pyramid of pileRows rows of 10 cm boxes
// of material mat to w, at rest, and returns the boxes.
func addPyramid(t *testing.T, w *World, mat int) []BodyID {
	t.Helper()
	const h = 0.05
	var ids []BodyID
	for row := 0; row < pileRows; row++ {
		n := pileRows - row
		for i := 0; i < n; i++ {
			x := (float64(i) - float64(n-1)/2) * 2 * h * 1.01
			ids = append(ids, mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: shapes.Vec3{h, h, h}},
				Density: 500, Material: mat, Position: shapes.Vec3{x, 0, h + 2*h*float64(row)}}))
		}
	}
	return ids
}

func (w *World) anyAwake(ids []BodyID) bool {
	for _, id := range ids {
		if w.Awake(id) {
			return true
		}
	}
	return false
}

func TestSleepingPileIgnoresPassingBody(t *testing.T) {
	// A ball rolls past the corner of the pile's base: their bounding boxes
	// overlap, their surfaces stay 5 mm apart. Nothing touches the pile, so
	// it must stay asleep.
	w, ids, dt := restingPile(t, 1e-3)
	const r, gap, v = 0.03, 0.005, 0.5
	// The base's corner edge at (+x, +y); the ball's path is perpendicular
	// to the corner's diagonal, closest to the edge at r+gap.
	corner := w.Position(ids[pileRows-1]).Add(shapes.Vec3{0.05, 0.05, 0})
	a := (r + gap) / math.Sqrt2 // the ball's offset along x and y at its closest
	dir := shapes.Vec3{1, -1, 0}.Normalize()
	closest := shapes.Vec3{corner[0] + a, corner[1] + a, r}
	start := closest.Sub(dir.Mul(v * 0.2))
	vel := dir.Mul(v)
	ball := mustAdd(t, w, BodyDef{Name: "ball", Shape: shapes.Sphere{Radius: r}, Density: 500, Position: start,
		Velocity: vel, Spin: shapes.Vec3{0, 0, 1}.Cross(vel).Mul(1 / r)}) // rolling: no slip at the floor
	overlapped := false
	for n := 0; n < 400; n++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		overlapped = overlapped || w.b.bounds[ball].Overlaps(w.b.bounds[ids[pileRows-1]])
		for _, e := range w.Events() {
			if e.Kind == Wake {
				t.Fatalf("t = %.3f s: %s %d woke; nothing touched the pile", e.Time, w.Name(e.A), e.A)
			}
		}
	}
	if !overlapped {
		t.Fatal("the ball's bounds never overlapped the box's: the test does not test what it should")
	}
	if w.anyAwake(ids) {
		t.Error("the pile woke up")
	}
}

// lurchTolerance is the largest speed a pile body may have right after a
// gentle touch wakes it: the world's default rest speed (Config.RestSpeed),
// below which a body counts as resting.
const lurchTolerance = 5e-3

func TestWokenPileHoldsStill(t *testing.T) {
	// A 4 g cube dropped 2 mm onto the top of the sleeping pile wakes it.
	// Bodies at rest stay at rest unless an impulse acts (Newton's first
	// law): the only new impulse is the cube's momentum, m v = 4 g x 0.2 m/s,
	// which moves the 0.5 kg top box by at most m v / (m + M) = 1.6 mm/s even
	// if nothing held it from below. A woken pile that had forgotten its
	// contact loads would instead sag under a step of gravity and rebound
	// (measured: 8 mm/s at 4 ms steps without the memory; 14 to 62 mm/s at
	// 1 to 4 ms when a woken pile lost both the memory and a step of gravity).
	for _, dt := range []float64{1e-3, 2e-3, 4e-3} {
		w, ids, dt := restingPile(t, dt)
		top := w.Position(ids[len(ids)-1])
		mustAdd(t, w, BodyDef{Name: "cube", Shape: shapes.Box{Half: shapes.Vec3{0.01, 0.01, 0.01}}, Density: 500,
			Position: top.Add(shapes.Vec3{0, 0, 0.05 + 0.01 + 0.002})})
		woke := math.NaN()
		worst := 0.0
		for n := 0; n < int(0.3/dt); n++ {
			if err := w.Step(dt); err != nil {
				t.Fatal(err)
			}
			if math.IsNaN(woke) && w.Awake(ids[0]) {
				woke = w.Time()
			}
			if !math.IsNaN(woke) && w.Time() < woke+0.1 {
				for _, id := range ids {
					worst = math.Max(worst, w.Velocity(id).Len())
				}
			}
		}
		if math.IsNaN(woke) {
			t.Fatalf("dt %g s: the cube landed on the pile and did not wake it", dt)
		}
		if worst > lurchTolerance {
			t.Errorf("dt %g s: a pile box reached %.3g m/s within 0.1 s of waking; want below %.3g m/s", dt, worst, lurchTolerance)
		}
	}
}

// stillTolerance is the largest speed of a pile woken without any impulse:
// a fiftieth of the rest speed. Its contacts resume exactly the loads they
// carried as it fell asleep, so what remains is the residual of the
// stack's unconverged velocity iterations (measured 2.4e-5 m/s at 4 ms
// steps; a pile woken without its loads reached 0.07 m/s).
const stillTolerance = 1e-4

func TestPileWokenWithoutImpulseStaysStill(t *testing.T) {
	// Waking a resting pile (setting a body's velocity to the zero it
	// already has) applies no impulse, so no body may change its velocity
	// (Newton's first law; the pile was in equilibrium).
	for _, dt := range []float64{1e-3, 4e-3} {
		w, ids, dt := restingPile(t, dt)
		w.SetVelocity(ids[0], shapes.Vec3{}, shapes.Vec3{})
		worst := 0.0
		for n := 0; n < int(0.1/dt); n++ {
			if err := w.Step(dt); err != nil {
				t.Fatal(err)
			}
			for _, id := range ids {
				worst = math.Max(worst, w.Velocity(id).Len())
			}
		}
		if !w.anyAwake(ids) {
			t.Fatalf("dt %g s: the pile did not wake", dt)
		}
		if worst > stillTolerance {
			t.Errorf("dt %g s: a pile box reached %.3g m/s after waking with no impulse; want below %.3g m/s", dt, worst, stillTolerance)
		}
	}
}
