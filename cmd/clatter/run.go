package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"clatter/engine"
	"clatter/engine/report"
	"clatter/engine/scene"
)

var cmdRun = &command{
	name:    "run",
	summary: "simulate one scene and write its results",
	usage:   "clatter run SCENE.toml [-o DIR] [--sample SECONDS] [--animation] [--pictures] [--json] [--quiet]",
	help: `
Simulates the scene to its [world] duration, or until every moving body has
settled when until_settled is true, and writes into DIR (default clatter-out):

  summary.json     final pose, velocity, resting face and largest impact of
                   every moving body; energy and momentum at start and end
  trajectory.csv   time,body,x,y,z,qw,qx,qy,qz,vx,vy,vz,wx,wy,wz: a row per
                   moving or driven body every --sample seconds (default
                   0.01) and at the end
  events.jsonl     impacts (with the struck face, edge or corner of each
                   body), rest_begin and rest_end (a body came to rest or
                   was set moving again), tips and slides, settling and
                   errors, one JSON object a line
  joints.csv       for a scene with joints: time,joint,fx,fy,fz,tx,ty,tz,
                   position,speed,effort, a row per joint every sample: the
                   force and torque the joint applied to its first body, its
                   angle (deg) or travel, its speed and its motor's effort
  animation.glb    with --animation: every body's shape and the motion of
                   the moving ones at the sample times, as glTF 2.0 binary
                   (metres and seconds; opens in 3-D viewers and in the
                   page of clatter report)
  start.png        with --pictures: shaded views of the first and last
  end.png          states, from above at a three-quarter angle
  gates.csv        for a scene with [[gate]]s: time,gate,body,face_down,x,y,z,
                   vx,vy,vz, a row per crossing (tested every step); the
                   summary adds each gate's count, rate per minute and
                   counts per face down, and each vibration drive's throw
                   number and conveying speed

Everything is in the scene's units (units = { length, mass }), time in s,
angles in degrees, angular velocity in rad/s, energy in J. A table of the
final state goes to stdout; --json prints summary.json there instead.

A scene with a [drop] (a drop test: body, strike, height, onto) adds the
drop's report to summary.json and a table of its impacts to stdout, in
the face numbering of the drop-test standards (1 top, 2 right side, 3
bottom, 4 left side, 5 near end, 6 far end).

A [sweep] section is read and checked, and ignored: clatter sweep runs it.

Exit codes: 0 the run completed, 1 the simulation failed (diverged or was
interrupted; the files keep everything up to its last good state and the
error), 2 bad input (the scene's errors name file and line), 70 an internal
error (please report it).

Options:
  -o DIR           where to write the results (default clatter-out)
  --sample SECONDS trajectory sample interval (default 0.01; a unit may be
                   given, e.g. "5 ms"); a warning says when it is too coarse
                   for a drive's vibration
  --animation      also write animation.glb
  --pictures       also write start.png and end.png
  --json           print the summary as JSON instead of a table
  --quiet, -q      no progress bar or informational messages`,
}

func runScene(e *env, args []string) int {
	fs := newFlags(e, cmdRun)
	dir := fs.String("o", "clatter-out", "")
	sampleText := fs.String("sample", "0.01", "")
	asJSON := fs.Bool("json", false, "")
	var vis visuals
	vis.flags(fs)
	pos, code := parse(e, cmdRun, fs, args)
	if code >= 0 {
		return code
	}
	if len(pos) != 1 {
		e.errorf("run: give one scene file, e.g. clatter run testdata/scenes/slide.toml (got %d arguments)", len(pos))
		return exitBad
	}
	sample, err := parseSeconds(*sampleText)
	if err != nil {
		e.errorf("run: --sample: %v", err)
		return exitBad
	}
	s, err := scene.Load(pos[0])
	if err != nil {
		fmt.Fprintln(e.stderr, err)
		return exitBad
	}
	e.warn(s.Warnings)
	e.warn(report.SampleAliases(s, sample))
	if s.Sweep != nil {
		e.infof("note: run simulates the scene once and ignores its [sweep] section; clatter sweep runs the study")
	}
	return simulate(e, s, *dir, sample, *asJSON, &vis)
}

