package engine

import "clatter/shapes"

// EventKind names what happened.
type EventKind uint8

const (
	// Impact: two bodies struck with a normal approach speed above the bounce threshold.
	Impact EventKind = iota
	// ContactBegin and ContactEnd: a pair of bodies started or stopped touching.
	ContactBegin
	ContactEnd
	// Sleep and Wake: a body's island came to rest, so that the step
	// stops moving it (its bodies stayed below the rest thresholds for the
	// rest time), or was set moving again by a contact, a kick or a moving
	// support. Their names in files are "rest_begin" and "rest_end", like
	// a contact's; the previous release wrote "sleep" and "wake".
	Sleep
	Wake
	// Settled: every dynamic body is at rest and nothing scheduled will
	// move them any more: no kick or motor change to come, no driven body
	// whose motion has not ended (once per run).
	Settled
)

func (k EventKind) String() string {
	return [...]string{"impact", "contact_begin", "contact_end", "rest_begin", "rest_end", "settled"}[k]
}

// Event is one thing that happened during a step. A and B are the bodies
// (B is -1 for events of one body, both -1 for Settled).
type Event struct {
	Kind EventKind
	Time float64
	A, B BodyID
	// Point, Speed (normal approach speed, m/s) and Impulse (N s) of an
	// impact; Normal is the contact normal there, unit, from A toward B.
	Point   shapes.Vec3
	Normal  shapes.Vec3
	Speed   float64
	Impulse float64
	// Compliant marks an impact through a compliant contact, with its
	// largest contact force PeakForce (N), its Duration (s) and, per body
	// (A, B), PeakAcceleration: that force over the body's weight, in units
	// of standard gravity (0 for a body that is not dynamic).
	Compliant        bool
	PeakForce        float64
	Duration         float64
	PeakAcceleration [2]float64
	// Poses are the shape poses (ShapePose) of A and B when a compliant
	// impact began: it is reported when it ends, after the bodies have
	// moved and turned, and what it struck is read at its start. Zero for
	// a rigid impact, which is reported in the step it happens.
	Poses [2]shapes.Pose
}

// Events returns the events of the steps since the last call; the slice is
// reused by the next step, so copy what must be kept.
func (w *World) Events() []Event {
	ev := w.events
	w.events = w.events[:0]
	return ev
}

func (w *World) emit(e Event) {
	if w.cfg.NoEvents {
		return
	}
	w.events = append(w.events, e)
}
