package report

import (
	"fmt"
	"math"
	"strconv"

	"clatter/engine"
	"clatter/engine/scene"
	"clatter/shapes"
)

// ConveyStart is the time, s, after which the conveying speed of a
// vibratory drive is measured: the parts dropped onto a track take some
// strokes to fall into their steady gait.
const ConveyStart = 1.0

// Drive is the figures of one vibration drive in summary.json.
type Drive struct {
	Body string `json:"body"`
	// ThrowNumber is the track's peak normal acceleration over
	// g cos(track angle) (common feeder-design practice); null when
	// gravity does not press parts onto the track.
	ThrowNumber *float64 `json:"throw_number"`
	// ConveyingSpeed is the mean speed along the track of the parts on
	// it (those that touched it within the last two strokes, so that
	// hopping parts count in flight too), after ConveyStart; null when
	// none was on it then.
	ConveyingSpeed *float64 `json:"conveying_speed"`
	// StepSpeed is how much the track's speed along itself changes in a
	// step at most, averaged over the parts whose speeds were measured
	// (not in summary.json): hopping parts land to within a step, so a
	// conveying speed is resolved to only a part of that (CoarseSteps).
	StepSpeed *float64 `json:"-"`
}

// driveMeter measures one vibration drive over a run.
type driveMeter struct {
	scene  int // index in s.Drives
	track  engine.BodyID
	vib    *engine.Vibration
	normal shapes.Vec3 // the track's outward normal: its own z axis
	throw  float64
	sum    float64 // of speeds along the track, one per part and step
	acc    float64 // of the track's acceleration along it there (AlongAcceleration)
	n      int64
	// last is when each body last touched the track; hold how long after
	// that it still counts as on it: two periods of the slowest term.
	last []float64
	hold float64
}

// newDriveMeters sets up a meter per vibration drive, with its throw
// number from the track's starting pose. A track's normal is its own z
// axis, as the scene orients it.
func newDriveMeters(s *scene.Scene, w *engine.World, ids []engine.BodyID) []driveMeter {
	var out []driveMeter
	for k, d := range s.Drives {
		vib, ok := d.Motion.(*engine.Vibration)
		if !ok {
			continue
		}
		id := ids[s.BodyIndex(d.Body)]
		n := w.Orientation(id).Rotate(shapes.Vec3{0, 0, 1})
		m := driveMeter{scene: k, track: id, vib: vib, normal: n,
			throw: vib.ThrowNumber(w.Position(id), n, w.Config().Gravity), last: make([]float64, w.NumBodies())}
		for i := range m.last {
			m.last[i] = math.Inf(-1)
		}
		for _, o := range vib.Terms {
			if o.Frequency > 0 {
				m.hold = math.Max(m.hold, 2/o.Frequency)
			}
		}
		out = append(out, m)
	}
	return out
}

// convey notes which parts touch each vibrating track and, after
// ConveyStart, adds the speeds along the track of those on it.
func (r *runner) convey() {
	t := r.w.Time()
	for k := range r.drives {
		m := &r.drives[k]
		for _, i := range r.dyn {
			id := r.ids[i]
			if r.pairs[[2]engine.BodyID{min(id, m.track), max(id, m.track)}] {
				m.last[id] = t
			}
			if t <= ConveyStart || t-m.last[id] > m.hold {
				continue
			}
			p := r.w.Position(id)
			dir := m.vib.ConveyingDirection(p, m.normal)
			if dir == (shapes.Vec3{}) {
				continue
			}
			m.sum += r.w.Velocity(id).Dot(dir)
			m.acc += m.vib.AlongAcceleration(p, dir)
			m.n++
		}
	}
}

