package report

import (
	"math"

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
	// ConveyingSpeed is the mean speed along the track of the parts
	// touching it, after ConveyStart; null when none touched it then.
	ConveyingSpeed *float64 `json:"conveying_speed"`
}

// driveMeter measures one vibration drive over a run.
type driveMeter struct {
	scene  int // index in s.Drives
	track  engine.BodyID
	vib    *engine.Vibration
	normal shapes.Vec3 // the track's outward normal: its own z axis
	throw  float64
	sum    float64 // of speeds along the track, one per part and step
	n      int64
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
		out = append(out, driveMeter{scene: k, track: id, vib: vib, normal: n,
			throw: vib.ThrowNumber(w.Position(id), n, w.Config().Gravity)})
	}
	return out
}

// convey adds the speeds along the track of the parts touching each
// vibrating track after this step.
func (r *runner) convey() {
	if len(r.drives) == 0 || r.w.Time() <= ConveyStart {
		return
	}
	for k := range r.drives {
		m := &r.drives[k]
		for _, i := range r.dyn {
			id := r.ids[i]
			if !r.pairs[[2]engine.BodyID{min(id, m.track), max(id, m.track)}] {
				continue
			}
			p := r.w.Position(id)
			dir := m.vib.ConveyingDirection(p, m.normal)
			if dir == (shapes.Vec3{}) {
				continue
			}
			m.sum += r.w.Velocity(id).Dot(dir)
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
		}
		out = append(out, d)
	}
	return out
}
