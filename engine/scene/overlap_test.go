package scene

import (
	"errors"
	"strings"
	"testing"
	"testing/fstest"
)

func TestStartingOverlapIsBadInput(t *testing.T) {
	// Two 20 mm cubes whose centres are 15 mm apart along x overlap by
	// 20 - 15 = 5 mm (plain geometry); the second one is to move, along +x.
	src := `units = { length = "mm", mass = "g" }
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "left"
shape = { box = [20, 20, 20] }
density = 1
position = [0, 0, 10]
[[body]]
name = "right"
shape = { box = [20, 20, 20] }
density = 1
position = [15, 0, 10]
`
	s, err := Parse([]byte(src), "s.toml", Options{FS: fstest.MapFS{}})
	if err != nil {
		t.Fatal(err)
	}
	_, _, err = s.Build()
	if err == nil {
		t.Fatal("no error for two bodies that start inside each other")
	}
	if !errors.Is(err, ErrBadScene) {
		t.Errorf("error %v does not wrap ErrBadScene", err)
	}
	want := `s.toml:10: body "right" starts 5.0 mm inside body "left"; move it along (1, 0, 0) by at least 5.0 mm`
	if !strings.Contains(err.Error(), want) {
		t.Errorf("error\n%v\nwant\n%s", err, want)
	}
}
