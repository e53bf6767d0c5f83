package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"text/tabwriter"
	"time"

	"clatter/engine/scene"
	"clatter/engine/sweep"
)

// toolVersion is recorded in every sweep.json: a sweep folder is resumed,
// and shards are merged, only by the version that made them, since another
// version may simulate differently.
const toolVersion = "0.1.0"

var cmdSweep = &command{
	name:    "sweep",
	summary: "run a scene's [sweep] section as many trials, with statistics and plots",
	usage:   "clatter sweep SCENE.toml [-o DIR] [-j WORKERS] [--shard K/N] [--resume] [--quiet]\n       clatter sweep SCENE.toml --replay CASE/TRIAL [-o DIR] [--animation] [--pictures] [--sample SECONDS]",
	help: `
Runs the scene's [sweep] section: every combination of the [[sweep.vary]]
values is a case, and every case runs its trials, each with its own random
draws ([sweep.randomize]: orientation, position, height, velocity, spin).
A trial's draws depend only on the sweep's seed, its case and its number,
so the results are the same on any number of workers and in any shards.

It writes into DIR (default clatter-sweep):

  trials.csv   a row per trial and moving body: case,trial,seed, the varied
               values, body,resting_face,settled,settled_at,x,y,z,
               qw,qx,qy,qz,max_impact_speed; appended as trials finish
  cases.csv    a row per case, body and resting face: the count, the
               fraction of the case's trials and its 95 percent Wilson
               interval (low, high)
  sweep.json   the study as run: the digests of the scene and of every
               file it reads, the build and architecture, seed, cases,
               trials done, the faces of each body, tool version
  *.png        the fraction of each resting face against each varied key,
               and the distribution of the times to settle
  failures.csv trials whose simulation failed, if any
  drops.csv    for a scene with a [drop], a row per trial: case,trial, the
               varied values, strike,height,impact_speed,second_feature,
               secondary_impact_speed,peak_spin,final_face,turned_over,
               peak_acceleration (g, compliant contacts only);
               drops = "ten" in [sweep] makes the ten drops of the
               parcel-test sequence its cases (the varied key drop.number)
  face-down.csv per case, body and face: how often the face closest to
               facing gravity at the end was that one, settled or not
  crossings.csv, gate-cases.csv, gate-*.png
               for a scene with [[gate]]s: every crossing; per case, gate,
               body and face down the count, share with interval, and rate
               per minute; the orienting efficiency of gates with wanted
               faces is printed

Everything is in the scene's units; resting faces are numbered as
clatter inspect lists them. A table of the cases goes to stdout.

An interrupted sweep (Ctrl-C, kill, a lost node) keeps every finished
trial: run the same command with --resume to run only the rest. The
finished folder is the same, byte for byte, as an uninterrupted run's.

On a cluster, --shard K/N runs the K-th of N equal parts of the trials
(K from 1); clatter merge joins the shards' folders. Without --shard the
shard is taken from a Kubernetes Indexed Job (JOB_COMPLETION_INDEX from 0,
with the number of shards from --shard-count or CLATTER_SHARD_COUNT) or a
Slurm job array (SLURM_ARRAY_TASK_ID, SLURM_ARRAY_TASK_COUNT,
SLURM_ARRAY_TASK_MIN). Give each shard its own DIR: one process writes
into a folder at a time, and a second is refused (exit 2) naming the
process and host that hold it.

--replay CASE/TRIAL runs that one trial (the case and trial columns of
trials.csv) as clatter run would, with the case's values and the trial's
random draws, and writes what run writes into DIR (default clatter-replay),
with --animation and --pictures as in run. Its final state is the trial's
row in trials.csv.

Exit codes: 0 every trial ran; 1 the sweep was interrupted (resume it);
2 bad input (also a folder in use by another sweep); 3 the study finished
but some trials failed: failures.csv says which and why, and rerunning
will not change them; 70 an internal error (please report it).

Options:
  -o DIR            where to write (default clatter-sweep)
  -j WORKERS        trials run at once (default: the CPUs it may use)
  --shard K/N       run shard K of N (default: from the environment, else all)
  --shard-count N   the number of shards of a Kubernetes Indexed Job
  --resume          finish the sweep already in DIR
  --replay C/T      run trial T of case C alone, as clatter run would
  --animation       with --replay: also write animation.glb
  --pictures        with --replay: also write start.png and end.png
  --sample SECONDS  with --replay: the trajectory sample interval
  --quiet, -q       no progress or informational messages`,
}

