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
