package scene

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"strconv"
	"strings"

	"clatter/engine"
	"clatter/shapes"
)

// Joint is one [[joint]] section, in SI. Its geometry is in the world frame
// at the bodies' starting poses, as engine.JointDef takes it.
type Joint struct {
	Name string
	Line int
	Kind engine.JointKind
	// A is the jointed body; B its base, or "" for the world.
	A, B string
	Def  engine.JointDef // bodies left unset: Build fills them in
	// Program is the motor's program: motors that take over at times.
	Program []MotorChange
}

// MotorChange is one entry of a motor's program.
type MotorChange struct {
	Time  float64
	Motor engine.Motor
}

// Drive is one [[drive]] section, in SI.
type Drive struct {
	Body string
	Line int
	// Motion moves a driven body (nil: the body stays put, as a conveyor
	// belt's frame does).
	Motion engine.Motion
	// Conveyor is the surface velocity in the body's own axes, m/s.
	Conveyor shapes.Vec3
	// PathFile is the resolved path of a pose table.
	PathFile string
}

// jointKinds are the names of joint kinds in a scene file, after the
// kinematic pairs (rename.go reads the names of the previous release).
var jointKinds = map[string]engine.JointKind{
	"revolute":  engine.Revolute,
	"prismatic": engine.Prismatic,
	"spherical": engine.Spherical,
	"fixed":     engine.Fixed,
	"link":      engine.Distance,
}

var jointKindNames = []string{"revolute", "prismatic", "spherical", "fixed", "link"}

// KindName is the joint's kind as the scene file names it.
func (j *Joint) KindName() string { return jointKindNames[j.Kind] }

// bodyNamed returns the index of the body called name, or reports that
// there is none, with a suggestion, and returns -1.
func (r *reader) bodyNamed(name string, path []string, pre string) int {
	if i := r.s.BodyIndex(name); i >= 0 {
		return i
	}
	var cands []string
	for _, b := range r.s.Bodies {
		cands = append(cands, b.Name)
	}
	r.errAt(path, "%sno body is named %q%s", pre, name, Suggest(name, cands))
	return -1
}

// jointed reports whether a joint holds the named body.
func (s *Scene) jointed(name string) bool {
	for _, j := range s.Joints {
		if j.A == name || j.B == name {
			return true
		}
	}
	return false
}

func (r *reader) joints(root section) {
	list, ok := r.sections(root, "joint")
	if !ok {
		return
	}
	names := map[string]int{}
	for i, m := range list {
		j, ok := r.joint(i, m)
		if !ok {
			continue
		}
		if k, dup := names[j.Name]; dup {
			r.errAt([]string{"joint", strconv.Itoa(i), "name"}, "joint %q: the name is already used by the joint at line %d; names must be unique", j.Name, r.s.Joints[k].Line)
			continue
		}
		names[j.Name] = len(r.s.Joints)
		r.s.Joints = append(r.s.Joints, j)
	}
}

