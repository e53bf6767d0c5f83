package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"clatter/engine/sweep"
)

func TestHostileInputExitsBad(t *testing.T) {
	// Files that are not regular files are refused at once with exit 2,
	// by run and by inspect: a fifo would block the reader, /dev/zero
	// would never end.
	dir := t.TempDir()
	fifo := filepath.Join(dir, "part.stl")
	if err := mkfifo(fifo); err != nil {
		t.Skipf("no fifo here: %v", err)
	}
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"inspect", fifo}, "a named pipe (fifo), not a regular file"},
		{[]string{"run", fifo}, "a named pipe (fifo), not a regular file"},
		{[]string{"inspect", "/dev/zero"}, "a device, not a regular file"},
		{[]string{"run", "/dev/zero", "-o", filepath.Join(dir, "out")}, "a device, not a regular file"},
		{[]string{"sweep", "/dev/zero", "-o", filepath.Join(dir, "sw")}, "a device, not a regular file"},
	}
	for _, c := range cases {
		done := make(chan [2]any, 1)
		go func() { _, errs, code := clatter(t, c.args...); done <- [2]any{errs, code} }()
		select {
		case r := <-done:
			if r[1] != exitBad || !strings.Contains(r[0].(string), c.want) {
				t.Errorf("clatter %v: exit %v, %q; want %d and %q", c.args, r[1], r[0], exitBad, c.want)
			}
		case <-time.After(time.Minute): // a refusal is a stat: a minute means it blocks
			t.Fatalf("clatter %v still reading after a minute", c.args)
		}
	}
}

func TestUnwritableOutputExitsBad(t *testing.T) {
	// An output folder that cannot be written is bad input, exit 2,
	// whether it is missing (and cannot be made) or exists.
	dir := t.TempDir()
	file := filepath.Join(dir, "file")
	os.WriteFile(file, []byte("x"), 0o644)
	ro := filepath.Join(dir, "ro")
	os.Mkdir(ro, 0o555)
	if f, err := os.Create(filepath.Join(ro, "probe")); err == nil {
		// Root writes anywhere: use a folder of the kernel's instead.
		f.Close()
		ro = "/proc/self"
	}
	for _, out := range []string{filepath.Join(file, "out"), ro} {
		for _, args := range [][]string{{"run", "../../testdata/scenes/bounce.toml"}, {"sweep", exampleSweep}, {"demo"}} {
			_, errs, code := clatter(t, append(args, "-o", out, "--quiet")...)
			if code != exitBad || !strings.Contains(errs, out) {
				t.Errorf("%s into %s: exit %d, want %d naming the folder\n%s", args[0], out, code, exitBad, errs)
			}
		}
	}
}

func TestFolderInUseExitsBad(t *testing.T) {
	// A sweep into a folder that another process holds exits 2 naming it.
	dir := t.TempDir()
	l, err := sweep.LockFolder(dir)
	if err != nil {
		t.Fatal(err)
	}
	defer l.Release()
	host, _ := os.Hostname()
	for _, extra := range [][]string{nil, {"--resume"}} {
		_, errs, code := clatter(t, append([]string{"sweep", exampleSweep, "-o", dir, "--quiet"}, extra...)...)
		want := fmt.Sprintf("clatter: %s is in use by process %d on host %s", dir, os.Getpid(), host)
		if code != exitBad || !strings.Contains(errs, want) {
			t.Errorf("sweep %v into a folder in use: exit %d, want %d and %q\n%s", extra, code, exitBad, want, errs)
		}
	}
}
