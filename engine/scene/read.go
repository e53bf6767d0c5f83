package scene

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"math/rand/v2"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"clatter/engine"
	"clatter/shapes"
	"clatter/shapes/mesh"
	"clatter/units"

	"github.com/go-gl/mathgl/mgl64"
)

// Defaults of [world], chosen for parts of centimetres to decimetres.
const (
	DefaultStep     = 0.001 // s: resolves impacts of such parts at a few m/s
	DefaultDuration = 5.0   // s: long enough for dropped parts to settle
	DefaultSeed     = 1
)

// section is a table of the document with what errors need to name it.
type section struct {
	m    map[string]any
	path []string // for line numbers
	name string   // "[world]", "body \"cap\"": where unknown keys are
	pre  string   // prefix of value errors: "[world] ", "body \"cap\": "
}

type reader struct {
	s    *Scene
	errs Errors
	warn []string
	n    int // problems found, including those past maxErrors
	// moved maps the path of a key read under its new name to where its
	// old name is written (alias.go).
	moved map[string][]string
}

// line returns the line where the key at path is written.
func (r *reader) line(path []string) int {
	for n := len(path); n > 0 && len(r.moved) > 0; n-- {
		if old, ok := r.moved[pathKey(path[:n])]; ok {
			return r.s.lines.line(append(append([]string{}, old...), path[n:]...))
		}
	}
	return r.s.lines.line(path)
}

func (r *reader) errAt(path []string, format string, args ...any) {
	r.n++
	if len(r.errs) >= maxErrors {
		return
	}
	r.errs = append(r.errs, &Error{File: r.s.File, Line: r.line(path), Msg: fmt.Sprintf(format, args...)})
}

func (r *reader) warnAt(path []string, format string, args ...any) {
	r.warn = append(r.warn, fmt.Sprintf("%s:%d: %s", r.s.File, r.line(path), fmt.Sprintf(format, args...)))
}

func sub(p []string, k ...string) []string { return append(append([]string{}, p...), k...) }

func typeName(v any) string {
	switch v.(type) {
	case string:
		return "a string"
	case int64:
		return "an integer"
	case float64:
		return "a number"
	case bool:
		return "true or false"
	case []any:
		return "an array"
	case map[string]any:
		return "a table"
	case []map[string]any:
		return "an array of tables"
	}
	return fmt.Sprintf("a %T", v)
}

func show(v any) string {
	switch t := v.(type) {
	case string:
		return strconv.Quote(t)
	case []any, map[string]any, []map[string]any:
		return typeName(v)
	}
	return fmt.Sprint(v)
}

// quantity converts a value of dimension d to SI: a plain number in the
// file's units or a string with its own unit.
func (r *reader) quantity(v any, d Dim, path []string, what string) (float64, bool) {
	x, ok := r.quantitySI(v, d, path, what)
	if !ok || !r.inRange(x, d, path, what) {
		return 0, false
	}
	return x, true
}

func (r *reader) quantitySI(v any, d Dim, path []string, what string) (float64, bool) {
	switch t := v.(type) {
	case int64:
		return float64(t) * r.s.Units.Plain(d), true
	case float64:
		if math.IsNaN(t) || math.IsInf(t, 0) {
			r.errAt(path, "%s must be a finite number, got %v", what, t)
			return 0, false
		}
		return t * r.s.Units.Plain(d), true
	case string:
		x, qd, err := ParseQuantity(t)
		if err != nil {
			r.errAt(path, "%s: %v; write a number, or a number and a unit such as %s", what, err, exampleOr(d))
			return 0, false
		}
		if qd == Dimensionless {
			return x * r.s.Units.Plain(d), true
		}
		if qd != d {
			if d == Dimensionless {
				r.errAt(path, "%s is a plain number without unit, got %q (%s)", what, t, qd)
			} else {
				r.errAt(path, "%s must be %s, got %q, which is %s (e.g. %s)", what, d, t, qd, d.Example())
			}
			return 0, false
		}
		return x, true
	}
	r.errAt(path, "%s must be %s (a number or a string with a unit), got %s", what, d, show(v))
	return 0, false
}

func exampleOr(d Dim) string {
	if e := d.Example(); e != "" && d != Dimensionless {
		return e
	}
	return `"2 mm"`
}

// value returns the value of sec at key, for the sections still read key
// by key.
func (sec section) value(key string) value {
	v := sec.m[key]
	return value{v: v, path: sub(sec.path, key), key: key}
}

// scalar reads an optional quantity of sec.
func (r *reader) scalar(sec section, q Quantity, d Dim, def float64) (float64, bool) {
	if !q.Given() {
		return def, false
	}
	x, good := r.quantity(q.v, d, q.path, sec.pre+q.key)
	if !good {
		return def, false
	}
	return x, true
}

// vec3 reads an optional 3-vector of sec.
func (r *reader) vec3(sec section, v Vector, d Dim, def shapes.Vec3) (shapes.Vec3, bool) {
	if !v.Given() {
		return def, false
	}
	return r.vec(v.v, d, v.path, sec.pre+v.key, 3)
}

// text reads an optional string of sec.
func (r *reader) text(sec section, t Text) (string, bool) {
	return typed(r, sec, t.value, "", "a string")
}

