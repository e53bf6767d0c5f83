package report

import (
	"math"

	"clatter/engine"
	"clatter/engine/pack"
	"clatter/engine/scene"
	"clatter/shapes"
	"clatter/shapes/resting"
)

// Drop is the summary.json "drop" object: what a [drop] struck, in the
// package face numbering of the drop-test standards (package pack). Speeds
// are in the scene's units, times in s, spin in rad/s.
type Drop struct {
	Body   string  `json:"body"`
	Strike string  `json:"strike"`
	Height float64 `json:"height"`
	// ImpactSpeed is the normal speed of the first contact with the
	// surface, taken from the free fall just before it.
	ImpactSpeed float64      `json:"impact_speed"`
	Impacts     []DropImpact `json:"impacts"`
	// SecondFeature names the first feature other than the one struck
	// first to strike (null if none), as drops.csv's second_feature.
	SecondFeature *string `json:"second_feature"`
	// SecondaryImpactSpeed is the normal speed of its first impact.
	SecondaryImpactSpeed *float64 `json:"secondary_impact_speed"`
	PeakSpin             float64  `json:"peak_spin"`
	// FinalFace is the face the body ended on (null: not on a face).
	FinalFace  *int `json:"final_face"`
	TurnedOver bool `json:"turned_over"`
	// PeakAcceleration is the body's (peaks.go), for drops.csv.
	PeakAcceleration *float64 `json:"peak_acceleration"`
}

// DropImpact is one impact of the dropped body.
type DropImpact struct {
	Time        float64 `json:"time"`
	Feature     *string `json:"feature"`
	NormalSpeed float64 `json:"normal_speed"`
	Impulse     float64 `json:"impulse"`
}

// maxDropImpacts bounds the impacts listed: a body that chatters to rest
// makes an impact a step; the first ones tell the story.
const maxDropImpacts = 100

// finalFaceTol is the angle (deg) within which a face counts as the one
// the body ended on: resting.FaceDownTolerance, the rest of the outputs'.
const finalFaceTol = resting.FaceDownTolerance * 180 / math.Pi

// DropTracker follows a dropped body through a run.
type DropTracker struct {
	d      *scene.Drop
	id     engine.BodyID
	bounds shapes.AABB
	com    shapes.Vec3 // centre of mass in the shape's axes
	g      float64     // gravity along -up, m/s^2
	// surface is the struck plane's height along up.
	surface float64
	// approach and gap are the lowest point's normal approach speed and
	// height at the start, from which the speed at first contact follows
	// by free fall. Until then only gravity acts, so this is the model's
	// exact answer; the integrated velocity of a semi-implicit Euler step
	// falls short of it by g dt / 2 relative to the speed, and the last
	// step before contact is slowed by the speculative contact.
	approach, gap float64
	started, hit  bool
	// kicks are the times of the body's kicks; a kick before the first
	// contact restarts the free fall from the state after it, and a
	// spinning body's lowest point does not fall freely, so its speed is
	// then the solver's.
	kicks    []float64
	spinning bool
	out      Drop // in SI until Report
}

// NewDropTracker starts following the scene's drop, or returns nil.
func NewDropTracker(s *scene.Scene, w *engine.World, ids []engine.BodyID) *DropTracker {
	if s.Drop == nil {
		return nil
	}
	i := s.BodyIndex(s.Drop.Body)
	id := ids[i]
	t := &DropTracker{d: s.Drop, id: id, bounds: w.Shape(id).Bounds(), com: s.Bodies[i].Props.Center,
		g: -w.Config().Gravity.Dot(s.Drop.Up)}
	floor := &s.Bodies[s.BodyIndex(s.Drop.Onto)]
	if pl, ok := floor.Shape.(shapes.Plane); ok {
		t.surface = floor.Position.Add(floor.Orientation.Rotate(pl.Normal.Mul(pl.Offset))).Dot(s.Drop.Up)
	}
	for _, k := range s.Kicks {
		if k.Body == s.Drop.Body {
			t.kicks = append(t.kicks, k.Time)
		}
	}
	t.out = Drop{Body: s.Drop.Body, Strike: s.Drop.Strike.String(), Height: s.Drop.Height, Impacts: []DropImpact{}}
	return t
}

