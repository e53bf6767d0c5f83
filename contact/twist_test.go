package contact

import (
	"math"
	"testing"

	"github.com/go-gl/mathgl/mgl64"
)

// Tolerances of the patch friction tests.
const (
	// tolPatchRate: relative error of the per-step change of a velocity under
	// full slip. The patch's rows are solved in a 3x3 block, so a steady slip
	// is exact to rounding after the warm start (measured below 1e-12); the
	// first steps after a switch converge within the ten sweeps.
	tolPatchRate = 1e-9
	// tolEllipse: the impulse of a slipping patch lies on the limit ellipsoid
	// and opposes the generalised slip; the isotropic step converges to that
	// fixed point geometrically, ten sweeps per step and the warm start from
	// the last step leave less than this (measured about 1e-10).
	tolEllipse = 1e-6
)

// disc returns a static floor (body 0) and a disc of radius r and mass m
// (body 1, I = m r^2/2 about its axis and m(3r^2+h^2)/12 across, any
// dynamics handbook) lying on it, touching at four rim points that sample a
// patch of effective radius 2r/3 (uniform pressure on a disc).
func disc(m, r, h, mu float64) ([]Body, []Point) {
	ia, ic := m*r*r/2, m*(3*r*r+h*h)/12
	b := Body{InvMass: 1 / m, InvInertia: mgl64.Diag3(vec{1 / ic, 1 / ic, 1 / ia}), Position: vec{0, 0, h / 2}}
	var pts []Point
	for k := 0; k < 4; k++ {
		th := float64(k) * math.Pi / 2
		pts = append(pts, Point{
			A: 0, B: 1,
			Position: vec{r * math.Cos(th), r * math.Sin(th), 0},
			Normal:   vec{0, 0, 1},
			Friction: mu, StaticFriction: mu,
			Key:         uint64(k),
			PatchRadius: 2 * r / 3,
		})
	}
	return []Body{staticBody(vec{}), b}, pts
}

// TestPatchSpinDown: a disc spinning on a floor under uniform pressure feels
// the friction moment mu m g (2r/3) (Goyal, Ruina and Papadopoulos 1991), so
// its spin falls by mu g (2r/3) dt / (r^2/2) per step; the same disc with
// friction at its rim points alone (no patch) would lose it at the rim's
// lever arm r, 1.5 times as fast.
func TestPatchSpinDown(t *testing.T) {
	const dt, m, r, h, mu = 1e-3, 2.0, 0.1, 0.02, 0.4
	bodies, pts := disc(m, r, h, mu)
	bodies[1].W = vec{0, 0, 30}
	s := NewSolver(DefaultSettings())
	want := mu * gStd * (2 * r / 3) / (r * r / 2) * dt
	for step := 0; step < 200; step++ {
		before := bodies[1].W[2]
		addGravity(bodies, dt)
		if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
			t.Fatal(err)
		}
		if step < 3 {
			continue // the load builds up from a cold start
		}
		if got := before - bodies[1].W[2]; relErr(got, want) > tolPatchRate {
			t.Fatalf("step %d: spin fell by %.12g rad/s, want %.12g", step, got, want)
		}
		if v := bodies[1].V; math.Hypot(v[0], v[1]) > 1e-12 {
			t.Fatalf("step %d: a pure spin made the disc slide at %v", step, v)
		}
	}
}

// TestPatchLimitSurface: a disc sliding and spinning at once. Each step the
// friction impulse (force f, moment tau) must lie on the ellipsoid
// (|f|/(mu N))^2 + (tau/(mu N r))^2 = 1 and follow its flow rule, f opposite
// to the slip v and f/|v| = tau/(r^2 w) (maximal dissipation on the
// ellipsoidal limit surface: Howe and Cutkosky 1996, section 3).
func TestPatchLimitSurface(t *testing.T) {
	const dt, m, r, h, mu = 1e-3, 1.5, 0.08, 0.01, 0.3
	cases := []struct {
		name string
		v, w float64
	}{
		{"v = r w", 1.2, 15},
		{"mostly sliding", 2, 2},
		{"mostly spinning", 0.1, 40},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bodies, pts := disc(m, r, h, mu)
			bodies[1].V = vec{c.v * 0.6, c.v * 0.8, 0}
			bodies[1].W = vec{0, 0, c.w}
			ia := m * r * r / 2
			reff := 2 * r / 3
			s := NewSolver(DefaultSettings())
			checked := 0
			for step := 0; step < 100; step++ {
				v0, w0 := bodies[1].V, bodies[1].W[2]
				addGravity(bodies, dt)
				if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
					t.Fatal(err)
				}
				if step < 3 {
					continue
				}
				v1, w1 := bodies[1].V, bodies[1].W[2]
				if v1.Len() < 1e-3 || w1 < 1e-3 {
					break // stopped
				}
				fx, fy := m*(v1[0]-v0[0]), m*(v1[1]-v0[1])
				tau := ia * (w1 - w0)
				n := m * gStd * dt
				f := math.Hypot(fx, fy)
				if e := math.Pow(f/(mu*n), 2) + math.Pow(tau/(mu*n*reff), 2); math.Abs(e-1) > tolEllipse {
					t.Fatalf("step %d: impulse at %.9g of the ellipsoid, want 1", step, e)
				}
				vl := math.Hypot(v1[0], v1[1])
				if cos := -(fx*v1[0] + fy*v1[1]) / (f * vl); math.Abs(cos-1) > tolEllipse {
					t.Fatalf("step %d: friction at cos %.9g to the slip, want opposite", step, cos)
				}
				if got, want := f*reff*reff*w1, -tau*vl; relErr(got, want) > tolEllipse {
					t.Fatalf("step %d: f r^2 w = %.9g, -tau v = %.9g: not the flow rule", step, got, want)
				}
				checked++
			}
			if checked < 90 {
				t.Errorf("only %d steps checked, want the whole 0.1 s of slipping", checked)
			}
		})
	}
}

