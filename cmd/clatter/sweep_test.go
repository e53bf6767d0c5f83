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
	"strconv"
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

// kubeJob is what the test reads from the example Kubernetes manifest.
type kubeJob struct {
	completions int
	workingDir  string
	command     []string
	env         map[string]string
}

func readKubeJob(t *testing.T, path string) kubeJob {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	j := kubeJob{env: map[string]string{}}
	lines := strings.Split(string(b), "\n")
	for i, l := range lines {
		l = strings.TrimSpace(l)
		switch {
		case strings.HasPrefix(l, "completions:"):
			j.completions, _ = strconv.Atoi(strings.TrimSpace(strings.TrimPrefix(l, "completions:")))
		case strings.HasPrefix(l, "workingDir:"):
			j.workingDir = strings.TrimSpace(strings.TrimPrefix(l, "workingDir:"))
		case strings.HasPrefix(l, "command:"):
			// A flow sequence of double-quoted strings is also JSON.
			if err := json.Unmarshal([]byte(strings.TrimPrefix(l, "command:")), &j.command); err != nil {
				t.Fatalf("%s: command: %v", path, err)
			}
		case strings.HasPrefix(l, "- name: ") && i+1 < len(lines):
			v := strings.TrimSpace(lines[i+1])
			if strings.HasPrefix(v, "value:") {
				j.env[strings.TrimPrefix(l, "- name: ")], _ = strconv.Unquote(strings.TrimSpace(strings.TrimPrefix(v, "value:")))
			}
		}
	}
	if j.completions < 2 || len(j.command) < 2 || j.command[0] != "clatter" || j.env["CLATTER_SHARD_COUNT"] != strconv.Itoa(j.completions) {
		t.Fatalf("%s: %+v: want an Indexed Job of clatter with CLATTER_SHARD_COUNT equal to its completions", path, j)
	}
	return j
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

func TestKubernetesExample(t *testing.T) {
	// The shipped Indexed Job, run as Kubernetes would run its pods: one
	// process per index 0..completions-1 with JOB_COMPLETION_INDEX set and
	// the container's env, $(VAR) in the command expanded from them, in
	// the working directory on the shared volume. Then the shards merged
	// as its comment says: the single run's folder, byte for byte.
	ref := reference(t)
	job := readKubeJob(t, "../../deploy/kubernetes/sweep-job.yaml")
	data := dataDir(t)
	if job.workingDir != "/data" {
		t.Fatalf("workingDir %q, want the volume /data", job.workingDir)
	}
	var shards []string
	for i := 0; i < job.completions; i++ {
		env := map[string]string{"JOB_COMPLETION_INDEX": strconv.Itoa(i)}
		for k, v := range job.env {
			env[k] = v
		}
		var args []string
		for _, a := range job.command[1:] {
			args = append(args, regexp.MustCompile(`\$\(([A-Z_]+)\)`).ReplaceAllStringFunc(a, func(m string) string { return env[m[2:len(m)-1]] }))
		}
		var envList []string
		for k, v := range env {
			envList = append(envList, k+"="+v)
		}
		out, err := asProcess(t, data, envList, args...).CombinedOutput()
		if err != nil {
			t.Fatalf("pod %d: clatter %v: %v\n%s", i, args, err, out)
		}
		shards = append(shards, filepath.Join(data, "results", fmt.Sprintf("shard-%d", i)))
	}
	all := filepath.Join(data, "results", "all")
	if _, errs, code := clatter(t, append(append([]string{"merge"}, shards...), "-o", all, "--quiet")...); code != exitOK {
		t.Fatalf("merge: exit %d\n%s", code, errs)
	}
	sameDirs(t, "Kubernetes shards merged", ref, all)
}

func TestSlurmExample(t *testing.T) {
	// The shipped batch script, run by bash as Slurm would run each task of
	// its #SBATCH --array=A-B: SLURM_ARRAY_TASK_ID from A to B with _COUNT,
	// _MIN, _MAX, _STEP and SLURM_CPUS_PER_TASK set, clatter on the PATH,
	// in the folder it was submitted from. Then merged as its comment says.
	ref := reference(t)
	bash, err := exec.LookPath("bash")
	if err != nil {
		t.Skip("no bash to run the batch script")
	}
	script, _ := filepath.Abs("../../deploy/slurm/sweep.sbatch")
	b, err := os.ReadFile(script)
	if err != nil {
		t.Fatal(err)
	}
	m := regexp.MustCompile(`(?m)^#SBATCH --array=(\d+)-(\d+)$`).FindSubmatch(b)
	cpus := regexp.MustCompile(`(?m)^#SBATCH --cpus-per-task=(\d+)$`).FindSubmatch(b)
	if m == nil || cpus == nil {
		t.Fatalf("%s has no #SBATCH --array=A-B and --cpus-per-task", script)
	}
	lo, _ := strconv.Atoi(string(m[1]))
	hi, _ := strconv.Atoi(string(m[2]))
	bin := t.TempDir()
	self, _ := os.Executable()
	if err := os.Symlink(self, filepath.Join(bin, "clatter")); err != nil {
		t.Fatal(err)
	}
	data := dataDir(t)
	var shards []string
	for id := lo; id <= hi; id++ {
		c := exec.Command(bash, script)
		c.Dir = data
		c.Env = append(os.Environ(), asMain+"=1", "PATH="+bin+string(os.PathListSeparator)+os.Getenv("PATH"),
			"SLURM_ARRAY_JOB_ID=1000", fmt.Sprintf("SLURM_ARRAY_TASK_ID=%d", id), fmt.Sprintf("SLURM_ARRAY_TASK_COUNT=%d", hi-lo+1),
			fmt.Sprintf("SLURM_ARRAY_TASK_MIN=%d", lo), fmt.Sprintf("SLURM_ARRAY_TASK_MAX=%d", hi), "SLURM_ARRAY_TASK_STEP=1",
			"SLURM_CPUS_PER_TASK="+string(cpus[1]))
		if out, err := c.CombinedOutput(); err != nil {
			t.Fatalf("task %d: %v\n%s", id, err, out)
		}
		shards = append(shards, filepath.Join(data, "results", fmt.Sprintf("shard-%d", id)))
	}
	all := filepath.Join(data, "results", "all")
	if _, errs, code := clatter(t, append(append([]string{"merge"}, shards...), "-o", all, "--quiet")...); code != exitOK {
		t.Fatalf("merge: exit %d\n%s", code, errs)
	}
	sameDirs(t, "Slurm shards merged", ref, all)
	// Merging a shard of another scene is refused with exit 2.
	other := filepath.Join(data, "sweeps", "other.toml")
	os.WriteFile(other, bytes.Replace(b0(t), []byte("seed = 7"), []byte("seed = 8"), 1), 0o644)
	odir := filepath.Join(data, "results", "other-shard-1")
	if _, errs, code := clatter(t, "sweep", other, "-o", odir, "--shard", fmt.Sprintf("1/%d", hi-lo+1), "--quiet"); code != exitOK {
		t.Fatalf("other sweep: %s", errs)
	}
	_, errs, code := clatter(t, append(append([]string{"merge", odir}, shards[1:]...), "-o", filepath.Join(data, "bad"), "--quiet")...)
	if code != exitBad || !strings.Contains(errs, "its seed is 7, not 8") {
		t.Errorf("merging shards of two studies: exit %d, %s", code, errs)
	}
}

func b0(t *testing.T) []byte {
	t.Helper()
	b, err := os.ReadFile(exampleSweep)
	if err != nil {
		t.Fatal(err)
	}
	return b
}
