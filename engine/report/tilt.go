package report

import (
	"math"

	"clatter/engine"
	"clatter/engine/pack"
	"clatter/shapes"
)

// Thresholds of the tips and slides events: a body has tipped once it has
// turned this far relative to the body it stands on, and slid once the
// point of it that stood on its support has slipped this far over it.
const (
	TipAngle      = 2 * math.Pi / 180 // rad
	SlideDistance = 1e-3              // m
)

// The onset of a tip or a slide: the events wait for 2 degrees and 1 mm,
// so that a rock or a creep does not count, but by then the support has
// turned on (near the critical tilt a body starts to tip or slide slowly:
// at 2 deg/s, about 1 degree more before it has turned 2 degrees). The
// tilt they report is the support's tilt at the onset. A tip's onset is
// dated back from the times the turn passed onsetAngle and two and four
// times that (tiltonset.go); a slide's is the last step at which the
// body's foot had slipped less than onsetDistance (tiltslip.go). Both
// bounds lie far above the solver's rounding and creep and far below the
// events'.
const (
	onsetAngle    = 1e-3 // rad
	onsetDistance = 5e-5 // m
)

// supportWindow is how long after the start a body may take to find the
// body it stands on (a part placed a hair above its support settles onto
// it within a few steps); bodies that touch nothing by then, dropped ones,
// are not followed.
const supportWindow = 0.02 // s

// supportSteps is the same in steps, for a step longer than the window.
const supportSteps = 3

// TiltMark is when a body tipped or slid and its support's tilt then.
type TiltMark struct {
	Time float64 `json:"time"`
	Tilt float64 `json:"tilt"`
}

// tiltState follows one body standing on another.
type tiltState struct {
	id, on engine.BodyID
	found  bool
	// rel0 is the body's pose in its support's frame at the start, foot
	// the point of the body below its centre of mass on the support (body
	// frame), up the support's normal in its own frame.
	rel0     shapes.Pose
	foot, up shapes.Vec3
	tipped   *TiltMark
	slid     *TiltMark
	// calmTurn and calmMove are the support's orientation at the last
	// step the body was within onsetAngle and onsetDistance of its start.
	calmTurn, calmMove shapes.Quat
	// slip is how far the foot has slipped over the support, in the
	// support's frame (tiltslip.go); was the two bodies' poses at the
	// start of the last step.
	slip shapes.Vec3
	was  [2]shapes.Pose
	then float64 // the time of was
	// tipAt dates the start of a tip from the times the turn passed
	// onsetAngle, twice and four times that (tiltonset.go).
	tipAt tipClock
	since float64 // when its support was found
}

// TiltTracker makes the tips and slides events.
type TiltTracker struct {
	bodies []tiltState
	start  []shapes.Quat // every body's starting orientation
}

// tiltEvent is a tips or slides event, in SI.
type tiltEvent struct {
	kind    string
	id, on  engine.BodyID
	time    float64
	tiltDeg float64
}

// NewTiltTracker follows the given moving bodies.
func NewTiltTracker(w *engine.World, moving []engine.BodyID) *TiltTracker {
	t := &TiltTracker{}
	for i := 0; i < w.NumBodies(); i++ {
		t.start = append(t.start, w.Orientation(engine.BodyID(i)))
	}
	for _, id := range moving {
		t.bodies = append(t.bodies, tiltState{id: id})
	}
	return t
}

// tilt is the rotation of support on, turned to q, from its starting
// pose, degrees.
func (t *TiltTracker) tilt(on engine.BodyID, q shapes.Quat) float64 {
	return rotationAngle(q.Mul(t.start[on].Conjugate())) * 180 / math.Pi
}

func rotationAngle(q shapes.Quat) float64 {
	return 2 * math.Atan2(q.V.Len(), math.Abs(q.W))
}

