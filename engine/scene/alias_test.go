package scene

import (
	"strings"
	"testing"
	"testing/fstest"
)

// TestRenamedKey checks the hook for renamed keys with a made-up rename
// (grip, the old name of friction): the old name is read as the new one
// with a warning naming its line and the new name, and both together are
// refused.
func TestRenamedKey(t *testing.T) {
	defer func(old map[string]string) { renamedKeys = old }(renamedKeys)
	renamedKeys = map[string]string{"grip": "friction"}
	const head = "[material.abs]\n"
	const rest = `
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "abs"
[[body]]
name = "cap"
shape = { sphere = 0.01 }
density = 1000
position = [0, 0, 0.02]
`
	s, err := Parse([]byte(head+"grip = 0.3\n"+rest), "s.toml", Options{FS: fstest.MapFS{}})
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Materials[0].Friction; got != 0.3 {
		t.Errorf("friction read from the old name = %g, want 0.3", got)
	}
	want := `s.toml:2: material "abs": grip is now called friction`
	if len(s.Warnings) != 1 || !strings.HasPrefix(s.Warnings[0], want) {
		t.Errorf("warnings %q, want one beginning %q", s.Warnings, want)
	}
	msg := parseErr(t, head+"grip = 0.3\nfriction = 0.3\n"+rest)
	if !strings.Contains(msg, "s.toml:2: material \"abs\": grip and friction are the old and new names of one key; keep only friction") {
		t.Errorf("both names: got %q", msg)
	}
}
