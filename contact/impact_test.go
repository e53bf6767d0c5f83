package contact

import (
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// Tolerances of the impact tests.
const (
	// tolExact: a single-point impact is a handful of float operations on
	// values of order 1, so results match closed forms to a few ulps.
	tolExact = 1e-12
	// tolChain: Newton's cradle runs a few passes of pair impacts; each is
	// exact to rounding, 1e-9 leaves three orders above the accumulated ulps.
	tolChain = 1e-9
	// tolConserve: momenta about the origin sum lever arms of order 1 times
	// impulses of order 10; 1e-9 relative is far above rounding and far below
	// any real leak (a missing lever-arm term gives order 1).
	tolConserve = 1e-9
)

// TestHeadOn checks a central 1D collision against the textbook formulas
// (Halliday, Resnick and Walker, Fundamentals of Physics, ch. 9, extended
// with Newton's coefficient of restitution e as in any mechanics text):
//
//	v1' = (m1 v1 + m2 v2 - m2 e (v1 - v2)) / (m1 + m2)
//	v2' = (m1 v1 + m2 v2 + m1 e (v1 - v2)) / (m1 + m2)
//
// and, for a static second body, v1' = -e v1.
func TestHeadOn(t *testing.T) {
	cases := []struct {
		name   string
		m1, m2 float64 // m2 = +Inf: static
		v1, v2 float64
		e      float64
	}{
		{"equal e=0", 1, 1, 2, -1, 0},
		{"equal e=0.5", 1, 1, 2, -1, 0.5},
		{"equal e=1", 1, 1, 2, -1, 1},
		{"unequal e=0", 3, 0.5, 1.5, 0.2, 0},
		{"unequal e=0.5", 3, 0.5, 1.5, 0.2, 0.5},
		{"unequal e=1", 3, 0.5, 1.5, 0.2, 1},
		{"static wall e=0.5", 2, math.Inf(1), 4, 0, 0.5},
		{"static wall e=1", 2, math.Inf(1), 4, 0, 1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			a := sphereBody(c.m1, 0.5, vec{0, 0, 0})
			b := sphereBody(c.m2, 0.5, vec{1, 0, 0})
			if math.IsInf(c.m2, 1) {
				b = staticBody(vec{1, 0, 0})
			}
			a.V, b.V = vec{c.v1, 0, 0}, vec{c.v2, 0, 0}
			bodies := []Body{a, b}
			pts := []Point{{A: 0, B: 1, Position: vec{0.5, 0, 0}, Normal: vec{1, 0, 0}, Friction: 0.4, Restitution: c.e, Key: 1}}
			p0 := linearMomentum(bodies)
			s := NewSolver(DefaultSettings())
			rep, err := s.Solve(1e-3, bodies, pts, nil)
			if err != nil {
				t.Fatal(err)
			}
			var w1, w2 float64
			if math.IsInf(c.m2, 1) {
				w1, w2 = -c.e*c.v1, 0
			} else {
				p := c.m1*c.v1 + c.m2*c.v2
				w1 = (p - c.m2*c.e*(c.v1-c.v2)) / (c.m1 + c.m2)
				w2 = (p + c.m1*c.e*(c.v1-c.v2)) / (c.m1 + c.m2)
			}
			if math.Abs(bodies[0].V[0]-w1) > tolExact*math.Abs(c.v1) || math.Abs(bodies[1].V[0]-w2) > tolExact*math.Abs(c.v1) {
				t.Errorf("velocities %v, %v; textbook %v, %v", bodies[0].V[0], bodies[1].V[0], w1, w2)
			}
			if !math.IsInf(c.m2, 1) {
				if d := linearMomentum(bodies).Sub(p0).Len(); d > tolExact*p0.Len() {
					t.Errorf("momentum changed by %g (of %g)", d, p0.Len())
				}
			}
			if c.e > 0 && (rep.Impacts != 1 || math.Abs(pts[0].ImpactSpeed-(c.v1-c.v2)) > tolExact) {
				t.Errorf("report %+v, impact speed %v; want 1 impact at %v", rep, pts[0].ImpactSpeed, c.v1-c.v2)
			}
			// Total impulse on B equals its momentum change (impulse-momentum theorem).
			if !math.IsInf(c.m2, 1) {
				j := pts[0].NormalImpulse + pts[0].ImpactImpulse
				if relErr(j, c.m2*(w2-c.v2)) > 1e-9 {
					t.Errorf("reported impulse %v, momentum change of B %v", j, c.m2*(w2-c.v2))
				}
			}
		})
	}
}

