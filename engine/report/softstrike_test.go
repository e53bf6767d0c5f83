package report_test

import (
	"fmt"
	"testing"

	"clatter/engine"
	"clatter/engine/report"
)

// A compliant impact lasts (half the natural period of the cushion, here
// 2 pi sqrt(12 kg / 20 kN/m) / 2 = 77 ms) and is reported when it ends, by
// which time a box struck on an edge or corner has turned onto a face and
// bounced. What it struck is the feature lowest when it began: for a box
// turned by an angle below 45 degrees about a body axis, the edge of the
// bottom face and the side that axis turns down; about a diagonal of the
// bottom, the corner under it (rigid-body kinematics; package numbering of
// ASTM D5276 / ISTA: 1 top, 2 -y, 3 bottom, 4 +y, 5 -x, 6 +x). The answer
// must not depend on the step, coarse or fine.
func TestCompliantImpactNamesTheFeatureStruckFirst(t *testing.T) {
	for _, c := range []struct {
		axis  string
		angle float64
		step  string
		want  string // reference: the lowest edge or corner of the turned box, by hand
	}{
		{"[1, 0, 0]", 25, "10 ms", "edge 2-3"}, // +x turns -y down
		{"[1, 0, 0]", 25, "1 ms", "edge 2-3"},
		{"[0, 1, 0]", 25, "20 ms", "edge 3-6"}, // +y turns +x down
		{"[0, 1, 0]", -25, "0.5 ms", "edge 3-5"},
		{"[1, -1, 0]", 20, "5 ms", "corner 2-3-5"}, // -x and -y go down
		{"[1, -1, 0]", 20, "1 ms", "corner 2-3-5"},
	} {
		name := fmt.Sprintf("%s %g deg at %s", c.axis, c.angle, c.step)
		text := fmt.Sprintf(`
[world]
step = %q
duration = 0.5
until_settled = false
[material.cushion]
friction = 0.5
restitution = 0.3
stiffness = "20 N/mm"
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "cushion"
[[body]]
name = "carton"
shape = { box = [0.4, 0.3, 0.25] }
mass = 12
position = [0, 0, 0.6]
orientation = { axis = %s, angle = %g }
`, c.step, c.axis, c.angle)
		s := parseText(t, text, "cushion.toml", "")
		w, _, err := s.Build()
		if err != nil {
			t.Fatal(err)
		}
		got := ""
		for w.Time() < 0.5 && got == "" {
			if err := w.Step(s.World.Step); err != nil {
				t.Fatal(err)
			}
			for _, e := range w.Events() {
				if e.Kind == engine.Impact && got == "" {
					if !e.Compliant {
						t.Fatalf("%s: the impact on the cushion is not compliant", name)
					}
					got = report.Features(w, e)[1].String()
				}
			}
		}
		if got != c.want {
			t.Errorf("%s: struck %q, want %q", name, got, c.want)
		}
	}
}
