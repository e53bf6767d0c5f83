package sweep

import (
	"os"
	"path/filepath"
	"strconv"

	"clatter/engine"
	"clatter/engine/report"
	"clatter/engine/scene"
)

// DropsFile is the table of a study with a [drop]: a row per trial with
// what struck first and second and how the body ended.
const DropsFile = "drops.csv"

// dropsHeader is the first line of drops.csv.
func (m *Meta) dropsHeader() string {
	return "case,trial," + m.keysHeader() + "strike,height,impact_speed,second_feature,secondary_impact_speed,peak_spin,final_face,turned_over,peak_acceleration"
}

func dropsTable(m *Meta) *table {
	return &table{header: m.dropsHeader(), fields: 11 + len(m.Vary), rows: 1, cases: m.Cases, trials: m.Trials}
}

// dropWatch follows a trial's drop through the world's impact events.
type dropWatch struct {
	t *report.DropTracker
}

// watchDrop starts following the drop of a trial's scene, or returns a
// watch that does nothing.
func watchDrop(sc *scene.Scene, w *engine.World, ids []engine.BodyID) dropWatch {
	return dropWatch{t: report.NewDropTracker(sc, w, ids)}
}

func (d dropWatch) before(w *engine.World) {
	if d.t != nil {
		d.t.Before(w)
	}
}

// after reads the step's events (the world keeps them for a drop study).
func (d dropWatch) after(w *engine.World) {
	if d.t == nil {
		return
	}
	for _, e := range w.Events() {
		if e.Kind == engine.Impact {
			fts := report.Features(w, e)
			switch {
			case e.A == d.t.Body():
				d.t.Impact(e, fts[0])
			case e.B == d.t.Body():
				d.t.Impact(e, fts[1])
			}
		}
	}
	d.t.After(w)
}

// row is the trial's line of drops.csv, or nil without a drop.
func (d dropWatch) row(c, t int64, values []byte, w *engine.World, u scene.Units, touching, failed bool) []byte {
	if d.t == nil {
		return nil
	}
	cfg := w.Config()
	id := d.t.Body()
	resting := !failed && touching && (!w.Awake(id) || w.Velocity(id).Len() < cfg.RestSpeed && w.Spin(id).Len() < cfg.RestSpin)
	r := d.t.Report(w, u, resting)
	b := strconv.AppendInt(nil, c, 10)
	b = append(b, ',')
	b = strconv.AppendInt(b, t, 10)
	b = append(b, ',')
	b = append(b, values...)
	b = append(b, r.Strike...)
	b = append(b, ',')
	b = appendNumber(b, r.Height)
	b = append(b, ',')
	b = appendNumber(b, r.ImpactSpeed)
	b = append(b, ',')
	if r.SecondFeature != nil {
		b = append(b, *r.SecondFeature...)
	}
	b = append(b, ',')
	if r.SecondaryImpactSpeed != nil {
		b = appendNumber(b, *r.SecondaryImpactSpeed)
	}
	b = append(b, ',')
	b = appendNumber(b, r.PeakSpin)
	b = append(b, ',')
	if r.FinalFace != nil {
		b = strconv.AppendInt(b, int64(*r.FinalFace), 10)
	}
	b = append(b, ',')
	b = strconv.AppendBool(b, r.TurnedOver)
	b = append(b, ',')
	if r.PeakAcceleration != nil { // empty for a rigid drop
		b = appendNumber(b, *r.PeakAcceleration)
	}
	return append(b, '\n')
}

// finishDrops sorts drops.csv of the folders srcs into out, if any has one.
func finishDrops(out string, meta *Meta, srcs []string, lo, hi int64) (bool, error) {
	var dsrcs []string
	for _, d := range srcs {
		if _, err := os.Stat(filepath.Join(d, DropsFile)); err == nil {
			dsrcs = append(dsrcs, d)
		}
	}
	if len(dsrcs) == 0 {
		return false, nil
	}
	var dropped int
	if _, err := sortInto(out, DropsFile, dropsTable(meta), dsrcs, lo, hi, &dropped, nil); err != nil {
		return false, err
	}
	return true, nil
}

// recoverDrops drops a torn last line of drops.csv before a resumed study
// appends to it.
func recoverDrops(dir string, meta *Meta) error {
	p := filepath.Join(dir, DropsFile)
	if _, err := os.Stat(p); err != nil {
		return nil
	}
	_, err := recoverLog(p, dropsTable(meta), func(group) error { return nil })
	return err
}
