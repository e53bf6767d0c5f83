package sweep

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"time"

	"golang.org/x/sync/errgroup"
)

// Options control a Run.
type Options struct {
	// Dir is the output folder (made if missing).
	Dir string
	// Workers is the number of trials run at once. The default is
	// runtime.GOMAXPROCS(0): the number of CPUs, or fewer where a
	// container's CPU limit allows fewer (there NumCPU counts the whole
	// machine, and more workers than the quota only contend).
	Workers int
	// Shard is the part of the study to run; the zero Shard runs all of it.
	Shard Shard
	// Resume continues the study already in Dir, running only the trials
	// missing from its trials.csv. Without it a folder that holds a sweep
	// is refused, so that finished results are never overwritten.
	Resume bool
	// Version is the tool version recorded in sweep.json; a folder made by
	// another version is not resumed or merged.
	Version string
	// Progress, if set, is called from one goroutine after each finished
	// trial with the trials this run has finished and is to run.
	Progress func(done, total int64)
	// Lock, if set, is the caller's hold on Dir (LockFolder), kept past
	// the run (to Finish the folder); without it Run takes and releases
	// its own, and refuses a folder that another process writes into.
	Lock *Lock
}

// RunInfo tells what a Run did.
type RunInfo struct {
	// Meta is sweep.json as written at the start of the run.
	Meta *Meta
	// Total is the number of trials of the folder's part of the study;
	// Skipped those already in trials.csv (resumed); Ran those run now;
	// Failed those of Ran whose simulation failed.
	Total, Skipped, Ran, Failed int64
	// Torn is set when a resumed trials.csv ended in a row cut off by the
	// interruption, which was dropped; Dropped counts other unusable rows.
	Torn    bool
	Dropped int
	Elapsed time.Duration
}

// ErrInterrupted is returned by Run when its context is cancelled; every
// trial finished before is kept in trials.csv.
var ErrInterrupted = errors.New("interrupted")

// syncEvery is how often trials.csv is synced to disk while trials run:
// rows are written to the file as each trial finishes (so a killed process
// loses none), and synced at this interval (so a power cut loses at most
// this much work) without a disk flush per trial.
const syncEvery = 2 * time.Second

