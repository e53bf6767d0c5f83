package scene

import (
	"fmt"
	"strings"
	"testing"
	"testing/fstest"
)

// TestStackedBodiesNotJudgedByTheirHeight checks the step check's fall
// estimate: a box resting on top of a tower of equal boxes can fall only
// onto the box below it, so a 12-box tower of 50 mm boxes at 1/60 s is
// accepted without a warning, while the same box alone at the tower's top
// height can reach sqrt(2 g h) = 3.2 m/s (free fall from 550 mm) and would
// move more than its own size in a step: warned of.
func TestStackedBodiesNotJudgedByTheirHeight(t *testing.T) {
	head := `units = { length = "mm", mass = "kg" }
[world]
step = 0.0166666666667
duration = 2
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
`
	box := func(name string, z float64) string {
		return fmt.Sprintf("[[body]]\nname = %q\nshape = { box = [50, 50, 50] }\nmass = 0.5\nposition = [0, 0, %g]\n", name, z)
	}
	var tower strings.Builder
	tower.WriteString(head)
	for i := 0; i < 12; i++ {
		tower.WriteString(box(fmt.Sprintf("b%d", i), 25+50*float64(i)))
	}
	s, err := Parse([]byte(tower.String()), "tower.toml", Options{FS: fstest.MapFS{}})
	if err != nil || len(s.Warnings) != 0 {
		t.Errorf("a 12-box tower at 1/60 s: %v, warnings %q; want it accepted as it is", err, s.Warnings)
	}
	s, err = Parse([]byte(head+box("alone", 575)), "alone.toml", Options{FS: fstest.MapFS{}})
	if err != nil || len(s.Warnings) == 0 || !strings.Contains(s.Warnings[0], `is coarse for body "alone"`) {
		t.Errorf("a lone box 575 mm up at 1/60 s: %v, warnings %q; want a warning that it moves more than its size in a step", err, s.Warnings)
	}
}