// flag reads an optional true or false of sec.
func (r *reader) flag(sec section, f Flag, def bool) (bool, bool) {
	return typed(r, sec, f.value, def, "true or false")
}

// whole reads an optional whole number of sec.
func (r *reader) whole(sec section, w Whole, def int64) (int64, bool) {
	return typed(r, sec, w.value, def, "a whole number")
}

// subTable reads an optional table of parent as a section of its own.
func (r *reader) subTable(parent section, t Table, name, pre string) (section, bool) {
	m, ok := typed[map[string]any](r, parent, t.value, nil, "a table")
	if !ok {
		return section{}, false
	}
	return section{m: m, path: t.path, name: name, pre: pre}, true
}

// typed returns x as a T, or def if it is not given or, with a message
// saying it must be what, not a T.
func typed[T any](r *reader, sec section, x value, def T, what string) (T, bool) {
	if !x.Given() {
		return def, false
	}
	v, ok := x.v.(T)
	if !ok {
		r.errAt(x.path, "%s%s must be %s, got %s", sec.pre, x.key, what, show(x.v))
		return def, false
	}
	return v, true
}

// number, vector, str, boolean and table read a key of a section
// read key by key.
func (r *reader) number(sec section, key string, d Dim, def float64) (float64, bool) {
	return r.scalar(sec, Quantity{sec.value(key)}, d, def)
}

func (r *reader) vector(sec section, key string, d Dim, def shapes.Vec3) (shapes.Vec3, bool) {
	return r.vec3(sec, Vector{sec.value(key)}, d, def)
}

func (r *reader) str(sec section, key string) (string, bool) {
	return r.text(sec, Text{sec.value(key)})
}

func (r *reader) boolean(sec section, key string, def bool) (bool, bool) {
	return r.flag(sec, Flag{sec.value(key)}, def)
}

func (r *reader) table(parent section, key, name, pre string) (section, bool) {
	return r.subTable(parent, Table{parent.value(key)}, name, pre)
}

// vec reads an array of n quantities.
func (r *reader) vec(v any, d Dim, path []string, what string, n int) (shapes.Vec3, bool) {
	a, ok := v.([]any)
	if !ok || len(a) != n {
		got := show(v)
		if ok {
			got = fmt.Sprintf("%d elements", len(a))
		}
		r.errAt(path, "%s must be an array of %d numbers, got %s", what, n, got)
		return shapes.Vec3{}, false
	}
	var out shapes.Vec3
	good := true
	for i, x := range a {
		q, ok := r.quantity(x, d, sub(path, strconv.Itoa(i)), fmt.Sprintf("%s[%d]", what, i))
		good = good && ok
		if i < 3 {
			out[i] = q
		}
	}
	return out, good
}

// read checks the decoded document and fills the scene.
func (s *Scene) read() (*Scene, error) {
	r := &reader{s: s}
	s.Units = SI
	root := section{m: s.raw, name: "the scene's top level"}
	r.keys(root, "units", "world", "material", "pair", "body", "joint", "drive", "kick", "gate", "sweep", "drop")
	r.units(root)
	r.world(root)
	r.materials(root)
	r.pairs(root)
	r.bodies(root)
	r.joints(root)
	r.drives(root)
	r.kicks(root)
	r.gates(root) // gate.go
	r.sweep(root)
	r.drop(root)
	if r.n == 0 {
		r.checkStep()
	}
	s.Warnings = r.warn
	if len(r.errs) > 0 {
		sort.SliceStable(r.errs, func(i, j int) bool { return r.errs[i].Line < r.errs[j].Line })
		return nil, r.errs
	}
	return s, nil
}

// unitsKeys are the keys of units = { length, mass }.
type unitsKeys struct {
	Length Text `toml:"length"`
	Mass   Text `toml:"mass"`
}

func (r *reader) units(root section) {
	v, ok := root.m["units"]
	if !ok {
		return
	}
	m, ok := v.(map[string]any)
	if !ok {
		r.errAt([]string{"units"}, `units must be a table such as units = { length = "mm", mass = "g" }, got %s`, show(v))
		return
	}
	sec := section{m: m, path: []string{"units"}, name: "units", pre: "units: "}
	var k unitsKeys
	r.decode(sec, &k)
	l, m0 := "m", "kg"
	if x, ok := r.text(sec, k.Length); ok {
		if _, known := LengthUnits[x]; !known {
			r.errAt(k.Length.path, "units: unknown length unit %q%s", x, Suggest(x, units.FileLengths))
		} else {
			l = x
		}
	}
	if x, ok := r.text(sec, k.Mass); ok {
		if _, known := MassUnits[x]; !known {
			r.errAt(k.Mass.path, "units: unknown mass unit %q%s", x, Suggest(x, units.FileMasses))
		} else {
			m0 = x
		}
	}
	u, err := NewUnits(l, m0)
	if err == nil {
		r.s.Units = u
	}
}

// worldKeys are the keys of [world].
type worldKeys struct {
	Gravity      Vector   `toml:"gravity"`
	Step         Quantity `toml:"step"`
	Duration     Quantity `toml:"duration"`
	UntilSettled Flag     `toml:"until_settled"`
	RestSpeed    Quantity `toml:"rest_speed"`
	RestSpin     Quantity `toml:"rest_spin"`
	RestTime     Quantity `toml:"rest_time"`
	Seed         Whole    `toml:"seed"`
}

