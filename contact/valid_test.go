package contact

import (
	"math"
	"strings"
	"testing"
)

// TestSettingsCheckedEachChange: the solver checks its settings only when
// they change (valid.go), so a setting made bad between two steps of one
// solver must still be refused, by name, and leave the bodies alone. The
// bad values are outside the ranges Settings documents (negative counts,
// a fraction above 1, NaN).
func TestSettingsCheckedEachChange(t *testing.T) {
	cases := []struct {
		name string
		bad  func(*Settings)
	}{
		{"VelocityIterations", func(s *Settings) { s.VelocityIterations = -1 }},
		{"Correction", func(s *Settings) { s.Correction = 1.5 }},
		{"Tolerance", func(s *Settings) { s.Tolerance = math.NaN() }},
		{"WarmStart", func(s *Settings) { s.WarmStart = math.NaN() }},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bodies, pts := stack(1, 1, 0.1, 0.5)
			bodies[1].V = vec{0, 0, -gStd * 1e-3}
			s := NewSolver(DefaultSettings())
			if _, err := s.Solve(1e-3, bodies, pts, nil); err != nil {
				t.Fatalf("valid settings: %v", err)
			}
			c.bad(&s.Settings)
			before := bodies[1].V
			for step := 0; step < 2; step++ { // refused again, not remembered
				_, err := s.Solve(1e-3, bodies, pts, nil)
				if err == nil || !strings.Contains(err.Error(), c.name) {
					t.Fatalf("step %d: got error %v, want one naming %s", step, err, c.name)
				}
			}
			if bodies[1].V != before {
				t.Errorf("refused step changed the body's velocity: %v, was %v", bodies[1].V, before)
			}
			s.Settings = DefaultSettings()
			if _, err := s.Solve(1e-3, bodies, pts, nil); err != nil {
				t.Errorf("settings restored: %v", err)
			}
		})
	}
}
