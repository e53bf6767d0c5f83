package demo

import (
	"context"
	"embed"
	"encoding/csv"
	"fmt"
	"os"
	"path/filepath"
	"strconv"

	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/engine/view"
	"clatter/shapes/resting"
)

//go:embed study/chute.toml study/bracket.stl
var files embed.FS

// SceneFile and PartFile name the embedded scene and its part.
const (
	SceneFile = "chute.toml"
	PartFile  = "bracket.stl"
)

// Frictions are the tray's kinetic friction coefficients the study runs;
// Seeds the starting orientations (world.seed) of each.
var (
	Frictions = []float64{0.15, 0.35, 0.6}
	Seeds     = []int{1, 2, 3, 4, 5, 6, 7, 8}
)

// PartName is the moving body of the study.
const PartName = "bracket"

// Row is one run of the study.
type Row struct {
	Friction float64
	Seed     int
	// Face is the resting face (the index `clatter inspect` lists), or -1.
	Face int
	// SettledAt is when the part came to rest, or -1 if it did not.
	SettledAt float64
	// MaxImpact is the largest impact speed, mm/s.
	MaxImpact float64
	// Dir holds the run's summary.json, trajectory.csv and events.jsonl.
	Dir string
	Err string
}

// Study is the outcome of the demo.
type Study struct {
	Scene *scene.Scene
	Rows  []Row
	// Faces is the resting analysis of the part, indexed like Row.Face.
	Faces []resting.Face
	// Dir is where the files went.
	Dir string
}

// Scene returns the embedded scene, read and checked.
func Scene() (*scene.Scene, error) {
	data, err := files.ReadFile("study/" + SceneFile)
	if err != nil {
		return nil, err
	}
	return scene.Parse(data, SceneFile, scene.Options{Dir: "study", FS: files})
}

// Run runs the study and writes into dir: the scene and its part, a
// results.csv with a row per run, and a folder per run with its result
// files. progress, if set, gets the fraction of runs done.
func Run(ctx context.Context, dir string, progress func(float64)) (*Study, error) {
	base, err := Scene()
	if err != nil {
		return nil, fmt.Errorf("the embedded study does not read: %w", err)
	}
	st := &Study{Scene: base, Dir: dir}
	pi := base.BodyIndex(PartName)
	if pi < 0 || base.Bodies[pi].Part == nil {
		return nil, fmt.Errorf("the embedded study has no part %q", PartName)
	}
	part := base.Bodies[pi].Part
	st.Faces, err = resting.OfHull(part.Hull, base.Bodies[pi].Props.Center)
	if err != nil {
		return nil, fmt.Errorf("the embedded part: %w", err)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, err
	}
	for _, name := range []string{SceneFile, PartFile} {
		data, err := files.ReadFile("study/" + name)
		if err != nil {
			return nil, err
		}
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			return nil, err
		}
	}
	total := len(Frictions) * len(Seeds)
	for _, mu := range Frictions {
		for _, seed := range Seeds {
			if err := ctx.Err(); err != nil {
				return st, err
			}
			row := Row{Friction: mu, Seed: seed, Face: -1, SettledAt: -1}
			row.Dir = filepath.Join(dir, "runs", fmt.Sprintf("friction-%g-seed-%d", mu, seed))
			s, err := base.With("material.tray.friction", mu)
			if err == nil {
				s, err = s.With("world.seed", float64(seed))
			}
			if err != nil {
				return st, fmt.Errorf("the embedded study: %w", err)
			}
			rec := view.NewRecorder(s)
			sum, err := report.Run(ctx, s, report.Options{Dir: row.Dir, Observe: rec.Observe})
			if err != nil {
				row.Err = err.Error()
			}
			if sum != nil {
				if err := writeVisuals(rec, row.Dir); err != nil {
					return st, err
				}
			}
			if sum != nil && len(sum.Bodies) == 1 {
				b := sum.Bodies[0]
				if b.RestingFace != nil {
					row.Face = *b.RestingFace
				}
				if sum.SettledAt != nil {
					row.SettledAt = *sum.SettledAt
				}
				row.MaxImpact = b.MaxImpactSpeed
			}
			st.Rows = append(st.Rows, row)
			if progress != nil {
				progress(float64(len(st.Rows)) / float64(total))
			}
		}
	}
	return st, st.writeCSV(filepath.Join(dir, "results.csv"))
}

// writeVisuals writes a run's pictures and animation beside its results.
func writeVisuals(rec *view.Recorder, dir string) error {
	if err := rec.WritePictures(filepath.Join(dir, view.StartPicture), filepath.Join(dir, view.EndPicture)); err != nil {
		return err
	}
	return rec.WriteGLB(filepath.Join(dir, view.AnimationFile))
}

// writeCSV writes a row per run: tray_friction,seed,resting_face,settled,settled_at,max_impact_speed.
func (st *Study) writeCSV(path string) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	w := csv.NewWriter(f)
	w.Write([]string{"tray_friction", "seed", "resting_face", "settled", "settled_at", "max_impact_speed"})
	for _, r := range st.Rows {
		face, at := "", ""
		if r.Face >= 0 {
			face = strconv.Itoa(r.Face)
		}
		if r.SettledAt >= 0 {
			at = strconv.FormatFloat(r.SettledAt, 'g', 6, 64)
		}
		w.Write([]string{strconv.FormatFloat(r.Friction, 'g', -1, 64), strconv.Itoa(r.Seed), face,
			strconv.FormatBool(r.SettledAt >= 0), at, strconv.FormatFloat(r.MaxImpact, 'g', 6, 64)})
	}
	w.Flush()
	if err := w.Error(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