func (r *reader) world(root section) {
	w := &r.s.World
	*w = Settings{
		Gravity:      shapes.Vec3{0, 0, -engine.StandardGravity},
		Step:         DefaultStep,
		Duration:     DefaultDuration,
		UntilSettled: true,
		RestSpeed:    engine.DefaultRestSpeed,
		RestSpin:     engine.DefaultRestSpin,
		RestTime:     engine.DefaultRestTime,
		Seed:         DefaultSeed,
	}
	sec, ok := r.table(root, "world", "[world]", "[world] ")
	if !ok {
		return
	}
	var k worldKeys
	r.decode(sec, &k)
	w.Gravity, _ = r.vec3(sec, k.Gravity, Acceleration, w.Gravity)
	positive := func(q Quantity, d Dim, v *float64) {
		x, ok := r.scalar(sec, q, d, *v)
		if !ok {
			return
		}
		if !(x > 0) {
			r.errAt(q.path, "[world] %s must be positive, got %s", q.key, show(q.v))
			return
		}
		*v = x
	}
	positive(k.Step, Time, &w.Step)
	positive(k.Duration, Time, &w.Duration)
	positive(k.RestSpeed, Speed, &w.RestSpeed)
	positive(k.RestSpin, AngularSpeed, &w.RestSpin)
	positive(k.RestTime, Time, &w.RestTime)
	w.UntilSettled, _ = r.flag(sec, k.UntilSettled, true)
	if seed, ok := r.whole(sec, k.Seed, DefaultSeed); ok {
		if seed < 0 {
			r.errAt(k.Seed.path, "[world] seed must be a whole number >= 0, got %d", seed)
		} else {
			w.Seed = uint64(seed)
		}
	}
	if w.Step > w.Duration {
		r.errAt(sub(sec.path, "step"), "[world] step %g s is longer than the duration %g s", w.Step, w.Duration)
	}
}

// contactKeys are the keys that materials and pairs share.
type contactKeys struct {
	Friction       Quantity `toml:"friction"`
	StaticFriction Quantity `toml:"static_friction"`
	Restitution    Quantity `toml:"restitution"`
	// Stiffness is a quantity ("40 N/mm") or a table (stiffness.go).
	Stiffness value `toml:"stiffness"`
}

// coefficients reads friction, static_friction and restitution of a
// material or pair section; missing ones are nil.
func (r *reader) coefficients(sec section, k contactKeys) (f, fs, e *float64) {
	get := func(q Quantity) *float64 {
		if !q.Given() {
			return nil
		}
		x, ok := r.quantitySI(q.v, Dimensionless, q.path, sec.pre+q.key)
		if ok && q.key != "restitution" && x > maxFriction {
			r.errAt(q.path, "%s%s %g is beyond any measured surface (dry surfaces stay below about 5); clatter accepts at most %d, and 10 already holds every contact that can hold", sec.pre, q.key, x, maxFriction)
			return nil
		}
		if !ok || !r.inRange(x, Dimensionless, q.path, sec.pre+q.key) {
			return nil
		}
		return &x
	}
	f, fs, e = get(k.Friction), get(k.StaticFriction), get(k.Restitution)
	if f != nil && *f < 0 {
		r.errAt(k.Friction.path, "%sfriction must be >= 0, got %g", sec.pre, *f)
		f = nil
	}
	if fs != nil && *fs < 0 {
		r.errAt(k.StaticFriction.path, "%sstatic_friction must be >= 0, got %g", sec.pre, *fs)
		fs = nil
	}
	if f != nil && fs != nil && *fs < *f {
		r.errAt(k.StaticFriction.path, "%sstatic_friction %g must be at least friction %g (a contact that sticks holds at least as well as one that slides)", sec.pre, *fs, *f)
		fs = nil
	}
	if e != nil && (*e < 0 || *e > 1) {
		r.errAt(k.Restitution.path, "%srestitution must be between 0 and 1, got %g", sec.pre, *e)
		e = nil
	}
	return f, fs, e
}

func (r *reader) materials(root section) {
	v, ok := root.m["material"]
	if !ok {
		return
	}
	all, ok := v.(map[string]any)
	if !ok {
		r.errAt([]string{"material"}, "material must be tables such as [material.abs], got %s", show(v))
		return
	}
	for _, n := range sortedKeys(all) {
		path := []string{"material", n}
		m, ok := all[n].(map[string]any)
		if !ok {
			r.errAt(path, "material %q must be a table [material.%s] with friction and restitution, got %s", n, n, show(all[n]))
			continue
		}
		if n == "" {
			r.errAt(path, "a material needs a name: [material.NAME]")
			continue
		}
		sec := section{m: m, path: path, name: fmt.Sprintf("[material.%s]", n), pre: fmt.Sprintf("material %q: ", n)}
		var k contactKeys
		unknown := r.decode(sec, &k)
		f, fs, e := r.coefficients(sec, k)
		mat := Material{Name: n, Line: r.s.lines.line(path), Stiffness: r.stiffness(sec, k.Stiffness)}
		if f == nil {
			if !k.Friction.Given() && unknown == 0 {
				r.errAt(path, "material %q: friction is missing; give the kinetic Coulomb coefficient measured for this material, e.g. friction = 0.35", n)
			}
		} else {
			mat.Friction = *f
		}
		mat.StaticFriction = mat.Friction
		if fs != nil {
			mat.StaticFriction = *fs
		}
		if e != nil {
			mat.Restitution = *e
		}
		r.s.Materials = append(r.s.Materials, mat)
	}
}

