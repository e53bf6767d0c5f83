package main

import (
	"bytes"
	"debug/elf"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"runtime"
	"strconv"
	"strings"
	"testing"

	"gopkg.in/yaml.v3"
)

// The Kubernetes objects of deploy/kubernetes, as far as the tests read
// them: the fields the API server requires of a Job with a pod failure
// policy (batch/v1, Kubernetes API reference) and of a volume claim.
type kubeDoc struct {
	APIVersion string `yaml:"apiVersion"`
	Kind       string `yaml:"kind"`
	Metadata   struct {
		Name string `yaml:"name"`
	} `yaml:"metadata"`
	Spec struct {
		// PersistentVolumeClaim
		AccessModes []string `yaml:"accessModes"`
		// Job
		CompletionMode       string `yaml:"completionMode"`
		Completions          *int   `yaml:"completions"`
		Parallelism          *int   `yaml:"parallelism"`
		BackoffLimit         *int   `yaml:"backoffLimit"`
		BackoffLimitPerIndex *int   `yaml:"backoffLimitPerIndex"`
		PodFailurePolicy     *struct {
			Rules []struct {
				Action      string `yaml:"action"`
				OnExitCodes *struct {
					ContainerName string `yaml:"containerName"`
					Operator      string `yaml:"operator"`
					Values        []int  `yaml:"values"`
				} `yaml:"onExitCodes"`
				OnPodConditions []struct {
					Type string `yaml:"type"`
				} `yaml:"onPodConditions"`
			} `yaml:"rules"`
		} `yaml:"podFailurePolicy"`
		Template struct {
			Spec struct {
				RestartPolicy string `yaml:"restartPolicy"`
				Containers    []struct {
					Name       string   `yaml:"name"`
					Image      string   `yaml:"image"`
					WorkingDir string   `yaml:"workingDir"`
					Command    []string `yaml:"command"`
					Env        []struct {
						Name  string `yaml:"name"`
						Value string `yaml:"value"`
					} `yaml:"env"`
					VolumeMounts []struct {
						Name      string `yaml:"name"`
						MountPath string `yaml:"mountPath"`
					} `yaml:"volumeMounts"`
				} `yaml:"containers"`
				Volumes []struct {
					Name string `yaml:"name"`
					PVC  *struct {
						ClaimName string `yaml:"claimName"`
					} `yaml:"persistentVolumeClaim"`
				} `yaml:"volumes"`
			} `yaml:"spec"`
		} `yaml:"template"`
	} `yaml:"spec"`
}

// readKube parses every document of a manifest.
func readKube(t *testing.T, path string) []kubeDoc {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	dec := yaml.NewDecoder(bytes.NewReader(b))
	var docs []kubeDoc
	for {
		var d kubeDoc
		if err := dec.Decode(&d); err != nil {
			if errors.Is(err, io.EOF) {
				break
			}
			t.Fatalf("%s: %v", path, err)
		}
		docs = append(docs, d)
	}
	return docs
}

// checkJob checks what the API server requires of a Job with a pod
// failure policy.
func checkJob(t *testing.T, path string, d kubeDoc, claims map[string]bool) {
	t.Helper()
	s := d.Spec
	ps := s.Template.Spec
	if d.APIVersion != "batch/v1" || d.Metadata.Name == "" || len(ps.Containers) != 1 {
		t.Fatalf("%s: Job %q: want batch/v1, a name and one container", path, d.Metadata.Name)
	}
	c := ps.Containers[0]
	if c.Name == "" || c.Image == "" || len(c.Command) < 2 || c.Command[0] != "clatter" {
		t.Errorf("%s: container %+v: want a name, an image and a clatter command", path, c)
	}
	// A pod failure policy requires restartPolicy Never (the API server
	// refuses OnFailure with it); FailIndex requires backoffLimitPerIndex.
	if s.PodFailurePolicy == nil || ps.RestartPolicy != "Never" {
		t.Errorf("%s: Job %s: want a podFailurePolicy and restartPolicy Never, got %q", path, d.Metadata.Name, ps.RestartPolicy)
		return
	}
	for _, r := range s.PodFailurePolicy.Rules {
		switch r.Action {
		case "FailJob", "Ignore", "Count":
		case "FailIndex":
			if s.BackoffLimitPerIndex == nil {
				t.Errorf("%s: FailIndex needs backoffLimitPerIndex", path)
			}
		default:
			t.Errorf("%s: unknown action %q", path, r.Action)
		}
		if (r.OnExitCodes == nil) == (len(r.OnPodConditions) == 0) {
			t.Errorf("%s: a rule needs onExitCodes or onPodConditions, one of them", path)
		}
		if e := r.OnExitCodes; e != nil {
			if e.ContainerName != c.Name || (e.Operator != "In" && e.Operator != "NotIn") || len(e.Values) == 0 {
				t.Errorf("%s: onExitCodes %+v: want the container %q, In or NotIn, and values", path, e, c.Name)
			}
			for _, v := range e.Values {
				if v == 0 && e.Operator == "In" {
					t.Errorf("%s: exit code 0 is not allowed with In", path)
				}
			}
		}
	}
	mounted := map[string]bool{}
	for _, m := range c.VolumeMounts {
		mounted[m.Name] = m.MountPath == c.WorkingDir
	}
	for _, v := range ps.Volumes {
		if v.PVC == nil || !claims[v.PVC.ClaimName] || !mounted[v.Name] {
			t.Errorf("%s: volume %q: want a claim with access mode ReadWriteMany, mounted at the working directory %s", path, v.Name, c.WorkingDir)
		}
	}
}

