package main

import (
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files of the JSON key structures")

// skeleton lists every key path of a JSON document with the type of its
// value, sorted: the structure that scripts depend on, without the numbers.
// Array elements share the path "name[]"; null is "null" (settled_at of a
// run that did not settle, resting_face of a ball).
func skeleton(t *testing.T, doc []byte) string {
	t.Helper()
	var v any
	if err := json.Unmarshal(doc, &v); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, doc)
	}
	seen := map[string]bool{}
	var walk func(path string, v any)
	walk = func(path string, v any) {
		kind := "null"
		switch x := v.(type) {
		case map[string]any:
			kind = "object"
			for k, e := range x {
				walk(strings.TrimPrefix(path+"."+k, "."), e)
			}
		case []any:
			kind = "array"
			for _, e := range x {
				walk(path+"[]", e)
			}
		case string:
			kind = "string"
		case float64:
			kind = "number"
		case bool:
			kind = "bool"
		}
		if path != "" {
			seen[path+": "+kind] = true
		}
	}
	walk("", v)
	lines := make([]string, 0, len(seen))
	for l := range seen {
		lines = append(lines, l)
	}
	sort.Strings(lines)
	return strings.Join(lines, "\n") + "\n"
}

func golden(t *testing.T, name, got string) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if *update {
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to write it)", err)
	}
	if got != string(want) {
		t.Errorf("key structure of %s changed (a fixed interface: scripts depend on it):\ngot\n%s\nwant\n%s", name, got, want)
	}
}

func TestSummaryKeys(t *testing.T) {
	// The drop scene settles on a face; the bounce scene does not settle and
	// has a ball (no face): between them every key takes both forms.
	settled, _, code := clatter(t, "run", "../../testdata/scenes/drop.toml", "--json", "-o", t.TempDir(), "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d", code)
	}
	golden(t, "summary-settled.keys", skeleton(t, []byte(settled)))
	moving, _, code := clatter(t, "run", "../../testdata/scenes/bounce.toml", "--json", "-o", t.TempDir(), "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d", code)
	}
	golden(t, "summary-moving.keys", skeleton(t, []byte(moving)))
}

func TestInspectKeys(t *testing.T) {
	out, _, code := clatter(t, "inspect", "../../testdata/parts/bracket.stl", "--json", "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d", code)
	}
	golden(t, "inspect.keys", skeleton(t, []byte(out)))
}

func TestEventKeys(t *testing.T) {
	dir := t.TempDir()
	if _, _, code := clatter(t, "run", "../../testdata/scenes/drop.toml", "-o", dir, "--quiet"); code != exitOK {
		t.Fatalf("exit %d", code)
	}
	b, err := os.ReadFile(filepath.Join(dir, "events.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	byKind := map[string]string{}
	for _, line := range strings.Split(strings.TrimSpace(string(b)), "\n") {
		var e struct{ Event string }
		if err := json.Unmarshal([]byte(line), &e); err != nil {
			t.Fatal(err)
		}
		byKind[e.Event] = skeleton(t, []byte(line))
	}
	var all []string
	for _, k := range []string{"impact", "settled", "rest_begin"} {
		s, ok := byKind[k]
		if !ok {
			t.Fatalf("no %s event in %s", k, b)
		}
		all = append(all, "# "+k+"\n"+s)
	}
	golden(t, "events.keys", strings.Join(all, ""))
}
