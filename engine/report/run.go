package report

import (
	"bufio"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"

	"clatter/engine"
	"clatter/engine/scene"
	"clatter/shapes"
	"clatter/shapes/resting"
)

// DefaultSample is the trajectory sample interval, s.
const DefaultSample = 0.01

// Names of the files Run writes.
const (
	SummaryFile    = "summary.json"
	TrajectoryFile = "trajectory.csv"
	EventsFile     = "events.jsonl"
	JointsFile     = "joints.csv"
)

// TrajectoryHeader is the first line of trajectory.csv.
const TrajectoryHeader = "time,body,x,y,z,qw,qx,qy,qz,vx,vy,vz,wx,wy,wz"

// JointsHeader is the first line of joints.csv: the force and torque that
// each joint applied to its first body (world frame, at its anchor), its
// position (a revolute joint's angle in degrees, a prismatic joint's travel
// or a link's length), its speed (rad/s or length/s) and its motor's effort (torque
// or force along the axis); empty where a kind has no such quantity.
const JointsHeader = "time,joint,fx,fy,fz,tx,ty,tz,position,speed,effort"

// Options control a run.
type Options struct {
	// Dir is where the files go; empty writes none.
	Dir string
	// Sample is the trajectory sample interval, s (default DefaultSample).
	Sample float64
	// Progress, if set, is called now and then with the fraction of the
	// duration simulated.
	Progress func(fraction float64)
	// Observe, if set, is called at every sample (the start, each sample
	// time and the end) with the world and the scene's bodies in file
	// order, to record what a run looked like.
	Observe func(t float64, w *engine.World, ids []engine.BodyID)
}

// SimulationError is a run that could not finish: the simulation diverged
// or was interrupted. The files hold everything up to its last good state.
type SimulationError struct {
	Time float64
	Err  error
}

func (e *SimulationError) Error() string { return e.Err.Error() }
func (e *SimulationError) Unwrap() error { return e.Err }

// bodyState is the state of one body, kept so that a failed step can be
// undone for the summary.
type bodyState struct {
	pos, vel, spin shapes.Vec3
	rot            shapes.Quat
}

type runner struct {
	s    *scene.Scene
	w    *engine.World
	ids  []engine.BodyID
	dyn  []int // indices of the moving bodies in s.Bodies
	opt  Options
	u    scene.Units
	traj *bufio.Writer
	ev   *bufio.Writer
	jt   *bufio.Writer // joints.csv, when the scene has joints
	out  *sink
	// peak holds each joint's largest reaction force and torque so far.
	peak [][2]float64
	row  []byte
	// touching counts, per body id, the bodies it touches.
	touching []int
	pairs    map[[2]engine.BodyID]bool
	faces    map[int][]resting.Face
	lastRow  float64
	prev     []bodyState
	prevT    float64
	prevN    int
	// traced are the bodies trajectory.csv follows: moving and driven.
	traced []int
	pack   packWatch
	// index maps a body id to its index in s.Bodies; gates counts the
	// gate crossings (gates.go), drives measures the vibration drives
	// (drives.go).
	index  []int
	gates  *gateCounter
	gt     *bufio.Writer
	drives []driveMeter
}