// policyAction is what a Job does with a pod whose container exited with
// code: the action of the first rule that matches, else "Count" (a retry
// counted against the backoff limit).
func policyAction(d kubeDoc, code int) string {
	for _, r := range d.Spec.PodFailurePolicy.Rules {
		if e := r.OnExitCodes; e != nil {
			in := false
			for _, v := range e.Values {
				in = in || v == code
			}
			if in == (e.Operator == "In") {
				return r.Action
			}
		}
	}
	return "Count"
}

// podArgs expands $(VAR) in a container's command from env, as the
// kubelet does.
func podArgs(command []string, env map[string]string) []string {
	var args []string
	for _, a := range command[1:] {
		args = append(args, regexp.MustCompile(`\$\(([A-Z_]+)\)`).ReplaceAllStringFunc(a, func(m string) string { return env[m[2:len(m)-1]] }))
	}
	return args
}

func TestKubernetesExample(t *testing.T) {
	// The shipped manifests, read by a YAML parser and checked against
	// what the API server requires; the Indexed Job's pods run as
	// Kubernetes would run them (one process per index with
	// JOB_COMPLETION_INDEX and the container's env, $(VAR) expanded, in
	// the working directory on the shared volume); then the merge Job's
	// pod: the single run's folder, byte for byte.
	ref := reference(t)
	sweepDocs := readKube(t, "../../deploy/kubernetes/sweep-job.yaml")
	mergeDocs := readKube(t, "../../deploy/kubernetes/merge-job.yaml")
	if len(sweepDocs) != 2 || sweepDocs[0].Kind != "PersistentVolumeClaim" || sweepDocs[1].Kind != "Job" || len(mergeDocs) != 1 || mergeDocs[0].Kind != "Job" {
		t.Fatalf("want a claim and the sweep Job, then the merge Job")
	}
	claim, job, merge := sweepDocs[0], sweepDocs[1], mergeDocs[0]
	if len(claim.Spec.AccessModes) != 1 || claim.Spec.AccessModes[0] != "ReadWriteMany" {
		t.Errorf("the claim's access modes are %v; pods on several nodes write to it: want ReadWriteMany", claim.Spec.AccessModes)
	}
	claims := map[string]bool{claim.Metadata.Name: true}
	checkJob(t, "sweep-job.yaml", job, claims)
	checkJob(t, "merge-job.yaml", merge, claims)
	s := job.Spec
	c := s.Template.Spec.Containers[0]
	env := map[string]string{}
	for _, e := range c.Env {
		env[e.Name] = e.Value
	}
	if s.CompletionMode != "Indexed" || s.Completions == nil || *s.Completions < 2 || s.Parallelism == nil || env["CLATTER_SHARD_COUNT"] != strconv.Itoa(*s.Completions) {
		t.Fatalf("want an Indexed Job with CLATTER_SHARD_COUNT equal to its completions")
	}
	// What the Job does with each exit code (README): an interrupted shard
	// is retried, a finished shard with failed trials is not, bad input and
	// internal errors fail the Job.
	for code, want := range map[int]string{exitFailed: "Count", exitBad: "FailJob", exitTrials: "FailIndex", exitInternal: "FailJob"} {
		if got := policyAction(job, code); got != want {
			t.Errorf("sweep Job, exit %d: %s, want %s", code, got, want)
		}
	}
	for code, want := range map[int]string{exitFailed: "Count", exitBad: "FailJob", exitTrials: "FailJob", exitInternal: "FailJob"} {
		if got := policyAction(merge, code); got != want {
			t.Errorf("merge Job, exit %d: %s, want %s", code, got, want)
		}
	}

	data := dataDir(t)
	if c.WorkingDir != "/data" || merge.Spec.Template.Spec.Containers[0].WorkingDir != "/data" {
		t.Fatalf("workingDir %q, want the volume /data", c.WorkingDir)
	}
	for i := 0; i < *s.Completions; i++ {
		penv := map[string]string{"JOB_COMPLETION_INDEX": strconv.Itoa(i)}
		var envList []string
		for k, v := range env {
			penv[k] = v
		}
		for k, v := range penv {
			envList = append(envList, k+"="+v)
		}
		args := podArgs(c.Command, penv)
		if out, err := asProcess(t, data, envList, args...).CombinedOutput(); err != nil {
			t.Fatalf("pod %d: clatter %v: %v\n%s", i, args, err, out)
		}
	}
	margs := podArgs(merge.Spec.Template.Spec.Containers[0].Command, nil)
	if out, err := asProcess(t, data, nil, margs...).CombinedOutput(); err != nil {
		t.Fatalf("merge pod: clatter %v: %v\n%s", margs, err, out)
	}
	sameDirs(t, "Kubernetes shards merged by the merge Job", ref, filepath.Join(data, "results", "all"))
}

