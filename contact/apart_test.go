package contact

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/go-gl/mathgl/mgl64"
)

func TestApartSkipIsSafe(t *testing.T) {
	// Whenever skip says a marked point is still apart, its update must
	// indeed change nothing: the row's velocity, rounded as solveNormal
	// rounds it, is at least its target. Random rows (lever arms, inertias
	// up to 1:100, normals up to the 5e-7 off unit length that check
	// accepts) and random velocity changes of both bodies, some up to the
	// margin itself; the reference is the definition, evaluated directly.
	rng := rand.New(rand.NewPCG(13, 5))
	r3 := func(s float64) vec { return vec{s * rng.NormFloat64(), s * rng.NormFloat64(), s * rng.NormFloat64()} }
	skipped, swept := 0, 0
	for trial := 0; trial < 20000; trial++ {
		A := Body{InvMass: 1 / (0.01 + rng.Float64()), InvInertia: mgl64.Diag3(vec{1 + 99*rng.Float64(), 1 + 99*rng.Float64(), 1 + 99*rng.Float64()})}
		B := A
		B.InvInertia = mgl64.Diag3(vec{1 + 99*rng.Float64(), 1 + 99*rng.Float64(), 1 + 99*rng.Float64()})
		n := r3(1).Normalize().Mul(1 + 5e-7*(2*rng.Float64()-1))
		rA, rB := r3(0.02), r3(0.02)
		var rn crow
		a, b := int32(1), int32(2)
		if trial%4 == 0 {
			a = fixedSlot // a part against the ground
		}
		rn.setupContact(&A, &B, a, b, &n, &rA, &rB)
		vel := []sbody{{}, {r3(0.1), r3(3)}, {r3(0.1), r3(3)}}
		v0 := rowVel(&vel[a], &vel[b], &rn)
		rn.target = min(v0, 0) - 1e-3 - math.Abs(0.5*rng.NormFloat64()) // a gap: a margin of about half a metre per second
		s := &Solver{nrows: []crow{rn}, trows: make([]crow, 2), pts: make([]pstate, 1)}
		s.sl.vel = vel
		s.markApart()
		fp := s.apart.pts[0]
		if !(fp.margin > 0) {
			t.Fatalf("trial %d: a row %.3g m/s above its target was not marked", trial, v0-rn.target)
		}
		// Changes of the velocities from a small fraction of the margin to
		// several times it, along random directions.
		scale := (v0 - rn.target) * math.Pow(10, 2*rng.Float64()-1.5)
		for k := 1; k <= 2; k++ {
			vel[k].v = vel[k].v.Add(r3(scale))
			vel[k].w = vel[k].w.Add(r3(scale / 0.02))
		}
		if !fp.skip(vel, s.apart.vel0, &apartDiffs{}) {
			swept++
			continue
		}
		skipped++
		if v := rowVel(&vel[a], &vel[b], &rn); !(v >= rn.target) {
			t.Fatalf("trial %d: skipped a point whose row velocity %.17g is below its target %.17g", trial, v, rn.target)
		}
	}
	// Both answers must occur, or the test checked one branch only.
	if skipped < 1000 || swept < 1000 {
		t.Fatalf("skipped %d, swept %d of 20000: the changes do not straddle the margins", skipped, swept)
	}
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
		for run, off := range []bool{false, true} {
			s := NewSolver(set)
			s.apart.off = off
			bs, ps := append([]Body(nil), bodies...), append([]Point(nil), pts...)
			if _, err := s.Solve(dt, bs, ps, nil); err != nil {
				t.Fatal(err)
			}
			got[run], gotPts[run] = bs, ps
			if !off {
				marked += s.apart.n
				for _, fp := range s.apart.pts {
					if fp.margin > 0 {
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
