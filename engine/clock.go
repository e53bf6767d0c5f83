package engine

// advanceTime adds a step of dt seconds to the world's time with compensated
// (Kahan) summation (Kahan, "Further remarks on reducing truncation errors",
// Comm. ACM 8(1), 1965; Higham, "Accuracy and Stability of Numerical
// Algorithms", 2nd ed., 2002, sec. 4.3). A plain running sum of a step that
// binary floating point cannot hold (1e-3, 1e-4 s) drifts by a rounding error
// a step: 600 s of 1 ms steps ended at 599.999999993 s, and from 43 s on
// every sample fell one step after its time. The compensated sum stays
// within a rounding error of the exact sum of the steps however many there
// are; timeLost keeps the low-order part the last addition lost.
func (w *World) advanceTime(dt float64) {
	y := dt - w.timeLost
	t := w.time + y
	w.timeLost = (t - w.time) - y
	w.time = t
}
