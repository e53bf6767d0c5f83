package scene

import (
	"fmt"
	"strconv"

	"clatter/shapes"
)

// Gate is one [[gate]] section, in SI: a plane that counts the moving
// bodies whose centre of mass crosses it in the direction of Normal.
type Gate struct {
	Name string
	Line int
	// At is a point of the plane, Normal the counted direction (unit
	// length), Radius (0: the whole plane) the reach from At.
	At, Normal shapes.Vec3
	Radius     float64
	// Wanted lists the face_down values (faces as `clatter inspect` lists
	// them) of the orientation the tooling before the gate is meant to
	// deliver; a study reports the orienting efficiency of the gate with
	// them. Empty when not given.
	Wanted []int
}

// gates reads the [[gate]] sections.
func (r *reader) gates(root section) {
	list, ok := r.sections(root, "gate")
	if !ok {
		return
	}
	names := map[string]int{}
	for i, m := range list {
		g, ok := r.gate(i, m)
		if !ok {
			continue
		}
		if k, dup := names[g.Name]; dup {
			r.errAt([]string{"gate", strconv.Itoa(i), "name"}, "gate %q: the name is already used by the gate at line %d; names must be unique", g.Name, r.s.Gates[k].Line)
			continue
		}
		names[g.Name] = len(r.s.Gates)
		r.s.Gates = append(r.s.Gates, g)
	}
}

// gateKeys are the keys of a [[gate]].
type gateKeys struct {
	Name   Text     `toml:"name"`
	At     Vector   `toml:"at"`
	Normal Vector   `toml:"normal"`
	Radius Quantity `toml:"radius"`
	Wanted value    `toml:"wanted"` // face numbers
}

func (r *reader) gate(i int, m map[string]any) (Gate, bool) {
	path := []string{"gate", strconv.Itoa(i)}
	sec := section{m: m, path: path, name: fmt.Sprintf("[[gate]] number %d", i+1), pre: fmt.Sprintf("[[gate]] number %d: ", i+1)}
	g := Gate{Line: r.s.lines.line(path)}
	nerr := r.n
	name, ok := r.required(sec, "name", "every gate needs a unique name = \"...\" (it labels gates.csv)")
	if ok {
		g.Name = name
		sec.name = fmt.Sprintf("gate %q", name)
		sec.pre = fmt.Sprintf("gate %q: ", name)
	}
	var k gateKeys
	r.decode(sec, &k)
	if !ok {
		return g, false
	}
	for _, v := range []Vector{k.At, k.Normal} {
		if !v.Given() {
			r.errAt(path, "%s%s is missing: a gate is the plane through at = [x, y, z] that counts parts crossing it along normal = [x, y, z]", sec.pre, v.key)
		}
	}
	g.At, _ = r.vec3(sec, k.At, Length, shapes.Vec3{})
	n, given := r.vec3(sec, k.Normal, Dimensionless, shapes.Vec3{})
	if given && !(n.Len() > 1e-12) {
		r.errAt(k.Normal.path, "%snormal must not be zero: give the direction in which parts pass, e.g. [1, 0, 0]", sec.pre)
	} else if given {
		g.Normal = n.Normalize()
	}
	if rad, given := r.scalar(sec, k.Radius, Length, 0); given {
		if !(rad > 0) {
			r.errAt(k.Radius.path, "%sradius must be positive; leave it out to count across the whole plane", sec.pre)
		}
		g.Radius = rad
	}
	g.Wanted = r.faceList(sec, k.Wanted)
	return g, r.n == nerr
}

// faceList reads an optional list of face indices.
func (r *reader) faceList(sec section, list value) []int {
	if !list.Given() {
		return nil
	}
	v, key := list.v, list.key
	a, ok := v.([]any)
	if !ok || len(a) == 0 {
		r.errAt(list.path, "%s%s must be a list of face numbers as `clatter inspect` lists them, e.g. [4, 5], got %s", sec.pre, key, show(v))
		return nil
	}
	out := make([]int, 0, len(a))
	for k, x := range a {
		f, ok := x.(int64)
		if !ok || f < 0 || f > 1<<20 {
			r.errAt(sub(list.path, strconv.Itoa(k)), "%s%s[%d] must be a face number (a whole number >= 0), got %s", sec.pre, key, k, show(x))
			return nil
		}
		out = append(out, int(f))
	}
	return out
}

// GateIndex returns the index of a gate in s.Gates, or -1.
func (s *Scene) GateIndex(name string) int {
	for i := range s.Gates {
		if s.Gates[i].Name == name {
			return i
		}
	}
	return -1
}