func (r *reader) joint(i int, m map[string]any) (Joint, bool) {
	path := []string{"joint", strconv.Itoa(i)}
	sec := section{m: m, path: path, name: fmt.Sprintf("[[joint]] number %d", i+1), pre: fmt.Sprintf("[[joint]] number %d: ", i+1)}
	j := Joint{Line: r.s.lines.line(path)}
	name, ok := r.required(sec, "name", "every joint needs a unique name = \"...\"")
	if !ok {
		return j, false
	}
	j.Name = name
	sec.name = fmt.Sprintf("joint %q", name)
	sec.pre = fmt.Sprintf("joint %q: ", name)
	nerr := r.n
	r.keys(sec, "name", "kind", "bodies", "at", "at_other", "axis", "limits", "length", "friction", "collide", "motor")

	kind, ok := r.required(sec, "kind", "give kind = one of "+strings.Join(quoted(jointKindNames), ", "))
	if !ok {
		return j, false
	}
	if now, warning := currentJointKind(kind); warning != "" { // rename.go
		r.warnAt(sub(path, "kind"), "%s", warning)
		kind = now
	}
	k, known := jointKinds[kind]
	if !known {
		r.errAt(sub(path, "kind"), "%sunknown kind %q%s; the kinds are %s", sec.pre, kind, jointKindSuggestion(kind), strings.Join(quoted(jointKindNames), ", "))
		return j, false
	}
	j.Kind = k
	def := &j.Def
	def.Name, def.Kind = name, k

	// The bodies: the jointed one, then its base (the world if left out).
	bv, given := m["bodies"]
	a, isArr := bv.([]any)
	var bodyNames []string
	for _, x := range a {
		if s, isStr := x.(string); isStr {
			bodyNames = append(bodyNames, s)
		}
	}
	switch {
	case !given:
		r.errAt(path, "%sbodies is missing: name the jointed body and its base, e.g. bodies = [\"flap\", \"frame\"], or one body to joint it to the world", sec.pre)
		return j, false
	case !isArr || len(a) < 1 || len(a) > 2 || len(bodyNames) != len(a):
		r.errAt(sub(path, "bodies"), "%sbodies must name one or two bodies, e.g. [\"flap\", \"frame\"] (one body is jointed to the world), got %s", sec.pre, show(bv))
		return j, false
	}
	bi := make([]int, len(bodyNames))
	for n, bn := range bodyNames {
		bi[n] = r.bodyNamed(bn, sub(path, "bodies", strconv.Itoa(n)), sec.pre)
	}
	if r.n > nerr {
		return j, false
	}
	j.A = bodyNames[0]
	if len(bodyNames) == 2 {
		j.B = bodyNames[1]
		if j.A == j.B {
			r.errAt(sub(path, "bodies"), "%sjoins body %q to itself; name two different bodies", sec.pre, j.A)
			return j, false
		}
	}
	dynA := !r.s.Bodies[bi[0]].Static
	dynB := len(bi) == 2 && !r.s.Bodies[bi[1]].Static
	if !dynA && !dynB {
		r.errAt(sub(path, "bodies"), "%sneither body moves under gravity and contact (%s); a joint needs at least one that does", sec.pre, r.s.Bodies[bi[0]].kindName())
		return j, false
	}
	if !dynA {
		// Positions, speeds and reactions are those of the first body,
		// relative to the second: the moving one comes first.
		r.errAt(sub(path, "bodies"), "%sthe first body %q is %s; name the moving body first, its base second", sec.pre, j.A, r.s.Bodies[bi[0]].kindName())
		return j, false
	}

	// Geometry.
	needs := func(key, why string) bool {
		if _, given := m[key]; !given {
			r.errAt(path, "%sa %s joint needs %s", sec.pre, kind, why)
			return false
		}
		return true
	}
	refuse := func(key, why string) {
		if _, given := m[key]; given {
			r.errAt(sub(path, key), "%sa %s joint takes no %s: %s", sec.pre, kind, key, why)
		}
	}
	def.Anchor = r.s.Bodies[bi[0]].Position
	switch k {
	case engine.Revolute, engine.Spherical, engine.Distance:
		needs("at", "at = [x, y, z], the world point where it holds")
	}
	def.Anchor, _ = r.vector(sec, "at", Length, def.Anchor)
	if k == engine.Distance {
		if needs("at_other", "at_other = [x, y, z], the world point on the second body (or the world) at the other end") {
			def.AnchorB, _ = r.vector(sec, "at_other", Length, shapes.Vec3{})
		}
	} else {
		refuse("at_other", "only a link has two ends")
	}
	switch k {
	case engine.Revolute, engine.Prismatic:
		what := "axis = [x, y, z], the line it turns about"
		if k == engine.Prismatic {
			what = "axis = [x, y, z], the direction of travel"
		}
		if needs("axis", what) {
			axis, ok := r.vector(sec, "axis", Dimensionless, shapes.Vec3{})
			if ok && !(axis.Len() > 1e-12) {
				r.errAt(sub(path, "axis"), "%saxis must not be zero", sec.pre)
			}
			def.Axis = axis
		}
	default:
		refuse("axis", "it has no single axis")
	}

	// What bounds and resists the free motion.
	free := Angle // the unit of the free motion
	switch k {
	case engine.Prismatic:
		free = Length
	case engine.Revolute:
	default:
		refuse("limits", "it has no angle or travel to limit (a link bounds its length with length = [min, max])")
		refuse("friction", "it has no single free motion for friction to resist")
		refuse("motor", "only revolute and prismatic joints are driven by a motor")
	}
	if lv, given := m["limits"]; given && (k == engine.Revolute || k == engine.Prismatic) {
		lim, ok := r.pair(lv, free, sub(path, "limits"), sec.pre+"limits")
		if ok && lim[0] > lim[1] {
			r.errAt(sub(path, "limits"), "%slimits must be [lower, upper] with lower <= upper, got %.6g and %.6g %s", sec.pre, r.s.Units.FromSI(lim[0], free), r.s.Units.FromSI(lim[1], free), r.s.Units.Symbol(free))
		}
		def.Limited, def.Lower, def.Upper = true, lim[0], lim[1]
	}
	if k == engine.Distance {
		if lv, given := m["length"]; given {
			switch t := lv.(type) {
			case []any:
				lim, ok := r.pair(t, Length, sub(path, "length"), sec.pre+"length")
				if ok && !(0 <= lim[0] && lim[0] <= lim[1]) {
					r.errAt(sub(path, "length"), "%slength = [min, max] needs 0 <= min <= max", sec.pre)
				}
				def.MinLength, def.MaxLength = lim[0], lim[1]
			default:
				l, ok := r.quantity(lv, Length, sub(path, "length"), sec.pre+"length")
				if ok && !(l > 0) {
					r.errAt(sub(path, "length"), "%slength must be positive", sec.pre)
				}
				def.MinLength, def.MaxLength = l, l
			}
		}
	} else {
		refuse("length", "only a link has a length")
	}
	effort := Torque
	if k == engine.Prismatic {
		effort = Force
	}
	if k == engine.Revolute || k == engine.Prismatic {
		f, _ := r.number(sec, "friction", effort, 0)
		if f < 0 {
			r.errAt(sub(path, "friction"), "%sfriction (%s that resists the motion) must be >= 0", sec.pre, effort)
		}
		def.Friction = f
		if ms, ok := r.table(sec, "motor", fmt.Sprintf("the motor of joint %q", name), sec.pre+"motor "); ok {
			def.Motor, j.Program = r.motor(ms, k, free, effort)
		}
	}
	def.Collide, _ = r.boolean(sec, "collide", false)
	return j, r.n == nerr
}

