package sweep

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"

	"clatter/engine"
	"clatter/engine/report"
)

// Files of a study with counting gates.
const (
	// CrossingsFile holds every crossing of every trial.
	CrossingsFile = "crossings.csv"
	// GateCasesFile holds the counts per case, gate, body and face_down.
	GateCasesFile = "gate-cases.csv"
)

const crossingsHeader = "case,trial,gate,body,time,face_down"

// GateMeta is a counting gate as sweep.json records it: its name and the
// faces of the orientation wanted through it (empty when not given).
type GateMeta struct {
	Name   string `json:"name"`
	Wanted []int  `json:"wanted,omitempty"`
}

// gateCasesHeader is the first line of gate-cases.csv.
func (m *Meta) gateCasesHeader() string {
	return "case," + m.keysHeader() + "gate,body,face_down,count,trials,fraction,low,high,rate"
}

func crossingsTable(m *Meta) *table {
	return &table{header: crossingsHeader, fields: 6, rows: 0, cases: m.Cases, trials: m.Trials}
}

// setGates records the scene's gates in the study's description and
// checks that their wanted faces exist on every moving body.
func (st *Study) setGates() error {
	for _, g := range st.Scene.Gates {
		for _, f := range g.Wanted {
			for _, b := range st.meta.Bodies {
				if f >= len(b.Faces) {
					return badf("%s: gate %q: wanted face %d does not exist on body %q, which has faces 0 to %d (see clatter inspect)", st.Scene.File, g.Name, f, b.Name, len(b.Faces)-1)
				}
			}
		}
		st.meta.Gates = append(st.meta.Gates, GateMeta{Name: g.Name, Wanted: slices.Clone(g.Wanted)})
	}
	return nil
}

// startCrossings prepares a trial's crossing rows.
func (wk *worker) startCrossings(ids []engine.BodyID) {
	wk.cross = wk.cross[:0]
	n := 0
	for _, id := range ids {
		n = max(n, int(id)+1)
	}
	if cap(wk.slot) < n {
		wk.slot = make([]int, n)
	}
	wk.slot = wk.slot[:n]
	for i := range wk.slot {
		wk.slot[i] = -1
	}
	for k, i := range wk.st.dyn {
		wk.slot[ids[i]] = k
	}
}

// crossings adds the rows of the crossings of the last step.
func (wk *worker) crossings(c, t int64, w *engine.World) {
	for _, x := range w.Crossings() {
		k := wk.slot[x.Body]
		if k < 0 {
			continue
		}
		b := wk.cross
		b = strconv.AppendInt(b, c, 10)
		b = append(b, ',')
		b = strconv.AppendInt(b, t, 10)
		b = append(b, ',')
		b = append(b, csvField(wk.st.meta.Gates[x.Gate].Name)...)
		b = append(b, ',')
		b = append(b, wk.names[k]...)
		b = append(b, ',')
		b = appendNumber(b, x.Time)
		b = append(b, ',')
		if f := report.FaceDown(wk.faces[k], x.Orientation, w.Config().Gravity); f >= 0 {
			b = strconv.AppendInt(b, int64(f), 10)
		}
		wk.cross = append(b, '\n')
	}
}

// gateKey identifies a row of gate-cases.csv; body "" is every moving
// body together.
type gateKey struct {
	c    int64
	gate string
	body string
	face int // -1: none (a round body)
}

// gateStats counts crossings by case, gate, body and face_down.
type gateStats struct {
	meta   *Meta
	counts map[gateKey]int64
	csv    csvLine
	// byTrio lists the faces counted per case, gate and body (face 0).
	byTrio map[gateKey][]int
}

func newGateStats(m *Meta) *gateStats { return &gateStats{meta: m, counts: map[gateKey]int64{}} }

// body returns the index of a moving body in s.meta.Bodies, or -1.
func (s *gateStats) body(name string) int {
	for i, b := range s.meta.Bodies {
		if b.Name == name {
			return i
		}
	}
	return -1
}

func (s *gateStats) add(g group) error {
	c := g.g / s.meta.Trials
	for _, line := range bytes.SplitAfter(g.data, []byte("\n")) {
		if len(line) == 0 {
			continue
		}
		f, ok := s.csv.split(bytes.TrimSuffix(line, []byte("\n")))
		if !ok || len(f) != 6 {
			return fmt.Errorf("case %d trial %d: a crossing row without its six fields", c, g.g%s.meta.Trials)
		}
		face := -1
		if f[5] != "" {
			i, err := strconv.Atoi(f[5])
			if err != nil || i < 0 {
				return fmt.Errorf("case %d trial %d: face_down %q is not a face index", c, g.g%s.meta.Trials, f[5])
			}
			face = i
		}
		if b := s.body(f[3]); b >= 0 && face >= 0 && s.meta.GroupFaces && face < len(s.meta.Bodies[b].Faces) {
			face = s.meta.Bodies[b].Faces[face].Group // counted as cases.csv counts resting faces
		}
		s.counts[gateKey{c, f[2], f[3], face}]++
		if len(s.meta.Bodies) > 1 {
			s.counts[gateKey{c, f[2], "", face}]++
		}
	}
	return nil
}