// simulate runs a loaded scene as run does, writing into dir, and returns
// the exit code.
func simulate(e *env, s *scene.Scene, dir string, sample float64, asJSON bool, vis *visuals) int {
	if dir != "" {
		if err := writableDir(dir); err != nil {
			e.errorf("run: -o %s: cannot write into the output folder: %v; choose another folder with -o", dir, err)
			return exitBad
		}
	}
	p := newProgress(e, "simulating")
	opt := report.Options{Dir: dir, Sample: sample, Progress: p.update}
	vis.observe(s, &opt)
	sum, err := report.Run(e.ctx, s, opt)
	p.done()
	if sum == nil {
		fmt.Fprintln(e.stderr, err)
		if errors.Is(err, scene.ErrBadScene) {
			return exitBad
		}
		return exitFailed
	}
	extra, verr := vis.write(dir)
	if verr != nil {
		e.errorf("run: cannot write the animation or pictures: %v", verr)
		return exitFailed
	}
	warnBalanced(e, sum)
	e.warn(report.CoarseSteps(s, sum)) // feeders (engine/report/drives.go)
	if asJSON {
		e.stdout.Write(sum.JSON())
		if !e.quiet {
			fmt.Fprintln(e.stderr, safetyNote)
		}
	} else {
		writeRunTable(e.stdout, s, sum, dir, append(outputFiles(s), extra...))
	}
	var we *report.WriteError
	if errors.As(err, &we) {
		e.errorf("%v", err) // says what the folder keeps
		return exitFailed
	}
	if err != nil {
		e.errorf("run failed: %v", err)
		if dir != "" {
			e.errorf("the results up to t = %g s and the error are in %s", sum.Time, dir)
		}
		return exitFailed
	}
	if dir != "" {
		e.infof("wrote %s", strings.Join(append(append([]string{filepath.Join(dir, report.SummaryFile)}, outputFiles(s)[1:]...), extra...), ", "))
	}
	return exitOK
}

// parseSeconds reads a time: a plain number of seconds or a value with a unit.
func parseSeconds(s string) (float64, error) {
	v, d, err := scene.ParseQuantity(s)
	if err != nil {
		return 0, err
	}
	if d != scene.Dimensionless && d != scene.Time {
		return 0, fmt.Errorf("%q is %s, not a time", s, d)
	}
	if !(v > 0) {
		return 0, fmt.Errorf("must be a positive number of seconds, got %q", s)
	}
	return v, nil
}