// Run simulates the scene to its duration, or until every moving body has
// settled when the scene says until_settled, writing the result files into
// opt.Dir. It returns the summary; on a failed run the summary of its last
// good state together with a *SimulationError. A scene that cannot be
// built gives no summary and an error that wraps scene.ErrBadScene.
func Run(ctx context.Context, s *scene.Scene, opt Options) (*Summary, error) {
	if opt.Sample == 0 {
		opt.Sample = DefaultSample
	}
	if !(opt.Sample > 0) || math.IsInf(opt.Sample, 0) {
		return nil, fmt.Errorf("%w: the sample interval must be a positive number of seconds, got %g", scene.ErrBadScene, opt.Sample)
	}
	w, ids, err := s.Build()
	if err != nil {
		return nil, err
	}
	r := newRunner(s, w, ids, opt)
	r.out = newSink(opt.Dir)
	defer r.out.close()
	if err := r.openFiles(); err != nil {
		return nil, err
	}
	r.peak = make([][2]float64, len(s.Joints))

	sum := &Summary{Units: UnitsOf(r.u)}
	sum.Energy.Initial = w.Energy()
	sum.Momentum.Linear.Initial = r.u.VecFromSI(w.LinearMomentum(), scene.Impulse)
	sum.Momentum.Angular.Initial = r.u.VecFromSI(w.AngularMomentum(shapes.Vec3{}), angularMomentum)

	simErr, diverged := r.loop(ctx)
	if opt.Progress != nil {
		opt.Progress(1)
	}
	end := w.Time()
	if diverged {
		end = r.prevT
	}
	if end != r.lastRow && r.out.err == nil {
		r.sample(end)
	}
	r.out.commit(end)
	r.summarise(sum, simErr)
	return r.finish(sum, simErr)
}

// newRunner sets up the run of scene s, built into w with body ids ids:
// which bodies move and are traced, and the packages, drives and gates it
// watches.
func newRunner(s *scene.Scene, w *engine.World, ids []engine.BodyID, opt Options) *runner {
	r := &runner{s: s, w: w, ids: ids, opt: opt, u: s.Units, pairs: map[[2]engine.BodyID]bool{},
		touching: make([]int, w.NumBodies()), faces: map[int][]resting.Face{}, lastRow: math.NaN()}
	r.index = make([]int, w.NumBodies())
	for i, b := range s.Bodies {
		r.index[ids[i]] = i
		if !b.Static {
			r.dyn = append(r.dyn, i)
		}
		if !b.Static || b.Driven {
			r.traced = append(r.traced, i)
		}
	}
	r.watchPackages()
	r.drives = newDriveMeters(s, w, ids)
	if len(s.Gates) > 0 {
		r.gates = newGateCounter(len(s.Gates))
	}
	return r
}

// openFiles makes the output folder, if the run has one, and opens the
// result files the scene needs with their header rows.
func (r *runner) openFiles() error {
	if r.opt.Dir == "" {
		return nil
	}
	if err := os.MkdirAll(r.opt.Dir, 0o755); err != nil {
		return fmt.Errorf("cannot make the output folder: %w", err)
	}
	type output struct {
		name string
		bw   **bufio.Writer
	}
	outs := []output{{TrajectoryFile, &r.traj}, {EventsFile, &r.ev}}
	if len(r.s.Joints) > 0 {
		outs = append(outs, output{JointsFile, &r.jt})
	}
	if r.gates != nil {
		outs = append(outs, output{GatesFile, &r.gt})
	}
	for _, f := range outs {
		bw, err := r.out.create(f.name)
		if err != nil {
			return fmt.Errorf("cannot write results: %w", err)
		}
		*f.bw = bw
	}
	r.traj.WriteString(TrajectoryHeader + "\n")
	if r.jt != nil {
		r.jt.WriteString(JointsHeader + "\n")
	}
	if r.gt != nil {
		r.gt.WriteString(GatesHeader + "\n")
		r.gates.out = r.gt
	}
	return nil
}