// GateRow is one row of gate-cases.csv: how many times a body (Body "":
// every moving body together) crossed a gate lying on face FaceDown (-1:
// a round body) in the trials of a case; Fraction is the share of that
// face among the body's crossings of the gate, with its 95 percent
// Wilson interval; Rate the crossings per minute of simulated time.
type GateRow struct {
	Case          int64
	Values        []float64
	Gate, Body    string
	FaceDown      int
	Count, Trials int64
	Fraction      float64
	Low, High     float64
	Rate          float64
	// QuasiStatic is the face's quasi-static resting probability (NaN
	// for all bodies together or no face).
	QuasiStatic float64
}

// Efficiency is the orienting efficiency of a gate with wanted faces in
// one case: the fraction of the parts fed (moving bodies times trials)
// that crossed it in a wanted orientation, with its Wilson interval
// (Boothroyd, "Assembly Automation and Product Design", 2nd ed., 2005,
// ch. 3: the proportion of the parts fed that an orienting device
// delivers in the wanted orientation).
type Efficiency struct {
	Case       int64
	Values     []float64
	Gate       string
	Wanted     []int
	Count, Fed int64
	Fraction   float64
	Low, High  float64
}

// rows makes the rows of gate-cases.csv in case, gate, body (scene order,
// then all together) and face order.
func (s *gateStats) rows(st *stats) ([]GateRow, []Efficiency) {
	m := s.meta
	bodies := make([]string, 0, len(m.Bodies)+1)
	for _, b := range m.Bodies {
		bodies = append(bodies, b.Name)
	}
	if len(m.Bodies) > 1 {
		bodies = append(bodies, "")
	}
	var out []GateRow
	var eff []Efficiency
	for c := int64(0); c < m.Cases; c++ {
		n := st.trials[c]
		if n == 0 {
			continue
		}
		vals := st.values(c)
		minutes := float64(n) * s.duration(vals) / 60
		for _, g := range m.Gates {
			wanted := int64(0)
			for bi, body := range bodies {
				faces, total := s.faces(c, g.Name, body)
				for _, f := range faces {
					k := s.counts[gateKey{c, g.Name, body, f}]
					lo, hi := Wilson(k, total, Confidence)
					q := math.NaN()
					switch {
					case body != "":
						q = st.quasiStatic(bi, f)
					case sameFaces(m.Bodies):
						q = st.quasiStatic(0, f) // parts alike: their common probability
					}
					out = append(out, GateRow{Case: c, Values: vals, Gate: g.Name, Body: body, FaceDown: f, Count: k, Trials: n,
						Fraction: report.Tidy(float64(k) / float64(total)), Low: report.Tidy(lo), High: report.Tidy(hi),
						Rate: report.Tidy(float64(k) / minutes), QuasiStatic: q})
					if (body == "" || len(m.Bodies) == 1) && s.wanted(g.Wanted, f) {
						wanted += k
					}
				}
			}
			if len(g.Wanted) > 0 {
				fed := n * int64(len(m.Bodies))
				k := min(wanted, fed) // a part counted twice (it came round again) is still one part fed
				lo, hi := Wilson(k, fed, Confidence)
				eff = append(eff, Efficiency{Case: c, Values: vals, Gate: g.Name, Wanted: g.Wanted, Count: k, Fed: fed,
					Fraction: report.Tidy(float64(k) / float64(fed)), Low: report.Tidy(lo), High: report.Tidy(hi)})
			}
		}
	}
	return out, eff
}

// wanted reports whether face f, as counted (the lowest of its symmetry
// group when faces are grouped), is one of the wanted faces.
func (s *gateStats) wanted(faces []int, f int) bool {
	fs := s.meta.Bodies[0].Faces
	return slices.ContainsFunc(faces, func(w int) bool {
		if s.meta.GroupFaces && w < len(fs) {
			w = fs[w].Group
		}
		return w == f
	})
}

// faces returns the faces with crossings of a gate by a body in case c,
// ascending with none (-1) last, and the number of crossings.
func (s *gateStats) faces(c int64, gate, body string) ([]int, int64) {
	if s.byTrio == nil {
		// Index the counts once: scanning them per case, gate and body
		// would take a time quadratic in the size of the study.
		s.byTrio = map[gateKey][]int{}
		for k := range s.counts {
			t := gateKey{c: k.c, gate: k.gate, body: k.body}
			s.byTrio[t] = append(s.byTrio[t], k.face)
		}
	}
	out := slices.Clone(s.byTrio[gateKey{c: c, gate: gate, body: body}])
	var total int64
	for _, f := range out {
		total += s.counts[gateKey{c, gate, body, f}]
	}
	slices.SortFunc(out, func(a, b int) int {
		if (a < 0) != (b < 0) {
			if a < 0 {
				return 1
			}
			return -1
		}
		return a - b
	})
	return out, total
}

