package sweep

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"

	"clatter/engine/report"
)

// Result is a finished folder: its statistics as cases.csv holds them.
type Result struct {
	Dir  string
	Meta *Meta
	// Rows are the rows of cases.csv.
	Rows []CaseRow
	// Settled counts the trials that settled; SettleMean and SettleMax
	// are the mean and longest time to settle of those, s.
	Settled               int64
	SettleMean, SettleMax float64
	// Dropped counts rows of trials.csv that were not part of a complete
	// trial (a crash, or an edit) and were left out.
	Dropped int
	// GateRows are the rows of gate-cases.csv and Efficiencies the
	// orienting efficiencies of gates with wanted faces (gates.go);
	// DownRows count face_down at the end of the trials as Rows count
	// resting faces (facedown.go).
	GateRows     []GateRow
	Efficiencies []Efficiency
	DownRows     []CaseRow
}

// CaseRow is one row of cases.csv: the fraction of a case's trials in
// which a body came to rest on a face (Face -1: on none, still moving or
// leaning), with its 95 percent Wilson interval, and the face's
// quasi-static probability (NaN for Face -1).
type CaseRow struct {
	Case          int64
	Values        []float64
	Body          string
	Face          int
	Count, Trials int64
	Fraction      float64
	Low, High     float64
	QuasiStatic   float64
}

// Finish puts a folder of finished trials in order and writes its
// results: trials.csv in case and trial order, failures.csv (if any trial
// failed), cases.csv, the plots and sweep.json. The files depend only on
// the trials, so a study finishes to the same bytes however its trials
// were run: on any number of workers, interrupted and resumed, or in
// shards merged. Finishing a folder again rewrites the same bytes.
func Finish(dir string) (*Result, error) {
	meta, err := ReadMeta(dir)
	if err != nil {
		return nil, err
	}
	removeTemps(dir)
	return finish(dir, meta, []string{dir})
}

// finish writes the results of the trials in the folders srcs into out,
// for the study meta describes (its Shard set if out is one shard).
func finish(out string, meta *Meta, srcs []string) (*Result, error) {
	lo, hi := meta.span()
	res := &Result{Dir: out, Meta: meta}
	tb := trialsTable(meta)
	st := newStats(meta)
	done := newBitset(hi - lo)
	n, err := sortInto(out, TrialsFile, tb, srcs, lo, hi, &res.Dropped, func(g group) error {
		done.set(g.g - lo)
		return st.add(g)
	})
	if err != nil {
		return nil, err
	}
	meta.TrialsDone = n
	ft := failuresTable(meta)
	var fsrcs []string
	for _, d := range srcs {
		if _, err := os.Stat(filepath.Join(d, FailuresFile)); err == nil {
			fsrcs = append(fsrcs, d)
		}
	}
	meta.TrialsFailed = 0
	fpath := filepath.Join(out, FailuresFile)
	if len(fsrcs) > 0 {
		var dropped int
		nf, err := sortInto(out, FailuresFile, ft, fsrcs, lo, hi, &dropped, nil)
		if err != nil {
			return nil, err
		}
		meta.TrialsFailed = nf
		if nf == 0 {
			os.Remove(fpath)
		}
	} else {
		os.Remove(fpath)
	}
	meta.Complete = meta.TrialsDone == meta.TrialsTotal
	files := []string{TrialsFile, CasesFile}
	if meta.TrialsFailed > 0 {
		files = append(files, FailuresFile)
	}
	if has, err := finishDrops(out, meta, srcs, lo, hi); err != nil {
		return nil, err
	} else if has {
		files = append(files, DropsFile)
	}
	res.Rows = st.rows()
	if err := writeAtomic(filepath.Join(out, CasesFile), casesCSV(meta, res.Rows, meta.casesHeader())); err != nil {
		return nil, fmt.Errorf("cannot write %s: %w", CasesFile, err)
	}
	more, err := finishGates(out, meta, srcs, st, done, lo, hi, res) // gates.go
	if err != nil {
		return nil, err
	}
	files = append(files, more...)
	plots, err := writePlots(out, meta, st, res.Rows)
	if err != nil {
		return nil, fmt.Errorf("cannot write the plots: %w", err)
	}
	meta.Files = append(files, plots...)
	if err := writeMeta(out, meta); err != nil {
		return nil, fmt.Errorf("cannot write %s: %w", MetaFile, err)
	}
	res.Settled = st.settledAll
	if st.settledAll > 0 {
		res.SettleMean = st.settleSum / float64(st.settledAll)
	}
	res.SettleMax = st.settleMax
	return res, nil
}

