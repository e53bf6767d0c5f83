package sweep

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"path/filepath"
	"strings"
	"sync"

	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/shapes"
)

// ErrBadInput is wrapped by the errors that come from what the user gave:
// a scene without a [sweep] section, a folder of another study, shards
// that do not belong together. Scene errors wrap scene.ErrBadScene instead.
var ErrBadInput = errors.New("bad input")

func badf(format string, args ...any) error {
	return fmt.Errorf("%w: %s", ErrBadInput, fmt.Sprintf(format, args...))
}

// Limits on the size of a study: beyond them a study is more likely a
// slip than an intention, and the bookkeeping (a bit per trial when
// resuming, a row per case in memory) stays small.
const (
	maxCases       = 100000
	maxStudyTrials = int64(1) << 40
)

// Study is a scene with a [sweep] section, read and checked, ready to run.
// It is safe for use by the workers of one Run at a time.
type Study struct {
	// Scene is the scene as written, in SI.
	Scene *scene.Scene
	// Warnings are the scene's warnings and those of its cases, each once.
	Warnings []string

	meta   Meta  // the study's identity and layout; counts are filled by Run and Finish
	radix  []int // values per varied key
	dyn    []int // indices of the moving bodies in Scene.Bodies
	draws  []draw
	header string

	mu sync.Mutex // Scene.With shares the scene's file cache
}

// draw is what a trial draws for one body.
type draw struct {
	orient           bool
	jitter, velocity shapes.Vec3
	height, spin     *scene.Range
}

// Open reads a scene file with a [sweep] section; mesh paths are relative
// to its folder.
func Open(file string) (*Study, error) {
	data, err := scene.ReadInput(file, scene.MaxSceneBytes)
	if err != nil {
		return nil, scene.Errors{{File: file, Msg: fmt.Sprintf("cannot read the scene: %v", unwrapPath(err))}}
	}
	return New(data, file, scene.Options{Dir: filepath.Dir(file)})
}

func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// New reads a study from the bytes of a scene file; name identifies it in
// messages and opt says where its mesh files are. Every case is read and
// checked here, so that a bad combination of values is reported before
// any trial runs.
func New(data []byte, name string, opt scene.Options) (*Study, error) {
	s, err := scene.Parse(data, name, opt)
	if err != nil {
		return nil, err
	}
	if s.Sweep == nil {
		return nil, badf("%s has no [sweep] section: add one with trials = N and the [[sweep.vary]] keys to vary (or use clatter run for a single simulation)", name)
	}
	st := &Study{Scene: s}
	sw := s.Sweep
	st.meta = Meta{
		Tool:       toolName,
		Build:      CurrentBuild(),
		Scene:      FileDigest{File: filepath.Base(name), SHA256: digest(data)},
		Units:      report.UnitsOf(s.Units),
		Seed:       sw.Seed,
		Trials:     int64(sw.Trials),
		GroupFaces: sw.GroupFaces,
		Vary:       []VaryMeta{},
	}
	cases := int64(1)
	for _, v := range sw.Vary {
		vals := make([]float64, len(v.Values))
		for i, x := range v.Values {
			vals[i] = report.Tidy(x)
		}
		st.meta.Vary = append(st.meta.Vary, VaryMeta{Key: v.Key, Values: vals, Log: v.Log})
		st.radix = append(st.radix, len(v.Values))
		cases *= int64(len(v.Values))
		if cases > maxCases {
			return nil, badf("%s: the [[sweep.vary]] keys make more than %d cases; split the study into several scenes", name, maxCases)
		}
	}
	st.meta.Cases = cases
	if cases*st.meta.Trials > maxStudyTrials {
		return nil, badf("%s: %d cases of %d trials is more than %d trials; split the study into several scenes", name, cases, sw.Trials, maxStudyTrials)
	}
	st.setDraws()
	for _, i := range st.dyn {
		if n := s.Bodies[i].Name; strings.ContainsAny(n, "\r\n") {
			return nil, badf("%s: body %q: a body in a sweep needs a name without line breaks (its rows in trials.csv are one line each)", name, n)
		}
	}
	if err := st.bodyFaces(); err != nil {
		return nil, err
	}
	if err := st.setGates(); err != nil { // gates.go
		return nil, err
	}
	seen := map[string]bool{}
	for _, w := range s.Warnings {
		seen[w] = true
		st.Warnings = append(st.Warnings, w)
	}
	for c := int64(0); c < cases; c++ {
		cs, err := st.caseScene(c)
		if err != nil {
			return nil, err
		}
		st.meta.Duration = math.Max(st.meta.Duration, cs.World.Duration)
		for _, w := range cs.Warnings {
			if !seen[w] {
				seen[w] = true
				st.Warnings = append(st.Warnings, fmt.Sprintf("%s (case %d: %s)", w, c, st.describe(c)))
			}
		}
	}
	st.meta.Duration = report.Tidy(st.meta.Duration)
	st.recordInputs()
	st.header = st.meta.trialsHeader()
	return st, nil
}

