package engine

import (
	"math"
	"testing"

	"clatter/shapes"
)

func TestThrowNumberAndConveyingDirection(t *testing.T) {
	// The throw number A W^2 sin(psi) / (g cos(alpha)) (common
	// feeder-design practice) of a linear track's stroke, and of a bowl's
	// helical stroke (a vertical term and a turn about the axis, in
	// phase), whose normal acceleration is the vertical term's alone; and
	// the direction each conveys parts: along the track's stroke, and
	// along the circle about the bowl's axis. Closed forms, so the
	// tolerance is rounding.
	const tol = 1e-12
	w := 2 * math.Pi * 50
	g := shapes.Vec3{0, 0, -g0}
	alpha, psi := 3*math.Pi/180, 20*math.Pi/180
	track := shapes.Vec3{math.Cos(alpha), 0, math.Sin(alpha)}
	normal := shapes.Vec3{-math.Sin(alpha), 0, math.Cos(alpha)}
	stroke := shapes.Vec3{math.Cos(alpha + psi), 0, math.Sin(alpha + psi)}
	bowl := &Vibration{Terms: []Oscillation{
		{Axis: shapes.Vec3{0, 0, 1}, Amplitude: 1e-4, Frequency: 50},
		{Rotary: true, Axis: shapes.Vec3{0, 0, 1}, Amplitude: 0.01, Frequency: 50},
	}}
	for _, c := range []struct {
		name       string
		v          *Vibration
		at, normal shapes.Vec3
		throw      float64
		dir        shapes.Vec3
	}{
		{"linear track", &Vibration{Terms: []Oscillation{{Axis: stroke, Amplitude: 3e-4, Frequency: 50}}}, shapes.Vec3{}, normal,
			3e-4 * w * w * math.Sin(psi) / (g0 * math.Cos(alpha)), track},
		{"bowl, at +x", bowl, shapes.Vec3{0.05, 0, 0.01}, shapes.Vec3{0, 0, 1}, 1e-4 * w * w / g0, shapes.Vec3{0, 1, 0}},
		{"bowl, at -y", bowl, shapes.Vec3{0, -0.05, 0.01}, shapes.Vec3{0, 0, 1}, 1e-4 * w * w / g0, shapes.Vec3{1, 0, 0}},
	} {
		if got := c.v.ThrowNumber(c.at, c.normal, g); math.Abs(got-c.throw) > tol*c.throw {
			t.Errorf("%s: throw number %.15g, want %.15g", c.name, got, c.throw)
		}
		if got := c.v.ConveyingDirection(c.at, c.normal); got.Sub(c.dir).Len() > tol {
			t.Errorf("%s: conveys along %v, want %v", c.name, got, c.dir)
		}
	}
	// Two frequencies: the peak is found by sampling. Displacements
	// sin(W t) + sin(2 W t) / 16 accelerate as W^2 (sin x + sin(2 x) / 4),
	// x = W t, whose peak is at cos x = (-1 + sqrt 3) / 2 (the derivative
	// cos x + cos(2 x) / 2 vanishes there): W^2 sin x (1 + cos(x) / 2).
	// sampleTol: the sampling's resolution, 64 points per period.
	const sampleTol = 1e-3
	two := &Vibration{Terms: []Oscillation{{Axis: shapes.Vec3{0, 0, 1}, Amplitude: 1, Frequency: 1}, {Axis: shapes.Vec3{0, 0, 1}, Amplitude: 1.0 / 16, Frequency: 2}}}
	c := (-1 + math.Sqrt(3)) / 2
	want := 4 * math.Pi * math.Pi * math.Sqrt(1-c*c) * (1 + c/2) / g0
	if got := two.ThrowNumber(shapes.Vec3{}, shapes.Vec3{0, 0, 1}, g); math.Abs(got-want) > sampleTol*want {
		t.Errorf("two frequencies: throw number %g, want %g", got, want)
	}
	if got := two.ThrowNumber(shapes.Vec3{}, shapes.Vec3{0, 0, -1}, g); !math.IsNaN(got) {
		t.Errorf("a track facing down: throw number %g, want NaN", got)
	}
}