// Run runs the study's trials that are not yet in opt.Dir, on opt.Workers
// workers, appending each trial's rows to trials.csv as it finishes. It
// leaves trials.csv in the order trials finished; Finish puts the folder
// in order and writes the statistics and plots.
func (st *Study) Run(ctx context.Context, opt Options) (*RunInfo, error) {
	start := time.Now()
	if opt.Dir == "" {
		return nil, badf("no output folder given")
	}
	workers := opt.Workers
	if workers == 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	if workers < 1 || workers > 4096 {
		return nil, badf("the number of workers must be from 1 to 4096, got %d", opt.Workers)
	}
	if opt.Shard.Count != 0 {
		if _, err := checkShard(opt.Shard.Index, opt.Shard.Count, "shard"); err != nil {
			return nil, badf("%v", err)
		}
	}
	meta := st.meta.clone()
	meta.Version = opt.Version
	if meta.Version == "" {
		meta.Version = "unversioned"
	}
	total := meta.Cases * meta.Trials
	lo, hi := opt.Shard.span(total)
	if !opt.Shard.Whole() {
		meta.Shard = &ShardMeta{Index: opt.Shard.Index, Count: opt.Shard.Count, From: lo, To: hi}
	}
	meta.TrialsTotal = hi - lo
	info := &RunInfo{Meta: &meta, Total: hi - lo}

	if opt.Lock == nil {
		l, err := LockFolder(opt.Dir)
		if err != nil {
			return nil, err
		}
		defer l.Release()
	}
	done, err := st.prepare(opt, &meta, info, lo, hi)
	if err != nil {
		return nil, err
	}
	meta.TrialsDone = info.Skipped
	meta.Files = []string{}
	if err := writeMeta(opt.Dir, &meta); err != nil {
		return nil, fmt.Errorf("cannot write %s: %w", MetaFile, err)
	}
	trials, err := openLog(filepath.Join(opt.Dir, TrialsFile), meta.trialsHeader())
	if err != nil {
		return nil, err
	}
	defer trials.close()
	failures := &appendLog{path: filepath.Join(opt.Dir, FailuresFile), header: failuresHeader}
	defer failures.close()
	drops := &appendLog{path: filepath.Join(opt.Dir, DropsFile), header: meta.dropsHeader()}
	defer drops.close()
	crossings := &appendLog{path: filepath.Join(opt.Dir, CrossingsFile), header: crossingsHeader}
	defer crossings.close()

	todo := info.Total - info.Skipped
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	jobs := make(chan int64, workers)
	results := make(chan result, workers)
	// The group's context ends at the first failed trial (a worker's
	// error), an interruption (ctx) or a write error (cancel).
	grp, gctx := errgroup.WithContext(ctx)
	grp.Go(func() error {
		defer close(jobs)
		for g := lo; g < hi; g++ {
			if done != nil && done.has(g-lo) {
				continue
			}
			select {
			case jobs <- g:
			case <-gctx.Done():
				return nil
			}
		}
		return nil
	})
	for i := 0; i < workers; i++ {
		grp.Go(func() error {
			wk := newWorker(st)
			for g := range jobs {
				r, err := wk.safeRun(gctx, g)
				if err != nil {
					if gctx.Err() != nil {
						return nil // stopped by another's failure or an interruption
					}
					return err
				}
				select {
				case results <- r:
				case <-gctx.Done():
					return nil
				}
			}
			return nil
		})
	}
	var fatal error
	go func() {
		fatal = grp.Wait()
		close(results)
	}()

	var werr error
	lastSync := time.Now()
	for r := range results {
		if werr != nil {
			continue
		}
		// The failure and the crossings first: a crash between the writes
		// then reruns the trial, and Finish drops the repeated rows.
		if r.crossings != nil {
			if werr = crossings.write(r.crossings); werr != nil {
				cancel()
				continue
			}
		}
		if r.failure != nil {
			if werr = failures.write(r.failure); werr != nil {
				cancel()
				continue
			}
			info.Failed++
		}
		if r.drop != nil {
			if werr = drops.write(r.drop); werr != nil {
				cancel()
				continue
			}
		}
		if werr = trials.write(r.rows); werr != nil {
			cancel()
			continue
		}
		info.Ran++
		if time.Since(lastSync) > syncEvery {
			trials.sync()
			lastSync = time.Now()
		}
		if opt.Progress != nil {
			opt.Progress(info.Ran, todo)
		}
	}
	info.Elapsed = time.Since(start)
	if err := trials.close(); err != nil && werr == nil {
		werr = err
	}
	if err := failures.close(); err != nil && werr == nil {
		werr = err
	}
	if err := drops.close(); err != nil && werr == nil {
		werr = err
	}
	if err := crossings.close(); err != nil && werr == nil {
		werr = err
	}
	switch {
	case werr != nil:
		return info, fmt.Errorf("cannot write the results: %w", werr)
	case fatal != nil:
		return info, fatal
	case info.Ran < todo:
		return info, fmt.Errorf("%w: %d of %d trials done", ErrInterrupted, info.Skipped+info.Ran, info.Total)
	}
	return info, nil
}

// prepare checks the output folder and, when resuming, reads which trials
// it holds already.
func (st *Study) prepare(opt Options, meta *Meta, info *RunInfo, lo, hi int64) (*bitset, error) {
	dir := opt.Dir
	removeTemps(dir)
	old, err := ReadMeta(dir)
	_, statErr := os.Stat(filepath.Join(dir, MetaFile))
	tpath := filepath.Join(dir, TrialsFile)
	_, tErr := os.Stat(tpath)
	switch {
	case statErr == nil && err != nil:
		return nil, err
	case old != nil && !opt.Resume:
		return nil, badf("%s already holds a sweep (%s); add --resume to finish it, or choose another folder with -o", dir, MetaFile)
	case old != nil:
		if why := sameStudy(meta, old); why != "" {
			return nil, badf("cannot resume the sweep in %s: %s; run this study into another folder", dir, why)
		}
		if (old.Shard == nil) != (meta.Shard == nil) || old.Shard != nil && (old.Shard.Index != meta.Shard.Index || old.Shard.Count != meta.Shard.Count) {
			return nil, badf("cannot resume the sweep in %s: it holds shard %s, this is shard %s; give each shard its own folder", dir, shardName(old.Shard), shardName(meta.Shard))
		}
	case tErr == nil:
		return nil, badf("%s holds a %s but no %s: it is not the folder of a sweep; choose another folder with -o", dir, TrialsFile, MetaFile)
	}
	if old == nil || tErr != nil {
		return nil, nil
	}
	done := newBitset(hi - lo)
	tb := trialsTable(meta)
	n, err := recoverLog(tpath, tb, func(g group) error {
		if g.g < lo || g.g >= hi {
			return fmt.Errorf("it holds trial %d, outside this shard's trials %d to %d", g.g, lo, hi-1)
		}
		if !done.has(g.g - lo) {
			done.set(g.g - lo)
			info.Skipped++
		}
		return nil
	})
	if err != nil {
		return nil, badf("cannot resume from %s: %v", tpath, err)
	}
	info.Torn, info.Dropped = n.torn, n.dropped
	// failures.csv is only ever read back by Finish; a torn last line is
	// dropped here so that new rows start on a line of their own.
	fpath := filepath.Join(dir, FailuresFile)
	if _, err := os.Stat(fpath); err == nil {
		if _, err := recoverLog(fpath, failuresTable(meta), func(group) error { return nil }); err != nil {
			return nil, badf("cannot resume from %s: %v", fpath, err)
		}
	}
	if err := recoverDrops(dir, meta); err != nil {
		return nil, badf("cannot resume from %s: %v", filepath.Join(dir, DropsFile), err)
	}
	if err := pruneCrossings(dir, meta, done, lo); err != nil { // gates.go
		return nil, badf("cannot resume from %s: %v", filepath.Join(dir, CrossingsFile), err)
	}
	return done, nil
}