// After checks every followed body after a step; partners lists the bodies
// a body touches. It calls emit for each new event.
func (t *TiltTracker) After(w *engine.World, partners func(engine.BodyID) []engine.BodyID, emit func(tiltEvent)) {
	now := w.Time()
	for k := range t.bodies {
		b := &t.bodies[k]
		if !b.found {
			if now <= supportWindow || w.Steps() <= supportSteps {
				t.findSupport(w, b, partners(b.id))
			}
			continue
		}
		if b.tipped != nil && b.slid != nil {
			continue
		}
		if t.still(w, b) {
			b.hold(w)
			continue
		}
		sq := w.Orientation(b.on)
		if b.tipped == nil {
			tilt := t.tilt(b.on, sq)
			rel := supportPose(w, b.on).Inverse().Mul(bodyPose(w, b.id))
			turn := rotationAngle(rel.Orientation.Mul(b.rel0.Orientation.Conjugate()))
			b.tipAt.tick(now, turn, tilt)
			switch {
			case turn < onsetAngle:
				b.calmTurn = sq
			case turn >= TipAngle:
				onset, ok := b.tipAt.onset(b.since)
				if !ok {
					onset = t.tilt(b.on, b.calmTurn)
				}
				b.tipped = &TiltMark{Time: now, Tilt: onset}
				emit(tiltEvent{kind: "tips", id: b.id, on: b.on, time: now, tiltDeg: b.tipped.Tilt})
			}
		}
		if b.slid == nil {
			along := b.slipped(w, now-b.then).Len()
			switch {
			case along < onsetDistance:
				b.calmMove = sq
			case along >= SlideDistance:
				b.slid = &TiltMark{Time: now, Tilt: t.tilt(b.on, b.calmMove)}
				emit(tiltEvent{kind: "slides", id: b.id, on: b.on, time: now, tiltDeg: b.slid.Tilt})
			}
		}
	}
}

// still reports whether neither a body nor its support can have moved in
// the last step: the body asleep on a static or sleeping support.
func (t *TiltTracker) still(w *engine.World, b *tiltState) bool {
	return !w.Awake(b.id) && (w.KindOf(b.on) == engine.Static || !w.Awake(b.on))
}

// findSupport takes as a body's support the body it touches that lies
// lowest along the world's up (a static plane or mesh before all others).
func (t *TiltTracker) findSupport(w *engine.World, b *tiltState, touching []engine.BodyID) {
	if len(touching) == 0 {
		return
	}
	up := w.Config().Gravity.Mul(-1)
	if !(up.Len() > 0) {
		return
	}
	up = up.Normalize()
	best, low := engine.BodyID(-1), math.Inf(1)
	for _, o := range touching {
		h := w.Position(o).Dot(up)
		if _, plane := w.Shape(o).(shapes.Plane); plane {
			h = math.Inf(-1)
		}
		if best < 0 || h < low {
			best, low = o, h
		}
	}
	b.on, b.found = best, true
	b.calmTurn, b.calmMove = w.Orientation(best), w.Orientation(best)
	sp := supportPose(w, best)
	b.rel0 = sp.Inverse().Mul(bodyPose(w, b.id))
	// The foot: the point of the body's surface below its centre of mass
	// along the body axis nearest the world's down, the middle of the
	// base it stands on; the support's normal is that axis, reversed.
	q := w.Orientation(b.id)
	downB := q.Conjugate().Rotate(up.Mul(-1))
	k := 0
	for a := 1; a < 3; a++ {
		if math.Abs(downB[a]) > math.Abs(downB[k]) {
			k = a
		}
	}
	var axis shapes.Vec3
	axis[k] = math.Copysign(1, downB[k])
	normal := q.Rotate(axis.Mul(-1))
	com := w.ShapePose(b.id).ApplyInv(w.Position(b.id))
	depth, _ := pack.Lowest(w.Shape(b.id), com, q, normal)
	b.foot = axis.Mul(depth)
	b.up = sp.RotateInv(normal)
	b.hold(w)
	b.since = w.Time()
	b.tipAt = tipClock{base: onsetAngle, t: b.since, deg: t.tilt(best, w.Orientation(best))}
}

func bodyPose(w *engine.World, id engine.BodyID) shapes.Pose {
	return shapes.Pose{Position: w.Position(id), Orientation: w.Orientation(id)}
}

func supportPose(w *engine.World, id engine.BodyID) shapes.Pose { return bodyPose(w, id) }

// Marks returns a followed body's tipped_at and slid_at in SI.
func (t *TiltTracker) Marks(id engine.BodyID) (tipped, slid *TiltMark) {
	for k := range t.bodies {
		if t.bodies[k].id == id {
			return t.bodies[k].tipped, t.bodies[k].slid
		}
	}
	return nil, nil
}
