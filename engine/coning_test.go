package engine

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// TestFastTopStops spins the top of TestPrecessingTop (a disc 5 cm in
// radius on a ball joint 3 cm below its centre, tilted 30 degrees, in
// steady precession; Goldstein, Poole and Safko, "Classical Mechanics",
// 3rd ed., 2002, sec. 5.7) so fast for its step that it cones more than
// maxJointConing a step, where it sank and precessed slow with exit 0 (at
// 100 rad/s and 4 ms it sank 49 degrees in 10 s, measured). The run must
// stop at its first step naming the top and a step; at that step the top
// must precess at the rate of steady precession within topRateTol and keep
// its tilt within maxTopNod.
func TestFastTopStops(t *testing.T) {
	const seconds = 2.0
	for _, c := range []struct{ w3, dt float64 }{
		{100, 2e-3}, {100, 4e-3}, {100, 1.0 / 60}, {300, 1e-3}, {1000, 1e-3},
	} {
		t.Run(fmt.Sprintf("%g rad/s at %.4g s", c.w3, c.dt), func(t *testing.T) {
			_, _, err := steadyTop(t, c.w3, c.dt, seconds)
			var de *DivergenceError
			if !errors.As(err, &de) || de.Name != "top" || de.Time > 1.5*c.dt {
				t.Fatalf("got %v, want a stop at the first step naming the top", err)
			}
			m := regexp.MustCompile(`use a step of at most ([0-9.e+-]+) s`).FindStringSubmatch(de.Error())
			if m == nil || !strings.Contains(de.Error(), "spherical joint") {
				t.Fatalf("%v: names no joint or step to use", err)
			}
			dt, perr := strconv.ParseFloat(m[1], 64)
			if perr != nil || !(dt < c.dt) {
				t.Fatalf("%v: step %q is no smaller", err, m[1])
			}
			tilt, rate, err := steadyTop(t, c.w3, dt, seconds)
			if err != nil {
				t.Fatalf("at the step the message names, %g s: %v", dt, err)
			}
			if tilt > maxTopNod || rate > topRateTol {
				t.Errorf("at %g s: tilt off by %.3g degrees (want below %g), precession off by %.2g (want below %g)",
					dt, tilt, maxTopNod, rate, topRateTol)
			}
		})
	}
}

// steadyTop runs the top of TestPrecessingTop spun at w3 for seconds at
// dt and returns how far its tilt left 30 degrees (degrees), the relative
// error of its mean precession rate and the error that stopped it.
func steadyTop(t *testing.T, w3, dt, seconds float64) (tilt, rateErr float64, err error) {
	const r, h, l, rho = 0.05, 0.01, 0.03, 7800.0
	theta := math.Pi / 6
	m := rho * math.Pi * r * r * h
	i3, i1 := m*r*r/2, m*(3*r*r+h*h)/12+m*l*l
	// The slow root of I1 cos(theta) phi'^2 - I3 w3 phi' + m g l = 0.
	a, b, c := i1*math.Cos(theta), -i3*w3, m*g0*l
	phid := (-b - math.Sqrt(b*b-4*a*c)) / (2 * a)
	axis := shapes.Vec3{math.Sin(theta), 0, math.Cos(theta)}
	spin := shapes.Vec3{0, 0, phid}.Add(axis.Mul(w3 - phid*math.Cos(theta)))
	com := axis.Mul(l)
	w := newTestWorld(t, DefaultConfig())
	id := mustAdd(t, w, BodyDef{Name: "top", Shape: shapes.Cylinder{Radius: r, HalfLength: h / 2}, Density: rho,
		Position: com, Orientation: mgl64.QuatRotate(theta, shapes.Vec3{0, 1, 0}), Velocity: spin.Cross(com), Spin: spin})
	mustJoint(t, w, JointDef{Name: "pivot", Kind: Spherical, A: id, B: Ground})
	turned, prev := 0.0, 0.0
	for i := 0; float64(i)*dt < seconds; i++ {
		if err := w.Step(dt); err != nil {
			return 0, 0, err
		}
		e3 := w.Orientation(id).Rotate(shapes.Vec3{0, 0, 1})
		phi := math.Atan2(e3[1], e3[0])
		turned += math.Remainder(phi-prev, 2*math.Pi)
		prev = phi
		tilt = max(tilt, math.Abs(math.Acos(e3[2])-theta)*180/math.Pi)
	}
	return tilt, relErr(turned/w.Time(), phid), nil
}

