package broad

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
)

// TestSlackMatchesAllPairs: with a slack, the pairs are still exactly those
// of the brute-force reference AllPairs on the boxes themselves, step after
// step, while most bodies jitter inside their enlarged boxes (the kept
// pairs are updated body by body), some jump out of them, and bodies fall
// asleep, wake, change filters, go and come (the kept pairs are dropped).
func TestSlackMatchesAllPairs(t *testing.T) {
	cases := []struct {
		name   string
		slack  float64
		jitter float64 // every awake body's step along each axis, at most
		jumps  int     // bodies moved by a box size each step
		events bool    // sleep, filter, removal and insertion now and then
		// wantReuse: the least number of steps that must have updated the
		// kept pairs rather than swept (else the case proves little).
		wantReuse int
	}{
		{name: "resting", slack: 0.05, jitter: 1e-3, jumps: 3, wantReuse: 15},
		{name: "resting with events", slack: 0.05, jitter: 1e-3, jumps: 3, events: true, wantReuse: 5},
		{name: "jitter beyond the slack", slack: 1e-3, jitter: 0.05, wantReuse: 0},
		{name: "slack larger than the boxes", slack: 2, jitter: 0.3, jumps: 5, wantReuse: 5},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(21, 5))
			m := newMirror(t)
			m.s.SetSlack(tc.slack)
			inf := math.Inf(1)
			// A half-space below z = 0, as a floor would be if it were swept.
			m.insert(Body{ID: 0, Kind: Static, Category: AllBits, Mask: AllBits,
				Box: shapes.AABB{Min: shapes.Vec3{-inf, -inf, -inf}, Max: shapes.Vec3{inf, inf, 0}}})
			const n = 1200
			for id := int32(1); id < n; id++ {
				c := shapes.Vec3{rng.Float64() * 16, rng.Float64() * 16, rng.Float64() * 16}
				b := Body{ID: id, Box: boxAt(c, shapes.Vec3{0.5, 0.4, 0.6}), Category: AllBits, Mask: AllBits}
				switch {
				case id%11 == 0:
					b.Kind = Static
				case id%5 == 0:
					b.Asleep = true
				case id%13 == 0:
					b.Category, b.Mask = 2, 1
				}
				m.insert(b)
			}
			reused, total := 0, 0
			for step := 0; step < 24; step++ {
				for id := int32(1); id < n; id++ {
					b := m.bodies[id]
					if !m.in[id] || b.Kind == Static || b.Asleep {
						continue
					}
					var d shapes.Vec3
					for k := range d {
						d[k] = (2*rng.Float64() - 1) * tc.jitter
					}
					m.move(id, shapes.AABB{Min: b.Box.Min.Add(d), Max: b.Box.Max.Add(d)})
				}
				for k := 0; k < tc.jumps; k++ {
					id := int32(1 + rng.IntN(n-1))
					if b := m.bodies[id]; m.in[id] && b.Kind == Dynamic && !b.Asleep {
						d := shapes.Vec3{rng.Float64() - 0.5, rng.Float64() - 0.5, rng.Float64() - 0.5}
						m.move(id, shapes.AABB{Min: b.Box.Min.Add(d), Max: b.Box.Max.Add(d)})
					}
				}
				if tc.events {
					slackEvent(t, m, rng, step, n)
				}
				if m.s.reusable() {
					reused++
				}
				total += m.check(fmt.Sprintf("step %d", step))
			}
			if total < 24*200 {
				t.Fatalf("%d pairs in 24 steps: the scene is too sparse to test", total)
			}
			if reused < tc.wantReuse {
				t.Errorf("%d steps updated the kept pairs, want at least %d", reused, tc.wantReuse)
			}
		})
	}
}

// slackEvent changes, at some steps, what drops the kept pairs: a body
// falls asleep or wakes, a filter changes, a body is removed or added.
func slackEvent(t *testing.T, m *mirror, rng *rand.Rand, step int, n int32) {
	t.Helper()
	id := int32(1 + rng.IntN(int(n)-1))
	if !m.in[id] || m.bodies[id].Kind == Static {
		return
	}
	switch step % 6 {
	case 1:
		m.sleep(id, !m.bodies[id].Asleep)
	case 3:
		if err := m.s.SetFilter(id, 1, 1); err != nil {
			t.Fatal(err)
		}
		m.bodies[id].Category, m.bodies[id].Mask = 1, 1
	case 5:
		m.remove(id)
		b := m.bodies[id]
		b.Box = boxAt(shapes.Vec3{8, 8, 8}, shapes.Vec3{0.5, 0.5, 0.5})
		m.insert(b)
	}
}

// TestSlackSteadyStateAllocs: with a slack, updating the kept pairs
// allocates nothing once the buffers have grown.
func TestSlackSteadyStateAllocs(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	s := New()
	s.SetSlack(0.02)
	const n = 1000
	boxes := make([]shapes.AABB, n)
	for i := range boxes {
		c := shapes.Vec3{rng.Float64() * 20, rng.Float64() * 20, rng.Float64() * 20}
		boxes[i] = boxAt(c, shapes.Vec3{0.5, 0.5, 0.5})
		if err := s.Insert(int32(i), boxes[i], Dynamic); err != nil {
			t.Fatal(err)
		}
	}
	dst := s.Pairs(nil)
	step := 0
	allocs := testing.AllocsPerRun(20, func() {
		step++
		for i := range boxes {
			d := 0.01 * math.Sin(float64(step+i))
			if i == step {
				d = 0.3 // one body leaves its enlarged box each step
			}
			s.Move(int32(i), shapes.AABB{Min: boxes[i].Min.Add(shapes.Vec3{d, 0, 0}), Max: boxes[i].Max.Add(shapes.Vec3{d, 0, 0})})
		}
		dst = s.Pairs(dst[:0])
	})
	if len(dst) == 0 {
		t.Fatal("no pairs: the scene should have some")
	}
	if allocs != 0 {
		t.Errorf("%v allocations per step, want 0", allocs)
	}
}
