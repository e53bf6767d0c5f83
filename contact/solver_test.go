package contact

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"clatter/shapes"
)

// TestWarmStartConvergence: a resting stack of five cubes under gravity.
// Its exact solution leaves every body at rest, so the largest body speed
// after a solve is the solver's error (Catto 2005: warm starting makes a
// resting stack converge in few iterations per step). With warm starting the
// error must be far smaller at the same iteration count, and ten warm
// iterations must beat forty cold ones.
func TestWarmStartConvergence(t *testing.T) {
	const dt, steps = 1e-3, 60
	run := func(warm float64, iters int) float64 {
		bodies, pts := stack(1, 5, 0.2, 0.5)
		set := DefaultSettings()
		// Fixed sweeps, no direct solve: this measures the sweeps alone.
		set.WarmStart, set.VelocityIterations, set.Tolerance = warm, iters, 0
		set.Convergence, set.MaxBlock = 0, 0
		s := NewSolver(set)
		for step := 0; step < steps; step++ {
			addGravity(bodies, dt)
			if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
		}
		return maxSpeed(bodies)
	}
	errs := map[string]float64{}
	for _, c := range []struct {
		warm  float64
		iters int
	}{{1, 10}, {0, 10}, {1, 40}, {0, 40}} {
		name := fmt.Sprintf("warm %v, %d iterations", c.warm, c.iters)
		errs[name] = run(c.warm, c.iters)
		t.Logf("%s: largest body speed after %d steps %.3g m/s", name, steps, errs[name])
	}
	for _, it := range []int{10, 40} {
		w, c := errs[fmt.Sprintf("warm 1, %d iterations", it)], errs[fmt.Sprintf("warm 0, %d iterations", it)]
		if !(w < c/10) {
			t.Errorf("%d iterations: warm-started error %g not ten times below cold %g", it, w, c)
		}
	}
	if w, c := errs["warm 1, 10 iterations"], errs["warm 0, 40 iterations"]; !(w < c) {
		t.Errorf("ten warm iterations (error %g) do not beat forty cold ones (%g)", w, c)
	}
}

// TestWarmStartKeys: impulses are matched by key, not by position in the
// slice: after a shuffle of the points, a solve without iterations must
// report exactly the remembered impulses, times the warm-start factor and
// the ratio of step sizes (a steady load's impulse grows with the step).
func TestWarmStartKeys(t *testing.T) {
	cases := []struct {
		name      string
		factor    float64
		dt0, dt1  float64
		wantScale float64
	}{
		{"factor 1", 1, 1e-3, 1e-3, 1},
		{"factor 0.5", 0.5, 1e-3, 1e-3, 0.5},
		{"step doubled", 1, 1e-3, 2e-3, 2},
		{"off", 0, 1e-3, 1e-3, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bodies, pts := stack(2, 3, 0.2, 0.5)
			// a sideways push on the top cubes so that friction is not zero
			set := DefaultSettings()
			set.WarmStart = c.factor
			s := NewSolver(set)
			for step := 0; step < 30; step++ {
				addGravity(bodies, c.dt0)
				bodies[3].V[0] += 0.5 * c.dt0
				bodies[6].V[1] -= 0.5 * c.dt0
				if _, err := s.Solve(c.dt0, bodies, pts, nil); err != nil {
					t.Fatal(err)
				}
			}
			type imp struct {
				n float64
				f vec
			}
			remembered := map[uint64]imp{}
			frictionSeen := false
			for _, p := range pts {
				remembered[p.Key] = imp{p.NormalImpulse, p.FrictionImpulse}
				frictionSeen = frictionSeen || p.FrictionImpulse.Len() > 1e-6
			}
			if !frictionSeen {
				t.Fatal("the setup carries no friction, the check would be empty")
			}
			rand.New(rand.NewPCG(1, 2)).Shuffle(len(pts), func(i, j int) { pts[i], pts[j] = pts[j], pts[i] })
			s.Settings.VelocityIterations, s.Settings.PositionIterations, s.Settings.ImpactPasses = 0, 0, 0
			if _, err := s.Solve(c.dt1, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
			for _, p := range pts {
				want := remembered[p.Key]
				// tolerance: the friction vector is projected onto the same
				// tangents and rebuilt, a few ulps of its size.
				if math.Abs(p.NormalImpulse-c.wantScale*want.n) > 1e-15*want.n ||
					p.FrictionImpulse.Sub(want.f.Mul(c.wantScale)).Len() > 1e-14*want.f.Len()+1e-300 {
					t.Errorf("key %#x: warm impulse %v, %v; remembered %v, %v times %v", p.Key, p.NormalImpulse, p.FrictionImpulse, want.n, want.f, c.wantScale)
				}
			}
		})
	}
}

