package optics

import (
	"math"
	"slices"
)

// ksCritical returns the one-sample Kolmogorov-Smirnov critical value of
// D for n samples at significance alpha: the leading term of the
// Kolmogorov limit distribution, P(sqrt(n) D > K) = 2 exp(-2 K^2), with
// the finite-n factor sqrt(n) + 0.12 + 0.11/sqrt(n) of Stephens, J. R.
// Stat. Soc. B 32 (1970) 115.
func ksCritical(n int, alpha float64) float64 {
	k := math.Sqrt(-math.Log(alpha/2) / 2)
	sn := math.Sqrt(float64(n))
	return k / (sn + 0.12 + 0.11/sn)
}

// ksStatistic returns sup |F_n - cdf| for the samples x (sorted in place).
func ksStatistic(x []float64, cdf func(float64) float64) float64 {
	slices.Sort(x)
	n := float64(len(x))
	d := 0.0
	for i, v := range x {
		f := cdf(v)
		d = math.Max(d, math.Max(f-float64(i)/n, float64(i+1)/n-f))
	}
	return d
}
