package scene

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"clatter/shapes"
)

// Sweep is the [sweep] section: a study of many trials. It is read and
// checked here; `clatter run` ignores it.
type Sweep struct {
	Trials int
	Seed   uint64
	// Vary lists the varied keys; every combination of their values is a case.
	Vary []Vary
	// RandomOrientation names the bodies whose starting orientation is drawn
	// per trial; Jitter the bodies whose position is jittered.
	RandomOrientation []string
	Jitter            []Jitter
	// Height draws the starting height of a body's centre of mass (m,
	// along the direction opposite gravity) uniformly from a range: the
	// drop height. Spin adds a starting spin about a uniformly random axis
	// whose size (rad/s) is uniform in a range. VelocityJitter is a uniform
	// jitter of +- Amount (m/s, per world axis) around a body's velocity.
	// All are sorted by body name.
	Height         []Range
	Spin           []Range
	VelocityJitter []Jitter
	// GroupFaces asks that the statistics count faces equal by symmetry as
	// one (faces with the same area, height and resting probability).
	GroupFaces bool
	// Drops is "ten" for the ten-drop sequence of a [drop] (its cases
	// vary drop.number), else empty.
	Drops string
	Line  int
}

// Range is a uniform draw from [Low, High] for one body, in SI.
type Range struct {
	Body      string
	Low, High float64
}

// Vary is one [[sweep.vary]]: a numeric key of the scene by its dotted path
// and the values it takes, plain numbers in the file's units.
type Vary struct {
	Key    string
	Values []float64
	// Log is set for a geometric series (from, to, count and log = true).
	Log  bool
	Line int
}

// Jitter is a uniform jitter of +- Amount (m, per world axis) around a
// body's position.
type Jitter struct {
	Body   string
	Amount shapes.Vec3
}

// Cases is the number of combinations of the varied values.
func (s *Sweep) Cases() int {
	n := 1
	for _, v := range s.Vary {
		n *= len(v.Values)
	}
	return n
}

// maxSweepValues bounds the values of one varied key, and maxTrials the
// trials of a case: beyond them a study is more likely a typing slip than
// an intention.
const (
	maxSweepValues = 10000
	maxTrials      = 10000000
)

// sweepKeys are the keys of [sweep].
type sweepKeys struct {
	Trials     Whole `toml:"trials"`
	Seed       Whole `toml:"seed"`
	Vary       value `toml:"vary"` // [[sweep.vary]]
	Randomize  Table `toml:"randomize"`
	GroupFaces Flag  `toml:"group_faces"`
	Drops      value `toml:"drops"` // "ten" (drop.go)
}

// randomizeKeys are the keys of [sweep.randomize]: tables of body names.
type randomizeKeys struct {
	Orientation value `toml:"orientation"` // a list of names
	Position    value `toml:"position"`
	Height      value `toml:"height"`
	Spin        value `toml:"spin"`
	Velocity    value `toml:"velocity"`
}

func (r *reader) sweep(root section) {
	sec, ok := r.table(root, "sweep", "[sweep]", "[sweep] ")
	if !ok {
		return
	}
	var k sweepKeys
	r.decode(sec, &k)
	sw := &Sweep{Trials: 1, Seed: DefaultSeed, Line: r.s.lines.line(sec.path)}
	if t, ok := r.whole(sec, k.Trials, 1); ok {
		if t < 1 || t > maxTrials {
			r.errAt(k.Trials.path, "[sweep] trials must be between 1 and %d, got %d", maxTrials, t)
		} else {
			sw.Trials = int(t)
		}
	}
	if seed, ok := r.whole(sec, k.Seed, DefaultSeed); ok {
		if seed < 0 {
			r.errAt(k.Seed.path, "[sweep] seed must be a whole number >= 0, got %d", seed)
		} else {
			sw.Seed = uint64(seed)
		}
	}
	sw.GroupFaces, _ = r.flag(sec, k.GroupFaces, false)
	if k.Vary.Given() {
		sw.Vary = r.varies(k.Vary)
	}
	if rs, ok := r.subTable(sec, k.Randomize, "[sweep.randomize]", "[sweep.randomize] "); ok {
		r.randomize(rs, sw)
	}
	r.s.Sweep = sw
}

