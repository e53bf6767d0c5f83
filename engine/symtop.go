package engine

import (
	"math"

	"clatter/shapes"
)

// A body with two equal principal moments (a cylinder, a capsule, a square
// prism: a symmetric top) turns freely by an exact formula. Its kinetic
// energy splits into |L|^2/(2 I) and (1/I3 - 1/I) L3^2 / 2, with I the
// equal moment and I3, L3 the moment and momentum about the symmetry axis;
// |L|^2 is a Casimir, so the two flows commute and each is exact: the body
// turns about its angular momentum at |L|/I, and about its own axis at
// (1/I3 - 1/I) L3 (Goldstein, Poole and Safko, "Classical Mechanics", 3rd
// ed., 2002, sec. 5.6, the force-free symmetric top). The three-term
// splitting of freeRotation is exact per term but not in composition: with
// a spin of several radians per step about the symmetry axis its error
// grows step by step (the axis wanders off the angular momentum), which
// rolling cylinders at coarse steps met.

// topAxis returns the index of the symmetry axis of moments, when exactly
// two of them are equal; ok is false otherwise (no two equal, or a sphere
// or cube, whose splitting already turns about L alone).
func topAxis(m shapes.Vec3) (k int, ok bool) {
	switch {
	case m[0] == m[1] && m[1] == m[2]:
		return 0, false
	case m[1] == m[2]:
		return 0, true
	case m[0] == m[2]:
		return 1, true
	case m[0] == m[1]:
		return 2, true
	}
	return 0, false
}

// topRotation is freeRotation for a symmetric top with symmetry axis k:
// q turns from the principal frame to the world, spin is the world angular
// velocity.
func topRotation(q shapes.Quat, moments, spin shapes.Vec3, k int, dt float64) (shapes.Quat, shapes.Vec3) {
	wb := qrotateInv(&q, &spin)
	pi := shapes.Vec3{moments[0] * wb[0], moments[1] * wb[1], moments[2] * wb[2]}
	ip := moments[(k+1)%3]
	// About the symmetry axis; the body-frame momentum turns the other way.
	// principalRotate turns by dt pi_k / eff_k: eff_k = 1 / (1/I3 - 1/I).
	var eff shapes.Vec3
	eff[k] = ip * moments[k] / (ip - moments[k])
	principalRotate(&q, &pi, &eff, k, dt)
	// About L, fixed in the body frame during this flow.
	if l := math.Sqrt(pi[0]*pi[0] + pi[1]*pi[1] + pi[2]*pi[2]); l > 0 {
		s, c := sincos(0.5 * dt * l / ip)
		r := shapes.Quat{W: c, V: shapes.Vec3{s * pi[0] / l, s * pi[1] / l, s * pi[2] / l}}
		q = qmul(&q, &r)
	}
	q = q.Normalize()
	wb = shapes.Vec3{pi[0] / moments[0], pi[1] / moments[1], pi[2] / moments[2]}
	return q, qrotate(&q, &wb)
}