// motor reads the motor table of a revolute or prismatic joint: a speed motor
// (speed, max_torque or max_force) or a servo (target, stiffness, damping,
// max_torque or max_force), with its program of later speeds or targets.
func (r *reader) motor(sec section, k engine.JointKind, free, effort Dim) (engine.Motor, []MotorChange) {
	capKey, other := "max_torque", "max_force"
	if k == engine.Prismatic {
		capKey, other = other, capKey
	}
	r.keys(sec, "speed", "target", "stiffness", "damping", capKey, "program")
	if _, wrong := sec.m[other]; wrong {
		r.errAt(sub(sec.path, other), "%s(use %s: a %s)", sec.pre, capKey, effort)
	}
	mo := engine.Motor{MaxForce: math.Inf(1)}
	speed, hasSpeed := r.number(sec, "speed", free.Per(Time), 0)
	target, hasTarget := r.number(sec, "target", free, 0)
	stiff, hasStiff := r.number(sec, "stiffness", effort.Per(free), 0)
	damp, hasDamp := r.number(sec, "damping", effort.Per(free).Times(Time), 0)
	if c, ok := r.number(sec, capKey, effort, 0); ok {
		if !(c > 0) {
			r.errAt(sub(sec.path, capKey), "%s%s must be positive (leave it out for no cap)", sec.pre, capKey)
		}
		mo.MaxForce = c
	}
	switch {
	case hasSpeed && (hasTarget || hasStiff || hasDamp):
		r.errAt(sec.path, "%sgive either speed (a speed motor) or target, stiffness and damping (a servo), not both", sec.pre)
	case hasSpeed:
		mo.Mode, mo.Speed = engine.MotorSpeed, speed
	case hasTarget:
		if stiff < 0 || damp < 0 || !(stiff > 0 || damp > 0) {
			r.errAt(sec.path, "%sa servo needs stiffness > 0 or damping > 0, and neither negative", sec.pre)
		}
		mo.Mode, mo.Target, mo.Stiffness, mo.Damping = engine.MotorServo, target, stiff, damp
	default:
		r.errAt(sec.path, "%sgive speed = ... for a speed motor, or target = ... with stiffness and damping for a servo", sec.pre)
	}
	pv, given := sec.m["program"]
	if !given {
		return mo, nil
	}
	list, ok := arrayOfTables(pv)
	if !ok || len(list) == 0 {
		r.errAt(sub(sec.path, "program"), "%sprogram must be a list such as [{ time = 0.5, target = 30 }, { time = 1.2, target = 0 }], got %s", sec.pre, show(pv))
		return mo, nil
	}
	key, d, kind := "speed", free.Per(Time), "speed"
	if mo.Mode == engine.MotorServo {
		key, d, kind = "target", free, "servo"
	}
	var prog []MotorChange
	last := math.Inf(-1)
	for i, m := range list {
		p := sub(sec.path, "program", strconv.Itoa(i))
		ps := section{m: m, path: p, name: fmt.Sprintf("program entry %d", i+1), pre: fmt.Sprintf("%sprogram entry %d: ", sec.pre, i+1)}
		nerr := r.n
		unknown := r.keys(ps, "time", key)
		for _, need := range []string{"time", key} {
			if _, given := m[need]; !given && unknown == 0 { // a misspelt key is reported once
				r.errAt(p, "%s%s is missing (a %s motor's program gives time and %s)", ps.pre, need, kind, key)
			}
		}
		t, _ := r.number(ps, "time", Time, 0)
		x, _ := r.number(ps, key, d, 0)
		if r.n > nerr {
			continue
		}
		if t < 0 || t < last {
			r.errAt(sub(p, "time"), "%stimes must be >= 0 and in order, got %g s after %g s", ps.pre, t, math.Max(last, 0))
			continue
		}
		last = t
		c := MotorChange{Time: t, Motor: mo}
		if key == "target" {
			c.Motor.Target = x
		} else {
			c.Motor.Speed = x
		}
		prog = append(prog, c)
	}
	return mo, prog
}

