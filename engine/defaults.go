package engine

// The default rest thresholds (Config.RestSpeed, RestSpin and RestTime),
// kept here once for the world and for the scene reader that fills
// [world]. They suit parts of centimetres to decimetres: a part creeping
// slower than 5 mm/s and 0.05 rad/s for a quarter of a second is not
// going anywhere a designer cares about, and an island that has rested
// that long sleeps.
const (
	DefaultRestSpeed = 5e-3 // m/s
	DefaultRestSpin  = 0.05 // rad/s
	DefaultRestTime  = 0.25 // s
)
