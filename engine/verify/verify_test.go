package verify

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestCases(t *testing.T) {
	for _, c := range Cases() {
		t.Run(c.Name, func(t *testing.T) {
			if c.Source == "" || c.Reference == "" || c.Why == "" || !(c.Tolerance > 0) {
				t.Errorf("case %q lacks its reference, source or tolerance reason", c.Name)
			}
			r := Check(c)
			t.Logf("expected %.6g measured %.6g error %.3g tolerance %.3g", r.Expected, r.Measured, r.Error, r.Tolerance)
			if !r.Pass {
				t.Errorf("%s: %s; expected %g %s, measured %g, error %g over tolerance %g", r.Case, r.Problem, r.Expected, r.Unit, r.Measured, r.Error, r.Tolerance)
			}
		})
	}
}

func TestCheckJudges(t *testing.T) {
	fixed := func(exp, meas float64) func() (float64, float64, float64, error) {
		return func() (float64, float64, float64, error) { return exp, meas, math.NaN(), nil }
	}
	for _, c := range []struct {
		name    string
		c       Case
		pass    bool
		err     float64
		problem string
	}{
		{"relative within", Case{Relative: true, Tolerance: 0.02, Run: fixed(100, 101.5)}, true, 0.015, ""},
		{"relative beyond", Case{Relative: true, Tolerance: 0.02, Run: fixed(100, 103)}, false, 0.03, ""},
		{"absolute beyond", Case{Tolerance: 0.5, Run: fixed(26.57, 27.2)}, false, 0.63, ""},
		{"deviation given", Case{Tolerance: 0.02, Run: func() (float64, float64, float64, error) { return 1, 1, 0.05, nil }}, false, 0.05, ""},
		{"NaN measured", Case{Tolerance: 1, Run: fixed(1, math.NaN())}, false, math.NaN(), ""},
		{"error", Case{Tolerance: 1, Run: func() (float64, float64, float64, error) { return 0, 0, 0, errors.New("no rebound") }}, false, 0, "no rebound"},
		{"panic", Case{Tolerance: 1, Run: func() (float64, float64, float64, error) { panic("boom") }}, false, 0, "crashed: boom"},
	} {
		r := Check(c.c)
		if r.Pass != c.pass || (!math.IsNaN(c.err) && math.Abs(r.Error-c.err) > 1e-12) || !strings.Contains(r.Problem, c.problem) {
			t.Errorf("%s: %+v", c.name, r)
		}
	}
	if Passed(nil) || !Passed([]Result{{Pass: true}}) || Passed([]Result{{Pass: true}, {}}) {
		t.Error("Passed")
	}
}