// pair reads an array of two quantities.
func (r *reader) pair(v any, d Dim, path []string, what string) ([2]float64, bool) {
	a, ok := v.([]any)
	if !ok || len(a) != 2 {
		r.errAt(path, "%s must be an array of 2 numbers [low, high], got %s", what, show(v))
		return [2]float64{}, false
	}
	var out [2]float64
	good := true
	for i, x := range a {
		q, ok := r.quantity(x, d, sub(path, strconv.Itoa(i)), fmt.Sprintf("%s[%d]", what, i))
		good = good && ok
		out[i] = q
	}
	return out, good
}

func quoted(s []string) []string {
	out := make([]string, len(s))
	for i, x := range s {
		out[i] = strconv.Quote(x)
	}
	return out
}

func (r *reader) drives(root section) {
	list, ok := r.sections(root, "drive")
	if !ok {
		r.undriven()
		return
	}
	seen := map[string]int{}
	for i, m := range list {
		d, ok := r.drive(i, m)
		if !ok {
			continue
		}
		if k, dup := seen[d.Body]; dup {
			r.errAt([]string{"drive", strconv.Itoa(i), "body"}, "drive of %q: the body is already driven by the [[drive]] at line %d; put all its motion in one [[drive]] (vibration takes several terms)", d.Body, r.s.Drives[k].Line)
			continue
		}
		seen[d.Body] = len(r.s.Drives)
		r.s.Drives = append(r.s.Drives, d)
	}
	r.undriven()
}

// undriven refuses driven bodies that no [[drive]] moves.
func (r *reader) undriven() {
	for i, b := range r.s.Bodies {
		if !b.Driven {
			continue
		}
		if k := r.s.DriveIndex(b.Name); k < 0 || r.s.Drives[k].Motion == nil {
			r.errAt([]string{"body", strconv.Itoa(i), "driven"}, "body %q: driven = true, but no [[drive]] names it; add one with vibration, tilt or path, or make the body static", b.Name)
		}
	}
}

// DriveIndex returns the index of the drive of a body in s.Drives, or -1.
func (s *Scene) DriveIndex(body string) int {
	for i := range s.Drives {
		if s.Drives[i].Body == body {
			return i
		}
	}
	return -1
}

var motionKeys = []string{"vibration", "tilt", "path"}