// TestWarmStartTurnedNormal: the friction impulse is remembered as a world
// vector, so when the normal turns (and with it the tangent basis) the warm
// friction is the old vector projected onto the new tangent plane,
// F - (F·n) n (orthogonal projection).
func TestWarmStartTurnedNormal(t *testing.T) {
	for _, tilt := range []float64{0.01, 0.3, 1.2} {
		bodies := []Body{staticBody(vec{}), sphereBody(1, 0.1, vec{0, 0, 0.1})}
		bodies[1].V = vec{0.02, -0.01, -0.05}
		pts := []Point{{A: 0, B: 1, Normal: vec{0, 0, 1}, Friction: 0.9, StaticFriction: 0.9, Key: 42}}
		s := NewSolver(DefaultSettings())
		if _, err := s.Solve(1e-3, bodies, pts, nil); err != nil {
			t.Fatal(err)
		}
		F := pts[0].FrictionImpulse
		N := pts[0].NormalImpulse
		if F.Len() == 0 || N == 0 {
			t.Fatal("no impulses to carry over")
		}
		n1 := vec{math.Sin(tilt), 0.3 * math.Sin(tilt), math.Cos(tilt)}.Normalize()
		pts[0].Normal = n1
		s.Settings.VelocityIterations, s.Settings.PositionIterations, s.Settings.ImpactPasses = 0, 0, 0
		if _, err := s.Solve(1e-3, bodies, pts, nil); err != nil {
			t.Fatal(err)
		}
		want := F.Sub(n1.Mul(F.Dot(n1)))
		if want.Len() > 0.9*N {
			want = want.Mul(0.9 * N / want.Len()) // the new cone still bounds it
		}
		if d := pts[0].FrictionImpulse.Sub(want).Len(); d > 1e-14*F.Len() {
			t.Errorf("tilt %v: warm friction %v, projection %v", tilt, pts[0].FrictionImpulse, want)
		}
	}
}

// TestPositionCorrection: penetration beyond the slop shrinks by the
// correction fraction beta each step, so after n steps the depth is
// slop + (d0 - slop)(1 - beta)^n (the geometric series of the split-impulse
// rule; one point is solved exactly), while the real velocities, and so the
// kinetic energy, do not change at all. Pseudo-impulses are equal and
// opposite, so the pseudo-momentum sum m Vp stays zero.
func TestPositionCorrection(t *testing.T) {
	// tolDepth: twenty steps of a few float operations on lengths of 1e-2 m.
	const tolDepth = 1e-15
	cases := []struct {
		name   string
		mB     float64 // mass of the lower body; +Inf static
		depth  float64
		vTang  float64 // tangential velocity of the upper body, frictionless
		spinUp float64
	}{
		{"on static floor", math.Inf(1), 0.01, 0, 0},
		{"on static floor, sliding and spinning", math.Inf(1), 0.004, 0.7, 3},
		{"two bodies, unequal masses", 3, 0.02, 0.2, -1},
		{"within the slop: left alone", math.Inf(1), 0.5e-4, 0, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			const dt, n = 1e-3, 20
			set := DefaultSettings()
			bodies := []Body{staticBody(vec{}), sphereBody(1.3, 0.1, vec{0.02, 0, 0.1 - c.depth})}
			inertia := []shapes.Mat3{{}, {}}
			i1 := 2 * 1.3 * 0.01 / 5
			inertia[1] = shapes.Mat3{i1, 0, 0, 0, i1, 0, 0, 0, i1}
			if !math.IsInf(c.mB, 1) {
				bodies[0] = sphereBody(c.mB, 0.1, vec{0, 0, -0.1})
				i0 := 2 * c.mB * 0.01 / 5
				inertia[0] = shapes.Mat3{i0, 0, 0, 0, i0, 0, 0, 0, i0}
			}
			bodies[1].V, bodies[1].W = vec{c.vTang, 0, 0}, vec{0, 0, c.spinUp}
			v0, w0 := bodies[1].V, bodies[1].W
			e0 := kineticEnergy(bodies, inertia)
			sep := -c.depth
			pts := []Point{{A: 0, B: 1, Position: vec{0.02, 0, -c.depth / 2}, Normal: vec{0, 0, 1}, Separation: sep, Key: 9}}
			s := NewSolver(set)
			for step := 1; step <= n; step++ {
				pts[0].Separation = sep
				if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
					t.Fatal(err)
				}
				if bodies[1].V != v0 || bodies[1].W != w0 || bodies[0].V != (vec{}) {
					t.Fatalf("step %d: real velocities changed: %v %v", step, bodies[1].V, bodies[1].W)
				}
				if e := kineticEnergy(bodies, inertia); e != e0 {
					t.Fatalf("step %d: kinetic energy %v, was %v", step, e, e0)
				}
				if !math.IsInf(c.mB, 1) {
					if pm := bodies[0].Vp.Mul(c.mB).Add(bodies[1].Vp.Mul(1.3)); pm.Len() > 1e-15 {
						t.Fatalf("pseudo-momentum %v", pm)
					}
				}
				// relative normal velocity at the point, pseudo plus real
				at := func(b Body, v, w vec) float64 {
					return v.Add(w.Cross(pts[0].Position.Sub(b.Position))).Dot(pts[0].Normal)
				}
				sep += (at(bodies[1], bodies[1].V.Add(bodies[1].Vp), bodies[1].W.Add(bodies[1].Wp)) -
					at(bodies[0], bodies[0].V.Add(bodies[0].Vp), bodies[0].W.Add(bodies[0].Wp))) * dt
				want := -c.depth
				if c.depth > set.Slop {
					want = -set.Slop - (c.depth-set.Slop)*math.Pow(1-set.Correction, float64(step))
				}
				if math.Abs(sep-want) > tolDepth {
					t.Fatalf("step %d: separation %v, want %v", step, sep, want)
				}
			}
		})
	}
}

