package bench

import (
	"testing"

	"clatter/contact"
	"clatter/shapes"
)

// contactStack builds a static ground (body 0) and columns of 1 kg cubes of
// 0.2 m, levels high, resting on four corner points per contact.
func contactStack(columns, levels int) ([]contact.Body, []contact.Point) {
	const h = 0.2
	i := 1.0 * (h*h + h*h) / 12
	bodies := []contact.Body{{}}
	var pts []contact.Point
	for c := 0; c < columns; c++ {
		x0 := float64(c) * 3 * h
		below := int32(0)
		for l := 0; l < levels; l++ {
			bodies = append(bodies, contact.Body{
				InvMass:    1,
				InvInertia: shapes.Mat3{1 / i, 0, 0, 0, 1 / i, 0, 0, 0, 1 / i},
				Position:   shapes.Vec3{x0, 0, (float64(l) + 0.5) * h},
			})
			id := int32(len(bodies) - 1)
			for k := 0; k < 4; k++ {
				dx, dy := h/2*float64(1-2*(k&1)), h/2*float64(1-(k&2))
				pts = append(pts, contact.Point{
					A: below, B: id,
					Position: shapes.Vec3{x0 + dx, dy, float64(l) * h},
					Normal:   shapes.Vec3{0, 0, 1},
					Friction: 0.5, StaticFriction: 0.6, Restitution: 0.3,
					Key: uint64(c)<<32 | uint64(l)<<8 | uint64(k),
				})
			}
			below = id
		}
	}
	return bodies, pts
}

func contactStep(b *testing.B, s *contact.Solver, bodies []contact.Body, pts []contact.Point) {
	const dt = 1e-3
	for i := range bodies {
		if bodies[i].InvMass > 0 {
			bodies[i].V[2] -= 9.80665 * dt
		}
	}
	if _, err := s.Solve(dt, bodies, pts, nil); err != nil {
		b.Fatal(err)
	}
}

// BenchmarkContactStack1000 is one warm-started step of 1000 contact points
// (50 columns of 5 cubes, 4 points per contact) with default settings.
func BenchmarkContactStack1000(b *testing.B) {
	bodies, pts := contactStack(50, 5)
	s := contact.NewSolver(contact.DefaultSettings())
	for range 20 {
		contactStep(b, s, bodies, pts)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		contactStep(b, s, bodies, pts)
	}
	b.ReportMetric(float64(len(pts)), "points")
}

// BenchmarkContactStack1000Cold is the same step without warm-start memory,
// so every pair is new and gets its pre-solve.
func BenchmarkContactStack1000Cold(b *testing.B) {
	bodies, pts := contactStack(50, 5)
	s := contact.NewSolver(contact.DefaultSettings())
	for range 2 { // grow both warm-start slices
		s.Reset()
		contactStep(b, s, bodies, pts)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		s.Reset()
		contactStep(b, s, bodies, pts)
	}
}
