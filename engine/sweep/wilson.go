package sweep

import (
	"math"

	"gonum.org/v1/gonum/mathext"
)

// Confidence is the level of the intervals in cases.csv.
const Confidence = 0.95

// Wilson returns the Wilson score interval for a proportion of k successes
// in n trials at the given confidence level (E. B. Wilson, "Probable
// inference, the law of succession, and statistical inference", JASA 22,
// 1927): the proportions p for which |k/n - p| <= z sqrt(p (1 - p) / n),
// z the two-sided normal quantile. Unlike the normal approximation it stays
// inside [0, 1] and is not empty at k = 0 or k = n. For n = 0 it returns
// the whole range [0, 1].
func Wilson(k, n int64, confidence float64) (low, high float64) {
	if n <= 0 || k < 0 || k > n {
		return 0, 1
	}
	z := mathext.NormalQuantile(1 - (1-confidence)/2)
	nf := float64(n)
	p := float64(k) / nf
	z2 := z * z
	den := 1 + z2/nf
	centre := (p + z2/(2*nf)) / den
	half := z / den * math.Sqrt(p*(1-p)/nf+z2/(4*nf*nf))
	low, high = centre-half, centre+half
	// The bounds are exact at the ends: 0 successes have low 0, n have high 1.
	if k == 0 {
		low = 0
	}
	if k == n {
		high = 1
	}
	return math.Max(0, low), math.Min(1, high)
}