var cmdMerge = &command{
	name:    "merge",
	summary: "join the folders of a sharded sweep into one",
	usage:   "clatter merge SHARD_DIR... -o DIR [--quiet]",
	help: `
Joins the folders of a sweep run in shards (clatter sweep --shard K/N) into
DIR: the same files, byte for byte, as the whole sweep run in one folder.
It refuses folders of different studies (another scene, mesh or pose
table, seed, clatter version, build or architecture), a shard given twice
or missing, and unfinished shards (finish them with clatter sweep
--resume). A table of the cases goes to
stdout.

Options:
  -o DIR        where to write (required)
  --quiet, -q   no informational messages`,
}

func init() {
	cmdSweep.run, cmdMerge.run = runSweep, runMerge
}

func runSweep(e *env, args []string) int {
	fs := newFlags(e, cmdSweep)
	dir := fs.String("o", "clatter-sweep", "")
	workers := fs.Int("j", 0, "")
	shardText := fs.String("shard", "", "")
	shardCount := fs.Int("shard-count", 0, "")
	resume := fs.Bool("resume", false, "")
	replay := fs.String("replay", "", "")
	sampleText := fs.String("sample", "0.01", "")
	var vis visuals
	vis.flags(fs)
	pos, code := parse(e, cmdSweep, fs, args)
	if code >= 0 {
		return code
	}
	if *replay != "" {
		if *resume || *shardText != "" || *shardCount != 0 {
			e.errorf("sweep: --replay runs one trial alone; it does not go with --resume or --shard")
			return exitBad
		}
		if !flagGiven(fs, "o") {
			*dir = "clatter-replay"
		}
		return replayTrial(e, pos, *replay, *dir, *sampleText, &vis)
	}
	if vis.animation || vis.pictures {
		e.errorf("sweep: --animation and --pictures go with --replay CASE/TRIAL: a study keeps no trajectories")
		return exitBad
	}
	if len(pos) != 1 {
		e.errorf("sweep: give one scene file, e.g. clatter sweep testdata/sweeps/cube.toml (got %d arguments)", len(pos))
		return exitBad
	}
	if *dir == "" {
		e.errorf("sweep: -o needs a folder")
		return exitBad
	}
	if *workers < 0 {
		e.errorf("sweep: -j must be a positive number of workers, got %d", *workers)
		return exitBad
	}
	shard, ok := sweepShard(e, *shardText, *shardCount)
	if !ok {
		return exitBad
	}
	st, ok := openStudy(e, pos[0])
	if !ok {
		return exitBad
	}
	// The folder is held from the first trial to the last plot.
	lock, err := sweep.LockFolder(*dir)
	if err != nil {
		return sweepFailed(e, err, *dir)
	}
	defer lock.Release()
	p := newTrialProgress(e)
	info, err := st.Run(e.ctx, sweep.Options{Dir: *dir, Workers: *workers, Shard: shard, Resume: *resume, Version: toolVersion, Progress: p.update, Lock: lock})
	p.done()
	tellRun(e, info, err, *dir)
	if err != nil {
		return sweepFailed(e, err, *dir)
	}
	res, err := sweep.Finish(*dir)
	if err != nil {
		return sweepFailed(e, err, *dir)
	}
	writeSweepTable(e.stdout, res)
	return sweepOutcome(e, res)
}

// openStudy reads the study file at path and prints its warnings; it
// reports false, having printed the error, if the file is bad.
func openStudy(e *env, path string) (*sweep.Study, bool) {
	st, err := sweep.Open(path)
	if err != nil {
		fmt.Fprintln(e.stderr, err)
		return nil, false
	}
	e.warn(st.Warnings)
	return st, true
}