// duration returns a case's simulated time per trial, s: the varied
// world.duration if it is varied, else the study's.
func (s *gateStats) duration(vals []float64) float64 {
	for k, v := range s.meta.Vary {
		if v.Key == "world.duration" {
			return vals[k]
		}
	}
	return s.meta.Duration
}

func gateCasesCSV(m *Meta, rows []GateRow) []byte {
	var b []byte
	b = append(b, m.gateCasesHeader()...)
	b = append(b, '\n')
	for _, r := range rows {
		b = appendCase(b, r.Case, r.Values)
		b = append(b, csvField(r.Gate)...)
		b = append(b, ',')
		b = append(b, csvField(r.Body)...)
		b = append(b, ',')
		if r.FaceDown >= 0 {
			b = strconv.AppendInt(b, int64(r.FaceDown), 10)
		}
		for _, x := range [...]int64{r.Count, r.Trials} {
			b = append(b, ',')
			b = strconv.AppendInt(b, x, 10)
		}
		for _, x := range [...]float64{r.Fraction, r.Low, r.High, r.Rate} {
			b = append(b, ',')
			b = appendNumber(b, x)
		}
		b = append(b, '\n')
	}
	return b
}

// errSkip, returned by sortInto's each, leaves a trial out.
var errSkip = errors.New("skip")

// finishGates writes face-down.csv and, for a study with gates,
// crossings.csv (the crossings of the trials in trials.csv, in trial
// order) and gate-cases.csv; it returns the names of the files written.
func finishGates(out string, meta *Meta, srcs []string, st *stats, done *bitset, lo, hi int64, res *Result) ([]string, error) {
	res.DownRows = st.downRows()
	if err := writeAtomic(filepath.Join(out, FaceDownFile), casesCSV(meta, res.DownRows, meta.faceDownHeader())); err != nil {
		return nil, fmt.Errorf("cannot write %s: %w", FaceDownFile, err)
	}
	files := []string{FaceDownFile}
	if len(meta.Gates) == 0 {
		return files, nil
	}
	gs := newGateStats(meta)
	var dropped int
	_, err := sortInto(out, CrossingsFile, crossingsTable(meta), srcs, lo, hi, &dropped, func(g group) error {
		if !done.has(g.g - lo) {
			return errSkip // its trial is not in trials.csv: it is run again on resuming
		}
		return gs.add(g)
	})
	if err != nil {
		return nil, err
	}
	res.GateRows, res.Efficiencies = gs.rows(st)
	if err := writeAtomic(filepath.Join(out, GateCasesFile), gateCasesCSV(meta, res.GateRows)); err != nil {
		return nil, fmt.Errorf("cannot write %s: %w", GateCasesFile, err)
	}
	plots, err := writeGatePlots(out, meta, res.GateRows)
	if err != nil {
		return nil, fmt.Errorf("cannot write the gate plots: %w", err)
	}
	return append(append(files, CrossingsFile, GateCasesFile), plots...), nil
}

// sameFaces reports whether every body has the same faces (parts alike).
func sameFaces(bodies []BodyMeta) bool {
	for _, b := range bodies[1:] {
		if !slices.EqualFunc(b.Faces, bodies[0].Faces, func(x, y FaceMeta) bool {
			return x.Probability == y.Probability && x.Group == y.Group && x.Area == y.Area
		}) {
			return false
		}
	}
	return true
}

// pruneCrossings rewrites a resumed folder's crossings.csv with only the
// crossings of the trials in trials.csv (done). A trial's crossings are
// written before its rows of trials.csv, so those of a trial cut off by
// a crash, possibly in part, are dropped here, and the trial, run again,
// writes them whole.
func pruneCrossings(dir string, meta *Meta, done *bitset, lo int64) error {
	path := filepath.Join(dir, CrossingsFile)
	if st, err := os.Stat(path); err == nil && st.Size() <= int64(len(crossingsHeader)) {
		return os.Remove(path) // cut off within its header: made again
	}
	f, err := os.Open(path)
	if err != nil {
		if errors.Is(err, os.ErrNotExist) {
			return nil
		}
		return err
	}
	var kept bytes.Buffer
	kept.WriteString(crossingsHeader + "\n")
	_, err = crossingsTable(meta).scan(f, true, func(g group) error {
		if i := g.g - lo; i >= 0 && i < int64(len(*done))*64 && done.has(i) {
			kept.Write(g.data)
		}
		return nil
	})
	f.Close()
	if err != nil {
		return err
	}
	return writeAtomic(path, kept.Bytes())
}
