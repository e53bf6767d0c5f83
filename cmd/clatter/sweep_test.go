package main

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

// asMain is the variable that makes the test binary act as the clatter
// command, so that tests can run it as a process of its own (to kill it,
// or to run it from a cluster script).
const asMain = "CLATTER_TEST_AS_MAIN"

func TestMain(m *testing.M) {
	if os.Getenv(asMain) == "1" {
		main()
		return
	}
	code := m.Run()
	if refDir != "" {
		os.RemoveAll(refDir)
	}
	os.Exit(code)
}

// exampleSweep is the README's example study.
const exampleSweep = "../../testdata/sweeps/cube.toml"

var (
	refOnce sync.Once
	refDir  string
	refOut  string
)

// reference runs the example study once, in one folder on two workers, for
// the tests that compare other ways of running it with it.
func reference(t *testing.T) string {
	t.Helper()
	refOnce.Do(func() {
		d, err := os.MkdirTemp("", "clatter-sweep-ref")
		if err != nil {
			t.Fatal(err)
		}
		var code int
		var errs string
		refOut, errs, code = clatter(t, "sweep", exampleSweep, "-o", d, "-j", "2", "--quiet")
		if code != exitOK {
			t.Fatalf("reference sweep: exit %d\n%s", code, errs)
		}
		refDir = d
	})
	if refDir == "" {
		t.Fatal("the reference sweep failed")
	}
	return refDir
}

func sameDirs(t *testing.T, what, a, b string) {
	t.Helper()
	names := func(d string) []string {
		ents, err := os.ReadDir(d)
		if err != nil {
			t.Fatal(err)
		}
		var n []string
		for _, e := range ents {
			n = append(n, e.Name())
		}
		return n
	}
	na, nb := names(a), names(b)
	if strings.Join(na, " ") != strings.Join(nb, " ") {
		t.Fatalf("%s: files %v, want %v", what, nb, na)
	}
	for _, n := range na {
		x, _ := os.ReadFile(filepath.Join(a, n))
		y, _ := os.ReadFile(filepath.Join(b, n))
		if !bytes.Equal(x, y) {
			t.Errorf("%s: %s differs from the single run's", what, n)
		}
	}
}

func TestSweepExample(t *testing.T) {
	dir := reference(t)
	// The table: every case, body and face with its count and interval,
	// the quasi-static probability, and the safety note.
	for _, want := range []string{
		"sweep    cube.toml: 3 cases x 60 trials, seed 7 (lengths in mm, masses in g)",
		"trials   180 of 180 done",
		"case  material.steel.friction  body  face  count",
		"0.167", "95% interval", "qualified engineer",
		"results  " + dir + ": trials.csv, cases.csv, sweep.json, face-down.csv, faces-cube-material.steel.friction.png, settle-times.png",
	} {
		if !strings.Contains(refOut, want) {
			t.Errorf("sweep output lacks %q:\n%s", want, refOut)
		}
	}
	// 3 cases x 6 faces, each row's count out of 60.
	rows := regexp.MustCompile(`(?m)^[0-2] +0\.[136] +cube +[0-5] +\d+/60 `).FindAllString(refOut, -1)
	if len(rows) != 18 {
		t.Errorf("%d case rows, want 18:\n%s", len(rows), refOut)
	}
	var meta struct {
		Seed       uint64 `json:"seed"`
		Version    string `json:"version"`
		TrialsDone int    `json:"trials_done"`
		Complete   bool   `json:"complete"`
		Files      []string
	}
	b, err := os.ReadFile(filepath.Join(dir, "sweep.json"))
	if err != nil || json.Unmarshal(b, &meta) != nil {
		t.Fatalf("sweep.json: %v\n%s", err, b)
	}
	if meta.Seed != 7 || meta.Version != toolVersion || meta.TrialsDone != 180 || !meta.Complete || len(meta.Files) != 5 {
		t.Errorf("sweep.json %+v", meta)
	}
	for _, f := range meta.Files {
		if st, err := os.Stat(filepath.Join(dir, f)); err != nil || st.Size() == 0 {
			t.Errorf("%s: %v", f, err)
		}
	}
	// A second run into the folder is refused; resuming the finished
	// folder changes nothing.
	_, errs, code := clatter(t, "sweep", exampleSweep, "-o", dir, "--quiet")
	if code != exitBad || !strings.Contains(errs, "add --resume to finish it") {
		t.Errorf("sweep into a finished folder: exit %d, %s", code, errs)
	}
	copyDir := t.TempDir()
	copyFiles(t, dir, copyDir)
	if _, errs, code := clatter(t, "sweep", exampleSweep, "-o", copyDir, "--resume", "--quiet"); code != exitOK {
		t.Fatalf("resume of a finished sweep: exit %d, %s", code, errs)
	}
	sameDirs(t, "a finished sweep resumed", dir, copyDir)
}