// knownMaterial checks a material name used by a body or pair.
func (r *reader) knownMaterial(name string, path []string, pre string) bool {
	if r.s.MaterialIndex(name) >= 0 || name == DefaultMaterial {
		return true
	}
	cands := []string{DefaultMaterial}
	for _, m := range r.s.Materials {
		cands = append(cands, m.Name)
	}
	r.errAt(path, "%sunknown material %q%s (materials are defined as [material.NAME])", pre, name, Suggest(name, cands))
	return false
}

// DefaultMaterial names the engine's default material (friction 0.5, no
// restitution), used by bodies that name none.
const DefaultMaterial = "default"

// sections returns the array of tables at key of root, written [[key]];
// false if there is none or it is something else, which it reports.
func (r *reader) sections(root section, key string) ([]map[string]any, bool) {
	v, ok := root.m[key]
	if !ok {
		return nil, false
	}
	list, ok := arrayOfTables(v)
	if !ok {
		r.errAt([]string{key}, "%s must be an array of tables: write each as [[%s]], got %s", key, key, show(v))
	}
	return list, ok
}

// required reads a string key that must be given and not blank; a missing
// or blank one is reported as "KEY is missing: " followed by hint.
func (r *reader) required(sec section, key, hint string) (string, bool) {
	return r.requiredText(sec, Text{sec.value(key)}, hint)
}

func (r *reader) requiredText(sec section, t Text, hint string) (string, bool) {
	v, ok := r.text(sec, t)
	if ok && strings.TrimSpace(v) != "" {
		return v, true
	}
	if !t.Given() || ok {
		r.errAt(sec.path, "%s%s is missing: %s", sec.pre, t.key, hint)
	}
	return "", false
}

func arrayOfTables(v any) ([]map[string]any, bool) {
	switch t := v.(type) {
	case []map[string]any:
		return t, true
	case []any:
		out := make([]map[string]any, len(t))
		for i, x := range t {
			m, ok := x.(map[string]any)
			if !ok {
				return nil, false
			}
			out[i] = m
		}
		return out, true
	}
	return nil, false
}

// pairKeys are the keys of a [[pair]].
type pairKeys struct {
	Materials value `toml:"materials"` // two names
	contactKeys
}

func (r *reader) pairs(root section) {
	list, ok := r.sections(root, "pair")
	if !ok {
		return
	}
	seen := map[[2]string]int{}
	for i, m := range list {
		path := []string{"pair", strconv.Itoa(i)}
		sec := section{m: m, path: path, name: fmt.Sprintf("[[pair]] number %d", i+1), pre: fmt.Sprintf("[[pair]] number %d: ", i+1)}
		var k pairKeys
		r.decode(sec, &k)
		names, ok := r.pairNames(&sec, k.Materials)
		if !ok {
			continue
		}
		good := r.knownMaterial(names[0], k.Materials.path, sec.pre)
		good = r.knownMaterial(names[1], k.Materials.path, sec.pre) && good
		key := [2]string{min(names[0], names[1]), max(names[0], names[1])}
		if j, dup := seen[key]; dup {
			r.errAt(path, "%sthis pair of materials is already given in the [[pair]] at line %d", sec.pre, r.s.Pairs[j].Line)
			continue
		}
		p := Pair{A: names[0], B: names[1], Line: r.s.lines.line(path)}
		p.Friction, p.StaticFriction, p.Restitution = r.coefficients(sec, k.contactKeys)
		p.Stiffness = r.stiffness(sec, k.Stiffness)
		if p.Friction == nil && p.StaticFriction == nil && p.Restitution == nil && len(m) == 1 {
			r.errAt(path, "%sgive at least one of friction, static_friction, restitution and stiffness", sec.pre)
		}
		if good {
			seen[key] = len(r.s.Pairs)
			r.s.Pairs = append(r.s.Pairs, p)
		}
	}
}

// pairNames reads the two material names of a [[pair]] and names sec by
// them.
func (r *reader) pairNames(sec *section, mats value) ([2]string, bool) {
	if !mats.Given() {
		r.errAt(sec.path, "%smaterials is missing: name the two materials, e.g. materials = [\"abs\", \"steel\"]", sec.pre)
		return [2]string{}, false
	}
	a, ok := mats.v.([]any)
	var names []string
	for _, x := range a {
		if s, isStr := x.(string); isStr {
			names = append(names, s)
		}
	}
	if !ok || len(a) != 2 || len(names) != 2 {
		r.errAt(mats.path, "%smaterials must name two materials, e.g. [\"abs\", \"steel\"], got %s", sec.pre, show(mats.v))
		return [2]string{}, false
	}
	sec.pre = fmt.Sprintf("[[pair]] %s/%s: ", names[0], names[1])
	return [2]string{names[0], names[1]}, true
}

