package scene

import "math"

// stepSlack is the part of a step by which the duration may pass a whole
// number of steps and still end the run there: a step written with six or
// seven significant digits (0.0333333 s for 1/30 s) makes duration / step
// a little over a whole number (300.0003 for 10 s), and counting up from
// there ran one step past the duration, which the run should not pass.
// A thousandth of a step is far above that rounding and far below any
// duration a user means to be a step longer.
const stepSlack = 1e-3

// StepCount is the number of steps of a run of these settings: the
// duration over the step, rounded up, unless it passes a whole number of
// steps by less than stepSlack of a step; at least one.
func (w *Settings) StepCount() int {
	return max(int(math.Ceil(w.Duration/w.Step-stepSlack)), 1)
}
