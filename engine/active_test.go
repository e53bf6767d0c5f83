package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

// ledgerTol is the relative agreement of the sleepers' potential energy,
// kept as bodies fall asleep and wake, with its sum taken afresh: the
// ledger adds and subtracts the same products, so only the rounding of a
// few dozen additions separates them (about 1e-16 each).
const ledgerTol = 1e-12

// TestSleepLedgerAndGuard runs a pile far below the world origin, where
// each body's potential energy -m g . x (any mechanics text) is large
// against the energy guard's allowance: the pile falls asleep, is woken by
// a falling box, and sleeps again, and neither the moves of bodies between
// the awake list and the sleepers' ledger nor their potential energy may
// trip the guard. The ledger is checked against the sum over the sleeping
// bodies at every step.
func TestSleepLedgerAndGuard(t *testing.T) {
	const depth = -50.0 // m: the floor's height
	w := newTestWorld(t, DefaultConfig())
	mustAdd(t, w, BodyDef{Name: "floor", Kind: Static, Shape: shapes.Plane{Normal: shapes.Vec3{0, 0, 1}, Offset: depth}})
	const h = 0.05
	box := shapes.Box{Half: shapes.Vec3{h, h, h}}
	var ids []BodyID
	for row := 0; row < 3; row++ {
		for i := 0; i < 3-row; i++ {
			x := (float64(i) - float64(2-row)/2) * 2 * h * 1.01
			ids = append(ids, mustAdd(t, w, BodyDef{Name: "box", Shape: box, Density: 500,
				Position: shapes.Vec3{x, 0, depth + h + 2*h*float64(row)}}))
		}
	}
	// A box apart that sleeps throughout, so the ledger never empties.
	apart := mustAdd(t, w, BodyDef{Name: "apart", Shape: box, Density: 500, Position: shapes.Vec3{1, 0, depth + h}})
	ledger := func(when string) {
		t.Helper()
		sum := 0.0
		for i, k := range w.b.kind {
			if k == Dynamic && !w.b.awake[i] {
				sum += -w.b.mass[i] * w.cfg.Gravity.Dot(w.b.pos[i])
			}
		}
		if got := w.active.sleepPot; math.Abs(got-sum) > ledgerTol*math.Abs(sum) {
			t.Fatalf("%s: sleepers' potential energy %.17g in the ledger, %.17g summed", when, got, sum)
		}
	}
	steps := func(n int) {
		t.Helper()
		for s := 0; s < n; s++ {
			if err := w.Step(1e-3); err != nil {
				t.Fatal(err)
			}
			ledger("step")
		}
	}
	steps(2000)
	if w.anyAwake(ids) {
		t.Fatal("the pile did not fall asleep in 2 s")
	}
	if w.Awake(apart) || w.active.sleepers != len(ids)+1 {
		t.Fatalf("%d sleepers counted, want %d", w.active.sleepers, len(ids)+1)
	}
	top := mustAdd(t, w, BodyDef{Name: "dropped", Shape: box, Density: 500, Position: shapes.Vec3{0, 0, depth + 0.5}})
	woke := false
	for s := 0; s < 400; s++ {
		steps(1)
		woke = woke || w.anyAwake(ids)
	}
	if !woke || w.MaxImpactSpeed(top) == 0 || w.Awake(apart) {
		t.Fatal("the dropped box should strike and wake the pile, and only the pile")
	}
	steps(3000)
	if w.anyAwake(append(ids, top)) {
		t.Fatal("the pile did not fall asleep again in 3 s")
	}
}