// sortInto reads the file name from every folder of srcs, sorts its trials
// by global index into out/name (through a temporary file, so the sources
// may include out), and returns the number of trials written. Trials
// outside [lo, hi) are an error; a trial found twice must have the same
// rows both times. each, if set, sees every trial before it is written,
// and leaves it out by returning errSkip.
func sortInto(out, name string, tb *table, srcs []string, lo, hi int64, dropped *int, each func(group) error) (int64, error) {
	s := &sorter{dir: out}
	defer s.cleanup()
	for _, d := range srcs {
		p := filepath.Join(d, name)
		f, err := os.Open(p)
		if err != nil {
			if errors.Is(err, os.ErrNotExist) {
				continue
			}
			return 0, fmt.Errorf("cannot read %s: %w", p, unwrapPath(err))
		}
		n, err := tb.scan(f, true, func(g group) error {
			if g.g < lo || g.g >= hi {
				return fmt.Errorf("it holds case %d trial %d, outside this folder's trials", g.g/tb.trials, g.g%tb.trials)
			}
			return s.add(g)
		})
		f.Close()
		if err != nil {
			return 0, badf("%s: %v", p, err)
		}
		*dropped += n.dropped
	}
	tmp := filepath.Join(out, name+".tmp")
	f, err := os.Create(tmp)
	if err != nil {
		return 0, err
	}
	bw := bufio.NewWriterSize(f, 1<<16)
	bw.WriteString(tb.header + "\n")
	var count int64
	err = s.each(tb, func(g group) error {
		if each != nil {
			if err := each(g); err == errSkip {
				return nil
			} else if err != nil {
				return err
			}
		}
		count++
		bw.Write(g.data)
		return nil
	}, func(kept, other group) error {
		if !bytes.Equal(kept.data, other.data) {
			return badf("case %d trial %d appears twice with different results: the folders hold different studies", kept.g/tb.trials, kept.g%tb.trials)
		}
		return nil
	})
	if err == nil {
		err = bw.Flush()
	}
	if err == nil {
		err = f.Sync()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		os.Remove(tmp)
		return 0, err
	}
	return count, os.Rename(tmp, filepath.Join(out, name))
}

// settleBins is the number of fine bins of the settle-time histograms
// over the study's duration; the plot joins them into about plotBins bins
// over the times that occur.
const (
	settleBins = 1000
	plotBins   = 40
)

// stats gathers, trial by trial, what cases.csv and the plots show.
type stats struct {
	meta   *Meta
	nv     int
	trials []int64   // per case
	counts [][]int64 // per case and body: index face + 1 (0: no face)
	// pooled is the settle-time histogram of all trials; hist that of each
	// case when there are few enough cases to plot them apart.
	pooled []int64
	hist   [][]int64
	csv    csvLine
	// down counts face_down at the end like counts (facedown.go).
	down [][]int64

	settledAll           int64
	settleSum, settleMax float64
}

func newStats(m *Meta) *stats {
	s := &stats{meta: m, nv: len(m.Vary), trials: make([]int64, m.Cases), counts: make([][]int64, m.Cases*int64(len(m.Bodies))), pooled: make([]int64, settleBins)}
	if m.Cases <= maxSettleLines {
		s.hist = make([][]int64, m.Cases)
		for c := range s.hist {
			s.hist[c] = make([]int64, settleBins)
		}
	}
	return s
}

func (s *stats) add(g group) error {
	c := g.g / s.meta.Trials
	s.trials[c]++
	nb := len(s.meta.Bodies)
	lines := bytes.SplitAfter(g.data, []byte("\n"))
	for b := 0; b < nb; b++ {
		f, _ := s.csv.split(bytes.TrimSuffix(lines[b], []byte("\n")))
		face := -1
		if v := f[4+s.nv]; v != "" {
			i, err := strconv.Atoi(v)
			if err != nil || i < 0 {
				return fmt.Errorf("case %d trial %d: resting_face %q is not a face index", c, g.g%s.meta.Trials, v)
			}
			face = s.group(b, i)
		}
		count(&s.counts[c*int64(nb)+int64(b)], face)
		if err := s.addDown(c, b, g.g%s.meta.Trials, f[15+s.nv]); err != nil {
			return err
		}
		if b == 0 && f[5+s.nv] == "true" {
			at, err := strconv.ParseFloat(f[6+s.nv], 64)
			if err != nil {
				return fmt.Errorf("case %d trial %d: settled_at %q is not a number", c, g.g%s.meta.Trials, f[6+s.nv])
			}
			s.settledAll++
			s.settleSum += at
			s.settleMax = math.Max(s.settleMax, at)
			bin := min(max(int(at/s.meta.Duration*settleBins), 0), settleBins-1)
			s.pooled[bin]++
			if s.hist != nil {
				s.hist[c][bin]++
			}
		}
	}
	return nil
}