// TestOffCentreImpact hits two turned boxes off their centres with friction:
// the impulses act at one point on both bodies, so linear and angular
// momentum (about the world origin) are conserved exactly (Newton's third
// law; any dynamics text), the normal relative velocity ends at e times the
// approach (Newton's restitution), and friction stays inside the cone.
// Frictionless with e = 1 also conserves kinetic energy (any dynamics text).
func TestOffCentreImpact(t *testing.T) {
	qa := mgl64.QuatRotate(0.4, vec{1, 2, 3}.Normalize())
	qb := mgl64.QuatRotate(-1.1, vec{-2, 1, 0.5}.Normalize())
	cases := []struct {
		name   string
		mu, e  float64
		vt     float64 // tangential relative speed at the start
		energy bool    // kinetic energy must be conserved
	}{
		{"frictionless e=1", 0, 1, 1, true},
		{"frictionless e=0.3", 0, 0.3, 1, false},
		{"friction sticks e=0.5", 0.9, 0.5, 0.2, false},
		{"friction slides e=0.5", 0.2, 0.5, 3, false},
		{"friction slides e=0", 0.2, 0, 3, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			a, ia := boxBody(2, vec{0.4, 0.3, 0.2}, qa, vec{0.1, -0.2, 0.3})
			b, ib := boxBody(0.7, vec{0.2, 0.5, 0.3}, qb, vec{0.5, 0.1, 0.4})
			n := vec{1, 0.2, -0.1}.Normalize()
			t1, _ := tangents(n)
			a.V, a.W = n.Mul(1.5).Add(t1.Mul(c.vt)), vec{0.3, -2, 1}
			b.V, b.W = n.Mul(-0.5), vec{-1, 0.5, 2}
			bodies := []Body{a, b}
			inertia := []shapes.Mat3{ia, ib}
			pt := vec{0.32, 0.05, 0.38}
			pts := []Point{{A: 0, B: 1, Position: pt, Normal: n, Friction: c.mu, StaticFriction: c.mu, Restitution: c.e, Key: 7}}
			rel := func() vec {
				vb := bodies[1].V.Add(bodies[1].W.Cross(pt.Sub(bodies[1].Position)))
				va := bodies[0].V.Add(bodies[0].W.Cross(pt.Sub(bodies[0].Position)))
				return vb.Sub(va)
			}
			approach := -rel().Dot(n)
			p0, l0, e0 := linearMomentum(bodies), angularMomentum(bodies, inertia), kineticEnergy(bodies, inertia)
			set := DefaultSettings()
			set.VelocityIterations, set.PositionIterations = 0, 0 // the impact phase alone
			if _, err := NewSolver(set).Solve(1e-3, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
			if d := linearMomentum(bodies).Sub(p0).Len(); d > tolConserve*p0.Len() {
				t.Errorf("linear momentum changed by %g of %g", d, p0.Len())
			}
			if d := angularMomentum(bodies, inertia).Sub(l0).Len(); d > tolConserve*l0.Len() {
				t.Errorf("angular momentum changed by %g of %g", d, l0.Len())
			}
			vr := rel()
			if got := vr.Dot(n); math.Abs(got-c.e*approach) > tolConserve*approach {
				t.Errorf("normal relative velocity %v, want e*approach %v", got, c.e*approach)
			}
			jn, jt := pts[0].ImpactImpulse, pts[0].ImpactFriction.Len()
			if jt > c.mu*jn*(1+tolExact) {
				t.Errorf("friction impulse %v above mu*normal %v", jt, c.mu*jn)
			}
			slip := vr.Sub(n.Mul(vr.Dot(n))).Len()
			if jt < c.mu*jn*(1-1e-9) && slip > tolConserve {
				t.Errorf("friction %v inside the cone (%v) yet the contact still slips at %v", jt, c.mu*jn, slip)
			}
			if c.energy {
				if e := kineticEnergy(bodies, inertia); relErr(e, e0) > tolConserve {
					t.Errorf("kinetic energy %v, before %v", e, e0)
				}
			}
		})
	}
}