func (r *reader) bodies(root section) {
	if _, ok := root.m["body"]; !ok {
		r.errAt(nil, "the scene has no bodies: add at least one [[body]] section")
		return
	}
	list, ok := r.sections(root, "body")
	if !ok {
		return
	}
	names := map[string]int{}
	dynamic := 0
	for i, m := range list {
		b, ok := r.body(i, m)
		if !ok {
			continue
		}
		if j, dup := names[b.Name]; dup {
			r.errAt([]string{"body", strconv.Itoa(i), "name"}, "body %q: the name is already used by the body at line %d; names must be unique", b.Name, r.s.Bodies[j].Line)
			continue
		}
		names[b.Name] = len(r.s.Bodies)
		if !b.Static {
			dynamic++
		}
		r.s.Bodies = append(r.s.Bodies, b)
	}
	if dynamic == 0 && r.n == 0 {
		r.errAt([]string{"body"}, "the scene has no moving body: every body is static; give one a density or mass and leave out static = true")
	}
}

// bodyKeys are the keys of a [[body]].
type bodyKeys struct {
	Name         Text     `toml:"name"`
	Shape        Table    `toml:"shape"`
	Static       Flag     `toml:"static"`
	Driven       Flag     `toml:"driven"`
	Material     Text     `toml:"material"`
	Density      Quantity `toml:"density"`
	Mass         Quantity `toml:"mass"`
	Position     Vector   `toml:"position"`
	Orientation  value    `toml:"orientation"` // "random" or a table (orientation)
	Velocity     Vector   `toml:"velocity"`
	Spin         Vector   `toml:"spin"`
	CenterOfMass Vector   `toml:"center_of_mass"`
	Inertia      value    `toml:"inertia"` // a 3x3 matrix or its 6 entries (mass.go)
}

func (r *reader) body(i int, m map[string]any) (Body, bool) {
	path := []string{"body", strconv.Itoa(i)}
	sec := section{m: m, path: path, name: fmt.Sprintf("[[body]] number %d", i+1), pre: fmt.Sprintf("[[body]] number %d: ", i+1)}
	b := Body{Line: r.s.lines.line(path), Orientation: mgl64.QuatIdent()}
	name, ok := r.required(sec, "name", "every body needs a unique name = \"...\"")
	if !ok {
		return b, false
	}
	b.Name = name
	sec.name = fmt.Sprintf("body %q", name)
	sec.pre = fmt.Sprintf("body %q: ", name)
	nerr := r.n
	var k bodyKeys
	r.decode(sec, &k)

	static, staticGiven := r.flag(sec, k.Static, false)
	driven, drivenGiven := r.flag(sec, k.Driven, false)
	if static && driven {
		r.errAt(k.Driven.path, "%sa body is either static (it never moves) or driven (it moves as a [[drive]] says), not both", sec.pre)
	}
	b.Static, b.Driven = static || driven, driven
	staticGiven = staticGiven || drivenGiven
	if mat, ok := r.text(sec, k.Material); ok {
		if r.knownMaterial(mat, k.Material.path, sec.pre) {
			b.Material = mat
		}
	}
	b.Position, _ = r.vec3(sec, k.Position, Length, shapes.Vec3{})
	b.Velocity, _ = r.vec3(sec, k.Velocity, Speed, shapes.Vec3{})
	b.Spin, _ = r.vec3(sec, k.Spin, AngularSpeed, shapes.Vec3{})
	r.orientation(sec, k.Orientation, &b, i)

	shapeSec, ok := r.subTable(sec, k.Shape, fmt.Sprintf("the shape of body %q", name), sec.pre+"shape ")
	if !ok {
		if !k.Shape.Given() {
			r.errAt(path, "%sshape is missing: give one of shape = { box = [x, y, z] }, { sphere = r }, { cylinder = [r, length] }, { capsule = [r, length] }, { plane = [nx, ny, nz] }, { mesh = \"part.stl\" }", sec.pre)
		}
		return b, false
	}
	r.shape(shapeSec, &b, staticGiven)
	r.massOf(sec, k, &b)
	if b.Static {
		r.noMotion(sec, k, static, driven)
	}
	if r.n > nerr || b.Shape == nil {
		return b, false
	}
	if !b.Static {
		r.massProps(&b, k.Shape.path, sec.pre)
		r.measured(sec, k.CenterOfMass, k.Inertia, &b)
	}
	return b, r.n == nerr
}

// noMotion refuses the keys of motion and mass on a body that does not
// move by contact.
func (r *reader) noMotion(sec section, k bodyKeys, static, driven bool) {
	why, what := "remove it, or leave out static = true", "a static body does not move"
	switch {
	case driven:
		why, what = "remove it, or leave out driven = true", "a driven body moves only as its [[drive]] says"
	case !static:
		why = "remove it (planes and meshes kept as triangles are always static)"
	}
	for _, v := range []value{k.Density.value, k.Mass.value, k.Velocity.value, k.Spin.value, k.CenterOfMass.value, k.Inertia} {
		if v.Given() {
			r.errAt(v.path, "%s%s, so it takes no %s; %s", sec.pre, what, v.key, why)
		}
	}
}