// TestExtraRows: rows added by the engine join the velocity iterations. Two
// free bodies tied by a row on their x velocities: an equality row ends at
// its target with impulse m_eff (target - v_rel), m_eff = 1/(1/mA + 1/mB)
// (impulse-momentum on the two bodies); a bounded row stops at its bound;
// with Correct, the position pass removes Correction times Drift.
func TestExtraRows(t *testing.T) {
	const mA, mB, vrel0 = 2.0, 0.5, 1.0
	meff := 1 / (1/mA + 1/mB)
	inf := math.Inf(1)
	cases := []struct {
		name        string
		target      float64
		lo, hi      float64
		wantImpulse float64
	}{
		{"rigid", 0, -inf, inf, meff * (0 - vrel0)},
		{"motor", 0.25, -inf, inf, meff * (0.25 - vrel0)},
		{"motor at its force limit", 0.25, -0.1, 0.1, -0.1},
		{"push-only limit, not engaged", 0, 0, inf, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bodies := []Body{sphereBody(mA, 0.1, vec{0, 0, 0}), sphereBody(mB, 0.1, vec{1, 0, 0})}
			bodies[1].V = vec{vrel0, 0, 0}
			p0 := linearMomentum(bodies)
			rows := []Row{{A: 0, B: 1, LinA: vec{-1, 0, 0}, LinB: vec{1, 0, 0}, Target: c.target, Lo: c.lo, Hi: c.hi,
				Correct: true, Drift: 0.003, Key: 5}}
			set := DefaultSettings()
			if _, err := NewSolver(set).Solve(1e-3, bodies, nil, rows); err != nil {
				t.Fatal(err)
			}
			if math.Abs(rows[0].Impulse-c.wantImpulse) > tolExact {
				t.Errorf("impulse %v, want %v", rows[0].Impulse, c.wantImpulse)
			}
			if vrel := bodies[1].V[0] - bodies[0].V[0]; math.Abs(vrel-(vrel0+c.wantImpulse/meff)) > tolExact {
				t.Errorf("relative velocity %v, want %v", vrel, vrel0+c.wantImpulse/meff)
			}
			if d := linearMomentum(bodies).Sub(p0).Len(); d > tolExact {
				t.Errorf("momentum changed by %v", d)
			}
			// Position pass: C + (Cdot + Cdot_p) dt = (1 - beta) (C + Cdot dt).
			vrel := bodies[1].V[0] - bodies[0].V[0]
			pred := 0.003 + vrel*1e-3
			wantP := -set.Correction * pred / 1e-3
			if c.lo >= 0 && wantP < 0 {
				wantP = 0 // a push-only row cannot pull
			}
			if got := bodies[1].Vp[0] - bodies[0].Vp[0]; math.Abs(got-wantP) > tolExact {
				t.Errorf("pseudo relative velocity %v, want %v", got, wantP)
			}
		})
	}
}