func digest(b []byte) string {
	h := sha256.Sum256(b)
	return hex.EncodeToString(h[:])
}

// setDraws lists the moving bodies and what each trial draws for them:
// bodies named in [sweep.randomize] orientation, and those whose scene
// orientation is "random", get a fresh orientation per trial.
func (st *Study) setDraws() {
	s, sw := st.Scene, st.Scene.Sweep
	st.draws = make([]draw, len(s.Bodies))
	for i, b := range s.Bodies {
		if !b.Static {
			st.dyn = append(st.dyn, i)
		}
		st.draws[i].orient = b.RandomOrientation
	}
	for _, n := range sw.RandomOrientation {
		st.draws[s.BodyIndex(n)].orient = true
	}
	for _, j := range sw.Jitter {
		st.draws[s.BodyIndex(j.Body)].jitter = j.Amount
	}
	for _, j := range sw.VelocityJitter {
		st.draws[s.BodyIndex(j.Body)].velocity = j.Amount
	}
	for i := range sw.Height {
		st.draws[s.BodyIndex(sw.Height[i].Body)].height = &sw.Height[i]
	}
	for i := range sw.Spin {
		st.draws[s.BodyIndex(sw.Spin[i].Body)].spin = &sw.Spin[i]
	}
}

// bodyFaces records each moving body's faces as `clatter inspect` lists
// them, with their quasi-static probabilities and symmetry groups.
func (st *Study) bodyFaces() error {
	w, ids, err := st.Scene.Build()
	if err != nil {
		return err
	}
	u := st.Scene.Units
	area := scene.Dim{L: 2}
	for _, i := range st.dyn {
		faces := report.Faces(w, ids[i])
		bm := BodyMeta{Name: st.Scene.Bodies[i].Name, Faces: []FaceMeta{}}
		groups := groupFaces(faces)
		for f, rf := range faces {
			fm := FaceMeta{Face: f, Area: report.Tidy(u.FromSI(rf.Area, area)), Probability: report.Tidy(rf.Probability), Stable: rf.Stable, Group: groups[f]}
			if rf.Curved() {
				fm.Axis = &[3]float64{report.Tidy(rf.Axis[0]), report.Tidy(rf.Axis[1]), report.Tidy(rf.Axis[2])}
			} else {
				fm.Normal = &[3]float64{report.Tidy(rf.Normal[0]), report.Tidy(rf.Normal[1]), report.Tidy(rf.Normal[2])}
			}
			bm.Faces = append(bm.Faces, fm)
		}
		st.meta.Bodies = append(st.meta.Bodies, bm)
	}
	return nil
}

// caseValues returns the varied values of case c, in the file's units:
// the cases run through every combination, the last key fastest.
func (st *Study) caseValues(c int64) []float64 {
	out := make([]float64, len(st.radix))
	for k := len(st.radix) - 1; k >= 0; k-- {
		n := int64(st.radix[k])
		out[k] = st.Scene.Sweep.Vary[k].Values[c%n]
		c /= n
	}
	return out
}

// describe names the values of case c: "material.abs.friction = 0.2".
func (st *Study) describe(c int64) string {
	vals := st.caseValues(c)
	if len(vals) == 0 {
		return "the scene as written"
	}
	parts := make([]string, len(vals))
	for k, v := range vals {
		parts[k] = fmt.Sprintf("%s = %g", st.meta.Vary[k].Key, report.Tidy(v))
	}
	return strings.Join(parts, ", ")
}

// caseScene returns the scene of case c: the varied keys set, re-read and
// checked.
func (st *Study) caseScene(c int64) (*scene.Scene, error) {
	st.mu.Lock()
	defer st.mu.Unlock()
	s := st.Scene
	for k, v := range st.caseValues(c) {
		n, err := s.With(st.meta.Vary[k].Key, v)
		if err != nil {
			return nil, fmt.Errorf("case %d (%s): %w", c, st.describe(c), err)
		}
		s = n
	}
	return s, nil
}

// Cases is the number of cases; Trials the trials of each.
func (st *Study) Cases() int64  { return st.meta.Cases }
func (st *Study) Trials() int64 { return st.meta.Trials }

// Meta returns the study's description as sweep.json records it, before
// any trial has run.
func (st *Study) Meta() Meta { return st.meta.clone() }