// massOf reads the density and the mass, and keeps one for a moving body.
func (r *reader) massOf(sec section, k bodyKeys, b *Body) {
	density, hasDensity := r.scalar(sec, k.Density, Density, 0)
	mass, hasMass := r.scalar(sec, k.Mass, Mass, 0)
	if b.Static {
		return
	}
	switch {
	case k.Density.Given() && k.Mass.Given():
		r.errAt(k.Mass.path, "%sgive either density or mass, not both", sec.pre)
	case !k.Density.Given() && !k.Mass.Given():
		r.errAt(sec.path, "%sa moving body needs a density (e.g. density = \"1.05 g/cm3\") or a mass; or set static = true", sec.pre)
	case hasDensity && !(density > 0):
		r.errAt(k.Density.path, "%sdensity must be positive, got %s", sec.pre, show(k.Density.v))
	case hasMass && !(mass > 0):
		r.errAt(k.Mass.path, "%smass must be positive, got %s", sec.pre, show(k.Mass.v))
	case hasDensity:
		b.Density = density
	case hasMass:
		b.Mass = mass
	}
}

// massProps fills b.Props for a dynamic body.
func (r *reader) massProps(b *Body, path []string, pre string) {
	var unit shapes.Mass // at density 1
	switch {
	case b.Part != nil:
		unit = b.Part.Mass(1)
	case b.Kind == "pieces":
		unit = b.Shape.(*shapes.Compound).Mass(1)
	default:
		c, ok := b.Shape.(shapes.Convex)
		if !ok {
			r.errAt(path, "%sthis shape cannot move", pre)
			return
		}
		unit = c.Mass(1)
	}
	switch {
	case math.IsInf(unit.Volume, 0) || math.IsNaN(unit.Volume):
		r.errAt(path, "%sthe shape is too large: its volume overflows; give its sizes in the scene's length unit", pre)
		return
	case !(unit.Volume > 0):
		r.errAt(path, "%sthe shape has no volume, so it has no mass", pre)
		return
	}
	if b.Density > 0 {
		b.Props = unit.Scaled(b.Density)
	} else {
		b.Props = unit.WithMass(b.Mass)
	}
	r.finiteProps(b, path, pre)
	if !(b.Props.Mass > 0) || math.IsInf(b.Props.Mass, 0) {
		r.errAt(path, "%smass must be positive and finite, got %g kg", pre, b.Props.Mass)
	}
}

// orientationKeys are the keys of a table orientation.
type orientationKeys struct {
	Axis       Vector   `toml:"axis"`
	Angle      Quantity `toml:"angle"`
	Quaternion value    `toml:"quaternion"` // [w, x, y, z]
}

// orientation reads the orientation of a body or a piece: "random" or a
// table of orientationKeys.
func (r *reader) orientation(sec section, o value, b *Body, index int) {
	if !o.Given() {
		return
	}
	v, path := o.v, o.path
	if s, isStr := v.(string); isStr {
		if s != "random" {
			r.errAt(path, "%sorientation must be \"random\" or a table { axis = [x, y, z], angle = degrees }, got %q", sec.pre, s)
			return
		}
		b.RandomOrientation = true
		rng := rand.New(rand.NewPCG(r.s.World.Seed, uint64(index)))
		b.Orientation = RandomOrientation(rng)
		return
	}
	m, isMap := v.(map[string]any)
	if !isMap {
		r.errAt(path, "%sorientation must be \"random\" or a table { axis = [x, y, z], angle = degrees }, got %s", sec.pre, show(v))
		return
	}
	osec := section{m: m, path: path, name: fmt.Sprintf("the orientation of body %q", b.Name), pre: sec.pre + "orientation "}
	var k orientationKeys
	r.decode(osec, &k)
	if k.Quaternion.Given() {
		if k.Axis.Given() || k.Angle.Given() {
			r.errAt(path, "%sorientation: give either quaternion or axis and angle, not both", sec.pre)
			return
		}
		q, ok := r.quaternion(sec, k.Quaternion)
		if ok {
			b.Orientation = q
		}
		return
	}
	axis, okA := r.vec3(osec, k.Axis, Dimensionless, shapes.Vec3{})
	angle, okN := r.scalar(osec, k.Angle, Angle, 0)
	if !k.Axis.Given() || !k.Angle.Given() {
		r.errAt(path, "%sorientation needs both axis = [x, y, z] and angle = degrees", sec.pre)
		return
	}
	if !okA || !okN {
		return
	}
	if !(axis.Len() > 1e-12) {
		r.errAt(k.Axis.path, "%sorientation axis must not be zero", sec.pre)
		return
	}
	b.Orientation = mgl64.QuatRotate(angle, axis.Normalize())
}

// quaternion reads an orientation written as a quaternion [w, x, y, z].
func (r *reader) quaternion(sec section, qv value) (shapes.Quat, bool) {
	a, isArr := qv.v.([]any)
	if !isArr || len(a) != 4 {
		r.errAt(qv.path, "%sorientation quaternion must be [w, x, y, z], got %s", sec.pre, show(qv.v))
		return shapes.Quat{}, false
	}
	var q [4]float64
	for i, x := range a {
		f, ok := r.quantity(x, Dimensionless, sub(qv.path, strconv.Itoa(i)), sec.pre+"orientation quaternion")
		if !ok {
			return shapes.Quat{}, false
		}
		q[i] = f
	}
	quat := mgl64.Quat{W: q[0], V: mgl64.Vec3{q[1], q[2], q[3]}}
	if l := quat.Len(); !(l > 1e-9) {
		r.errAt(qv.path, "%sorientation quaternion must not be zero", sec.pre)
		return shapes.Quat{}, false
	}
	return quat.Normalize(), true
}