// freeSpinMomentumTol bounds the relative change of the world angular
// momentum of a torque-free body: the splitting conserves it to rounding
// (1e-12 measured over 2000 steps).
const freeSpinMomentumTol = 1e-9

// freeSpinNodTol bounds how far, relatively, the angle between the body's
// axis and its angular momentum may exceed the largest that energy and
// |L| allow: the splitting keeps the energy within 6e-9 of itself at up to
// 2 rad a step (measured), which moves that bound by 1e-4 of itself.
const freeSpinNodTol = 1e-3

// TestFastFreeSpinKeepsAxis spins a torque-free brick of 10 x 6 x 1 cm
// about its axis of largest inertia, 1 percent off it, at 0.5 to 2 rad a
// step: rotation about that axis is stable (Goldstein, Poole and Safko,
// "Classical Mechanics", 3rd ed., 2002, sec. 5.6), and the conservation of
// energy and angular momentum bound the angle between the axis and L: with
// L_k = I_k w_k, 2E - |L|^2/I3 = L1^2 (1/I1 - 1/I3) + L2^2 (1/I2 - 1/I3),
// so L1^2 + L2^2 <= (2E - |L|^2/I3) / (1/I2 - 1/I3). The body is not on a
// joint, and the fast coning of a free body is right (no stop).
func TestFastFreeSpinKeepsAxis(t *testing.T) {
	half := shapes.Vec3{0.05, 0.03, 0.005}
	const rho, eps = 7800.0, 0.01
	m := rho * 8 * half[0] * half[1] * half[2]
	mo := shapes.Vec3{ // a rectangular prism, m (b^2 + c^2) / 3 with half edges b, c
		m * (half[1]*half[1] + half[2]*half[2]) / 3,
		m * (half[0]*half[0] + half[2]*half[2]) / 3,
		m * (half[0]*half[0] + half[1]*half[1]) / 3,
	}
	for _, perStep := range []float64{0.5, 1, 2} {
		for _, dt := range []float64{1e-3, 1.0 / 60} {
			cfg := DefaultConfig()
			cfg.Gravity = shapes.Vec3{}
			w := newTestWorld(t, cfg)
			ws := perStep / dt
			s := shapes.Vec3{eps * ws, 0.5 * eps * ws, ws} // body axes are the world's at the start
			id := mustAdd(t, w, BodyDef{Name: "brick", Shape: shapes.Box{Half: half}, Density: rho, Spin: s})
			l := shapes.Vec3{mo[0] * s[0], mo[1] * s[1], mo[2] * s[2]}
			c := mo[0]*s[0]*s[0] + mo[1]*s[1]*s[1] + mo[2]*s[2]*s[2] - l.Dot(l)/mo[2]
			lp := math.Sqrt(c / (1/mo[1] - 1/mo[2]))
			bound := math.Atan2(lp, math.Sqrt(l.Dot(l)-lp*lp))
			worst := 0.0
			run(t, w, dt, 2000*dt, func() {
				e3 := w.Orientation(id).Rotate(shapes.Vec3{0, 0, 1})
				worst = max(worst, math.Acos(min(1, e3.Dot(l.Normalize()))))
			})
			l1 := w.AngularMomentum(w.Position(id))
			if d := l1.Sub(l).Len() / l.Len(); d > freeSpinMomentumTol {
				t.Errorf("%g rad a step at %.4g s: angular momentum changed by %.2g of itself, want below %g", perStep, dt, d, freeSpinMomentumTol)
			}
			if worst > bound*(1+freeSpinNodTol) {
				t.Errorf("%g rad a step at %.4g s: axis up to %.5g rad off L, energy and |L| allow %.5g", perStep, dt, worst, bound)
			}
		}
	}
}
