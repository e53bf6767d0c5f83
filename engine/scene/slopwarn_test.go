package scene

import (
	"fmt"
	"strings"
	"testing"
)

func TestSlopWarning(t *testing.T) {
	// A part rests sunk into its support by up to its contact slop: 0.2 mm,
	// or 1 percent of the radius of a part too small for that (engine's
	// slop.go). A thin sheet keeps the slop of its breadth and is warned
	// of; a small part keeps its slop a small part of its size and is not.
	for _, c := range []struct {
		name  string
		shape string
		warn  bool
	}{
		{"0.5 mm cube", "{ box = [0.5, 0.5, 0.5] }", false},
		{"0.3 mm ball", "{ sphere = 0.15 }", false},
		{"0.5 mm sheet of 100 mm", "{ box = [100, 100, 0.5] }", true},
		{"20 mm cube", "{ box = [20, 20, 20] }", false},
	} {
		t.Run(c.name, func(t *testing.T) {
			src := fmt.Sprintf(`units = { length = "mm", mass = "g" }
[world]
step = 0.0001
duration = 0.1
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
static = true
position = [0, 0, 0]
[[body]]
name = "part"
shape = %s
density = 1
position = [0, 0, 60]
`, c.shape)
			s, err := Parse([]byte(src), "s.toml", Options{})
			if err != nil {
				t.Fatal(err)
			}
			warned := false
			for _, w := range s.Warnings {
				warned = warned || strings.Contains(w, "visibly sunk")
			}
			if warned != c.warn {
				t.Errorf("warned of the slop: %v, want %v (warnings %q)", warned, c.warn, s.Warnings)
			}
		})
	}
}