// RandomOrientation draws a rotation uniformly from all rotations
// (K. Shoemake, "Uniform random rotations", Graphics Gems III, 1992).
func RandomOrientation(rng *rand.Rand) shapes.Quat {
	u1, u2, u3 := rng.Float64(), rng.Float64(), rng.Float64()
	a, b := math.Sqrt(1-u1), math.Sqrt(u1)
	t1, t2 := 2*math.Pi*u2, 2*math.Pi*u3
	return mgl64.Quat{W: b * math.Cos(t2), V: mgl64.Vec3{a * math.Sin(t1), a * math.Cos(t1), b * math.Sin(t2)}}
}

// shapeKeys are the keys of a body's shape: one kind of shape, and for a
// mesh how to keep it and its file's unit.
type shapeKeys struct {
	Box      Vector   `toml:"box"`
	Sphere   Quantity `toml:"sphere"`
	Cylinder value    `toml:"cylinder"` // [radius, length]
	Capsule  value    `toml:"capsule"`  // [radius, length]
	Plane    Vector   `toml:"plane"`
	Mesh     Text     `toml:"mesh"`
	Pieces   value    `toml:"pieces"` // compound.go
	As       Text     `toml:"as"`
	Units    Text     `toml:"units"`
}

func (r *reader) shape(sec section, b *Body, staticGiven bool) {
	var k shapeKeys
	unknown := r.decode(sec, &k)
	var kinds []value
	for _, v := range []value{k.Box.value, k.Sphere.value, k.Cylinder, k.Capsule, k.Plane.value, k.Mesh.value, k.Pieces} {
		if v.Given() {
			kinds = append(kinds, v)
		}
	}
	if len(kinds) != 1 {
		if len(kinds) == 0 && unknown > 0 {
			return // an unknown key was already reported
		}
		r.errAt(sec.path, "%sshape must have exactly one of box, sphere, cylinder, capsule, plane, mesh and pieces, got %d", r.bodyPre(b), len(kinds))
		return
	}
	kind := kinds[0]
	b.Kind = kind.key
	pre := r.bodyPre(b)
	if kind.key != "mesh" {
		for _, extra := range []Text{k.As, k.Units} {
			if extra.Given() {
				r.errAt(extra.path, "%sshape key %q belongs to a mesh shape only", pre, extra.key)
			}
		}
	}
	switch kind.key {
	case "box", "sphere", "cylinder", "capsule":
		r.solid(kind, b)
	case "plane":
		n, ok := r.vec(kind.v, Dimensionless, kind.path, pre+"plane normal", 3)
		if !ok {
			return
		}
		if !(n.Len() > 1e-12) {
			r.errAt(kind.path, "%splane normal must not be zero", pre)
			return
		}
		r.mustBeStatic(b, staticGiven, kind.path, "a plane")
		b.Shape = shapes.Plane{Normal: n.Normalize()}
	case "mesh":
		r.meshShape(sec, k, b, staticGiven)
	case "pieces":
		r.pieces(sec, b)
	}
}

// solid reads a box, sphere, cylinder or capsule.
func (r *reader) solid(kind value, b *Body) {
	pre := r.bodyPre(b)
	positive := func(x float64, what string) bool {
		if !(x > 0) {
			r.errAt(kind.path, "%s%s must be positive, got %g %s", pre, what, r.s.Units.FromSI(x, Length), r.s.Units.Length)
			return false
		}
		return true
	}
	switch k := kind.key; k {
	case "box":
		e, ok := r.vec(kind.v, Length, kind.path, pre+"box", 3)
		if ok && positive(e[0], "box x edge") && positive(e[1], "box y edge") && positive(e[2], "box z edge") {
			b.Shape = shapes.Box{Half: e.Mul(0.5)}
		}
	case "sphere":
		rad, ok := r.quantity(kind.v, Length, kind.path, pre+"sphere radius")
		if ok && positive(rad, "sphere radius") {
			b.Shape = shapes.Sphere{Radius: rad}
		}
	case "cylinder", "capsule":
		v, ok := r.vec2(kind.v, kind.path, pre+k+" [radius, length]")
		if !ok || !positive(v[0], k+" radius") {
			return
		}
		if k == "cylinder" {
			if positive(v[1], "cylinder length") {
				b.Shape = shapes.Cylinder{Radius: v[0], HalfLength: v[1] / 2}
			}
		} else if v[1] < 0 {
			r.errAt(kind.path, "%scapsule length must be >= 0, got %g %s", pre, r.s.Units.FromSI(v[1], Length), r.s.Units.Length)
		} else {
			b.Shape = shapes.Capsule{Radius: v[0], HalfLength: v[1] / 2}
		}
	}
}

func (r *reader) bodyPre(b *Body) string { return fmt.Sprintf("body %q: ", b.Name) }