// cradle builds n balls of radius r and mass 1 touching in a row along x,
// the first k moving at v toward the rest; points between neighbours in
// forward or reverse order.
func cradle(n, k int, v float64, e, mu float64, reverse bool) ([]Body, []Point) {
	const r = 0.5
	bodies := make([]Body, n)
	for i := range bodies {
		bodies[i] = sphereBody(1, r, vec{2 * r * float64(i), 0, 0})
		if i < k {
			bodies[i].V = vec{v, 0, 0}
		}
	}
	var pts []Point
	for i := 0; i+1 < n; i++ {
		pts = append(pts, Point{A: int32(i), B: int32(i + 1), Position: vec{2*r*float64(i) + r, 0, 0},
			Normal: vec{1, 0, 0}, Friction: mu, StaticFriction: mu, Restitution: e, Key: uint64(i)})
	}
	if reverse {
		for i, j := 0, len(pts)-1; i < j; i, j = i+1, j-1 {
			pts[i], pts[j] = pts[j], pts[i]
		}
	}
	return bodies, pts
}

// TestNewtonsCradle: five equal balls touching, e = 1: k striking balls leave
// k balls moving at the striking speed and the rest at rest, momentum exactly
// conserved (the classic result of sequential pair impacts,
// Guendelman, Bridson and Fedkiw 2003). The outcome must not depend on the
// order of the points, only the number of passes does.
func TestNewtonsCradle(t *testing.T) {
	const v = 1.0
	for _, reverse := range []bool{false, true} {
		for k := 1; k <= 3; k++ {
			name := map[bool]string{false: "forward", true: "reverse"}[reverse]
			t.Run(name+"/"+string(rune('0'+k)), func(t *testing.T) {
				bodies, pts := cradle(5, k, v, 1, 0.3, reverse)
				rep, err := NewSolver(DefaultSettings()).Solve(1e-3, bodies, pts, nil)
				if err != nil {
					t.Fatal(err)
				}
				for i := range bodies {
					want := 0.0
					if i >= 5-k {
						want = v
					}
					if d := bodies[i].V.Sub(vec{want, 0, 0}).Len(); d > tolChain {
						t.Errorf("ball %d: velocity %v, want %v (passes %d)", i, bodies[i].V, want, rep.ImpactPasses)
					}
					if bodies[i].W.Len() > tolChain {
						t.Errorf("ball %d spins %v", i, bodies[i].W)
					}
				}
				if d := linearMomentum(bodies)[0] - float64(k)*v; math.Abs(d) > tolExact {
					t.Errorf("momentum off by %g", d)
				}
			})
		}
	}
}

// TestCradleInelastic: with e < 1 the impact phase must reproduce the
// sequence of pairwise 1D impacts (the textbook formula of TestHeadOn applied
// pair by pair in the given order, passes repeated while a pair approaches
// faster than the threshold), computed here on scalars.
func TestCradleInelastic(t *testing.T) {
	for _, e := range []float64{0.8, 0.5} {
		const n, v, threshold = 5, 1.0, 1e-3 // a low threshold so that several passes run
		bodies, pts := cradle(n, 1, v, e, 0, false)
		set := DefaultSettings()
		set.BounceThreshold = threshold
		set.VelocityIterations, set.PositionIterations = 0, 0 // the impact phase alone
		set.ImpactPasses = 1000
		rep, err := NewSolver(set).Solve(1e-3, bodies, pts, nil)
		if err != nil {
			t.Fatal(err)
		}
		// Reference: equal masses, v1' = v1 - (1+e)(v1-v2)/2, v2' = v2 + (1+e)(v1-v2)/2.
		u := make([]float64, n)
		u[0] = v
		passes := 0
		for {
			hit := false
			for i := 0; i+1 < n; i++ {
				if a := u[i] - u[i+1]; a > threshold {
					u[i] -= (1 + e) * a / 2
					u[i+1] += (1 + e) * a / 2
					hit = true
				}
			}
			if !hit {
				break
			}
			passes++
		}
		if rep.ImpactPasses != passes {
			t.Errorf("e=%v: %d passes, reference %d", e, rep.ImpactPasses, passes)
		}
		for i := range u {
			if d := math.Abs(bodies[i].V[0] - u[i]); d > tolChain {
				t.Errorf("e=%v ball %d: %v, pairwise reference %v", e, i, bodies[i].V[0], u[i])
			}
		}
		t.Logf("e=%v: %d passes, final %v", e, passes, u)
	}
}

