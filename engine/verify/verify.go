package verify

import (
	"fmt"
	"math"
)

// Result is the outcome of one case.
type Result struct {
	Case string `json:"case"`
	// Reference is the closed-form result, Source where it comes from.
	Reference string  `json:"reference"`
	Source    string  `json:"source"`
	Expected  float64 `json:"expected"`
	Measured  float64 `json:"measured"`
	Unit      string  `json:"unit"`
	// Error is |measured - expected|, relative to |expected| when
	// Relative is set; Tolerance is its limit, explained by Why.
	Error     float64 `json:"error"`
	Relative  bool    `json:"relative"`
	Tolerance float64 `json:"tolerance"`
	Why       string  `json:"tolerance_reason"`
	Pass      bool    `json:"pass"`
	// Problem says why the case could not run (it then fails).
	Problem string `json:"problem,omitempty"`
}

// Case is one analytic check.
type Case struct {
	Name      string
	Reference string
	Source    string
	Unit      string
	Relative  bool
	Tolerance float64
	// Why gives the reason for the tolerance's size.
	Why string
	// Run simulates the case and returns the expected and measured values;
	// a case that judges several numbers returns their worst deviation in
	// dev (NaN to use |measured - expected|).
	Run func() (expected, measured, dev float64, err error)
}

// Check runs one case and judges it.
func Check(c Case) (res Result) {
	res = Result{Case: c.Name, Reference: c.Reference, Source: c.Source, Unit: c.Unit, Relative: c.Relative, Tolerance: c.Tolerance, Why: c.Why}
	defer func() {
		// A case is a simulation: if it panics that is a bug in the engine,
		// reported as a failed case rather than a crashed command.
		if p := recover(); p != nil {
			res.Pass = false
			res.Problem = fmt.Sprintf("the case crashed: %v", p)
		}
	}()
	exp, meas, dev, err := c.Run()
	res.Expected, res.Measured = exp, meas
	if err != nil {
		res.Problem = err.Error()
		return res
	}
	if math.IsNaN(dev) {
		dev = math.Abs(meas - exp)
		if c.Relative {
			dev /= math.Abs(exp)
		}
	}
	res.Error = dev
	res.Pass = dev <= c.Tolerance && !math.IsNaN(meas)
	return res
}

// RunAll runs every case of Cases in order.
func RunAll() []Result {
	cs := Cases()
	out := make([]Result, len(cs))
	for i, c := range cs {
		out[i] = Check(c)
	}
	return out
}

// Passed reports whether every result passed.
func Passed(rs []Result) bool {
	for _, r := range rs {
		if !r.Pass {
			return false
		}
	}
	return len(rs) > 0
}
