package sweep

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestOneWriterPerFolder(t *testing.T) {
	// While one process holds a folder, a second sweep into it and a
	// --resume of it are refused as bad input naming the holder (its pid
	// and host), and a merge into it too; once released, the folder is
	// free and the lock file is gone.
	st := newStudy(t, small)
	dir := t.TempDir()
	held, err := LockFolder(dir)
	if err != nil {
		t.Fatal(err)
	}
	host, _ := os.Hostname()
	holder := fmt.Sprintf("process %d on host %s", os.Getpid(), host)
	for _, resume := range []bool{false, true} {
		_, err := st.Run(context.Background(), Options{Dir: dir, Version: "test", Resume: resume})
		if !errors.Is(err, ErrBadInput) || !errors.Is(err, ErrLocked) || !strings.Contains(err.Error(), holder) {
			t.Errorf("a sweep (resume %v) into a folder in use: %v, want a refusal naming %q", resume, err, holder)
		}
	}
	if _, err := LockFolder(dir); !errors.Is(err, ErrLocked) {
		t.Errorf("a second lock: %v, want ErrLocked", err)
	}
	held.Release()
	if _, err := os.Stat(filepath.Join(dir, LockFile)); !os.IsNotExist(err) {
		t.Errorf("the lock file is left after release: %v", err)
	}
	res, _ := runAll(t, st, Options{Dir: dir, Workers: 2})
	if !res.Meta.Complete {
		t.Errorf("after release the sweep ran %d of %d trials", res.Meta.TrialsDone, res.Meta.TrialsTotal)
	}
	if _, err := os.Stat(filepath.Join(dir, LockFile)); !os.IsNotExist(err) {
		t.Errorf("a finished sweep leaves its lock file: %v", err)
	}
}

func TestStaleLockDoesNotBlockResume(t *testing.T) {
	// A crash leaves the lock file with the dead process's name in it, but
	// the system has let go of its lock: --resume takes the folder.
	st := newStudy(t, small)
	dir := t.TempDir()
	ctx, cancel := context.WithCancel(context.Background())
	st.Run(ctx, Options{Dir: dir, Version: "test", Workers: 1, Progress: func(done, _ int64) {
		if done == 3 {
			cancel()
		}
	}})
	cancel()
	stale := "pid 999999\nhost crashed-node\nsince 2026-01-02T03:04:05Z\n"
	if err := os.WriteFile(filepath.Join(dir, LockFile), []byte(stale), 0o644); err != nil {
		t.Fatal(err)
	}
	info, err := st.Run(context.Background(), Options{Dir: dir, Version: "test", Workers: 2, Resume: true})
	if err != nil || info.Skipped < 3 || info.Skipped+info.Ran != info.Total {
		t.Fatalf("resume after a crash: %+v, %v", info, err)
	}
}
