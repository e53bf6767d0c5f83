package page

import (
	_ "embed"
	"encoding/base64"
	"encoding/csv"
	"errors"
	"fmt"
	"html/template"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
)

// File is the name of the page.
const File = "report.html"

// maxRows is the most rows of a table shown in the page; the CSV file
// beside it has them all.
const maxRows = 200

//go:embed player.js
var player string

// Caution is the safety note every page carries.
const Caution = "Simulation informs design; it does not replace the physical tests that packaging and stability " +
	"standards and local codes require. Results that protect people or goods need review by a qualified engineer."

type table struct {
	Name   string
	Note   string // what the table is
	Head   []string
	Rows   [][]string
	Hidden int  // rows left out
	Open   bool // shown unfolded
}

// notes say what each table is; tables named here come first, in this
// order, unfolded; the long ones (trials, trajectory) come folded.
var notes = []struct{ file, note string }{
	// A drop study's answer is its drops table; its face counts come after.
	{"drops.csv", "each drop's impacts and outcome"},
	{"cases.csv", "each case's count of trials resting on each face, and its fraction with the 95 percent Wilson interval (the quasi-static probabilities are in the plots and the printed table)"},
	{"failures.csv", "trials whose simulation failed, and why"},
	{"gate-cases.csv", "each gate's counts by face down, their share of the gate's crossings with the 95 percent Wilson interval, and the crossings per minute"},
	{"face-down.csv", "each case's count of trials ending with each face down, settled or not"},
	{"crossings.csv", "each crossing of a gate in every trial"},
	{"gates.csv", "each crossing of a gate"},
	{"joints.csv", "the force and torque each joint carried at each sample"},
	{"trials.csv", "the final state of every trial"},
	{"trajectory.csv", "every moving body's state at each sample"},
}

type picture struct {
	Name string
	URI  template.URL // a data URI of a PNG the tool wrote
}

type content struct {
	Title     string
	Caution   string
	Summary   string  // the JSON files, as they are
	Summaries []table // a run's summary
	Lead      []table // the tables of results shown first
	Tables    []table // the long tables, folded
	Study     []table // a study's description
	Images    []picture
	GLB       string
	Player    template.JS
	HasMotion bool
}

// Write writes dir/report.html from the files in dir and returns its path.
func Write(dir string) (string, error) {
	c, err := readFolder(dir)
	if err != nil {
		return "", err
	}
	c.arrange()
	out := filepath.Join(dir, File)
	f, err := os.Create(out)
	if err != nil {
		return "", err
	}
	if err := pageTemplate.Execute(f, c); err != nil {
		f.Close()
		return "", err
	}
	return out, f.Close()
}

// readFolder reads the files of a run's or study's folder, in the order of
// their names, into the page's content.
func readFolder(dir string) (*content, error) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, err
	}
	c := &content{Title: filepath.Base(filepath.Clean(dir)), Caution: Caution, Player: template.JS(player)}
	var names []string
	for _, e := range entries {
		if e.Type().IsRegular() {
			names = append(names, e.Name())
		}
	}
	sort.Strings(names)
	found := false
	for _, n := range names {
		isSummary, err := c.add(dir, n)
		if err != nil {
			return nil, err
		}
		found = found || isSummary
	}
	if !found {
		return nil, fmt.Errorf("%s holds neither summary.json (clatter run) nor sweep.json (clatter sweep): give the folder a run or a study wrote", dir)
	}
	return c, nil
}

// add puts file n of folder dir on the page if it is one the page shows,
// and reports whether it was a summary (summary.json or sweep.json).
func (c *content) add(dir, n string) (bool, error) {
	p := filepath.Join(dir, n)
	switch {
	case n == "summary.json" || n == "sweep.json":
		ts, raw, err := summaryTables(p)
		if err != nil {
			return false, fmt.Errorf("%s: %v", p, err)
		}
		if n == "sweep.json" {
			// A study's description is reference: folded, after its results.
			for i := range ts {
				ts[i].Open = false
			}
			c.Study = append(c.Study, ts...)
		} else {
			c.Summaries = append(c.Summaries, ts...)
		}
		c.Summary += n + "\n" + raw + "\n"
		return true, nil
	case strings.HasSuffix(n, ".csv"):
		t, err := readTable(p)
		if err != nil {
			return false, fmt.Errorf("%s: %v", p, err)
		}
		c.Tables = append(c.Tables, t)
	case strings.HasSuffix(n, ".png"):
		b, err := os.ReadFile(p)
		if err != nil {
			return false, err
		}
		c.Images = append(c.Images, picture{n, template.URL("data:image/png;base64," + base64.StdEncoding.EncodeToString(b))})
	case n == "animation.glb":
		b, err := os.ReadFile(p)
		if err != nil {
			return false, err
		}
		c.GLB, c.HasMotion = base64.StdEncoding.EncodeToString(b), true
	}
	return false, nil
}