// loop steps the world to the scene's duration (or until it settles, or
// the context is cancelled, or a file cannot be written), sampling as it
// goes. It returns the simulation's error, if any, and whether a step
// failed (the state then is the one before it).
func (r *runner) loop(ctx context.Context) (simErr error, diverged bool) {
	s, w, opt := r.s, r.w, r.opt
	dt := s.World.Step
	total := s.World.StepCount() // scene/steps.go
	every := max(1, total/200)
	r.sample(0)
	next := opt.Sample
	r.prev = make([]bodyState, w.NumBodies())
	for n := 0; n < total; n++ {
		if n%64 == 0 && ctx.Err() != nil {
			simErr = &SimulationError{Time: w.Time(), Err: &interruptedError{time: w.Time(), cause: ctx.Err()}}
			r.event(eventJSON{Time: w.Time(), Event: "error", Message: simErr.Error()})
			return simErr, false
		}
		r.keep()
		r.pack.before(w)
		if err := w.Step(dt); err != nil {
			return r.stepFailed(err), true
		}
		r.events()
		r.peaks()
		r.afterStep()
		r.crossings() // gates.go
		r.convey()    // drives.go
		t := w.Time()
		if t >= next-1e-9*opt.Sample {
			r.sample(t)
			next = (math.Floor(t/opt.Sample+1e-9) + 1) * opt.Sample
			if !r.out.commit(t) {
				return nil, false
			}
		}
		if opt.Progress != nil && n%every == 0 {
			opt.Progress(t / s.World.Duration)
		}
		if settled, _ := w.Settled(); settled && s.World.UntilSettled {
			return nil, false
		}
	}
	return nil, false
}

// stepFailed records a failed step as an error event naming the body,
// puts the last good state back and returns the simulation error.
func (r *runner) stepFailed(err error) error {
	w := r.w
	r.events()
	msg := eventJSON{Time: clean(w.Time()), Event: "error", Message: err.Error()}
	var de *engine.DivergenceError
	var je *engine.JamError
	if errors.As(err, &de) {
		msg.Body = de.Name
		msg.Time = clean(de.Time)
	} else if errors.As(err, &je) {
		msg.Body = je.Name
		msg.Time = clean(je.Time)
	}
	r.event(msg)
	r.restore()
	return &SimulationError{Time: r.prevT, Err: err}
}

// finish writes summary.json, if the run has a folder, and returns the
// summary with the run's first error: a file that could not be written,
// else the simulation's.
func (r *runner) finish(sum *Summary, simErr error) (*Summary, error) {
	if we := r.out.err; we != nil && sum.Error == "" {
		sum.Error = fmt.Sprintf("stopped: cannot write %s: %v", we.File, we.Err)
	}
	if r.opt.Dir != "" {
		err := writeAtomic(filepath.Join(r.opt.Dir, SummaryFile), sum.JSON())
		if we := r.out.err; we != nil {
			we.Stopped, we.Summary = sum.Time, err == nil
			return sum, we
		}
		if err != nil {
			r.out.fail(&outFile{name: SummaryFile}, err)
			we := r.out.err
			we.Stopped, we.Kept = sum.Time, r.out.kept
			return sum, we
		}
	}
	if simErr != nil {
		return sum, simErr
	}
	return sum, nil
}

var angularMomentum = scene.Dim{L: 2, M: 1, T: -1}

// keep saves the state before a step, so that a failed step can be undone.
func (r *runner) keep() {
	w := r.w
	for _, i := range r.dyn {
		id := r.ids[i]
		r.prev[id] = bodyState{pos: w.Position(id), vel: w.Velocity(id), spin: w.Spin(id), rot: w.Orientation(id)}
	}
	r.prevT, r.prevN = w.Time(), w.Steps()
}

// restore puts the last good state back after a failed step.
func (r *runner) restore() {
	for _, i := range r.dyn {
		id := r.ids[i]
		p := r.prev[id]
		r.w.SetPose(id, p.pos, p.rot)
		r.w.SetVelocity(id, p.vel, p.spin)
	}
}

