package contact

import (
	"math"
	"testing"
)

// recallTol is the relative error allowed on a recalled load: the sweeps
// of a warm-started stack converge to rounding, far below this.
const recallTol = 1e-6

func TestRecallRestoresLoad(t *testing.T) {
	// A two-box column rests on the ground. In static equilibrium the four
	// points under the bottom box carry both weights per step, 2 m g dt
	// (Newton's first law), the ones under the top box m g dt. After steps
	// without those points (the column asleep) the solver has forgotten
	// them; Recall brings their memory back, so the first step after
	// carries the load from its warm start alone (no velocity iterations).
	const dt = 1e-3
	bodies, pts := stack(1, 2, 0.1, 0.5)
	s := NewSolver(DefaultSettings())
	for n := 0; n < 50; n++ {
		addGravity(bodies, dt)
		if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
			t.Fatal(err)
		}
	}
	mem := make([]Memory, len(pts))
	for i := range pts {
		mem[i] = s.Remembered(i)
	}
	for n := 0; n < 5; n++ { // asleep: a step with no points forgets them
		if _, err := s.Solve(dt, bodies[:1], nil, nil); err != nil {
			t.Fatal(err)
		}
	}
	for _, recall := range []bool{false, true} {
		s2 := *s
		s2.prevPts = append([]warmPoint(nil), s.prevPts...)
		s2.curPts = nil
		if recall {
			s2.Recall(append([]Memory(nil), mem...))
		}
		s2.Settings.VelocityIterations, s2.Settings.PairIterations = 0, 0
		bs := append([]Body(nil), bodies...)
		for i := range bs {
			bs[i].V, bs[i].W = vec{}, vec{}
		}
		addGravity(bs, dt)
		p := append([]Point(nil), pts...)
		if _, err := s2.Solve(dt, bs, p, nil); err != nil {
			t.Fatal(err)
		}
		for level, want := range []float64{2 * gStd * dt, gStd * dt} {
			got := 0.0
			for k := 0; k < 4; k++ {
				got += p[4*level+k].NormalImpulse
			}
			if !recall {
				want = 0 // nothing remembered: no warm start
			}
			if math.Abs(got-want) > recallTol*gStd*dt {
				t.Errorf("recall %v, level %d: normal impulse %.6g N s, want %.6g", recall, level, got, want)
			}
		}
	}
}

func TestRecallKeepsLastStep(t *testing.T) {
	// Recall adds memories without moving those of last step's points:
	// Remembered(i) still gives point i's own memory (same key), and the
	// patch memory and pair runs that index it stay valid.
	const dt = 1e-3
	bodies, pts := stack(1, 2, 0.1, 0.5)
	s := NewSolver(DefaultSettings())
	addGravity(bodies, dt)
	if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
		t.Fatal(err)
	}
	// The smallest key the stack does not use: below some of its keys.
	used := map[uint64]bool{}
	for _, p := range pts {
		used[p.Key] = true
	}
	key := uint64(0)
	for used[key] {
		key++
	}
	s.Recall([]Memory{{warmPoint{key: key, normal: 1}}})
	for i, p := range pts {
		if got := s.Remembered(i).Key(); got != p.Key {
			t.Errorf("after Recall, point %d remembers key %#x, want its own %#x", i, got, p.Key)
		}
	}
}
