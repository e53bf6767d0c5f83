package contact

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/go-gl/mathgl/mgl64"
)

func TestApartIsNoUpdate(t *testing.T) {
	// apart must say exactly when solveNormal, from a zero impulse, leaves
	// a row and the velocities unchanged (the reference: solveNormal run on
	// a copy). Random rows (lever arms, inertias up to 1:100, some against
	// the fixed slot) with targets around their velocities, some equal to
	// it.
	rng := rand.New(rand.NewPCG(13, 5))
	r3 := func(s float64) vec { return vec{s * rng.NormFloat64(), s * rng.NormFloat64(), s * rng.NormFloat64()} }
	counts := [2]int{}
	for trial := 0; trial < 20000; trial++ {
		A := Body{InvMass: 1 / (0.01 + rng.Float64()), InvInertia: mgl64.Diag3(vec{1 + 99*rng.Float64(), 1 + 99*rng.Float64(), 1 + 99*rng.Float64()})}
		B := A
		B.InvInertia = mgl64.Diag3(vec{1 + 99*rng.Float64(), 1 + 99*rng.Float64(), 1 + 99*rng.Float64()})
		n, rA, rB := r3(1).Normalize(), r3(0.02), r3(0.02)
		var rn crow
		a, b := int32(1), int32(2)
		if trial%4 == 0 {
			a = fixedSlot // a part against the ground
		}
		rn.setupContact(&A, &B, a, b, &n, &rA, &rB)
		vel := []sbody{{}, {r3(0.1), r3(3)}, {r3(0.1), r3(3)}}
		rn.target = rowVel(&vel[a], &vel[b], &rn)
		if trial%8 != 1 {
			rn.target += 0.01 * rng.NormFloat64()
		}
		ar := apartRow{d: rn.d, cA: rn.cA, cB: rn.cB, target: rn.target, a: rn.a, b: rn.b}
		got := ar.apart(vel)
		ref := append([]sbody(nil), vel...)
		same := solveNormal(ref, &rn) == 0 && rn.lambda == 0 && ref[1] == vel[1] && ref[2] == vel[2]
		if got != same {
			t.Fatalf("trial %d: apart = %v, but solveNormal changed nothing: %v", trial, got, same)
		}
		counts[btoi(got)]++
	}
	if counts[0] < 1000 || counts[1] < 1000 {
		t.Fatalf("apart %d, closing %d of 20000: the cases do not cover both answers", counts[1], counts[0])
	}
}

func btoi(b bool) int {
	if b {
		return 1
	}
	return 0
}

func TestApartSameAsFullSweeps(t *testing.T) {
	// Skipping the points that cannot close must leave the solve exactly
	// as full sweeps leave it (a brute-force reference: the same solve with
	// the skipping off). Three spinning columns of boxes 0.01 to 1 mm
	// apart, with speculative points between neighbours at their gap; the
	// first column drifts toward the second at up to twice the gap per
	// step, so that some gaps close from the start, some stay open and some
	// are swept again once their bodies' velocities have changed by their
	// margins. MaxBlock 4 leaves the islands to the sweeps, which skip
	// rows (live.go).
	const dt, h = 1e-3, 0.1
	rng := rand.New(rand.NewPCG(3, 8))
	marked, kept := 0, 0 // points skipped from the first sweep, and to the last
	for trial := 0; trial < 40; trial++ {
		gap := math.Pow(10, -5+2*rng.Float64())
		bodies, pts := columns([]int{6, 6, 6}, h)
		// columns puts the columns 3h apart; bring them to gap.
		for i := range bodies {
			if bodies[i].InvMass > 0 {
				c := math.Round(bodies[i].Position[0] / (3 * h))
				bodies[i].Position[0] -= c * (2*h - gap)
				bodies[i].V[0] = (1 - c) * gap / dt * rng.Float64() * 2
				bodies[i].W = vec{0.1 * rng.NormFloat64(), 0.1 * rng.NormFloat64(), 0}
			}
		}
		for i := range pts {
			c := math.Round(pts[i].Position[0] / (3 * h))
			pts[i].Position[0] -= c * (2*h - gap)
		}
		for c := 0; c < 2; c++ {
			for l := 0; l < 6; l++ {
				a, b := int32(1+6*c+l), int32(1+6*(c+1)+l)
				x := bodies[a].Position[0] + h/2
				for k := 0; k < 2; k++ {
					pts = append(pts, Point{A: a, B: b, Normal: vec{1, 0, 0}, Separation: gap, Friction: 0.5,
						Position: vec{x, h / 2 * float64(1-2*k), bodies[a].Position[2]}, Key: 1<<50 | uint64(c)<<16 | uint64(l)<<4 | uint64(k)})
				}
			}
		}
		addGravity(bodies, dt)
		set := DefaultSettings()
		set.MaxBlock = 4
		var got [2][]Body
		var gotPts [2][]Point
		var seen [2][]int32 // when each point was last updated (live.go)
		for run, off := range []bool{false, true} {
			s := NewSolver(set)
			s.apart.off = off
			bs, ps := append([]Body(nil), bodies...), append([]Point(nil), pts...)
			if _, err := s.Solve(dt, bs, ps, nil); err != nil {
				t.Fatal(err)
			}
			got[run], gotPts[run] = bs, ps
			seen[run] = append([]int32(nil), s.live.seen...)
			if !off {
				marked += len(s.apart.rows)
				for _, k := range s.apart.of {
					if k > 0 {
						kept++
					}
				}
			}
		}
		for i := range got[0] {
			if got[0][i].V != got[1][i].V || got[0][i].W != got[1][i].W || got[0][i].Vp != got[1][i].Vp || got[0][i].Wp != got[1][i].Wp {
				t.Fatalf("trial %d: body %d: velocities %v %v with skipping, %v %v without", trial, i, got[0][i].V, got[0][i].W, got[1][i].V, got[1][i].W)
			}
		}
		// A skipped point counts as updated, as the update it skips: the
		// sweeps' bookkeeping must not tell the two apart either, or a
		// point swept again later would be taken as due when it was not.
		for i := range seen[0] {
			if seen[0][i] != seen[1][i] {
				t.Fatalf("trial %d: entry %d last updated at %d with skipping, %d without", trial, i, seen[0][i], seen[1][i])
			}
		}
		for i := range gotPts[0] {
			p, q := &gotPts[0][i], &gotPts[1][i]
			if p.NormalImpulse != q.NormalImpulse || p.FrictionImpulse != q.FrictionImpulse || p.Sliding != q.Sliding ||
				math.Signbit(p.FrictionImpulse[0]) != math.Signbit(q.FrictionImpulse[0]) {
				t.Fatalf("trial %d: point %d: impulses %v %v with skipping, %v %v without", trial, i, p.NormalImpulse, p.FrictionImpulse, q.NormalImpulse, q.FrictionImpulse)
			}
		}
	}
	// Both outcomes must occur: points skipped to the end, and points
	// swept again once their bodies' changes reached their margins.
	if kept == 0 || kept == marked {
		t.Fatalf("%d points skipped, %d of them to the last sweep: the test does not exercise both outcomes", marked, kept)
	}
	t.Logf("%d points skipped, %d of them to the last sweep", marked, kept)
}