func writeRunTable(w io.Writer, s *scene.Scene, sum *report.Summary, dir string, files []string) {
	u := s.Units
	fmt.Fprintf(w, "scene    %s (lengths in %s, masses in %s)\n", s.File, u.Length, u.Mass)
	status := "not settled"
	if sum.SettledAt != nil {
		status = fmt.Sprintf("every moving body settled at %.4g s", *sum.SettledAt)
	}
	fmt.Fprintf(w, "ran      %.4g s in %d steps; %s\n", sum.Time, sum.Steps, status)
	if sum.Error != "" {
		fmt.Fprintf(w, "stopped  %s\n", sum.Error)
	}
	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	speed := u.Symbol(scene.Speed)
	fmt.Fprintf(tw, "body\tposition (%s)\torientation\tresting face\tface down\tlargest impact (%s)\n", u.Length, speed)
	for _, b := range sum.Bodies {
		face, down := "-", "-"
		switch {
		case b.RestingFace != nil:
			face = fmt.Sprint(*b.RestingFace)
		case b.Balanced != nil:
			face = "balanced on " + *b.Balanced
		}
		if b.FaceDown != nil {
			down = fmt.Sprint(*b.FaceDown)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%.4g\n", b.Name, fmtVec(b.Position[:]), fmtOrientation(b.Orientation), face, down, b.MaxImpactSpeed)
	}
	tw.Flush()
	fmt.Fprintln(w)
	if len(sum.Joints) > 0 {
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintf(tw, "joint	kind	position	speed	largest force (%s)	largest torque (%s)\n", u.Symbol(scene.Force), u.Symbol(scene.Torque))
		for _, j := range sum.Joints {
			pos, speed := "-", "-"
			if j.Position != nil {
				unit, rate := u.Length, u.Symbol(scene.Speed)
				if k, _ := scene.JointKindNamed(j.Kind); k == engine.Revolute {
					unit, rate = "deg", "rad/s"
				}
				pos, speed = fmt.Sprintf("%.4g %s", *j.Position, unit), fmt.Sprintf("%.4g %s", *j.Speed, rate)
			}
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%.4g\t%.4g\n", j.Name, j.Kind, pos, speed, j.MaxForce, j.MaxTorque)
		}
		tw.Flush()
		fmt.Fprintln(w)
	}
	writePackTables(w, s, sum)
	writeFeederFigures(w, s, sum) // feeder.go
	fmt.Fprintf(w, "energy   %.6g J at the start, %.6g J at the end (kinetic plus potential)\n", sum.Energy.Initial, sum.Energy.Final)
	if dir != "" {
		fmt.Fprintf(w, "results  %s: %s\n", dir, strings.Join(files, ", "))
	}
	fmt.Fprintln(w, "resting faces index the faces `clatter inspect` lists (a box: +x, -x, +y, -y, +z, -z); - means moving, leaning or round;")
	fmt.Fprintln(w, "face down is the face closest to facing gravity, resting or not")
	fmt.Fprintln(w, "balanced on an edge or corner means at rest there only until the slightest disturbance tips it")
	fmt.Fprintln(w)
	fmt.Fprintln(w, safetyNote)
}

// outputFiles names the files a run of s writes.
func outputFiles(s *scene.Scene) []string {
	files := []string{report.SummaryFile, report.TrajectoryFile, report.EventsFile}
	if len(s.Joints) > 0 {
		files = append(files, report.JointsFile)
	}
	if len(s.Gates) > 0 {
		files = append(files, report.GatesFile)
	}
	return files
}

func fmtVec(v []float64) string {
	s := make([]string, len(v))
	for i, x := range v {
		if math.Abs(x) < 5e-7*maxAbs(v) {
			x = 0
		}
		s[i] = fmt.Sprintf("%.6g", x)
	}
	return strings.Join(s, ", ")
}

func maxAbs(v []float64) float64 {
	m := 0.0
	for _, x := range v {
		m = math.Max(m, math.Abs(x))
	}
	return m
}

// fmtOrientation writes a quaternion [w, x, y, z] as an angle about an axis.
func fmtOrientation(q [4]float64) string {
	w := math.Max(-1, math.Min(1, q[0]))
	if w < 0 {
		w, q = -w, [4]float64{-q[0], -q[1], -q[2], -q[3]}
	}
	angle := 2 * math.Acos(w) * 180 / math.Pi
	n := math.Sqrt(q[1]*q[1] + q[2]*q[2] + q[3]*q[3])
	if angle < 0.05 || n == 0 {
		return "unturned"
	}
	return fmt.Sprintf("%.1f deg about (%.3f, %.3f, %.3f)", angle, q[1]/n, q[2]/n, q[3]/n)
}

// warnBalanced warns of every body that came to rest balanced on an edge or
// a corner: a result that no real part keeps.
func warnBalanced(e *env, sum *report.Summary) {
	for _, b := range sum.Bodies {
		if b.Balanced != nil {
			fmt.Fprintf(e.stderr, "warning: body %q came to rest balanced on %s %s, its centre of mass right above it; any disturbance tips it over, so it has no resting face\n",
				b.Name, article(*b.Balanced), *b.Balanced)
		}
	}
}

func article(s string) string {
	if s == "edge" {
		return "an"
	}
	return "a"
}