// varies reads the [[sweep.vary]] tables.
func (r *reader) varies(v value) []Vary {
	list, ok := arrayOfTables(v.v)
	if !ok {
		r.errAt(v.path, "[sweep] vary must be an array of tables: write each as [[sweep.vary]], got %s", show(v.v))
	}
	var out []Vary
	seen := map[string]bool{}
	for i, m := range list {
		if vr, ok := r.vary(sub(v.path, strconv.Itoa(i)), m, i); ok {
			if seen[vr.Key] {
				r.errAt(sub(v.path, strconv.Itoa(i)), "[[sweep.vary]] key %q is varied twice", vr.Key)
				continue
			}
			seen[vr.Key] = true
			out = append(out, vr)
		}
	}
	return out
}

// randomize reads [sweep.randomize].
func (r *reader) randomize(rs section, sw *Sweep) {
	var k randomizeKeys
	r.decode(rs, &k)
	if o := k.Orientation; o.Given() {
		a, isArr := o.v.([]any)
		if !isArr {
			r.errAt(o.path, "[sweep.randomize] orientation must list body names, e.g. [\"cap\"], got %s", show(o.v))
		}
		for i, x := range a {
			p := sub(o.path, strconv.Itoa(i))
			name, isStr := x.(string)
			if !isStr {
				r.errAt(p, "[sweep.randomize] orientation must list body names, got %s", show(x))
				continue
			}
			if r.movingBody(name, p, "[sweep.randomize] orientation: ") {
				sw.RandomOrientation = append(sw.RandomOrientation, name)
			}
		}
	}
	sw.Jitter = r.jitters(k.Position, Length)
	sw.Height = r.ranges(k.Height, Length, false)
	sw.Spin = r.ranges(k.Spin, AngularSpeed, true)
	sw.VelocityJitter = r.jitters(k.Velocity, Speed)
}

// bodyTable returns the body names of a [sweep.randomize] table such as
// height = { cap = [50, 300] }, sorted, with each name checked to be a
// moving body.
func (r *reader) bodyTable(t value, example string) (map[string]any, []string) {
	if !t.Given() {
		return nil, nil
	}
	m, isMap := t.v.(map[string]any)
	if !isMap {
		r.errAt(t.path, "[sweep.randomize] %s must be a table of body = %s, got %s", t.key, example, show(t.v))
		return nil, nil
	}
	var names []string
	for _, n := range sortedKeys(m) {
		if r.movingBody(n, sub(t.path, n), "[sweep.randomize] "+t.key+": ") {
			names = append(names, n)
		}
	}
	return m, names
}

// ranges reads a table of body = [low, high] (or body = high, from 0,
// when fromZero) of dimension d.
func (r *reader) ranges(t value, d Dim, fromZero bool) []Range {
	example := "[low, high]"
	if fromZero {
		example = "[low, high] or body = high"
	}
	m, names := r.bodyTable(t, example)
	key := t.key
	var out []Range
	for _, n := range names {
		p := sub(t.path, n)
		what := fmt.Sprintf("[sweep.randomize] %s of %q", key, n)
		var lo, hi float64
		if _, isArr := m[n].([]any); !isArr && fromZero {
			x, ok := r.quantity(m[n], d, p, what)
			if !ok {
				continue
			}
			hi = x
		} else {
			v, ok := r.vec(m[n], d, p, what+" [low, high]", 2)
			if !ok {
				continue
			}
			lo, hi = v[0], v[1]
		}
		u := r.s.Units
		switch {
		case fromZero && lo < 0:
			r.errAt(p, "%s: the range must not go below 0, got low %g %s", what, u.FromSI(lo, d), u.Symbol(d))
		case hi < lo:
			r.errAt(p, "%s: low must not be above high, got low %g and high %g %s", what, u.FromSI(lo, d), u.FromSI(hi, d), u.Symbol(d))
		default:
			out = append(out, Range{Body: n, Low: lo, High: hi})
		}
	}
	return out
}

// jitters reads a table of body = [dx, dy, dz] amounts of dimension d.
func (r *reader) jitters(t value, d Dim) []Jitter {
	m, names := r.bodyTable(t, "[dx, dy, dz]")
	key := t.key
	var out []Jitter
	for _, n := range names {
		p := sub(t.path, n)
		amt, ok := r.vec(m[n], d, p, fmt.Sprintf("[sweep.randomize] %s of %q", key, n), 3)
		if !ok {
			continue
		}
		if amt[0] < 0 || amt[1] < 0 || amt[2] < 0 {
			r.errAt(p, "[sweep.randomize] %s of %q: jitter amounts must be >= 0", key, n)
			continue
		}
		out = append(out, Jitter{Body: n, Amount: amt})
	}
	return out
}