func (r *reader) drive(i int, m map[string]any) (Drive, bool) {
	path := []string{"drive", strconv.Itoa(i)}
	sec := section{m: m, path: path, name: fmt.Sprintf("[[drive]] number %d", i+1), pre: fmt.Sprintf("[[drive]] number %d: ", i+1)}
	d := Drive{Line: r.s.lines.line(path)}
	nerr := r.n
	r.keys(sec, "body", "vibration", "center", "tilt", "path", "repeat", "conveyor")
	name, ok := r.required(sec, "body", "name the body to drive")
	if !ok {
		return d, false
	}
	sec.pre = fmt.Sprintf("drive of %q: ", name)
	sec.name = fmt.Sprintf("the [[drive]] of %q", name)
	bi := r.bodyNamed(name, sub(path, "body"), sec.pre)
	if bi < 0 {
		return d, false
	}
	b := &r.s.Bodies[bi]
	d.Body = name
	var motions []string
	for _, k := range motionKeys {
		if _, given := m[k]; given {
			motions = append(motions, k)
		}
	}
	_, hasConveyor := m["conveyor"]
	switch {
	case len(motions) > 1:
		r.errAt(path, "%sgive one of vibration, tilt and path, got %s", sec.pre, strings.Join(motions, " and "))
		return d, false
	case len(motions) == 0 && !hasConveyor:
		r.errAt(path, "%sgive vibration, tilt, path or conveyor", sec.pre)
		return d, false
	case !b.Static:
		r.errAt(sub(path, "body"), "%sbody %q is dynamic (moved by gravity and contact); a drive moves a body with driven = true, or gives a static one a conveyor surface", sec.pre, name)
		return d, false
	case len(motions) == 1 && !b.Driven:
		r.errAt(sub(path, motions[0]), "%sbody %q is static, so it cannot be moved by %s; write driven = true in its [[body]] instead of static = true", sec.pre, name, motions[0])
		return d, false
	}
	if hasConveyor {
		d.Conveyor, _ = r.vector(sec, "conveyor", Speed, shapes.Vec3{})
	}
	if len(motions) == 0 {
		for _, k := range []string{"center", "repeat"} {
			if _, given := m[k]; given {
				r.errAt(sub(path, k), "%s%s belongs to a vibration or a path", sec.pre, k)
			}
		}
		return d, r.n == nerr
	}
	if motions[0] != "vibration" {
		if _, given := m["center"]; given {
			r.errAt(sub(path, "center"), "%scenter belongs to a vibration (a tilt turns about its through point)", sec.pre)
		}
	}
	if motions[0] != "path" {
		if _, given := m["repeat"]; given {
			r.errAt(sub(path, "repeat"), "%srepeat belongs to a path", sec.pre)
		}
	}
	switch motions[0] {
	case "vibration":
		d.Motion = r.vibration(sec, b)
	case "tilt":
		d.Motion = r.tilt(sec, b)
	case "path":
		d.Motion, d.PathFile = r.posePath(sec)
	}
	return d, r.n == nerr && d.Motion != nil
}

// vibration reads vibration = [{along|turn, amplitude, frequency, phase}, ...].
func (r *reader) vibration(sec section, b *Body) engine.Motion {
	path := sub(sec.path, "vibration")
	v := sec.m["vibration"]
	if t, isTable := v.(map[string]any); isTable {
		v = []map[string]any{t} // one term written as a table
	}
	list, ok := arrayOfTables(v)
	if !ok || len(list) == 0 {
		r.errAt(path, "%svibration must be a list of terms such as [{ along = [0, 0, 1], amplitude = \"0.5 mm\", frequency = \"50 Hz\" }], got %s", sec.pre, show(v))
		return nil
	}
	vib := &engine.Vibration{Center: b.Position}
	vib.Center, _ = r.vector(sec, "center", Length, vib.Center)
	good := true
	for i, m := range list {
		p := sub(path, strconv.Itoa(i))
		ts := section{m: m, path: p, name: fmt.Sprintf("vibration term %d of %q", i+1, b.Name), pre: fmt.Sprintf("%svibration term %d: ", sec.pre, i+1)}
		nerr := r.n
		unknown := r.keys(ts, "along", "turn", "amplitude", "frequency", "phase")
		_, along := m["along"]
		_, turn := m["turn"]
		if along == turn && unknown == 0 {
			r.errAt(p, "%sgive along = [x, y, z] (a linear vibration) or turn = [x, y, z] (a rotary one about that axis), one of them", ts.pre)
			good = false
			continue
		}
		o := engine.Oscillation{Rotary: turn}
		axisKey, amp := "along", Length
		if turn {
			axisKey, amp = "turn", Angle
		}
		o.Axis, _ = r.vector(ts, axisKey, Dimensionless, shapes.Vec3{})
		if !(o.Axis.Len() > 1e-12) && r.n == nerr {
			r.errAt(sub(p, axisKey), "%s%s must not be zero", ts.pre, axisKey)
		}
		for _, k := range []string{"amplitude", "frequency"} {
			if _, given := m[k]; !given && unknown == 0 {
				r.errAt(p, "%s%s is missing", ts.pre, k)
			}
		}
		o.Amplitude, _ = r.number(ts, "amplitude", amp, 0)
		o.Frequency, _ = r.number(ts, "frequency", Frequency, 0)
		o.Phase, _ = r.number(ts, "phase", Angle, 0)
		if o.Amplitude < 0 {
			r.errAt(sub(p, "amplitude"), "%samplitude must be >= 0 (a phase of 180 reverses a term)", ts.pre)
		}
		if _, given := m["frequency"]; given && !(o.Frequency > 0) {
			r.errAt(sub(p, "frequency"), "%sfrequency must be positive", ts.pre)
		}
		if r.n > nerr {
			good = false
			continue
		}
		vib.Terms = append(vib.Terms, o)
	}
	if !good {
		return nil
	}
	return vib
}