func shardName(s *ShardMeta) string {
	if s == nil {
		return "1/1 (the whole study)"
	}
	return fmt.Sprintf("%d/%d", s.Index, s.Count)
}

// recoverLog scans a log and cuts off a torn last line, so that rows
// appended later start on a line of their own. A file without even a
// complete header is removed, to be made again.
func recoverLog(path string, tb *table, fn func(group) error) (scanStats, error) {
	f, err := os.Open(path)
	if err != nil {
		return scanStats{}, err
	}
	n, err := tb.scan(f, true, fn)
	f.Close()
	if n.end == 0 {
		return n, os.Remove(path)
	}
	if err != nil {
		return n, err
	}
	if n.torn {
		if err := os.Truncate(path, n.end); err != nil {
			return n, err
		}
	}
	return n, nil
}

// removeTemps removes what an interrupted Finish may have left.
func removeTemps(dir string) {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return
	}
	for _, e := range ents {
		if n := e.Name(); strings.HasSuffix(n, ".tmp") && (strings.HasPrefix(n, ".sort-") || strings.HasPrefix(n, "trials.csv") ||
			strings.HasPrefix(n, "cases.csv") || strings.HasPrefix(n, "failures.csv") || strings.HasPrefix(n, DropsFile) || strings.HasPrefix(n, CrossingsFile) || strings.HasPrefix(n, GateCasesFile) || strings.HasPrefix(n, FaceDownFile) || strings.HasPrefix(n, "sweep.json") || strings.HasSuffix(n, ".png.tmp")) {
			os.Remove(filepath.Join(dir, n))
		}
	}
}

// appendLog is a CSV file that rows are appended to as trials finish.
// Each write goes straight to the file (no buffer in the process), so a
// killed process loses no finished row.
type appendLog struct {
	path   string
	header string
	f      *os.File
}

func openLog(path, header string) (*appendLog, error) {
	l := &appendLog{path: path, header: header}
	if err := l.open(); err != nil {
		return nil, err
	}
	return l, nil
}

func (l *appendLog) open() error {
	f, err := os.OpenFile(l.path, os.O_WRONLY|os.O_APPEND|os.O_CREATE, 0o644)
	if err != nil {
		return fmt.Errorf("cannot write %s: %w", l.path, err)
	}
	st, err := f.Stat()
	if err != nil {
		f.Close()
		return err
	}
	if st.Size() == 0 {
		if _, err := f.Write([]byte(l.header + "\n")); err != nil {
			f.Close()
			return err
		}
	}
	l.f = f
	return nil
}

func (l *appendLog) write(b []byte) error {
	if l.f == nil {
		if err := l.open(); err != nil {
			return err
		}
	}
	_, err := l.f.Write(b)
	return err
}

func (l *appendLog) sync() {
	if l.f != nil {
		l.f.Sync()
	}
}

func (l *appendLog) close() error {
	if l.f == nil {
		return nil
	}
	err := l.f.Sync()
	if cerr := l.f.Close(); err == nil {
		err = cerr
	}
	l.f = nil
	return err
}

// bitset is a set of trial indices from 0.
type bitset []uint64

func newBitset(n int64) *bitset    { b := make(bitset, (n+63)/64); return &b }
func (b *bitset) has(i int64) bool { return (*b)[i/64]&(1<<(i%64)) != 0 }
func (b *bitset) set(i int64)      { (*b)[i/64] |= 1 << (i % 64) }
