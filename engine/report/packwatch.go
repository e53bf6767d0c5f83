package report

import (
	"slices"

	"clatter/engine"
)

// packWatch holds what a run follows for packaging studies: the drop of a
// [drop] and the tipping and sliding of bodies on their supports.
type packWatch struct {
	drop *DropTracker
	tilt *TiltTracker
	// partners and emit are made once, so that a step allocates nothing.
	partners func(engine.BodyID) []engine.BodyID
	emit     func(tiltEvent)
	// adj lists, per body, the bodies it touches, built from the touching
	// pairs once per step (at adjStep) when the tilt watch asks.
	adj     map[engine.BodyID][]engine.BodyID
	adjStep int
}

func (r *runner) watchPackages() {
	r.pack.drop = NewDropTracker(r.s, r.w, r.ids)
	var moving []engine.BodyID
	for _, i := range r.dyn {
		moving = append(moving, r.ids[i])
	}
	r.pack.tilt = NewTiltTracker(r.w, moving)
	r.pack.partners = r.partners
	r.pack.emit = func(e tiltEvent) {
		tilt := clean(e.tiltDeg)
		r.event(eventJSON{Time: clean(e.time), Event: e.kind, Body: r.name(e.id), On: r.name(e.on), Tilt: &tilt})
	}
}

func (p *packWatch) before(w *engine.World) {
	if p.drop != nil {
		p.drop.Before(w)
	}
}

// afterStep updates the drop's spin and writes tips and slides events.
func (r *runner) afterStep() {
	if r.pack.drop != nil {
		r.pack.drop.After(r.w)
	}
	r.pack.tilt.After(r.w, r.pack.partners, r.pack.emit)
}

// partners lists the bodies id touches, in id order.
func (r *runner) partners(id engine.BodyID) []engine.BodyID {
	p := &r.pack
	if p.adj == nil || p.adjStep != r.w.Steps() {
		p.adj, p.adjStep = map[engine.BodyID][]engine.BodyID{}, r.w.Steps()
		for k, on := range r.pairs {
			if on {
				p.adj[k[0]] = append(p.adj[k[0]], k[1])
				p.adj[k[1]] = append(p.adj[k[1]], k[0])
			}
		}
		// Map order is random: sort, for a deterministic choice of support.
		for _, l := range p.adj {
			slices.Sort(l)
		}
	}
	return p.adj[id]
}

// impactFeatures names the struck features of an impact's two bodies and
// passes the impact to the drop tracker.
func (r *runner) impactFeatures(e engine.Event) []*string {
	fts := Features(r.w, e)
	out := make([]*string, 2)
	for k, ft := range fts {
		if ft != nil {
			s := ft.String()
			out[k] = &s
		}
	}
	if d := r.pack.drop; d != nil {
		if e.A == d.id {
			d.Impact(e, fts[0])
		} else if e.B == d.id {
			d.Impact(e, fts[1])
		}
	}
	return out
}

func (r *runner) tiltMarks(id engine.BodyID) (tipped, slid *TiltMark) {
	t, s := r.pack.tilt.Marks(id)
	return cleanMark(t), cleanMark(s)
}

func cleanMark(m *TiltMark) *TiltMark {
	if m == nil {
		return nil
	}
	return &TiltMark{Time: clean(m.Time), Tilt: clean(m.Tilt)}
}

func (r *runner) dropReport() *Drop {
	d := r.pack.drop
	if d == nil {
		return nil
	}
	w, cfg := r.w, r.w.Config()
	slow := w.Velocity(d.id).Len() < cfg.RestSpeed && w.Spin(d.id).Len() < cfg.RestSpin
	resting := r.touching[d.id] > 0 && (!w.Awake(d.id) || slow)
	return d.Report(w, r.u, resting)
}