// TestBadInput: errors, not panics, and nothing is changed.
func TestBadInput(t *testing.T) {
	good := func() ([]Body, []Point, []Row) {
		bodies := []Body{staticBody(vec{}), sphereBody(1, 0.1, vec{0, 0, 0.1})}
		bodies[1].V = vec{0, 0, -1}
		return bodies, []Point{{A: 0, B: 1, Normal: vec{0, 0, 1}, Key: 1}}, []Row{{A: 0, B: 1, Lo: -1, Hi: 1}}
	}
	cases := []struct {
		name  string
		edit  func(*Settings, *float64, []Body, []Point, []Row)
		wants string
	}{
		{"body index", func(_ *Settings, _ *float64, _ []Body, p []Point, _ []Row) { p[0].B = 7 }, "out of range"},
		{"negative index", func(_ *Settings, _ *float64, _ []Body, p []Point, _ []Row) { p[0].A = -1 }, "out of range"},
		{"self contact", func(_ *Settings, _ *float64, _ []Body, p []Point, _ []Row) { p[0].B = 0 }, "itself"},
		{"normal not unit", func(_ *Settings, _ *float64, _ []Body, p []Point, _ []Row) { p[0].Normal = vec{0, 0, 2} }, "unit"},
		{"NaN separation", func(_ *Settings, _ *float64, _ []Body, p []Point, _ []Row) { p[0].Separation = math.NaN() }, "finite"},
		{"row index", func(_ *Settings, _ *float64, _ []Body, _ []Point, r []Row) { r[0].A = 2 }, "out of range"},
		{"row bounds", func(_ *Settings, _ *float64, _ []Body, _ []Point, r []Row) { r[0].Lo = 2 }, "Lo <= Hi"},
		{"step", func(_ *Settings, dt *float64, _ []Body, _ []Point, _ []Row) { *dt = 0 }, "step"},
		{"settings", func(s *Settings, _ *float64, _ []Body, _ []Point, _ []Row) { s.Correction = 1.5 }, "Correction"},
		{"settings iterations", func(s *Settings, _ *float64, _ []Body, _ []Point, _ []Row) { s.VelocityIterations = -1 }, "VelocityIterations"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bodies, pts, rows := good()
			set, dt := DefaultSettings(), 1e-3
			c.edit(&set, &dt, bodies, pts, rows)
			_, err := NewSolver(set).Solve(dt, bodies, pts, rows)
			if err == nil || !strings.Contains(err.Error(), c.wants) {
				t.Fatalf("error %v, want one mentioning %q", err, c.wants)
			}
			if bodies[1].V != (vec{0, 0, -1}) {
				t.Errorf("velocities changed on bad input: %v", bodies[1].V)
			}
		})
	}
}

// TestTangents: the basis must be orthonormal and right-handed (t1 × t2 = n)
// for any unit normal, including the poles where naive constructions fail
// (Duff et al. 2017). Checked by the defining dot and cross products.
func TestTangents(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	normals := []vec{{0, 0, 1}, {0, 0, -1}, {1, 0, 0}, {0, -1, 0}, {1e-9, 0, -1}}
	for i := 0; i < 200; i++ {
		normals = append(normals, vec{r.NormFloat64(), r.NormFloat64(), r.NormFloat64()}.Normalize())
	}
	for _, n := range normals {
		n = n.Normalize()
		t1, t2 := tangents(n)
		// tolerance: a dozen float operations on unit values
		const tol = 1e-14
		if math.Abs(t1.Len()-1) > tol || math.Abs(t2.Len()-1) > tol || math.Abs(t1.Dot(t2)) > tol ||
			math.Abs(t1.Dot(n)) > tol || t1.Cross(t2).Sub(n).Len() > tol {
			t.Errorf("n %v: t1 %v t2 %v not a right-handed orthonormal basis", n, t1, t2)
		}
	}
}

// TestDeterministic: the same input gives bit-identical output, also from a
// second solver (no hidden state beyond the warm-start memory).
func TestDeterministic(t *testing.T) {
	run := func() []Body {
		bodies, pts := stack(3, 4, 0.2, 0.5)
		bodies[5].V = vec{0.3, -0.2, -1.5}
		for i := range pts {
			pts[i].Restitution = 0.4
		}
		s := NewSolver(DefaultSettings())
		for step := 0; step < 20; step++ {
			addGravity(bodies, 1e-3)
			if _, err := s.Solve(1e-3, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
		}
		return bodies
	}
	a, b := run(), run()
	for i := range a {
		if a[i] != b[i] {
			t.Fatalf("body %d differs between identical runs", i)
		}
	}
}

// TestNoAllocations: a steady-state Solve allocates nothing.
func TestNoAllocations(t *testing.T) {
	bodies, pts := stack(4, 5, 0.2, 0.5)
	rows := []Row{{A: 1, B: 6, LinA: vec{-1, 0, 0}, LinB: vec{1, 0, 0}, Lo: math.Inf(-1), Hi: math.Inf(1), Correct: true, Key: 1}}
	for i := range pts {
		pts[i].Restitution = 0.5
	}
	s := NewSolver(DefaultSettings())
	step := func() {
		addGravity(bodies, 1e-3)
		if _, err := s.Solve(1e-3, bodies, pts, rows); err != nil {
			t.Fatal(err)
		}
	}
	for i := 0; i < 3; i++ {
		step()
	}
	if a := testing.AllocsPerRun(50, step); a != 0 {
		t.Errorf("%v allocations per Solve in steady state, want 0", a)
	}
}