// arrange orders the tables by the notes (the first four of them lead the
// page, and long tables other than those start folded) and the pictures of
// the run before the plots.
func (c *content) arrange() {
	rank := func(name string) int {
		for i, n := range notes {
			if n.file == name {
				return i
			}
		}
		return len(notes)
	}
	sort.SliceStable(c.Tables, func(i, j int) bool { return rank(c.Tables[i].Name) < rank(c.Tables[j].Name) })
	for i := range c.Tables {
		t := &c.Tables[i]
		if r := rank(t.Name); r < len(notes) {
			t.Note = notes[r].note
		}
		t.Open = rank(t.Name) < 4 || len(t.Rows) <= 20
	}
	for len(c.Tables) > 0 && rank(c.Tables[0].Name) < 4 {
		c.Lead, c.Tables = append(c.Lead, c.Tables[0]), c.Tables[1:]
	}
	// Pictures of the run first (start before end), then the plots.
	order := map[string]int{"start.png": 0, "end.png": 1}
	sort.SliceStable(c.Images, func(i, j int) bool {
		a, ok := order[c.Images[i].Name]
		if !ok {
			a = 2
		}
		b, ok := order[c.Images[j].Name]
		if !ok {
			b = 2
		}
		return a < b
	})
}

func readTable(path string) (table, error) {
	f, err := os.Open(path)
	if err != nil {
		return table{}, err
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.FieldsPerRecord = -1
	t := table{Name: filepath.Base(path)}
	for {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return t, err
		}
		switch {
		case t.Head == nil:
			t.Head = rec
		case len(t.Rows) < maxRows:
			for i, v := range rec {
				rec[i] = shortNumber(v)
			}
			t.Rows = append(t.Rows, rec)
		default:
			t.Hidden++
		}
	}
	return t, nil
}

// shortNumber writes a number of the result files with 6 significant
// digits, enough to read; the files keep all 12.
func shortNumber(s string) string {
	if !strings.ContainsAny(s, ".eE") {
		return s
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return s
	}
	return strconv.FormatFloat(x, 'g', 6, 64)
}

var pageTemplate = template.Must(template.New("page").Parse(`<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<title>{{.Title}}: clatter report</title>
<style>
body{font-family:system-ui,sans-serif;margin:1.5em;color:#222;max-width:1100px}
h1{font-size:1.5em}h2{font-size:1.15em;margin-top:1.6em}
.caution{border-left:4px solid #d55e00;background:#fff4ec;padding:.6em 1em}
table{border-collapse:collapse;font-size:.85em;margin:.4em 0}
th,td{border:1px solid #ccc;padding:.2em .5em;text-align:right}th{background:#eef}
img{max-width:100%;border:1px solid #ddd;margin:.4em 0}
pre{background:#f6f6f6;padding:.6em;max-height:24em;overflow:auto;font-size:.8em}
canvas{border:1px solid #ccc;background:#f4f4f6;max-width:100%}
details{margin:.8em 0}summary{cursor:pointer}.wide{overflow-x:auto}
td:first-child,th:first-child{text-align:left}
</style></head><body>
<h1>{{.Title}}</h1>
<p class="caution">{{.Caution}}</p>
{{if .HasMotion}}<h2>Motion</h2>
<canvas id="motion" width="800" height="500"></canvas>
<div><button id="play">Play</button> <input id="time" type="range" min="0" value="0" style="width:70%"></div>
{{end}}
{{if .Study}}<p>To watch one trial: <code>clatter sweep SCENE.toml --replay CASE/TRIAL -o DIR --animation --pictures</code>, then <code>clatter report DIR</code> (CASE and TRIAL are the first two columns of trials.csv).</p>{{end}}
{{range .Summaries}}{{template "table" .}}{{end}}
{{range .Lead}}{{template "table" .}}{{end}}
{{range .Images}}<h2>{{.Name}}</h2><img alt="{{.Name}}" src="{{.URI}}">
{{end}}
{{range .Tables}}{{template "table" .}}{{end}}
{{range .Study}}{{template "table" .}}{{end}}
<details><summary>The result files as written</summary><pre>{{.Summary}}</pre></details>
{{if .HasMotion}}<div id="glb" hidden>{{.GLB}}</div>
<script>{{.Player}}</script>{{end}}
</body></html>
{{define "table"}}<details{{if .Open}} open{{end}}><summary><b>{{.Name}}</b>{{if .Note}}: {{.Note}}{{end}}</summary>
<div class="wide"><table><thead><tr>{{range .Head}}<th>{{.}}</th>{{end}}</tr></thead><tbody>
{{range .Rows}}<tr>{{range .}}<td>{{.}}</td>{{end}}</tr>
{{end}}</tbody></table></div>{{if .Hidden}}<p>... and {{.Hidden}} more rows in {{.Name}}.</p>{{end}}</details>
{{end}}`))