func (r *runner) summarise(sum *Summary, simErr error) {
	w := r.w
	sum.Time, sum.Steps = clean(w.Time()), w.Steps()
	if simErr != nil {
		var se *SimulationError
		if errors.As(simErr, &se) && se.Time < w.Time() {
			sum.Time, sum.Steps = clean(r.prevT), r.prevN
		}
		sum.Error = simErr.Error()
	}
	if ok, at := w.Settled(); ok {
		sum.Settled = true
		a := clean(at)
		sum.SettledAt = &a
	}
	sum.Bodies = []Body{}
	for _, i := range r.dyn {
		id := r.ids[i]
		q := w.Orientation(id)
		b := Body{
			Name:             r.s.Bodies[i].Name,
			Position:         clean3(r.u.VecFromSI(w.Position(id), scene.Length)),
			Orientation:      [4]float64{clean(q.W), clean(q.V[0]), clean(q.V[1]), clean(q.V[2])},
			Velocity:         clean3(r.u.VecFromSI(w.Velocity(id), scene.Speed)),
			Spin:             clean3(r.u.VecFromSI(w.Spin(id), scene.AngularSpeed)),
			RestingFace:      r.restingFace(i),
			FaceDown:         faceOrNil(BodyFaceDown(w, id, r.facesOf(i))),
			MaxImpactSpeed:   clean(r.u.FromSI(w.MaxImpactSpeed(id), scene.Speed)),
			PeakAcceleration: PeakAcceleration(w, id), // peaks.go
		}
		b.TippedAt, b.SlidAt = r.tiltMarks(id)
		b.Balanced = Balanced(w, id, b.RestingFace != nil, r.touching[id] > 0) // (balance.go)
		sum.Bodies = append(sum.Bodies, b)
	}
	sum.Drop = r.dropReport()
	sum.Gates = r.gateSummary(sum.Time)
	sum.Drives = r.driveSummary()
	sum.Energy.Initial = clean(sum.Energy.Initial)
	sum.Energy.Final = clean(w.Energy())
	sum.Momentum.Linear.Initial = clean3(sum.Momentum.Linear.Initial)
	sum.Momentum.Angular.Initial = clean3(sum.Momentum.Angular.Initial)
	sum.Momentum.Linear.Final = clean3(r.u.VecFromSI(w.LinearMomentum(), scene.Impulse))
	sum.Momentum.Angular.Final = clean3(r.u.VecFromSI(w.AngularMomentum(shapes.Vec3{}), angularMomentum))
	for i, sj := range r.s.Joints {
		j := engine.JointID(i)
		pos, speed, _ := r.jointMotion(j, sj.Kind)
		sum.Joints = append(sum.Joints, Joint{
			Name:      sj.Name,
			Kind:      sj.KindName(),
			Position:  pos,
			Speed:     speed,
			MaxForce:  clean(r.u.FromSI(r.peak[i][0], scene.Force)),
			MaxTorque: clean(r.u.FromSI(r.peak[i][1], scene.Torque)),
		})
	}
}

// peaks tracks the largest reaction of every joint.
func (r *runner) peaks() {
	for i := range r.peak {
		f, t := r.w.JointReaction(engine.JointID(i))
		r.peak[i][0] = math.Max(r.peak[i][0], f.Len())
		r.peak[i][1] = math.Max(r.peak[i][1], t.Len())
	}
}

// jointMotion returns a joint's position and speed in the output units
// (nil for a kind without them) and whether it has a motor effort.
func (r *runner) jointMotion(j engine.JointID, k engine.JointKind) (pos, speed *float64, effort bool) {
	var pd, sd scene.Dim
	switch k {
	case engine.Revolute:
		pd, sd, effort = scene.Angle, scene.AngularSpeed, true
	case engine.Prismatic:
		pd, sd, effort = scene.Length, scene.Speed, true
	case engine.Distance:
		pd, sd = scene.Length, scene.Speed
	default:
		return nil, nil, false
	}
	p := clean(r.u.FromSI(r.w.JointPosition(j), pd))
	v := clean(r.u.FromSI(r.w.JointSpeed(j), sd))
	return &p, &v, effort
}

// restingFace returns the face body i rests on, or nil (see RestingFace).
func (r *runner) restingFace(i int) *int {
	id := r.ids[i]
	return faceOrNil(RestingFace(r.w, id, r.facesOf(i), r.touching[id] > 0))
}

func faceOrNil(f int) *int {
	if f < 0 {
		return nil
	}
	return &f
}