// driveSummary returns the drives' figures for summary.json.
func (r *runner) driveSummary() []Drive {
	var out []Drive
	for _, m := range r.drives {
		d := Drive{Body: r.s.Drives[m.scene].Body}
		if !math.IsNaN(m.throw) {
			t := clean(m.throw)
			d.ThrowNumber = &t
		}
		if m.n > 0 {
			v := clean(r.u.FromSI(m.sum/float64(m.n), scene.Speed))
			d.ConveyingSpeed = &v
			dv := r.u.FromSI(m.acc/float64(m.n)*r.s.World.Step, scene.Speed)
			d.StepSpeed = &dv
		}
		out = append(out, d)
	}
	return out
}

// SampleAliases returns a warning for each vibration term that the
// trajectory's sample interval cannot resolve: with two samples per period
// or fewer (the Nyquist limit) the samples show a slow false motion (an
// alias), or none at all when the interval is a multiple of half the
// period, instead of the vibration.
func SampleAliases(s *scene.Scene, sample float64) []string {
	var out []string
	for _, d := range s.Drives {
		vib, ok := d.Motion.(*engine.Vibration)
		if !ok {
			continue
		}
		for k, o := range vib.Terms {
			per := 1 / (o.Frequency * sample)         // samples per period
			if o.Frequency <= 0 || per > 2*(1+1e-9) { // exactly 2 (0.01 s and 50 Hz) is the limit, not past it
				continue
			}
			out = append(out, fmt.Sprintf("drive of %q: a sample interval of %g s gives the %g Hz vibration (term %d) only %.3g samples per period, so trajectory.csv cannot show its strokes (they appear as a false, slower motion or not at all); the drive's figures in summary.json are measured every step. To follow the strokes use --sample %s or less (ten samples per period)",
				d.Body, sample, o.Frequency, k+1, per, strconv.FormatFloat(tenPerPeriod(o.Frequency), 'g', 3, 64)))
		}
	}
	return out
}

// tenPerPeriod is a round sample interval of at most a tenth of the
// period of frequency f: 1, 2 or 5 times a power of ten.
func tenPerPeriod(f float64) float64 {
	x := 1 / (10 * f)
	p := math.Pow(10, math.Floor(math.Log10(x)))
	for _, m := range []float64{5, 2, 1} {
		if m*p <= x {
			return m * p
		}
	}
	return p
}

// coarseStepShare is the share of a conveying speed by which the track's
// speed along itself may change in a step before CoarseSteps warns. One
// part hopping at throw 1.8 on a stroke 12 degrees above a level track
// (friction 0.3) was conveyed at 122, 96, 82 and 77 mm/s at 40, 80, 160
// and 400 steps a stroke, where that change was 34, 22, 13 and 5 percent
// of the speed; at throw 1.5 and 20 degrees at 65.8, 55.1, 56.7 and 54.9
// mm/s, with changes of 31, 18, 9 and 4 percent (measured): within about
// 6 percent of the finest below a fifth, 20 to 60 percent off above.
const coarseStepShare = 0.2

// CoarseSteps returns a warning for each drive whose track changes its
// speed along itself in a step by more than coarseStepShare of the
// conveying speed measured: hopping parts land to within a step, and
// where the track moves fast along itself then the landings, and so the
// conveying speed and the feed rates, depend on the step.
func CoarseSteps(s *scene.Scene, sum *Summary) []string {
	var out []string
	speed := s.Units.Symbol(scene.Speed)
	for _, d := range sum.Drives {
		if d.ConveyingSpeed == nil || d.StepSpeed == nil || !(*d.StepSpeed > coarseStepShare*math.Abs(*d.ConveyingSpeed)) {
			continue
		}
		out = append(out, fmt.Sprintf("drive of %q: the track's speed along itself changes by up to %.3g %s in a step of %g s, %.0f percent of the conveying speed (%.3g %s); hopping parts land only to within a step, so the conveying speed and the gates' rates depend on the step here: run again at half the step and compare (they settle when that change is below a fifth of the speed)",
			d.Body, *d.StepSpeed, speed, s.World.Step, 100**d.StepSpeed/math.Abs(*d.ConveyingSpeed), *d.ConveyingSpeed, speed))
	}
	return out
}
