package report

import (
	"clatter/engine"
	"clatter/engine/scene"
)

// PeakAcceleration is a body's largest compliant contact force over its
// weight, in units of standard gravity; nil for a body that met only rigid
// contacts (a rigid impact is an instant and has no finite peak).
func PeakAcceleration(w *engine.World, id engine.BodyID) *float64 {
	g := w.PeakAcceleration(id)
	if g == 0 {
		return nil
	}
	g = clean(g)
	return &g
}

// compliantFields adds to an impact event's line what a compliant contact
// measured: peak force, duration and, per body, peak acceleration in g
// (null for a static body).
func (r *runner) compliantFields(ev *eventJSON, e engine.Event) {
	if !e.Compliant {
		return
	}
	f := clean(r.u.FromSI(e.PeakForce, scene.Force))
	d := clean(e.Duration)
	ev.PeakForce, ev.Duration = &f, &d
	ev.PeakAcceleration = make([]*float64, 2)
	for k, id := range [2]engine.BodyID{e.A, e.B} {
		if r.w.KindOf(id) == engine.Dynamic {
			g := clean(e.PeakAcceleration[k])
			ev.PeakAcceleration[k] = &g
		}
	}
}
