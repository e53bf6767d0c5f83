package engine

import (
	"fmt"
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

// A body on a joint that leaves it free to turn about more than one axis
// (a ball joint, a distance joint: a top on its pivot) follows its
// gyroscopic precession only while it cones little in a step. The step
// applies the joint's impulse, which tips L off the body's axis by the
// precession of the step, and then turns the body about the new L by the
// coning angle phi = dt |L| / I_min at once; the continuous motion turns
// it while L moves. With phi the angle its axes turn about L in the step
// (nutationRate), the axis then lands off by a part of order phi^2 of the
// step's precession, which the position pass takes out without giving
// back its energy: the top of TestPrecessingTop sank 0.56 degrees in 10 s
// at 0.2 rad a step, 4.5 degrees at 0.4, 17 at 0.6 and fell over at 1
// (measured), its precession 1.2, 4.7, 11 and 28 percent slow. No step
// lets it be right there, so the run stops and says what step would.

// maxJointConing is the largest coning dt nu (nutationRate), in radians, of a
// body free to turn on a joint: 0.25 rad keeps the precession of a top
// within 2 percent and its tilt within a degree in 10 s (measured 1.2
// percent and 0.56 degrees at 0.2 rad; the error grows as phi^2).
const maxJointConing = 0.25

// coningAdvice is the part of the largest step that the stop advises: a
// step at the limit could reach it again as the spin changes while the body
// precesses, and the advice is printed to two digits.
const coningAdvice = 0.8

// checkConing stops the run on the first body free to turn on a joint that
// cones faster than maxJointConing in a step of dt.
func (w *World) checkConing(dt float64) error {
	for i := range w.mech.joints {
		def := &w.mech.joints[i].def
		if def.Kind != Spherical && def.Kind != Distance {
			continue
		}
		for _, id := range [2]BodyID{def.A, def.B} {
			if id == Ground || !w.jointFree(id) {
				continue
			}
			phi := dt * w.nutationRate(id)
			if !(phi > maxJointConing) { // NaN is left to checkFinite
				continue
			}
			name := def.Name
			if name == "" {
				name = fmt.Sprint("#", i+1)
			}
			return &DivergenceError{Body: id, Name: w.b.name[id], Time: w.time,
				Cause: fmt.Sprintf("it spins on %s joint %q so fast that it turns %.3g rad a step about its angular momentum, and a step cannot follow its precession beyond %g rad (the top sinks and precesses slow); use a step of at most %.2g s",
					def.Kind, name, phi, maxJointConing, coningAdvice*dt*maxJointConing/phi)}
		}
	}
	return nil
}

// nutationRate is the rate (rad/s) at which body id's principal axes turn
// about its angular momentum L when it turns near the principal axis k
// that L lies nearest: |w_k| (1 + sqrt((I_k - I_i)(I_k - I_j) / (I_i I_j)))
// with a plus sign when k has the largest moment and a minus sign when it
// has the smallest, the spin plus or minus the frequency at which L
// circles k in the body (Euler's equations linearised about a steady spin;
// Goldstein, Poole and Safko, "Classical Mechanics", 3rd ed., 2002,
// sec. 5.6). For a symmetric top spinning about its axis it is |L| / I,
// the rate at which the axis cones about L. A slender rod tumbling end
// over end (I_k = I_j) has no nutation: the rate is its spin, where
// dt |L| / I_min (coning) would be hundreds of times that.
func (w *World) nutationRate(id BodyID) float64 {
	q := qmul(&w.b.rot[id], &w.b.axes[id])
	m := w.b.moments[id]
	s := w.b.spin[id]
	wb := qrotateInv(&q, &s)
	k := 0
	for a := 1; a < 3; a++ {
		if math.Abs(m[a]*wb[a]) > math.Abs(m[k]*wb[k]) {
			k = a
		}
	}
	i, j := nextAxis[k], nextAxis[nextAxis[k]]
	f := math.Sqrt(math.Abs((m[k]-m[i])*(m[k]-m[j])) / (m[i] * m[j]))
	if m[k] < m[i] && m[k] < m[j] {
		f = -f
	}
	return math.Abs(wb[k] * (1 + f))
}
