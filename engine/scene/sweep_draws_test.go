package scene

import (
	"strings"
	"testing"
)

// drawScene is a scene in millimetres with one moving body and a [sweep]
// section; randomize is its [sweep.randomize] body.
func drawScene(randomize string) string {
	return `units = { length = "mm", mass = "g" }
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "cap"
shape = { box = [10, 10, 10] }
density = 1
position = [0, 0, 5]
[sweep]
trials = 4
group_faces = true
[sweep.randomize]
` + randomize
}

func TestSweepDraws(t *testing.T) {
	s, err := Parse([]byte(drawScene(`height = { cap = [20, "5 cm"] }
spin = { cap = 3 }
velocity = { cap = ["100 mm/s", 0, 50] }
`)), "s.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	sw := s.Sweep
	// In SI: 20 mm and 5 cm are 0.02 and 0.05 m; spin = 3 is the range
	// [0, 3] rad/s; 100 mm/s and 50 mm/s are 0.1 and 0.05 m/s.
	if len(sw.Height) != 1 || sw.Height[0].Body != "cap" || !near(sw.Height[0].Low, 0.02) || !near(sw.Height[0].High, 0.05) {
		t.Errorf("height %+v", sw.Height)
	}
	if len(sw.Spin) != 1 || sw.Spin[0].Low != 0 || sw.Spin[0].High != 3 {
		t.Errorf("spin %+v", sw.Spin)
	}
	if len(sw.VelocityJitter) != 1 || !near(sw.VelocityJitter[0].Amount[0], 0.1) || !near(sw.VelocityJitter[0].Amount[2], 0.05) {
		t.Errorf("velocity %+v", sw.VelocityJitter)
	}
	if !sw.GroupFaces {
		t.Error("group_faces not read")
	}
	for _, c := range []struct{ randomize, want string }{
		{`height = { cap = [50, 20] }`, `s.toml:14: [sweep.randomize] height of "cap": low must not be above high, got low 50 and high 20 mm`},
		{`height = { cap = 20 }`, `[sweep.randomize] height of "cap" [low, high] must be an array of 2 numbers`},
		{`height = { cap = ["2 kg", 5] }`, `must be a length, got "2 kg"`},
		{`spin = { cap = [-1, 2] }`, `[sweep.randomize] spin of "cap": the range must not go below 0`},
		{`spin = { floor = 2 }`, `[sweep.randomize] spin: body "floor" is static and cannot be randomized`},
		{`velocity = { cpa = [1, 1, 1] }`, `[sweep.randomize] velocity: no body is named "cpa"; did you mean "cap"?`},
		{`velocity = { cap = [-1, 0, 0] }`, `jitter amounts must be >= 0`},
		{`height = [1, 2]`, `[sweep.randomize] height must be a table of body = [low, high]`},
		{`hieght = { cap = [1, 2] }`, `unknown key "hieght" in [sweep.randomize]; did you mean "height"?`},
	} {
		_, err := Parse([]byte(drawScene(c.randomize)), "s.toml", Options{})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want %q", c.randomize, err, c.want)
		}
	}
	if _, err := Parse([]byte(strings.Replace(drawScene(""), "group_faces = true", "group_faces = 1", 1)), "s.toml", Options{}); err == nil || !strings.Contains(err.Error(), "group_faces must be true or false") {
		t.Errorf("group_faces = 1: %v", err)
	}
}

func TestSweepDrawsCheckTheStep(t *testing.T) {
	// The step is checked for the fastest trial the draws allow: a 10 mm
	// box dropped from up to 20 m reaches sqrt(2 g h) = 19.8 m/s, 19.8 mm
	// per 1 ms step, twice its own size (a warning); from its scene height
	// of 5 mm it would not. Spinning at 5000 rad/s its corners move 43 mm
	// per step (a warning); at 20000 rad/s 173 mm, 17 times its size
	// (refused).
	s, err := Parse([]byte(drawScene("")), "s.toml", Options{})
	if err != nil || len(s.Warnings) != 0 {
		t.Fatalf("%v, warnings %q", err, s.Warnings)
	}
	for _, c := range []struct{ randomize, what string }{
		{`height = { cap = [5, 20000] }`, "a drop from 20 m"},
		{`spin = { cap = 5000 }`, "a spin of 5000 rad/s"},
	} {
		s, err := Parse([]byte(drawScene(c.randomize)), "s.toml", Options{})
		if err != nil || len(s.Warnings) == 0 || !strings.Contains(s.Warnings[0], `is coarse for body "cap"`) {
			t.Errorf("%s with a 1 ms step: %v, warnings %q; want a warning", c.what, err, s.Warnings)
		}
	}
	_, err = Parse([]byte(drawScene(`spin = { cap = 20000 }`)), "s.toml", Options{})
	if err == nil || !strings.Contains(err.Error(), `is too large for body "cap"`) {
		t.Errorf("a spin of 20000 rad/s with a 1 ms step: %v, want the step refused", err)
	}
}