func (r *reader) movingBody(name string, path []string, pre string) bool {
	i := r.bodyNamed(name, path, pre)
	switch {
	case i < 0:
		return false
	case r.s.Bodies[i].Static:
		r.errAt(path, "%sbody %q is %s and cannot be randomized", pre, name, r.s.Bodies[i].kindName())
		return false
	case r.s.jointed(name):
		r.errAt(path, "%sbody %q is held by a joint, whose geometry is fixed in the scene; vary the joint's own keys instead", pre, name)
		return false
	}
	return true
}

// varyKeys are the keys of a [[sweep.vary]]: values, or from, to and
// count (and log).
type varyKeys struct {
	Key    Text  `toml:"key"`
	Values value `toml:"values"`
	From   value `toml:"from"`
	To     value `toml:"to"`
	Count  value `toml:"count"`
	Log    Flag  `toml:"log"`
}

func (r *reader) vary(path []string, m map[string]any, i int) (Vary, bool) {
	sec := section{m: m, path: path, name: fmt.Sprintf("[[sweep.vary]] number %d", i+1), pre: fmt.Sprintf("[[sweep.vary]] number %d: ", i+1)}
	var k varyKeys
	r.decode(sec, &k)
	vr := Vary{Line: r.s.lines.line(path)}
	key, ok := r.requiredText(sec, k.Key, "name a numeric key of the scene, e.g. key = \"material.abs.friction\"")
	if !ok {
		return vr, false
	}
	sec.pre = fmt.Sprintf("[[sweep.vary]] %q: ", key)
	ref, err := resolveKey(r.s.raw, key)
	if err != nil {
		r.errAt(k.Key.path, "%s%v", sec.pre, err)
		return vr, false
	}
	if _, d, err := ParseQuantity(ref.written); ref.written != "" && err == nil && d != Dimensionless {
		// The values replace the string with plain numbers, whose unit
		// may differ from the one the scene wrote ("2 deg/s" -> rad/s).
		r.warnAt(k.Key.path, "%sthe scene writes %q, but the values are plain numbers in the file's units, %s", sec.pre, ref.written, r.s.Units.Symbol(d))
	}
	vr.Key = key
	nerr := r.n
	switch {
	case k.Values.Given() && (k.From.Given() || k.To.Given() || k.Count.Given() || k.Log.Given()):
		r.errAt(path, "%sgive either values or from, to and count, not both", sec.pre)
	case k.Values.Given():
		vr.Values = r.values(sec, k.Values)
	case k.From.Given() && k.To.Given() && k.Count.Given():
		r.series(sec, k, &vr)
	default:
		r.errAt(path, "%sgive values = [...] or from, to and count", sec.pre)
	}
	return vr, r.n == nerr
}

// values reads the values = [...] of a [[sweep.vary]].
func (r *reader) values(sec section, v value) []float64 {
	a, isArr := v.v.([]any)
	if !isArr || len(a) == 0 {
		r.errAt(v.path, "%svalues must be a non-empty array of numbers, got %s", sec.pre, show(v.v))
		return nil
	}
	if len(a) > maxSweepValues {
		r.errAt(v.path, "%sat most %d values, got %d", sec.pre, maxSweepValues, len(a))
		return nil
	}
	var out []float64
	for j, x := range a {
		f, ok := plainNumber(x)
		if !ok {
			r.errAt(sub(v.path, strconv.Itoa(j)), "%svalues must be plain finite numbers in the file's units, got %s", sec.pre, show(x))
			continue
		}
		out = append(out, f)
	}
	return out
}

// series reads the from, to and count (and log) of a [[sweep.vary]]: an
// arithmetic or a geometric series.
func (r *reader) series(sec section, k varyKeys, vr *Vary) {
	from, ok1 := plainNumber(k.From.v)
	to, ok2 := plainNumber(k.To.v)
	count, ok3 := k.Count.v.(int64)
	logScale, _ := r.flag(sec, k.Log, false)
	switch {
	case !ok1 || !ok2:
		r.errAt(sec.path, "%sfrom and to must be plain finite numbers in the file's units", sec.pre)
	case !ok3 || count < 2 || count > maxSweepValues:
		r.errAt(k.Count.path, "%scount must be a whole number from 2 to %d, got %s", sec.pre, maxSweepValues, show(k.Count.v))
	case logScale && (from <= 0 || to <= 0):
		r.errAt(sec.path, "%sa geometric series (log = true) needs from and to above 0, got %g and %g", sec.pre, from, to)
	default:
		vr.Log = logScale
		for j := int64(0); j < count; j++ {
			f := float64(j) / float64(count-1)
			if logScale {
				vr.Values = append(vr.Values, from*math.Pow(to/from, f))
			} else {
				vr.Values = append(vr.Values, from+(to-from)*f)
			}
		}
	}
}