// Faces returns the resting analysis of a body's shape, its faces indexed
// as `clatter inspect` lists them, or nil when the shape has none (a ball,
// a static shape). It depends only on the shape and its centre of mass, so
// it can be computed once per shape and reused.
func Faces(w *engine.World, id engine.BodyID) []resting.Face {
	pose := w.ShapePose(id)
	com := pose.ApplyInv(w.Position(id))
	faces, err := resting.OfShape(w.Shape(id), com)
	if err != nil {
		return nil
	}
	return faces
}

// RestingFace returns the index in faces of the face a body rests on, or
// -1: it must touch something (touching), be at rest (asleep, or slower
// than the world's rest speed and spin), and have a face within
// resting.FaceDownTolerance of the gravity direction.
func RestingFace(w *engine.World, id engine.BodyID, faces []resting.Face, touching bool) int {
	if !touching || len(faces) == 0 || !atRest(w, id) {
		return -1
	}
	down := w.ShapePose(id).RotateInv(w.Config().Gravity)
	return resting.FaceDown(faces, down)
}

// sample writes a trajectory row per moving body.
func (r *runner) sample(t float64) {
	r.lastRow = t
	if r.opt.Observe != nil {
		r.opt.Observe(t, r.w, r.ids)
	}
	if r.traj == nil {
		return
	}
	w := r.w
	for _, i := range r.traced {
		id := r.ids[i]
		p := r.u.VecFromSI(w.Position(id), scene.Length)
		q := w.Orientation(id)
		v := r.u.VecFromSI(w.Velocity(id), scene.Speed)
		s := r.u.VecFromSI(w.Spin(id), scene.AngularSpeed)
		b := r.row[:0]
		b = strconv.AppendFloat(b, t, 'g', sigDigits, 64)
		b = append(b, ',')
		b = appendCSVField(b, r.s.Bodies[i].Name)
		for _, x := range []float64{p[0], p[1], p[2], q.W, q.V[0], q.V[1], q.V[2], v[0], v[1], v[2], s[0], s[1], s[2]} {
			b = append(b, ',')
			b = strconv.AppendFloat(b, x, 'g', sigDigits, 64)
		}
		b = append(b, '\n')
		r.traj.Write(b)
		r.row = b
	}
	if r.jt != nil {
		r.jointRows(t)
	}
}

// jointRows writes a joints.csv row per joint.
func (r *runner) jointRows(t float64) {
	for i, sj := range r.s.Joints {
		j := engine.JointID(i)
		f, tq := r.w.JointReaction(j)
		fu := r.u.VecFromSI(f, scene.Force)
		tu := r.u.VecFromSI(tq, scene.Torque)
		b := r.row[:0]
		b = strconv.AppendFloat(b, t, 'g', sigDigits, 64)
		b = append(b, ',')
		b = appendCSVField(b, sj.Name)
		for _, x := range []float64{fu[0], fu[1], fu[2], tu[0], tu[1], tu[2]} {
			b = append(b, ',')
			b = strconv.AppendFloat(b, x, 'g', sigDigits, 64)
		}
		pos, speed, effort := r.jointMotion(j, sj.Kind)
		for _, x := range []*float64{pos, speed} {
			b = append(b, ',')
			if x != nil {
				b = strconv.AppendFloat(b, *x, 'g', sigDigits, 64)
			}
		}
		b = append(b, ',')
		if effort {
			d := scene.Torque
			if sj.Kind == engine.Prismatic {
				d = scene.Force
			}
			b = strconv.AppendFloat(b, r.u.FromSI(r.w.MotorEffort(j), d), 'g', sigDigits, 64)
		}
		b = append(b, '\n')
		r.jt.Write(b)
		r.row = b
	}
}

