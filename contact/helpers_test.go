package contact

import (
	"math"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// gStd is standard gravity (CGPM 1901), the project's g.
const gStd = 9.80665

// sphereBody is a solid sphere: I = 2 m r^2 / 5 (any dynamics handbook).
func sphereBody(m, r float64, x vec) Body {
	i := 2 * m * r * r / 5
	return Body{InvMass: 1 / m, InvInertia: mgl64.Diag3(vec{1 / i, 1 / i, 1 / i}), Position: x}
}

// boxBody is a solid box of full edges size turned by q, with I = m(b^2+c^2)/12
// about each principal axis (any dynamics handbook). It returns the body and
// its world inertia (for angular momentum).
func boxBody(m float64, size vec, q shapes.Quat, x vec) (Body, shapes.Mat3) {
	a, b, c := size[0], size[1], size[2]
	I := vec{m * (b*b + c*c) / 12, m * (a*a + c*c) / 12, m * (a*a + b*b) / 12}
	R := shapes.RotationMatrix(q)
	Iw := R.Mul3(mgl64.Diag3(I)).Mul3(R.Transpose())
	Iinv := R.Mul3(mgl64.Diag3(vec{1 / I[0], 1 / I[1], 1 / I[2]})).Mul3(R.Transpose())
	return Body{InvMass: 1 / m, InvInertia: Iinv, Position: x}, Iw
}

func staticBody(x vec) Body { return Body{Position: x} }

func linearMomentum(bs []Body) vec {
	var p vec
	for _, b := range bs {
		if b.InvMass > 0 {
			p = p.Add(b.V.Mul(1 / b.InvMass))
		}
	}
	return p
}

// angularMomentum about the world origin: sum of x × m v + I w.
func angularMomentum(bs []Body, inertia []shapes.Mat3) vec {
	var l vec
	for i, b := range bs {
		if b.InvMass > 0 {
			l = l.Add(b.Position.Cross(b.V.Mul(1 / b.InvMass))).Add(inertia[i].Mul3x1(b.W))
		}
	}
	return l
}

func kineticEnergy(bs []Body, inertia []shapes.Mat3) float64 {
	e := 0.0
	for i, b := range bs {
		if b.InvMass > 0 {
			e += 0.5*b.V.Dot(b.V)/b.InvMass + 0.5*b.W.Dot(inertia[i].Mul3x1(b.W))
		}
	}
	return e
}

func relErr(got, want float64) float64 {
	return math.Abs(got-want) / math.Max(math.Abs(want), 1e-300)
}

// stack builds a static ground (body 0) and columns of unit-mass cubes of
// edge h resting on it and on each other, 4 corner points per contact, keys
// unique per (column, level, corner). The ground's top is z = 0.
func stack(columns, levels int, h, mu float64) ([]Body, []Point) {
	bodies := []Body{staticBody(vec{})}
	var pts []Point
	for c := 0; c < columns; c++ {
		x0 := float64(c) * 3 * h
		below := int32(0)
		for l := 0; l < levels; l++ {
			b, _ := boxBody(1, vec{h, h, h}, mgl64.QuatIdent(), vec{x0, 0, (float64(l) + 0.5) * h})
			bodies = append(bodies, b)
			id := int32(len(bodies) - 1)
			for k := 0; k < 4; k++ {
				dx, dy := h/2*float64(1-2*(k&1)), h/2*float64(1-(k&2))
				pts = append(pts, Point{
					A: below, B: id,
					Position: vec{x0 + dx, dy, float64(l) * h},
					Normal:   vec{0, 0, 1},
					Friction: mu, StaticFriction: mu,
					Key: uint64(c)<<32 | uint64(l)<<8 | uint64(k),
				})
			}
			below = id
		}
	}
	return bodies, pts
}

func addGravity(bs []Body, dt float64) {
	for i := range bs {
		if bs[i].InvMass > 0 {
			bs[i].V[2] -= gStd * dt
		}
	}
}

func maxSpeed(bs []Body) float64 {
	m := 0.0
	for _, b := range bs {
		m = math.Max(m, math.Max(b.V.Len(), b.W.Len()))
	}
	return m
}
