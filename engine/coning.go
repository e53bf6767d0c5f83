package engine

import (
	"math"

	"clatter/shapes"
)

// A body held by a joint and spinning off its principal axes (a top
// precessing about its pivot) cones about its angular momentum L at |L|/I
// within the step (Goldstein, Poole and Safko, "Classical Mechanics", 3rd
// ed., 2002, sec. 5.6, the force-free symmetric top). A joint's velocity
// target built on a constant spin misses that turn; the position pass then
// takes the miss every step without giving back its energy, and a top
// sinks: one of 5 cm radius spun at 100 rad/s about a pivot 3 cm from its
// centre, set precessing steadily at 30 degrees, fell to 58 degrees in 10 s
// at 1 ms (measured). predictAll therefore predicts a jointed body's turn
// with the free rotation for the velocity targets too, while the turn per
// step stays small enough for the targets to follow the solve's changes of
// spin.

// maxPredictedConing bounds, in radians, the coning dt |L| / I_min of a
// jointed body whose velocity targets include its free rotation. The
// target then depends on the spin the last solve left, and above about
// 2 rad a step that feedback grows: the top above at 1000 rad/s and 1 ms
// (1.97 rad a step) gained nineteen times its energy, while up to 1.77 rad
// it kept its energy (measured). 1 rad leaves a factor of two; above it the
// constant spin is kept, which loses energy rather than gains it.
const maxPredictedConing = 1.0

// coning is the angle dt |L| / I_min by which body id, at world spin s,
// could turn about its angular momentum L in a step of dt.
func (w *World) coning(id BodyID, s shapes.Vec3, dt float64) float64 {
	q := qmul(&w.b.rot[id], &w.b.axes[id])
	m := w.b.moments[id]
	wb := qrotateInv(&q, &s)
	l := math.Sqrt(m[0]*wb[0]*m[0]*wb[0] + m[1]*wb[1]*m[1]*wb[1] + m[2]*wb[2]*m[2]*wb[2])
	return dt * l / min(m[0], m[1], m[2])
}
