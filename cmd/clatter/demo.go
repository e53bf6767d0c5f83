package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"sort"
	"strings"
	"text/tabwriter"

	"clatter/engine/demo"
)

var cmdDemo = &command{
	name:    "demo",
	summary: "run the built-in example study and print its results",
	usage:   "clatter demo [-o DIR] [--quiet]",
	help: `
Runs the example study built into clatter, an invented scenario: a moulded
L-bracket (40 x 20 x 35 mm, ABS) drops onto a steel chute, slides off its
end and falls about 60 mm onto a tray. For three values of the tray's
friction and eight starting orientations it reports the face the part comes
to rest on (numbered as clatter inspect numbers them) and how long it takes
to settle.

It writes into DIR (default clatter-demo): the scene (chute.toml) and its
part (bracket.stl), so that you can run and change them with clatter run;
results.csv with a row per run; and runs/*/ with each run's summary.json,
trajectory.csv, events.jsonl, pictures of its start and end (start.png,
end.png) and its motion (animation.glb; clatter report runs/NAME shows it).

Options:
  -o DIR        where to write (default clatter-demo)
  --quiet, -q   no progress bar or informational messages`,
}

func runDemo(e *env, args []string) int {
	fs := newFlags(e, cmdDemo)
	dir := fs.String("o", "clatter-demo", "")
	pos, code := parse(e, cmdDemo, fs, args)
	if code >= 0 {
		return code
	}
	if len(pos) > 0 {
		e.errorf("demo takes no arguments, got %q", pos[0])
		return exitBad
	}
	if *dir == "" {
		e.errorf("demo: -o needs a folder")
		return exitBad
	}
	if err := writableDir(*dir); err != nil {
		e.errorf("demo: -o %s: cannot write into the output folder: %v; choose another folder with -o", *dir, err)
		return exitBad
	}
	p := newProgress(e, "demo")
	st, err := demo.Run(e.ctx, *dir, p.update)
	p.done()
	if errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
		e.errorf("demo: interrupted; the runs finished so far are in %s", *dir)
		return exitFailed
	}
	if err != nil {
		e.errorf("demo: %v", err)
		return exitFailed
	}
	writeDemoTable(e.stdout, st)
	for _, r := range st.Rows {
		if r.Err != "" {
			e.errorf("demo: a run failed: %s", r.Err)
			return exitFailed
		}
	}
	return exitOK
}

func writeDemoTable(w io.Writer, st *demo.Study) {
	fmt.Fprintln(w, "Demo study (an invented scenario): a moulded L-bracket, 40 x 20 x 35 mm in ABS, drops onto a")
	fmt.Fprintln(w, "steel chute, slides off it and falls about 60 mm onto a tray. Which face does it come to rest")
	fmt.Fprintln(w, "on, and how long does it rattle, as the tray's friction changes?")
	fmt.Fprintln(w)
	used := writeDemoRuns(w, st)
	fmt.Fprintln(w)
	fmt.Fprintln(w, "by tray friction: resting faces (count) and mean time to settle")
	for _, mu := range demo.Frictions {
		fmt.Fprintf(w, "  %-5g %s\n", mu, demoFriction(st, mu))
	}
	fmt.Fprintln(w)
	writeDemoFaces(w, st, used)
	fmt.Fprintf(w, "files in %s: %s and %s (the scene and its part), results.csv, runs/*/ (each run's results,\n",
		st.Dir, demo.SceneFile, demo.PartFile)
	fmt.Fprintln(w, "  with start.png and end.png, pictures of its start and end, and its motion in animation.glb)")
	fmt.Fprintf(w, "try: clatter run %s -o %s\n", filepath.Join(st.Dir, demo.SceneFile), filepath.Join(st.Dir, "single"))
	fmt.Fprintln(w, "     clatter inspect "+filepath.Join(st.Dir, demo.PartFile)+" --units mm --density \"1.05 g/cm3\"")
	if len(st.Rows) > 0 {
		fmt.Fprintln(w, "     clatter report "+st.Rows[0].Dir+"    (a page with the run's tables, pictures and motion)")
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, safetyNote)
}

// writeDemoRuns writes the table of the demo's runs and returns the faces
// the part came to rest on.
func writeDemoRuns(w io.Writer, st *demo.Study) map[int]bool {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "tray friction\tstart (seed)\tresting face\tsettled after (s)\tlargest impact (mm/s)")
	used := map[int]bool{}
	for _, r := range st.Rows {
		face, at := "-", "not settled"
		if r.Face >= 0 {
			face = fmt.Sprint(r.Face)
			used[r.Face] = true
		}
		if r.SettledAt >= 0 {
			at = fmt.Sprintf("%.3f", r.SettledAt)
		}
		if r.Err != "" {
			at = "failed"
		}
		fmt.Fprintf(tw, "%g\t%d\t%s\t%s\t%.0f\n", r.Friction, r.Seed, face, at, r.MaxImpact)
	}
	tw.Flush()
	return used
}

// demoFriction sums up the demo's runs at tray friction mu: the resting
// faces with their counts and the mean time to settle.
func demoFriction(st *demo.Study, mu float64) string {
	counts := map[int]int{}
	sum, n := 0.0, 0
	for _, r := range st.Rows {
		if r.Friction != mu {
			continue
		}
		counts[r.Face]++
		if r.SettledAt >= 0 {
			sum += r.SettledAt
			n++
		}
	}
	var keys []int
	for k := range counts {
		keys = append(keys, k)
	}
	sort.Ints(keys)
	var parts []string
	for _, k := range keys {
		name := fmt.Sprintf("face %d", k)
		if k < 0 {
			name = "no face"
		}
		parts = append(parts, fmt.Sprintf("%s x%d", name, counts[k]))
	}
	mean := "-"
	if n > 0 {
		mean = fmt.Sprintf("%.3f s", sum/float64(n))
	}
	return fmt.Sprintf("%s; settles in %s on average", strings.Join(parts, ", "), mean)
}

// writeDemoFaces describes the faces the part landed on, if any.
func writeDemoFaces(w io.Writer, st *demo.Study, used map[int]bool) {
	var faces []int
	for f := range used {
		faces = append(faces, f)
	}
	sort.Ints(faces)
	if len(faces) == 0 {
		return
	}
	fmt.Fprintln(w, "faces it landed on (outward normal in the part's axes; quasi-static probability from clatter inspect):")
	for _, f := range faces {
		if f < len(st.Faces) {
			rf := st.Faces[f]
			fmt.Fprintf(w, "  face %d  normal (%s)  probability %.3f\n", f, fmtNormal([3]float64(rf.Normal)), rf.Probability)
		}
	}
	fmt.Fprintln(w)
}