func TestSlurmExample(t *testing.T) {
	// The shipped batch script, run by bash as Slurm would run each task of
	// its #SBATCH --array=A-B: SLURM_ARRAY_TASK_ID from A to B with _COUNT,
	// _MIN, _MAX, _STEP and SLURM_CPUS_PER_TASK set, clatter on the PATH,
	// in the folder it was submitted from. Then one task run again alone as
	// the script's recipe says (sbatch --array=3: a one-task array, id 3),
	// which must be shard 3 again, and the shards merged as the comment says.
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
	if !bytes.Contains(b, []byte("sbatch --array=3 sweep.sbatch")) || !bytes.Contains(b, []byte("--dependency=afterany:")) {
		t.Errorf("%s: want the rerun recipe sbatch --array=3 and a merge after any end of the tasks", script)
	}
	lo, _ := strconv.Atoi(string(m[1]))
	hi, _ := strconv.Atoi(string(m[2]))
	bin := t.TempDir()
	self, _ := os.Executable()
	if err := os.Symlink(self, filepath.Join(bin, "clatter")); err != nil {
		t.Fatal(err)
	}
	data := dataDir(t)
	task := func(id, min, max int) {
		t.Helper()
		c := exec.Command(bash, script)
		c.Dir = data
		c.Env = append(os.Environ(), asMain+"=1", "PATH="+bin+string(os.PathListSeparator)+os.Getenv("PATH"),
			"SLURM_ARRAY_JOB_ID=1000", fmt.Sprintf("SLURM_ARRAY_TASK_ID=%d", id), fmt.Sprintf("SLURM_ARRAY_TASK_COUNT=%d", max-min+1),
			fmt.Sprintf("SLURM_ARRAY_TASK_MIN=%d", min), fmt.Sprintf("SLURM_ARRAY_TASK_MAX=%d", max), "SLURM_ARRAY_TASK_STEP=1",
			"SLURM_CPUS_PER_TASK="+string(cpus[1]))
		if out, err := c.CombinedOutput(); err != nil {
			t.Fatalf("task %d of %d-%d: %v\n%s", id, min, max, err, out)
		}
	}
	var shards []string
	for id := lo; id <= hi; id++ {
		task(id, lo, hi)
		shards = append(shards, filepath.Join(data, "results", fmt.Sprintf("shard-%d", id)))
	}
	// Task 3 lost its folder; the recipe runs it again alone.
	os.RemoveAll(shards[2])
	task(3, 3, 3)
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

func TestContainerfileBuildsStatic(t *testing.T) {
	// The image recipe's build step, run as written: it must give a static
	// binary (an ELF file without a program interpreter, which the empty
	// final image could not provide) of the command.
	if testing.Short() || runtime.GOOS != "linux" {
		t.Skip("builds the command; linux only")
	}
	b, err := os.ReadFile("../../deploy/Containerfile")
	if err != nil {
		t.Fatal(err)
	}
	m := regexp.MustCompile(`(?m)^RUN (CGO_ENABLED=0 go build .*-o )(\S+)( ./cmd/clatter)$`).FindSubmatch(b)
	if m == nil || !bytes.Contains(b, []byte("\nFROM scratch\n")) {
		t.Fatalf("Containerfile: want RUN CGO_ENABLED=0 go build ... -o PATH ./cmd/clatter and a FROM scratch stage")
	}
	out := filepath.Join(t.TempDir(), "clatter")
	fields := strings.Fields(string(m[1]) + out + string(m[3]))
	cmd := exec.Command("go", fields[2:]...)
	cmd.Dir = "../.."
	cmd.Env = append(os.Environ(), fields[0])
	if o, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("%v: %v\n%s", fields, err, o)
	}
	f, err := elf.Open(out)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	for _, p := range f.Progs {
		if p.Type == elf.PT_INTERP {
			t.Errorf("the binary asks for a program interpreter: it is not static")
		}
	}
}
