package main

import (
	"math"
	"testing"
)

// slopeTol is the tolerance on a fitted exponent of exact power laws: only
// rounding of the logarithms separates the fit from the exponent.
const slopeTol = 1e-12

func TestLogLogSlope(t *testing.T) {
	// y = c x^p is a straight line of slope p on log-log axes (the
	// definition of a power law), whatever c.
	for _, c := range []struct {
		p, c float64
		xs   []float64
	}{
		{1, 5e6, []float64{1000, 2000, 4000, 8000}},
		{1.1, 3, []float64{1000, 2000, 4000, 8000}},
		{2, 0.5, []float64{10, 30}},
		{0.5, 7, []float64{1, 2, 3, 100}},
	} {
		pts := make([][2]float64, len(c.xs))
		for i, x := range c.xs {
			pts[i] = [2]float64{x, c.c * math.Pow(x, c.p)}
		}
		got, ok := logLogSlope(pts)
		if !ok || math.Abs(got-c.p) > slopeTol {
			t.Errorf("slope of %g x^%g over %v = %g %v, want %g", c.c, c.p, c.xs, got, ok, c.p)
		}
	}
	if _, ok := logLogSlope([][2]float64{{1000, 1}, {1000, 2}}); ok {
		t.Errorf("a fit over one size succeeded")
	}
}