// TestFlatLanding: a box landing flat on four corner points must bounce with
// e times its speed and no spin; sliding in, Coulomb's law over the impact
// takes mu (1+e) v_n off the tangential speed (impulse-momentum with the
// friction impulse mu times the normal impulse, any dynamics text), still
// without pitching since the four normal impulses balance the friction torque.
func TestFlatLanding(t *testing.T) {
	// tolLanding: four coupled points converge geometrically in the pair's
	// sweeps to 1e-12 of the impact speed; 1e-9 allows for that.
	const tolLanding = 1e-9
	cases := []struct {
		name       string
		vx, vz, e  float64
		mu         float64
		wantVx     float64
		wantVz     float64
		wantSpin0  bool
		wantImpact int
	}{
		{"straight e=0.5", 0, -2, 0.5, 0.3, 0, 1, true, 4},
		{"straight e=0.9", 0, -1, 0.9, 0.3, 0, 0.9, true, 4},
		{"sliding e=0.5", 2, -1, 0.5, 0.3, 2 - 0.3*1.5*1, 0.5, true, 4},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bodies, pts := stack(1, 1, 0.2, c.mu)
			for i := range pts {
				pts[i].Restitution = c.e
			}
			bodies[1].V = vec{c.vx, 0, c.vz}
			set := DefaultSettings()
			set.VelocityIterations, set.PositionIterations = 0, 0
			rep, err := NewSolver(set).Solve(1e-3, bodies, pts, nil)
			if err != nil {
				t.Fatal(err)
			}
			b := bodies[1]
			if math.Abs(b.V[2]-c.wantVz) > tolLanding || math.Abs(b.V[0]-c.wantVx) > tolLanding || b.W.Len() > tolLanding {
				t.Errorf("after landing V %v W %v; want vx %v vz %v, no spin", b.V, b.W, c.wantVx, c.wantVz)
			}
			if rep.Impacts != c.wantImpact {
				t.Errorf("%d impacts, want %d", rep.Impacts, c.wantImpact)
			}
		})
	}
}

// TestSpeculative: a point still apart is an impact only if the approach
// would close the gap within the step (approach dt > gap); otherwise the
// velocity solve lets it approach by up to gap/dt. A point that closes its
// gap within the step arrives exactly (approach gap/dt, no impact yet) and
// its impact, at the approach speed it had, is deferred to the next step,
// when the point touches: Newton's restitution then sends it away at e
// times that speed. Expected values follow from these rules.
func TestSpeculative(t *testing.T) {
	const dt = 1e-3
	cases := []struct {
		name       string
		gap, v0, e float64 // v0 < 0: ball moving down toward the floor
		wantV      float64 // after the first step
		wantGap    float64 // at the end of the first step, integrating with V+Vp
		impact     bool    // in the first step
		wantV2     float64 // after a second step with the point touching (gap 0), no gravity
	}{
		{"far: no impact, free approach", 0.01, -1, 0.5, -1, 0.009, false, -1},
		{"closing within the step bounces next step", 0.01, -20, 0.5, -10, 0, false, 10},
		{"closing, e=0: stops at the floor", 0.01, -20, 0, -10, 0, false, 0},
		{"slow below threshold: limited to the gap", 0.00001, -0.05, 0.5, -0.01, 0, false, 0},
		{"touching: plain impact", 0, -3, 0.5, 1.5, 1.5e-3, true, 1.5},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bodies := []Body{staticBody(vec{}), sphereBody(1, 0.1, vec{0, 0, 0.1 + c.gap})}
			bodies[1].V = vec{0, 0, c.v0}
			pts := []Point{{A: 0, B: 1, Position: vec{0, 0, 0}, Normal: vec{0, 0, 1}, Separation: c.gap, Restitution: c.e, Key: 3}}
			s := NewSolver(DefaultSettings())
			rep, err := s.Solve(dt, bodies, pts, nil)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(bodies[1].V[2]-c.wantV) > tolExact*math.Abs(c.v0) {
				t.Errorf("vz %v, want %v", bodies[1].V[2], c.wantV)
			}
			gap := c.gap + (bodies[1].V[2]+bodies[1].Vp[2])*dt
			if math.Abs(gap-c.wantGap) > tolExact*math.Abs(c.v0)*dt {
				t.Errorf("gap at the end of the step %v, want %v", gap, c.wantGap)
			}
			if (rep.Impacts == 1) != c.impact {
				t.Errorf("impacts %d, want impact %v", rep.Impacts, c.impact)
			}
			if c.wantGap != 0 {
				return
			}
			// Second step: the ball touches the floor.
			bodies[1].Position = vec{0, 0, 0.1}
			pts[0].Separation = 0
			if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
				t.Fatal(err)
			}
			if math.Abs(bodies[1].V[2]-c.wantV2) > tolExact*math.Abs(c.v0) {
				t.Errorf("second step: vz %v, want %v", bodies[1].V[2], c.wantV2)
			}
		})
	}
}
