package engine

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// A block standing on a table that tilts slowly tips over its downhill
// edge once its centre of mass passes over that edge, at a tilt of
// atan(b/h) for base width b and height h, if static friction holds it
// that long (mu_s > b/h); else it slides first, at atan(mu_s) (statics of
// a rigid block: J. L. Meriam and L. G. Kraige, "Engineering Mechanics:
// Statics", chapter on friction, tipping versus slipping). The answer
// depends on neither the size nor the step, so every size and step must
// give it: a 1 mm block (the scale of small mechanism parts) leaned
// against the moving table while the solver's stopping error sank its
// downhill edge, and tipped by 1e-3 rad at 4 to 15 degrees (contact/turn.go).
//
// The turn that marks the tip, tipTurn, comes a little after the critical
// tilt: the overturning moment grows from zero with the tilt, so the block
// needs time to turn that far. Rotation about the fixed edge (Meriam and
// Kraige, "Engineering Mechanics: Dynamics", rotation about a fixed axis,
// M = I alpha) with I = m (b^2 + h^2)/3 for a box about its edge and the
// moment m g d sin(phi + theta - phi_c), d the edge-to-centre distance,
// gives for small angles theta” = s^2 (w t + theta), s^2 = 3 g / (4 d),
// w the tilt rate: theta(t) = (w/s) (sinh(s t) - s t). The tip is expected
// at atan(b/h) plus the tilt during the time that takes to reach tipTurn
// (0.05 degrees for the 1 mm block, 0.34 for 0.2 m, 0.74 for 2 m).
func TestTiltTableTipsAtEverySize(t *testing.T) {
	const (
		muS      = 0.8
		rate     = 2.0  // degrees per second of tilt
		tipTurn  = 1e-3 // rad turned relative to the table: tipping
		slideMax = 0.05 // of the base width moved along the table before the tip: it slid
		// tipTol (degrees): the tip is seen at the end of the step in which
		// the turn passes tipTurn, up to one step's tilt (0.033 degrees at
		// 1/60 s) after it, and the model of the delay ignores the support's
		// own slow turn and the pivot's shift within the contact slop, worth
		// a few hundredths of a degree more (measured: within 0.03 at 1e-4 s).
		tipTol = 0.1
	)
	g := 9.81
	for _, b := range []float64{1e-3, 0.2, 2} {
		for _, dt := range []float64{1.0 / 60, 1e-3} {
			name := fmt.Sprintf("b=%gm/dt=%.4gs", b, dt)
			t.Run(name, func(t *testing.T) {
				h := 2 * b
				w := newTestWorld(t, DefaultConfig())
				mat, _ := w.AddMaterial(Material{Name: "rubber", Friction: 0.75 * muS, StaticFriction: muS})
				span := 8 * b // the table, hinged along its +x edge
				table := mustAdd(t, w, BodyDef{Name: "table", Kind: Kinematic, Shape: shapes.Box{Half: shapes.Vec3{span / 2, span / 2, span / 80}},
					Material: mat, Position: shapes.Vec3{0, 0, -span / 80}})
				block := mustAdd(t, w, BodyDef{Name: "block", Shape: shapes.Box{Half: shapes.Vec3{b / 2, b / 2, h / 2}}, Mass: 1000 * b * b * h,
					Material: mat, Position: shapes.Vec3{span / 4, 0, h / 2}})
				run(t, w, dt, 0.2, nil) // settle on the still table
				rel := func() (shapes.Vec3, shapes.Quat) {
					qt := w.Orientation(table)
					return qt.Conjugate().Rotate(w.Position(block).Sub(w.Position(table))), qt.Conjugate().Mul(w.Orientation(block))
				}
				p0, r0 := rel()
				omega := mgl64.DegToRad(rate)
				if err := w.SetMotion(table, &Tilt{Axis: shapes.Vec3{0, 1, 0}, Point: shapes.Vec3{span / 2, 0, 0}, Rate: omega, Start: w.Time()}); err != nil {
					t.Fatal(err)
				}
				t0 := w.Time()
				critical := mgl64.RadToDeg(math.Atan(b / h))
				got := math.NaN()
				for w.Time() < t0+(critical+5)/rate {
					if err := w.Step(dt); err != nil {
						t.Fatal(err)
					}
					p, r := rel()
					if moved := math.Abs(p[0] - p0[0]); moved > slideMax*b {
						t.Fatalf("slid %.3g of its base at %.2f degrees, before tipping", moved/b, rate*(w.Time()-t0))
					}
					if quatAngle(r, r0) > tipTurn {
						got = rate * (w.Time() - t0)
						break
					}
				}
				if math.IsNaN(got) {
					t.Fatalf("did not tip up to %.1f degrees", critical+5)
				}
				want := critical + rate*tipDelay(omega, math.Sqrt(3*g/(4*math.Hypot(b/2, h/2))), tipTurn)
				if math.Abs(got-want) > tipTol {
					t.Errorf("tipped at %.3f degrees, want %.3f (atan(b/h) = %.3f plus the delay to turn %g rad)", got, want, critical, tipTurn)
				}
				t.Logf("tipped at %.3f degrees, want %.3f (atan(b/h) = %.3f)", got, want, critical)
			})
		}
	}
}

// tipDelay is the time t at which (w/s) (sinh(s t) - s t) reaches theta,
// by bisection: the growing function's root is bracketed by doubling.
func tipDelay(w, s, theta float64) float64 {
	f := func(t float64) float64 { return w/s*(math.Sinh(s*t)-s*t) - theta }
	lo, hi := 0.0, 1e-3
	for f(hi) < 0 {
		lo, hi = hi, 2*hi
	}
	for i := 0; i < 100; i++ {
		mid := (lo + hi) / 2
		if f(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}
