package engine

import (
	"testing"

	"clatter/shapes"
)

// TestApartSkipSameSteps: a pile of mixed parts falling into a bin and
// settling, with the apart pairs skipped while their room lasts
// (apartskip.go) and without, takes the same steps bit for bit: every
// body's pose and velocity after every step, and the narrow phase's
// counts of queries (a skipped pair counts as the bound's proof it stands
// for), are equal; and most pairs the bound proves apart are skipped. The
// same holds with the bodies asleep and woken (a body's pose is taken
// again when it falls asleep) and after a body is placed by hand.
func TestApartSkipSameSteps(t *testing.T) {
	const dt = 1e-3
	for _, sleep := range []bool{false, true} {
		skip, _ := persistPile(t, 32)
		plain, ids := persistPile(t, 32)
		for _, w := range []*World{skip, plain} {
			w.cfg.NoSleep = !sleep
			w.collision.det.SetPersistence(w.cfg.Slop) // as a world has it
		}
		plain.collision.skip.off = true
		for step := 0; step < 1500; step++ {
			if step == 1000 { // placed by hand: the poses are taken anew
				for _, w := range []*World{skip, plain} {
					w.SetPose(ids[5], shapes.Vec3{0, 0, 0.3}, w.b.rot[ids[5]])
				}
			}
			for _, w := range []*World{skip, plain} {
				if err := w.Step(dt); err != nil {
					t.Fatal(err)
				}
			}
			for i := range skip.b.kind {
				if skip.b.pos[i] != plain.b.pos[i] || skip.b.rot[i] != plain.b.rot[i] ||
					skip.b.vel[i] != plain.b.vel[i] || skip.b.spin[i] != plain.b.spin[i] {
					t.Fatalf("sleep %v, step %d: body %d differs with the skip", sleep, step, i)
				}
			}
			if a, b := skip.collision.det.Stats(), plain.collision.det.Stats(); a != b {
				t.Fatalf("sleep %v, step %d: the narrow phase counts %+v with the skip, %+v without", sleep, step, a, b)
			}
		}
		if sleep && skip.active.sleepers == 0 {
			t.Errorf("no body fell asleep: the case does not test the poses taken at sleep")
		}
		st := skip.collision.det.Stats()
		n := skip.collision.skip.skipped
		t.Logf("sleep %v: %d pairs skipped of %d proved apart by the bound", sleep, n, st.Bounded)
		if n < st.Bounded/2 {
			t.Errorf("sleep %v: only %d of the %d pairs proved apart by the bound were skipped", sleep, n, st.Bounded)
		}
	}
}