// sweepShard works out the part of the study this process runs: from
// --shard K/N, else from a Kubernetes Indexed Job's environment
// (--shard-count), else all of it. It reports false, having said why, on
// bad input.
func sweepShard(e *env, text string, count int) (sweep.Shard, bool) {
	if text != "" {
		shard, err := sweep.ParseShard(text)
		if err != nil {
			e.errorf("sweep: --shard: %v", err)
			return shard, false
		}
		return shard, true
	}
	shard, source, err := sweep.ShardFromEnv(os.Getenv, count)
	if err != nil {
		e.errorf("sweep: %v", err)
		return shard, false
	}
	if source != "" {
		e.infof("shard %s, from %s", shard, source)
	} else if count > 0 {
		e.errorf("sweep: --shard-count goes with a Kubernetes Indexed Job (JOB_COMPLETION_INDEX), which is not set; give --shard K/N instead")
		return shard, false
	}
	return shard, true
}

// tellRun says on stderr what a run of the study's trials into dir did:
// rows it dropped, trials resumed, and the rate of the trials it ran
// (these only if it succeeded, err nil).
func tellRun(e *env, info *sweep.RunInfo, err error, dir string) {
	if info != nil {
		if info.Torn {
			e.infof("dropped the last row of %s, cut off when the sweep stopped; that trial runs again", filepath.Join(dir, sweep.TrialsFile))
		}
		if info.Dropped > 0 {
			e.errorf("warning: %d rows of %s were not part of a complete trial and are left out; those trials run again", info.Dropped, filepath.Join(dir, sweep.TrialsFile))
		}
	}
	if err != nil {
		return
	}
	if info.Skipped > 0 {
		e.infof("resumed: %d of %d trials were done; ran the other %d", info.Skipped, info.Total, info.Ran)
	}
	if info.Ran > 0 {
		rate := float64(info.Ran) / math.Max(info.Elapsed.Seconds(), 1e-9)
		e.infof("ran %d trials in %s (%.4g trials/s)", info.Ran, info.Elapsed.Round(time.Millisecond), rate)
	}
}

func runMerge(e *env, args []string) int {
	fs := newFlags(e, cmdMerge)
	dir := fs.String("o", "", "")
	pos, code := parse(e, cmdMerge, fs, args)
	if code >= 0 {
		return code
	}
	if len(pos) == 0 {
		e.errorf("merge: name the shard folders, e.g. clatter merge out/shard-1 out/shard-2 -o out/all")
		return exitBad
	}
	if *dir == "" {
		e.errorf("merge: give the folder to merge into with -o DIR")
		return exitBad
	}
	res, err := sweep.Merge(pos, *dir)
	if err != nil {
		return sweepFailed(e, err, *dir)
	}
	e.infof("merged %d shard folders into %s", len(pos), *dir)
	writeSweepTable(e.stdout, res)
	return sweepOutcome(e, res)
}

// sweepFailed reports an error of sweep or merge and returns the exit code.
func sweepFailed(e *env, err error, dir string) int {
	var ie *sweep.InternalError
	switch {
	case errors.As(err, &ie):
		e.errorf("%v; every finished trial is kept in %s\n%s", err, filepath.Join(dir, sweep.TrialsFile), reportHint)
		writeIndented(e.stderr, ie.Stack)
		return exitInternal
	case errors.Is(err, scene.ErrBadScene):
		fmt.Fprintln(e.stderr, err)
		return exitBad
	case errors.Is(err, sweep.ErrBadInput):
		e.errorf("%v", strings.TrimPrefix(err.Error(), sweep.ErrBadInput.Error()+": "))
		return exitBad
	case errors.Is(err, sweep.ErrInterrupted):
		e.errorf("sweep %v; every finished trial is kept in %s: run the same command with --resume to finish", err, filepath.Join(dir, sweep.TrialsFile))
		return exitFailed
	}
	e.errorf("%v", err)
	return exitFailed
}