// count adds one to the slot of face in counts (slot 0: no face).
func count(counts *[]int64, face int) {
	for len(*counts) <= face+1 {
		*counts = append(*counts, 0)
	}
	(*counts)[face+1]++
}

// group maps a face to its symmetry group's lowest face when the study
// groups faces.
func (s *stats) group(b, face int) int {
	fs := s.meta.Bodies[b].Faces
	if s.meta.GroupFaces && face < len(fs) {
		return fs[face].Group
	}
	return face
}

// faceList returns the faces cases.csv lists for body b: the stable faces
// of its resting analysis and every face a trial rested on (for grouped
// faces, the lowest of each group), ascending, then -1 (no face) if any
// trial ended on none.
func (s *stats) faceList(b int) []int {
	nb := len(s.meta.Bodies)
	seen := map[int]bool{}
	for _, f := range s.meta.Bodies[b].Faces {
		if f.Stable {
			seen[s.group(b, f.Face)] = true
		}
	}
	none := false
	for c := int64(0); c < s.meta.Cases; c++ {
		for slot, n := range s.counts[c*int64(nb)+int64(b)] {
			if n == 0 {
				continue
			}
			if slot == 0 {
				none = true
			} else {
				seen[slot-1] = true
			}
		}
	}
	out := make([]int, 0, len(seen)+1)
	for f := range seen {
		out = append(out, f)
	}
	slices.Sort(out)
	if none {
		out = append(out, -1)
	}
	return out
}

// quasiStatic returns the quasi-static probability of a face of body b
// (of its whole group when faces are grouped).
func (s *stats) quasiStatic(b, face int) float64 {
	fs := s.meta.Bodies[b].Faces
	if face < 0 || face >= len(fs) {
		return math.NaN()
	}
	if !s.meta.GroupFaces {
		return fs[face].Probability
	}
	p := 0.0
	for _, f := range fs {
		if f.Group == face {
			p += f.Probability
		}
	}
	return report.Tidy(p)
}

func (s *stats) values(c int64) []float64 {
	out := make([]float64, s.nv)
	for k := s.nv - 1; k >= 0; k-- {
		n := int64(len(s.meta.Vary[k].Values))
		out[k] = s.meta.Vary[k].Values[c%n]
		c /= n
	}
	return out
}

// rows makes the rows of cases.csv: per case that has trials, per body,
// per listed face.
func (s *stats) rows() []CaseRow {
	nb := len(s.meta.Bodies)
	lists := make([][]int, nb)
	for b := range lists {
		lists[b] = s.faceList(b)
	}
	var out []CaseRow
	for c := int64(0); c < s.meta.Cases; c++ {
		n := s.trials[c]
		if n == 0 {
			continue
		}
		vals := s.values(c)
		for b := 0; b < nb; b++ {
			counts := s.counts[c*int64(nb)+int64(b)]
			for _, f := range lists[b] {
				var k int64
				if f+1 < len(counts) {
					k = counts[f+1]
				}
				lo, hi := Wilson(k, n, Confidence)
				q := s.quasiStatic(b, f)
				out = append(out, CaseRow{Case: c, Values: vals, Body: s.meta.Bodies[b].Name, Face: f, Count: k, Trials: n,
					Fraction: report.Tidy(float64(k) / float64(n)), Low: report.Tidy(lo), High: report.Tidy(hi), QuasiStatic: q})
			}
		}
	}
	return out
}

func casesCSV(m *Meta, rows []CaseRow, header string) []byte {
	var b []byte
	b = append(b, header...)
	b = append(b, '\n')
	for _, r := range rows {
		b = appendCase(b, r.Case, r.Values)
		b = append(b, csvField(r.Body)...)
		b = append(b, ',')
		if r.Face >= 0 {
			b = strconv.AppendInt(b, int64(r.Face), 10)
		}
		b = append(b, ',')
		b = strconv.AppendInt(b, r.Count, 10)
		b = append(b, ',')
		b = strconv.AppendInt(b, r.Trials, 10)
		for _, x := range [...]float64{r.Fraction, r.Low, r.High} {
			b = append(b, ',')
			b = appendNumber(b, x)
		}
		b = append(b, '\n')
	}
	return b
}
