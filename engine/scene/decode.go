package scene

import (
	"reflect"
	"sort"
)

// The keys of each section are declared once, as a struct whose fields
// carry the key in a `toml` tag (worldKeys, bodyKeys, ...). decode fills
// such a struct from a table of the decoded document: every key must be a
// field's, and each field keeps the value as written with its place in the
// file. The values are checked and converted to SI where they are used
// (reader.scalar, reader.vec3, ...), so that every message names the
// file, the line, the section and the key.

// value is a value of a section as written, with where it is written (or
// would be: the key and path are set for keys not given too).
type value struct {
	v    any      // as decoded: int64, float64, string, bool, []any, map[string]any; nil if not given
	path []string // path of the key in the document, for its line
	key  string
}

// Given reports whether the file gives the key.
func (x value) Given() bool { return x.v != nil }

func (x *value) set(v any, path []string, key string) { *x = value{v: v, path: path, key: key} }

// Quantity is a value with units: a plain number in the file's units or
// a string with its own unit, such as "50 mm" (units.go).
type Quantity struct{ value }

// Vector is an array of quantities, such as [0, 0, "-9.81 m/s2"].
type Vector struct{ value }

// Text, Flag and Whole are a string, true or false, and a whole number.
type (
	Text  struct{ value }
	Flag  struct{ value }
	Whole struct{ value }
)

// Table is a table of its own, such as a body's shape or orientation; it
// is decoded in turn by the code that knows its keys.
type Table struct{ value }

type setter interface {
	set(v any, path []string, key string)
}

// decode fills dst, a pointer to a struct of section keys, from sec and
// refuses the keys it does not declare, suggesting the nearest; it
// returns how many it refused.
func (r *reader) decode(sec section, dst any) int {
	field := map[string]setter{}
	known := fields(reflect.ValueOf(dst).Elem(), field, nil)
	bad := r.refuseUnknown(sec, known)
	for k, f := range field {
		f.set(sec.m[k], sub(sec.path, k), k)
	}
	return bad
}

// fields lists the keys of the struct v in order, and their setters;
// the keys of an embedded struct (keys that several sections share) come
// in its place.
func fields(v reflect.Value, set map[string]setter, known []string) []string {
	t := v.Type()
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		if f.Anonymous && f.Type.Kind() == reflect.Struct && f.Type != reflect.TypeOf(value{}) {
			known = fields(v.Field(i), set, known)
			continue
		}
		k := f.Tag.Get("toml")
		set[k] = v.Field(i).Addr().Interface().(setter)
		known = append(known, k)
	}
	return known
}

// keys refuses keys of sec that are not in allowed, suggesting the nearest,
// and returns how many it refused: for the sections still read key by key.
func (r *reader) keys(sec section, allowed ...string) int {
	return r.refuseUnknown(sec, allowed)
}

// refuseUnknown is where every section's keys are checked against the
// keys it knows. Keys renamed in a release are still read under their
// old name here, with a warning (renamed).
func (r *reader) refuseUnknown(sec section, known []string) int {
	ok := make(map[string]bool, len(known))
	for _, k := range known {
		ok[k] = true
	}
	bad := 0
	for _, k := range sortedKeys(sec.m) {
		if ok[k] || r.renamed(sec, k, ok) {
			continue
		}
		r.errAt(sub(sec.path, k), "unknown key %q in %s%s", k, sec.name, Suggest(k, known))
		bad++
	}
	return bad
}

// sortedKeys returns the keys of m in order.
func sortedKeys[V any](m map[string]V) []string {
	names := make([]string, 0, len(m))
	for k := range m {
		names = append(names, k)
	}
	sort.Strings(names)
	return names
}