func plainNumber(v any) (float64, bool) {
	switch t := v.(type) {
	case int64:
		return float64(t), true
	case float64:
		return t, !math.IsNaN(t) && !math.IsInf(t, 0)
	}
	return 0, false
}

// namedBy says which key names the elements of the top-level array of
// tables at walked, for dotted paths such as "body.cap.position.2",
// "joint.flap.motor.speed" and "drive.track.vibration.0.amplitude"; "" for
// arrays addressed by index.
func namedBy(walked []string) (nameKey, what string) {
	if len(walked) != 1 {
		return "", ""
	}
	switch walked[0] {
	case "body":
		return "name", "body is named"
	case "joint":
		return "name", "joint is named"
	case "drive":
		return "body", "drive is of the body"
	}
	return "", ""
}

// element finds the element s of an array of tables of a dotted key: by
// its name for bodies, joints and drives, else by its index.
func element(t []map[string]any, walked []string, s, key string) (int, error) {
	nameKey, what := namedBy(walked)
	if nameKey == "" {
		j, err := strconv.Atoi(s)
		if err != nil || j < 0 || j >= len(t) {
			return 0, fmt.Errorf("key %q: %q is not an index from 0 to %d", key, s, len(t)-1)
		}
		return j, nil
	}
	idx := -1
	for j, b := range t {
		if n, _ := b[nameKey].(string); n == s {
			idx = j
		}
	}
	if idx >= 0 {
		return idx, nil
	}
	var cands []string
	for _, b := range t {
		if n, ok := b[nameKey].(string); ok {
			cands = append(cands, n)
		}
	}
	return 0, fmt.Errorf("key %q: no %s %q%s", key, what, s, Suggest(s, cands))
}

// keyRef is a resolved numeric key of a document: a slot to set.
type keyRef struct {
	set func(v float64)
	// written is the value as the scene writes it when that is a string
	// with a unit, such as "2 deg/s".
	written string
}

// resolveKey finds the numeric value at a dotted path of the document:
// "world.step", "material.abs.friction", "body.cap.position.2" (bodies by
// name), "kick.0.time" and "pair.0.friction" (by index from 0); array
// elements by index.
func resolveKey(raw map[string]any, key string) (keyRef, error) {
	seg := strings.Split(key, ".")
	if key == "" || len(seg) < 2 {
		return keyRef{}, fmt.Errorf("key %q must be a dotted path such as \"material.abs.friction\" or \"body.cap.position.2\"", key)
	}
	var cur any = raw
	var setParent func(v any)
	walked := []string{}
	for i := 0; i < len(seg); i++ {
		s := seg[i]
		switch t := cur.(type) {
		case map[string]any:
			next, ok := t[s]
			if !ok {
				return keyRef{}, fmt.Errorf("key %q: %q has no %q%s", key, strings.Join(walked, "."), s, Suggest(s, sortedKeys(t)))
			}
			m := t
			k := s
			setParent = func(v any) { m[k] = v }
			cur = next
		case []map[string]any:
			idx, err := element(t, walked, s, key)
			if err != nil {
				return keyRef{}, err
			}
			cur = t[idx]
			setParent = nil
		case []any:
			j, err := strconv.Atoi(s)
			if err != nil || j < 0 || j >= len(t) {
				return keyRef{}, fmt.Errorf("key %q: %q is not an index from 0 to %d", key, s, len(t)-1)
			}
			a := t
			setParent = func(v any) { a[j] = v }
			cur = t[j]
		default:
			return keyRef{}, fmt.Errorf("key %q: %q is a value, not a table or array", key, strings.Join(walked, "."))
		}
		walked = append(walked, s)
	}
	switch v := cur.(type) {
	case int64, float64:
	case string:
		if _, _, err := ParseQuantity(v); err != nil {
			return keyRef{}, fmt.Errorf("key %q is %q, not a number", key, v)
		}
	default:
		return keyRef{}, fmt.Errorf("key %q is %s, not a number; name one element, e.g. %q", key, typeName(v), key+".0")
	}
	if setParent == nil {
		return keyRef{}, fmt.Errorf("key %q is not a number", key)
	}
	if _, isInt := cur.(int64); isInt {
		// Whole-number keys (a seed) stay whole numbers.
		set := setParent
		return keyRef{set: func(v float64) {
			if v == math.Trunc(v) && math.Abs(v) < 1<<53 {
				set(int64(v))
				return
			}
			set(v)
		}}, nil
	}
	written, _ := cur.(string)
	return keyRef{set: func(v float64) { setParent(v) }, written: written}, nil
}
