package engine

import (
	"fmt"
	"math"
	"sort"
)

// motorChange is a motor that takes over a joint at a moment.
type motorChange struct {
	time  float64
	joint JointID
	motor Motor
}

// ScheduleMotor makes m a joint's motor from time t on (from the step that
// begins at t, or the one that holds it), as SetMotor would then: a servo
// stepped through a program of targets, or a motor switched on, reversed or
// off on time.
// Changes at the same time take effect in the order they were scheduled.
func (w *World) ScheduleMotor(j JointID, t float64, m Motor) error {
	if j < 0 || int(j) >= len(w.mech.joints) {
		return fmt.Errorf("%w: no joint %d", ErrBadJoint, j)
	}
	jt := &w.mech.joints[j]
	if math.IsNaN(t) || math.IsInf(t, 0) {
		return w.jointErr(&jt.def, "motor change: time must be finite, got %g", t)
	}
	if err := w.checkMotor(&jt.def, m); err != nil {
		return err
	}
	w.motorChanges = append(w.motorChanges, motorChange{time: t, joint: j, motor: m})
	sort.SliceStable(w.motorChanges, func(a, b int) bool { return w.motorChanges[a].time < w.motorChanges[b].time })
	return nil
}

// applyMotorChanges installs the motors due in [time, time+dt); a change
// due at the step's end, give or take the rounding of the summed time,
// waits for the next step.
func (w *World) applyMotorChanges(dt float64) {
	for len(w.motorChanges) > 0 && w.motorChanges[0].time < w.time+dt*(1-1e-6) {
		c := w.motorChanges[0]
		w.motorChanges = w.motorChanges[1:]
		_ = w.SetMotor(c.joint, c.motor) // checked when scheduled
	}
}

// pending reports whether something scheduled will still move the bodies:
// a kick or a motor change to come, or a driven body whose motion has not
// ended. The world is not settled while it is, however still its bodies
// are: a carton at rest on a tilt table that starts in a second has not
// settled.
func (w *World) pending() bool {
	if len(w.kicks) > 0 || len(w.motorChanges) > 0 {
		return true
	}
	for i := range w.mech.motions {
		if w.time < motionEnd(w.mech.motions[i].m) {
			return true
		}
	}
	return false
}

// motionEnd is the time after which a motion holds its pose: never for a
// vibration or an endless tilt.
func motionEnd(m Motion) float64 {
	switch m := m.(type) {
	case *Tilt:
		if m.Angle != 0 && m.Rate != 0 {
			return m.Start + math.Abs(m.Angle/m.Rate)
		}
	case *Vibration:
		for _, o := range m.Terms {
			if o.Amplitude != 0 && o.Frequency != 0 {
				return math.Inf(1)
			}
		}
		return math.Inf(-1)
	case *PoseTable:
		if !m.Repeat && len(m.Times) > 0 {
			return m.Times[len(m.Times)-1]
		}
	}
	return math.Inf(1)
}
