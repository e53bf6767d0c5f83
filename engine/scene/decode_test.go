package scene

import (
	"reflect"
	"strings"
	"testing"

	"github.com/pelletier/go-toml/v2"
)

// TestDecode checks the decoding of a section into its keys: a struct with
// keys shared through an embedded struct (pairKeys embeds contactKeys).
// Given values keep what the file wrote and where; keys not given are
// still named; an unknown key is refused on its own line with the nearest
// key suggested. The expected values are read off the document below.
func TestDecode(t *testing.T) {
	const src = `[[pair]]
materials = ["abs", "steel"]
friction = "0.3"
restitutoin = 0.2
`
	var raw map[string]any
	if err := toml.Unmarshal([]byte(src), &raw); err != nil {
		t.Fatal(err)
	}
	doc := locate([]byte(src))
	arraysOfTables(raw, doc.tables)
	r := &reader{s: &Scene{File: "s.toml", lines: doc.lines}}
	m := raw["pair"].([]map[string]any)[0]
	sec := section{m: m, path: []string{"pair", "0"}, name: "[[pair]] number 1"}
	var k pairKeys
	if bad := r.decode(sec, &k); bad != 1 {
		t.Errorf("refused %d keys, want 1", bad)
	}
	for _, c := range []struct {
		v     value
		given bool
		key   string
		line  int
	}{
		{k.Materials, true, "materials", 2},
		{k.Friction.value, true, "friction", 3},
		{k.Restitution.value, false, "restitution", 1}, // misspelt: not given; the section's line
		{k.Stiffness, false, "stiffness", 1},
	} {
		if c.v.Given() != c.given || c.v.key != c.key || r.line(c.v.path) != c.line {
			t.Errorf("%s: given %v, key %q, line %d; want %v, %q, %d", c.key, c.v.Given(), c.v.key, r.line(c.v.path), c.given, c.key, c.line)
		}
	}
	if !reflect.DeepEqual(k.Friction.v, "0.3") {
		t.Errorf("friction as written = %#v, want the string \"0.3\"", k.Friction.v)
	}
	want := `s.toml:4: unknown key "restitutoin" in [[pair]] number 1; did you mean "restitution"?`
	if len(r.errs) != 1 || r.errs[0].Error() != want {
		t.Errorf("errors %v, want %q", r.errs, want)
	}
	// The suggestions list the keys in the order the struct declares them,
	// the embedded ones in its place.
	r.errs = nil
	r.decode(section{m: map[string]any{"zzz": int64(1)}, path: []string{"pair", "0"}, name: "x"}, &k)
	list := `valid: "materials", "friction", "static_friction", "restitution", "stiffness"`
	if len(r.errs) != 1 || !strings.HasSuffix(r.errs[0].Msg, list) {
		t.Errorf("errors %v, want one ending %s", r.errs, list)
	}
}