// appendCSVField quotes a name that holds a comma, quote or line break
// (RFC 4180).
func appendCSVField(b []byte, s string) []byte {
	needs := false
	for i := 0; i < len(s); i++ {
		if c := s[i]; c == ',' || c == '"' || c == '\n' || c == '\r' {
			needs = true
			break
		}
	}
	if !needs {
		return append(b, s...)
	}
	b = append(b, '"')
	for i := 0; i < len(s); i++ {
		if s[i] == '"' {
			b = append(b, '"')
		}
		b = append(b, s[i])
	}
	return append(b, '"')
}

// eventJSON is one line of events.jsonl.
type eventJSON struct {
	Time        float64     `json:"time"`
	Event       string      `json:"event"`
	Body        string      `json:"body,omitempty"`
	Bodies      []string    `json:"bodies,omitempty"`
	Point       *[3]float64 `json:"point,omitempty"`
	NormalSpeed *float64    `json:"normal_speed,omitempty"`
	Impulse     *float64    `json:"impulse,omitempty"`
	Message     string      `json:"message,omitempty"`
	// Features of an impact: each body's struck face, edge or corner in
	// package numbering, null for a static body (see package pack).
	Features []*string `json:"features,omitempty"`
	// On and Tilt of a tips or slides event: the support and its tilt (deg).
	On   string   `json:"on,omitempty"`
	Tilt *float64 `json:"tilt,omitempty"`
	// PeakForce, Duration and PeakAcceleration (per body, g; null for a
	// static body) of an impact through a compliant contact (peaks.go).
	PeakForce        *float64   `json:"peak_force,omitempty"`
	Duration         *float64   `json:"duration,omitempty"`
	PeakAcceleration []*float64 `json:"peak_acceleration,omitempty"`
}

// events takes the world's events of the last step: it writes impacts,
// rest_begin and rest_end (engine.Sleep and engine.Wake) and settling,
// and tracks which bodies touch.
func (r *runner) events() {
	w := r.w
	for _, e := range w.Events() {
		switch e.Kind {
		case engine.ContactBegin, engine.ContactEnd:
			key := [2]engine.BodyID{min(e.A, e.B), max(e.A, e.B)}
			if e.A < 0 || e.B < 0 || int(key[1]) >= len(r.touching) {
				continue
			}
			on := e.Kind == engine.ContactBegin
			if r.pairs[key] != on {
				r.pairs[key] = on
				d := 1
				if !on {
					d = -1
				}
				r.touching[key[0]] += d
				r.touching[key[1]] += d
			}
		case engine.Impact:
			p := clean3(r.u.VecFromSI(e.Point, scene.Length))
			sp := clean(r.u.FromSI(e.Speed, scene.Speed))
			im := clean(r.u.FromSI(e.Impulse, scene.Impulse))
			ev := eventJSON{Time: clean(e.Time), Event: "impact", Bodies: []string{r.name(e.A), r.name(e.B)}, Point: &p, NormalSpeed: &sp, Impulse: &im, Features: r.impactFeatures(e)}
			r.compliantFields(&ev, e) // peaks.go
			r.event(ev)
		case engine.Sleep, engine.Wake:
			r.event(eventJSON{Time: clean(e.Time), Event: e.Kind.String(), Body: r.name(e.A)})
		case engine.Settled:
			r.event(eventJSON{Time: clean(e.Time), Event: "settled"})
		}
	}
}

func (r *runner) name(id engine.BodyID) string {
	if id < 0 || int(id) >= r.w.NumBodies() {
		return ""
	}
	return r.w.Name(id)
}

func (r *runner) event(e eventJSON) {
	if r.ev == nil {
		return
	}
	b, err := json.Marshal(e)
	if err != nil {
		return // every number is cleaned, so this does not happen
	}
	r.ev.Write(b)
	r.ev.WriteByte('\n')
}

// writeAtomic writes a file through a temporary one, so that a reader never
// sees half of it.
func writeAtomic(path string, data []byte) error {
	tmp := path + ".tmp"
	if err := os.WriteFile(tmp, data, 0o644); err != nil {
		return err
	}
	return os.Rename(tmp, path)
}