// tilt reads tilt = { axis, through, rate, start, to }.
func (r *reader) tilt(sec section, b *Body) engine.Motion {
	ts, ok := r.table(sec, "tilt", fmt.Sprintf("the tilt of %q", b.Name), sec.pre+"tilt ")
	if !ok {
		return nil
	}
	nerr := r.n
	unknown := r.keys(ts, "axis", "through", "rate", "start", "to")
	for _, k := range []string{"axis", "rate"} {
		if _, given := ts.m[k]; !given && unknown == 0 {
			r.errAt(ts.path, "%s%s is missing (tilt = { axis = [0, 1, 0], rate = \"2 deg/s\" })", ts.pre, k)
		}
	}
	tl := &engine.Tilt{Point: b.Position}
	tl.Axis, _ = r.vector(ts, "axis", Dimensionless, shapes.Vec3{})
	if _, given := ts.m["axis"]; given && !(tl.Axis.Len() > 1e-12) {
		r.errAt(sub(ts.path, "axis"), "%saxis must not be zero", ts.pre)
	}
	tl.Point, _ = r.vector(ts, "through", Length, tl.Point)
	tl.Rate, _ = r.number(ts, "rate", AngularSpeed, 0)
	if _, given := ts.m["rate"]; given && !(tl.Rate > 0) {
		r.errAt(sub(ts.path, "rate"), "%srate must be positive; turn the axis around to tilt the other way", ts.pre)
	}
	tl.Start, _ = r.number(ts, "start", Time, 0)
	if tl.Start < 0 {
		r.errAt(sub(ts.path, "start"), "%sstart must be >= 0 s", ts.pre)
	}
	if to, given := r.number(ts, "to", Angle, 0); given {
		if !(to > 0) {
			r.errAt(sub(ts.path, "to"), "%sto must be a positive angle (the tilt where the table stops); leave it out to keep turning", ts.pre)
		}
		tl.Angle = to
	}
	if r.n > nerr {
		return nil
	}
	return tl
}

// posePath reads path = "poses.csv" and repeat.
func (r *reader) posePath(sec section) (engine.Motion, string) {
	file, ok := r.str(sec, "path")
	if !ok {
		return nil, ""
	}
	p, data, err := r.s.readFile(file)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			r.errAt(sub(sec.path, "path"), "%spose table %q not found (looked for %s; paths are relative to the scene file)", sec.pre, file, p)
		} else {
			r.errAt(sub(sec.path, "path"), "%scannot read pose table %q: %v", sec.pre, file, unwrapPath(err))
		}
		return nil, ""
	}
	table, err := engine.ReadPoseTable(bytes.NewReader(data), file, r.s.Units.L)
	if err != nil {
		r.errAt(sub(sec.path, "path"), "%s%v", sec.pre, err)
		return nil, ""
	}
	table.Relative = true // moves from where the scene puts the body
	table.Repeat, _ = r.boolean(sec, "repeat", false)
	if table.Repeat {
		last := len(table.Times) - 1
		if len(table.Times) < 2 || !(table.Times[last] > table.Times[0]) {
			r.errAt(sub(sec.path, "repeat"), "%sa repeated pose table needs at least two rows with increasing times", sec.pre)
			return nil, ""
		}
	}
	return table, p
}