// TestTouchingMatchesContacts checks Touching against the step's contact
// points: an awake body touches when one of its points lies at or inside
// the slop; a sleeping or napping one (its pairs skip the narrow phase, so
// it has no points) keeps what it touched as it came to rest (every box of
// a resting pyramid touches something).
func TestTouchingMatchesContacts(t *testing.T) {
	w, ids, dt := restingPile(t, 1.0/240)
	for _, id := range ids {
		if !w.Touching(id) {
			t.Fatalf("sleeping box %d does not touch anything", id)
		}
	}
	// Wake the pile with a kick on the top box and compare step by step.
	if err := w.Kick(ids[len(ids)-1], w.Time(), shapes.Vec3{0.05, 0, 0}, shapes.Vec3{}, true); err != nil {
		t.Fatal(err)
	}
	compared := 0
	for s := 0; s < 200; s++ {
		if err := w.Step(dt); err != nil {
			t.Fatal(err)
		}
		for _, id := range ids {
			if !w.Awake(id) || w.napping(id) {
				if !w.Touching(id) {
					t.Fatalf("step %d: resting box %d does not touch anything", s, id)
				}
				continue
			}
			compared++
			want := false
			for _, p := range w.collision.points {
				if (BodyID(p.A) == id || BodyID(p.B) == id) && p.Separation <= w.cfg.Slop {
					want = true
				}
			}
			if got := w.Touching(id); got != want {
				t.Fatalf("step %d: Touching(%d) = %v, its contact points say %v", s, id, got, want)
			}
		}
	}
	if compared == 0 {
		t.Fatal("no awake box was compared: the kick did not wake the pile")
	}
}

// TestKeptEnergiesStayTrue checks that the energies the guard keeps from
// one step's end for the next step's start equal the sums taken afresh
// (the definitions 1/2 m v^2, 1/2 w . I w and -m g . x, summed anew by
// awakeEnergies) after every way a caller can change the state between
// steps: otherwise the guard would measure a step against a stale start.
func TestKeptEnergiesStayTrue(t *testing.T) {
	w, mat := floorWorld(t, DefaultConfig(), 0, Material{Friction: 0.5})
	box := shapes.Box{Half: shapes.Vec3{0.02, 0.03, 0.01}}
	a := mustAdd(t, w, BodyDef{Name: "a", Shape: box, Density: 900, Material: mat, Position: shapes.Vec3{0, 0, 0.2}, Spin: shapes.Vec3{1, 2, 3}})
	b := mustAdd(t, w, BodyDef{Name: "b", Shape: box, Density: 900, Material: mat, Position: shapes.Vec3{0.2, 0, 0.01}})
	check := func(what string) {
		t.Helper()
		if !w.active.endOK || w.active.endStep != w.Steps() || w.active.endN != w.NumBodies() {
			return // not kept: the next step sums afresh
		}
		l0, r0, p0 := w.startEnergies()
		l1, r1, p1 := w.awakeEnergies()
		if l0 != l1 || r0 != r1 || p0 != p1 {
			t.Fatalf("after %s: kept energies (%g, %g, %g), afresh (%g, %g, %g)", what, l0, r0, p0, l1, r1, p1)
		}
	}
	changes := []struct {
		what string
		do   func()
	}{
		{"a step", func() {}},
		{"SetVelocity", func() { w.SetVelocity(a, shapes.Vec3{0.1, 0, 0}, shapes.Vec3{0, 0, 1}) }},
		{"SetPose", func() { w.SetPose(a, shapes.Vec3{0, 0, 0.3}, shapes.Quat{W: 1}) }},
		{"ApplyImpulse", func() { w.ApplyImpulse(a, shapes.Vec3{0, 0.01, 0}, shapes.Vec3{0.01, 0, 0.3}) }},
		{"SetGravity", func() { _ = w.SetGravity(shapes.Vec3{0, 1, -9}) }},
		{"AddBody", func() {
			mustAdd(t, w, BodyDef{Name: "c", Shape: box, Density: 900, Material: mat, Position: shapes.Vec3{-0.2, 0, 0.1}, Velocity: shapes.Vec3{0, 0, 1}})
		}},
		{"a kick", func() { _ = w.Kick(b, w.Time(), shapes.Vec3{0.01, 0, 0}, shapes.Vec3{}, true) }},
	}
	for round := 0; round < 3; round++ {
		for _, ch := range changes {
			if ch.what == "AddBody" && round > 0 {
				continue
			}
			for s := 0; s < 20; s++ {
				if err := w.Step(1e-3); err != nil {
					t.Fatal(err)
				}
				check("a step")
			}
			ch.do()
			check(ch.what)
		}
	}
}