func copyFiles(t *testing.T, from, to string) {
	t.Helper()
	ents, err := os.ReadDir(from)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range ents {
		b, err := os.ReadFile(filepath.Join(from, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(to, e.Name()), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// asProcess returns the test binary as the clatter command, with env added
// to the test's environment.
func asProcess(t *testing.T, dir string, env []string, args ...string) *exec.Cmd {
	t.Helper()
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	c := exec.Command(self, args...)
	c.Dir = dir
	c.Env = append(append(os.Environ(), asMain+"=1"), env...)
	return c
}

// rowsIn counts the complete lines of a file after its header.
func rowsIn(path string) int {
	b, _ := os.ReadFile(path)
	return max(0, bytes.Count(b, []byte("\n"))-1)
}

// checkRowsIntact fails unless every line of trials.csv (after the header)
// is a complete row of the example's 17 columns, ending in a line break.
func checkRowsIntact(t *testing.T, path string) int {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(b) > 0 && b[len(b)-1] != '\n' {
		t.Errorf("%s ends in a torn row", path)
	}
	sc := bufio.NewScanner(bytes.NewReader(b))
	n := 0
	for sc.Scan() {
		if f := strings.Split(sc.Text(), ","); len(f) != 17 {
			t.Errorf("row %d of %s has %d fields: %q", n, path, len(f), sc.Text())
		}
		n++
	}
	return n - 1
}

func TestSweepKilledAndResumed(t *testing.T) {
	// The built command as a process of its own: stopped with Ctrl-C
	// (SIGINT) early, then killed with SIGKILL mid-run after resuming, then
	// resumed to the end. Every finished row survives each stop, and the
	// finished folder is the uninterrupted run's, byte for byte.
	ref := reference(t)
	wd, _ := os.Getwd()
	scene := filepath.Join(wd, exampleSweep)
	dir := t.TempDir()
	trials := filepath.Join(dir, "trials.csv")
	stopAfter := func(sig syscall.Signal, rows int, args ...string) (int, string) {
		t.Helper()
		c := asProcess(t, wd, nil, args...)
		var stderr bytes.Buffer
		c.Stderr = &stderr
		if err := c.Start(); err != nil {
			t.Fatal(err)
		}
		deadline := time.Now().Add(30 * time.Second)
		for rowsIn(trials) < rows && time.Now().Before(deadline) {
			time.Sleep(2 * time.Millisecond)
		}
		c.Process.Signal(sig)
		err := c.Wait()
		code := 0
		if ee, ok := err.(*exec.ExitError); ok {
			code = ee.ExitCode()
		}
		return code, stderr.String()
	}
	code, errs := stopAfter(syscall.SIGINT, 20, "sweep", scene, "-o", dir, "-j", "1")
	if code != exitFailed || !strings.Contains(errs, "run the same command with --resume") {
		t.Fatalf("after Ctrl-C: exit %d, want %d\n%s", code, exitFailed, errs)
	}
	first := checkRowsIntact(t, trials)
	code, _ = stopAfter(syscall.SIGKILL, first+40, "sweep", scene, "-o", dir, "-j", "1", "--resume")
	if code != -1 {
		t.Fatalf("the resumed run finished (exit %d) before it was killed; the study is too small for this machine", code)
	}
	second := checkRowsIntact(t, trials)
	if !(first >= 20 && second >= first+40 && second < 180) {
		t.Errorf("rows after Ctrl-C %d, after kill -9 %d: want at least 20, then 40 more, short of 180", first, second)
	}
	out, err := asProcess(t, wd, nil, "sweep", scene, "-o", dir, "--resume").CombinedOutput()
	if err != nil {
		t.Fatalf("final resume: %v\n%s", err, out)
	}
	if want := fmt.Sprintf("resumed: %d of 180 trials were done", second); !strings.Contains(string(out), want) {
		t.Errorf("final resume output lacks %q:\n%s", want, out)
	}
	sameDirs(t, "killed and resumed", ref, dir)
}

// dataDir makes the shared volume of the examples: the example scene at
// sweeps/cube.toml.
func dataDir(t *testing.T) string {
	t.Helper()
	d := t.TempDir()
	os.MkdirAll(filepath.Join(d, "sweeps"), 0o755)
	b, err := os.ReadFile(exampleSweep)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(d, "sweeps", "cube.toml"), b, 0o644); err != nil {
		t.Fatal(err)
	}
	return d
}

func b0(t *testing.T) []byte {
	t.Helper()
	b, err := os.ReadFile(exampleSweep)
	if err != nil {
		t.Fatal(err)
	}
	return b
}