func (r *reader) vec2(v any, path []string, what string) ([2]float64, bool) {
	a, ok := v.([]any)
	if !ok || len(a) != 2 {
		r.errAt(path, "%s must be an array of 2 numbers, got %s", what, show(v))
		return [2]float64{}, false
	}
	var out [2]float64
	for i, x := range a {
		q, ok := r.quantity(x, Length, sub(path, strconv.Itoa(i)), fmt.Sprintf("%s[%d]", what, i))
		if !ok {
			return out, false
		}
		out[i] = q
	}
	return out, true
}

func (r *reader) mustBeStatic(b *Body, staticGiven bool, path []string, what string) {
	if staticGiven && !b.Static {
		r.errAt(path, "%s%s is always static or driven; remove static = false (a part that falls and tumbles needs a convex shape or a mesh kept as its hull)", r.bodyPre(b), what)
	}
	b.Static = true
}

func (r *reader) meshShape(sec section, k shapeKeys, b *Body, staticGiven bool) {
	pre := r.bodyPre(b)
	file, ok := r.text(sec, k.Mesh)
	if !ok {
		return
	}
	if strings.TrimSpace(file) == "" {
		r.errAt(k.Mesh.path, "%smesh must name an STL file", pre)
		return
	}
	as, asGiven := r.text(sec, k.As)
	if asGiven && as != "hull" && as != "triangles" {
		r.errAt(k.As.path, "%sshape as must be \"hull\" (the default: its convex hull, for moving parts) or \"triangles\" (a static fixture kept as its triangles), got %q%s", pre, as, Suggest(as, []string{"hull", "triangles"}))
		return
	}
	unit := mesh.Unit(r.s.Units.L)
	if us, ok := r.text(sec, k.Units); ok {
		u, known := LengthUnits[us]
		if !known {
			r.errAt(k.Units.path, "%sunknown mesh length unit %q%s", pre, us, Suggest(us, units.FileLengths))
			return
		}
		unit = mesh.Unit(u)
	}
	p, data, err := r.s.readFile(file)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			if abs, aerr := filepath.Abs(p); aerr == nil && r.s.opt.FS == nil {
				p = abs
			}
			r.errAt(k.Mesh.path, "%smesh file %q not found (looked for %s; paths are relative to the scene file)", pre, file, p)
		} else {
			r.errAt(k.Mesh.path, "%scannot read mesh file %q: %v", pre, file, unwrapPath(err))
		}
		return
	}
	b.MeshFile = p
	key := meshKey{path: p, file: file, unit: unit, triangles: as == "triangles"}
	made, ok := r.s.madeMesh(key) // meshcache.go
	if !ok {
		m, err := mesh.ReadSTL(bytes.NewReader(data), file, unit)
		if err != nil {
			r.errAt(k.Mesh.path, "%s%v", pre, err)
			return
		}
		if key.triangles {
			made.tri = m.TriMesh()
		} else if made.part, err = mesh.NewPart(m); err != nil {
			r.errAt(k.Mesh.path, "%s%v", pre, err)
			return
		}
		r.s.keepMesh(key, made)
	}
	if key.triangles {
		r.mustBeStatic(b, staticGiven, k.As.path, "a mesh kept as triangles")
		b.Triangles = true
		b.Shape = made.tri
		return
	}
	part := made.part
	for _, w := range part.Warnings {
		r.warnAt(k.Mesh.path, "%s%s", pre, w)
	}
	b.Part = part
	b.Shape = part.Hull
}

// kickKeys are the keys of a [[kick]].
type kickKeys struct {
	Body    Text     `toml:"body"`
	Time    Quantity `toml:"time"`
	Impulse Vector   `toml:"impulse"`
	At      Vector   `toml:"at"`
}

func (r *reader) kicks(root section) {
	list, ok := r.sections(root, "kick")
	if !ok {
		return
	}
	for i, m := range list {
		path := []string{"kick", strconv.Itoa(i)}
		sec := section{m: m, path: path, name: fmt.Sprintf("[[kick]] number %d", i+1), pre: fmt.Sprintf("[[kick]] number %d: ", i+1)}
		var k kickKeys
		r.decode(sec, &k)
		kick := Kick{Line: r.s.lines.line(path), AtCenter: true}
		name, ok := r.requiredText(sec, k.Body, "name the body to kick")
		if !ok {
			continue
		}
		sec.pre = fmt.Sprintf("kick on %q: ", name)
		bi := r.bodyNamed(name, k.Body.path, sec.pre)
		switch {
		case bi < 0:
			continue
		case r.s.Bodies[bi].Static:
			r.errAt(k.Body.path, "%sbody %q is %s; only bodies moved by gravity and contact can be kicked", sec.pre, name, r.s.Bodies[bi].kindName())
			continue
		}
		kick.Body = name
		t, _ := r.scalar(sec, k.Time, Time, 0)
		if t < 0 {
			r.errAt(k.Time.path, "%stime must be >= 0, got %g s", sec.pre, t)
		}
		kick.Time = t
		if !k.Impulse.Given() {
			r.errAt(path, "%simpulse is missing: give impulse = [x, y, z] (mass x length / s, world frame)", sec.pre)
			continue
		}
		kick.Impulse, _ = r.vec3(sec, k.Impulse, Impulse, shapes.Vec3{})
		if at, given := r.vec3(sec, k.At, Length, shapes.Vec3{}); given {
			kick.At, kick.AtCenter = at, false
		}
		r.s.Kicks = append(r.s.Kicks, kick)
	}
}