func sweepOutcome(e *env, res *sweep.Result) int {
	m := res.Meta
	if m.TrialsFailed > 0 {
		e.errorf("%d trials failed (their simulation stopped with an error): their rows hold the last good state, and %s says why", m.TrialsFailed, filepath.Join(res.Dir, sweep.FailuresFile))
		return exitTrials
	}
	if !m.Complete {
		e.errorf("%s holds %d of its %d trials", res.Dir, m.TrialsDone, m.TrialsTotal)
		return exitFailed
	}
	return exitOK
}

// maxTableRows is the most case rows printed; cases.csv has them all.
const maxTableRows = 60

func writeSweepTable(w io.Writer, res *sweep.Result) {
	m := res.Meta
	part := ""
	if m.Shard != nil {
		part = fmt.Sprintf(", shard %d/%d (trials %d to %d)", m.Shard.Index, m.Shard.Count, m.Shard.From, m.Shard.To-1)
	}
	fmt.Fprintf(w, "sweep    %s: %d cases x %d trials, seed %d%s (lengths in %s, masses in %s)\n",
		m.Scene.File, m.Cases, m.Trials, m.Seed, part, m.Units.Length, m.Units.Mass)
	fmt.Fprintf(w, "trials   %d of %d done", m.TrialsDone, m.TrialsTotal)
	if m.TrialsFailed > 0 {
		fmt.Fprintf(w, ", %d failed", m.TrialsFailed)
	}
	fmt.Fprintln(w)
	if m.TrialsDone > 0 {
		fmt.Fprintf(w, "settled  %d of %d trials", res.Settled, m.TrialsDone)
		if res.Settled > 0 {
			fmt.Fprintf(w, "; mean time to settle %.3g s, longest %.3g s", res.SettleMean, res.SettleMax)
		}
		fmt.Fprintln(w)
	}
	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	head := []string{"case"}
	for _, v := range m.Vary {
		head = append(head, v.Key)
	}
	head = append(head, "body", "face", "count", "fraction", "95% interval", "quasi-static")
	fmt.Fprintln(tw, strings.Join(head, "\t"))
	for i, r := range res.Rows {
		if i == maxTableRows {
			break
		}
		cols := []string{fmt.Sprint(r.Case)}
		for _, v := range r.Values {
			cols = append(cols, fmt.Sprintf("%g", v))
		}
		face, qs := "none", "-"
		if r.Face >= 0 {
			face = fmt.Sprint(r.Face)
		}
		if !math.IsNaN(r.QuasiStatic) {
			qs = fmt.Sprintf("%.3f", r.QuasiStatic)
		}
		cols = append(cols, r.Body, face, fmt.Sprintf("%d/%d", r.Count, r.Trials), fmt.Sprintf("%.3f", r.Fraction),
			fmt.Sprintf("%.3f-%.3f", r.Low, r.High), qs)
		fmt.Fprintln(tw, strings.Join(cols, "\t"))
	}
	tw.Flush()
	if n := len(res.Rows) - maxTableRows; n > 0 {
		fmt.Fprintf(w, "... and %d more rows in %s\n", n, sweep.CasesFile)
	}
	fmt.Fprintln(w)
	writeStudyFeeder(w, res) // feeder.go
	var files []string
	for _, f := range m.Files {
		files = append(files, f)
		if f == sweep.CasesFile {
			files = append(files, sweep.MetaFile)
		}
	}
	writeDropsTable(w, res.Dir, m.Units)
	fmt.Fprintf(w, "results  %s: %s\n", res.Dir, strings.Join(files, ", "))
	fmt.Fprintln(w, "faces are numbered as `clatter inspect` lists them (a box: +x, -x, +y, -y, +z, -z); none means still")
	fmt.Fprintln(w, "moving, leaning or round. quasi-static is the probability inspect gives for a part let go at rest")
	fmt.Fprintln(w, "on a support, without bouncing or sliding.")
	if m.GroupFaces {
		fmt.Fprintln(w, "faces equal by symmetry are counted together, under the lowest face number of each group.")
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, safetyNote)
}
