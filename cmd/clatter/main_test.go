package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// clatter runs the command in-process, as the binary's main does, and
// returns what it printed and its exit code.
func clatter(t *testing.T, args ...string) (stdout, stderr string, code int) {
	t.Helper()
	var o, e bytes.Buffer
	code = run(context.Background(), args, &o, &e)
	return o.String(), e.String(), code
}

// mustRun runs a scene into a temporary folder and returns the folder.
func mustRun(t *testing.T, scenePath string, extra ...string) string {
	t.Helper()
	dir := t.TempDir()
	args := append([]string{"run", scenePath, "-o", dir, "--quiet"}, extra...)
	out, errs, code := clatter(t, args...)
	if code != exitOK {
		t.Fatalf("clatter %s: exit %d\nstdout:\n%s\nstderr:\n%s", strings.Join(args, " "), code, out, errs)
	}
	return dir
}

// summaryDoc is the part of summary.json the tests read.
type summaryDoc struct {
	Units     map[string]string `json:"units"`
	Time      float64           `json:"time"`
	Steps     int               `json:"steps"`
	Settled   bool              `json:"settled"`
	SettledAt *float64          `json:"settled_at"`
	Bodies    []struct {
		Name           string     `json:"name"`
		Position       [3]float64 `json:"position"`
		Orientation    [4]float64 `json:"orientation"`
		Velocity       [3]float64 `json:"velocity"`
		Spin           [3]float64 `json:"spin"`
		RestingFace    *int       `json:"resting_face"`
		MaxImpactSpeed float64    `json:"max_impact_speed"`
	} `json:"bodies"`
	Energy struct {
		Initial, Final float64
	} `json:"energy"`
	Momentum struct {
		Linear struct {
			Initial, Final [3]float64
		} `json:"linear"`
	} `json:"momentum"`
	Joints []struct {
		Name      string   `json:"name"`
		Kind      string   `json:"kind"`
		Position  *float64 `json:"position"`
		Speed     *float64 `json:"speed"`
		MaxForce  float64  `json:"max_force"`
		MaxTorque float64  `json:"max_torque"`
	} `json:"joints"`
	Error string `json:"error"`
}

func readSummary(t *testing.T, dir string) summaryDoc {
	t.Helper()
	var s summaryDoc
	readJSON(t, filepath.Join(dir, "summary.json"), &s)
	return s
}

// row is one line of trajectory.csv.
type row struct {
	t    float64
	body string
	v    [13]float64 // x y z qw qx qy qz vx vy vz wx wy wz
}

func readTrajectory(t *testing.T, dir string) (string, []row) {
	t.Helper()
	f, err := os.Open(filepath.Join(dir, "trajectory.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	sc.Scan()
	header := sc.Text()
	var rows []row
	for sc.Scan() {
		fields := strings.Split(sc.Text(), ",")
		if len(fields) != 15 {
			t.Fatalf("trajectory row has %d fields: %q", len(fields), sc.Text())
		}
		var r row
		r.t = parseFloat(t, fields[0])
		r.body = fields[1]
		for i := range r.v {
			r.v[i] = parseFloat(t, fields[2+i])
		}
		rows = append(rows, r)
	}
	return header, rows
}

type eventDoc struct {
	Time        float64    `json:"time"`
	Event       string     `json:"event"`
	Body        string     `json:"body"`
	Bodies      []string   `json:"bodies"`
	Point       [3]float64 `json:"point"`
	NormalSpeed float64    `json:"normal_speed"`
	Impulse     float64    `json:"impulse"`
	Message     string     `json:"message"`
}

func readEvents(t *testing.T, dir string) []eventDoc {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, "events.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	var evs []eventDoc
	for i, line := range strings.Split(strings.TrimSpace(string(b)), "\n") {
		if line == "" {
			continue
		}
		var e eventDoc
		if err := json.Unmarshal([]byte(line), &e); err != nil {
			t.Fatalf("events.jsonl line %d: %v: %q", i+1, err, line)
		}
		evs = append(evs, e)
	}
	return evs
}