// TestPointContactNoTwist: a ball spinning about the vertical on one point
// has no patch and no friction against the spin (a point contact transmits
// no moment; friction at the point is zero while it does not slip).
func TestPointContactNoTwist(t *testing.T) {
	const dt, r = 1e-3, 0.05
	b := sphereBody(1, r, vec{0, 0, r})
	b.W = vec{0, 0, 20}
	bodies := []Body{staticBody(vec{}), b}
	pts := []Point{{A: 0, B: 1, Normal: vec{0, 0, 1}, Friction: 0.5, Key: 1}}
	s := NewSolver(DefaultSettings())
	for step := 0; step < 500; step++ {
		addGravity(bodies, dt)
		if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
			t.Fatal(err)
		}
	}
	if w := bodies[1].W[2]; w != 20 {
		t.Errorf("spin %v rad/s after 0.5 s, want 20 (unchanged)", w)
	}
}

// TestPatchSlidingBlock: a sliding block decelerates at mu g whether its
// friction acts at its corners or at its patch (Coulomb's law), and a
// patch that sticks holds it without creep.
func TestPatchSlidingBlock(t *testing.T) {
	const dt, mu = 1e-3, 0.4
	bodies, pts := block(mu, mu)
	for i := range pts {
		pts[i].PatchRadius = 0.2 * (math.Sqrt2 + math.Log(1+math.Sqrt2)) / 6
	}
	bodies[1].V = vec{1, 0.5, 0}
	s := NewSolver(DefaultSettings())
	want := mu * gStd * dt
	for step := 0; step < 400; step++ {
		before := bodies[1].V
		addGravity(bodies, dt)
		if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
			t.Fatal(err)
		}
		if step < 3 || bodies[1].V.Len() < 0.05 {
			continue
		}
		dv := math.Hypot(before[0]-bodies[1].V[0], before[1]-bodies[1].V[1])
		if relErr(dv, want) > tolPatchRate {
			t.Fatalf("step %d: speed fell by %.12g m/s, want %.12g", step, dv, want)
		}
		if w := bodies[1].W[2]; math.Abs(w) > 1e-9 {
			t.Fatalf("step %d: a straight slide turned the block at %g rad/s", step, w)
		}
	}
	if v := bodies[1].V; math.Hypot(v[0], v[1]) > stillSpeed {
		t.Errorf("block still moving at %v after it should have stopped", v)
	}
}

// TestPatchBadInput: a patch radius or centre that is not finite is refused.
func TestPatchBadInput(t *testing.T) {
	for _, c := range []struct {
		name string
		set  func(p *Point)
	}{
		{"NaN radius", func(p *Point) { p.PatchRadius = math.NaN() }},
		{"negative radius", func(p *Point) { p.PatchRadius = -1 }},
		{"infinite radius", func(p *Point) { p.PatchRadius = math.Inf(1) }},
		{"NaN centre", func(p *Point) { p.PatchCenter[1] = math.NaN() }},
	} {
		bodies, pts := disc(1, 0.1, 0.01, 0.3)
		c.set(&pts[2])
		if _, err := NewSolver(DefaultSettings()).Solve(1e-3, bodies, pts, nil); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
}

// TestPatchSolveAllocates: steady steps with patches allocate nothing.
func TestPatchSolveAllocates(t *testing.T) {
	bodies, pts := disc(1, 0.1, 0.01, 0.3)
	bodies[1].W = vec{0, 0, 5}
	s := NewSolver(DefaultSettings())
	step := func() {
		addGravity(bodies, 1e-3)
		if _, err := s.Solve(1e-3, bodies, pts, nil); err != nil {
			t.Fatal(err)
		}
	}
	step()
	if n := testing.AllocsPerRun(50, step); n != 0 {
		t.Errorf("%v allocations per step, want 0", n)
	}
}
