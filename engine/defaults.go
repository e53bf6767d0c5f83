package engine

// Defaults of Config that other packages need too (the scene reader fills
// [world] with them and judges a step by the slop), kept here once.
const (
	// DefaultRestSpeed, DefaultRestSpin and DefaultRestTime are the rest
	// thresholds. They suit parts of centimetres to decimetres: a part
	// creeping slower than 5 mm/s and 0.05 rad/s for a quarter of a second
	// is not going anywhere a designer cares about, and an island that has
	// rested that long sleeps.
	DefaultRestSpeed = 5e-3 // m/s
	DefaultRestSpin  = 0.05 // rad/s
	DefaultRestTime  = 0.25 // s
	// DefaultSlop is the penetration (m) left alone by position correction
	// and the extra margin of speculative contacts.
	DefaultSlop = 2e-4
)