// Before notes the state before a step.
func (t *DropTracker) Before(w *engine.World) {
	kicked := false
	for len(t.kicks) > 0 && t.kicks[0] < w.Time() {
		t.kicks, kicked = t.kicks[1:], true
	}
	if t.hit || t.started && !kicked {
		return
	}
	low, ok := pack.Lowest(w.Shape(t.id), t.com, w.Orientation(t.id), t.d.Up)
	if !ok {
		return
	}
	t.started = true
	t.approach = -w.Velocity(t.id).Dot(t.d.Up)
	t.gap = w.Position(t.id).Dot(t.d.Up) - low - t.surface
	t.spinning = w.Spin(t.id) != (shapes.Vec3{})
}

// Impact records an impact event of the run; feature is the dropped body's
// struck feature (nil if unknown).
func (t *DropTracker) Impact(e engine.Event, feature pack.Feature) {
	if e.A != t.id && e.B != t.id {
		return
	}
	var name *string
	if feature != nil {
		s := feature.String()
		name = &s
	}
	if !t.hit {
		t.hit = true
		// v^2 = v0^2 + 2 g d: uniform acceleration over the fall d.
		v := e.Speed
		if t.started && !t.spinning && t.gap >= 0 && t.approach >= 0 && t.g > 0 {
			v = math.Sqrt(t.approach*t.approach + 2*t.g*t.gap)
		}
		t.out.ImpactSpeed = v
	} else if t.out.SecondaryImpactSpeed == nil && name != nil && (t.out.Impacts[0].Feature == nil || *name != *t.out.Impacts[0].Feature) {
		v := e.Speed
		t.out.SecondaryImpactSpeed, t.out.SecondFeature = &v, name
	}
	if len(t.out.Impacts) < maxDropImpacts {
		t.out.Impacts = append(t.out.Impacts, DropImpact{Time: e.Time, Feature: name, NormalSpeed: e.Speed, Impulse: e.Impulse})
	}
}

// After notes the spin after a step.
func (t *DropTracker) After(w *engine.World) {
	t.out.PeakSpin = math.Max(t.out.PeakSpin, w.Spin(t.id).Len())
}

// Report returns the drop's summary in the scene's units; resting says
// whether the body ended at rest touching something.
func (t *DropTracker) Report(w *engine.World, u scene.Units, resting bool) *Drop {
	out := t.out
	out.Impacts = append([]DropImpact{}, t.out.Impacts...)
	if resting {
		down := w.ShapePose(t.id).RotateInv(w.Config().Gravity)
		if f := pack.FaceDown(down, finalFaceTol); f != 0 {
			n := int(f)
			out.FinalFace = &n
			out.TurnedOver = f != t.d.Below
		}
	}
	sp := func(x float64) float64 { return clean(u.FromSI(x, scene.Speed)) }
	out.Height = clean(u.FromSI(out.Height, scene.Length))
	out.ImpactSpeed = sp(out.ImpactSpeed)
	if out.SecondaryImpactSpeed != nil {
		v := sp(*out.SecondaryImpactSpeed)
		out.SecondaryImpactSpeed = &v
	}
	out.PeakSpin = clean(out.PeakSpin)
	out.PeakAcceleration = PeakAcceleration(w, t.id)
	for i := range out.Impacts {
		im := &out.Impacts[i]
		im.Time, im.NormalSpeed = clean(im.Time), sp(im.NormalSpeed)
		im.Impulse = clean(u.FromSI(im.Impulse, scene.Impulse))
	}
	return &out
}

// Features returns, for each body of an impact, the feature of its box of
// bounds struck, in package numbering; nil for a static body. A compliant
// impact is read in the poses the bodies had when it began (it is reported
// when it ends), a rigid one in their poses now.
func Features(w *engine.World, e engine.Event) [2]pack.Feature {
	var out [2]pack.Feature
	for k, id := range [2]engine.BodyID{e.A, e.B} {
		if id < 0 || int(id) >= w.NumBodies() || w.KindOf(id) == engine.Static {
			continue
		}
		pose := w.ShapePose(id)
		if e.Compliant {
			pose = e.Poses[k]
		}
		toward := e.Normal
		if k == 1 {
			toward = toward.Mul(-1)
		}
		out[k] = pack.Struck(w.Shape(id).Bounds(), pose.ApplyInv(e.Point), pose.RotateInv(toward))
	}
	return out
}

// Body is the dropped body's id.
func (t *DropTracker) Body() engine.BodyID { return t.id }
