package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestRunReportsBalancedBodies(t *testing.T) {
	// A 50 mm cube dropped 10 mm with its centre of mass exactly above a
	// corner (the diagonal turned vertical: axis (1, -1, 0), angle
	// acos(1/sqrt 3) = 54.7356 deg) or an edge (45 deg about x). The floor's
	// reaction passes through the centre of mass, so nothing turns it
	// (statics); it settles there, balanced, and no face is down.
	cases := []struct{ want, orientation, z string }{
		{"corner", "{ axis = [1, -1, 0], angle = 54.735610317245346 }", "53.30127018922193"},
		{"edge", "{ axis = [1, 0, 0], angle = 45 }", "45.35533905932738"},
	}
	for _, c := range cases {
		dir := t.TempDir()
		scene := `units = { length = "mm", mass = "g" }
[world]
step = 0.001
duration = 3
until_settled = true
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "cube"
shape = { box = [50, 50, 50] }
density = "0.5 g/cm3"
position = [0, 0, ` + c.z + `]
orientation = ` + c.orientation + "\n"
		path := filepath.Join(dir, "scene.toml")
		if err := os.WriteFile(path, []byte(scene), 0o644); err != nil {
			t.Fatal(err)
		}
		out := filepath.Join(dir, "out")
		_, errs, code := clatter(t, "run", path, "-o", out, "--quiet")
		if code != exitOK {
			t.Fatalf("%s: exit %d\n%s", c.want, code, errs)
		}
		var s struct {
			Settled bool
			Bodies  []struct {
				RestingFace *int    `json:"resting_face"`
				Balanced    *string `json:"balanced"`
			}
		}
		readJSON(t, filepath.Join(out, "summary.json"), &s)
		got := s.Bodies[0]
		if !s.Settled || got.Balanced == nil || *got.Balanced != c.want || got.RestingFace != nil {
			t.Errorf("%s: settled %v, balanced %v, resting face %v; want settled, %q, no face", c.want, s.Settled, got.Balanced, got.RestingFace, c.want)
		}
		if want := `warning: body "cube" came to rest balanced on`; !strings.Contains(errs, want) || !strings.Contains(errs, "any disturbance tips it") {
			t.Errorf("%s: stderr lacks the warning:\n%s", c.want, errs)
		}
	}
}
