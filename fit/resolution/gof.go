package resolution

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/stat/distuv"
)

// This file holds the goodness-of-fit tests the project's own tests use
// to compare sampled distributions with published or computed ones, one
// copy for every package: Kolmogorov-Smirnov for continuous samples and
// Pearson's chi-square for histograms.

// KSStatistic returns the one-sample Kolmogorov-Smirnov statistic
// D = sup |F_n(x) - F(x)| of the values x against the distribution
// function cdf. x is not modified.
func KSStatistic(x []float64, cdf func(float64) float64) float64 {
	s := slices.Clone(x)
	slices.Sort(s)
	n := float64(len(s))
	d := 0.0
	for i, v := range s {
		f := cdf(v)
		d = math.Max(d, math.Max(f-float64(i)/n, float64(i+1)/n-f))
	}
	return d
}

// kolmogorovQuantile returns K with P(K_limit > K) = alpha for the
// Kolmogorov limit distribution, from the leading term of its series,
// 2 exp(-2 K^2), which is accurate to better than 1e-7 in alpha for
// alpha <= 0.2 (the next term is 2 exp(-8 K^2)).
func kolmogorovQuantile(alpha float64) float64 {
	return math.Sqrt(-math.Log(alpha/2) / 2)
}

// KSCritical returns the critical value of the one-sample statistic D for
// n values at significance alpha (0 < alpha <= 0.2): the Kolmogorov limit
// quantile with the finite-n factor sqrt(n) + 0.12 + 0.11/sqrt(n) of
// Stephens, J. R. Stat. Soc. B 32 (1970) 115, which makes it accurate
// for n >= 5.
func KSCritical(n int, alpha float64) float64 {
	sn := math.Sqrt(float64(n))
	return kolmogorovQuantile(alpha) / (sn + 0.12 + 0.11/sn)
}

// KSTwoSampleCritical returns the critical value of the two-sample
// statistic D for samples of n and m values at significance alpha
// (0 < alpha <= 0.2): the limit quantile times sqrt((n+m)/(n m)), with
// Stephens' finite-size factor applied to the effective size n m/(n+m).
func KSTwoSampleCritical(n, m int, alpha float64) float64 {
	ne := float64(n) * float64(m) / float64(n+m)
	sn := math.Sqrt(ne)
	return kolmogorovQuantile(alpha) / (sn + 0.12 + 0.11/sn)
}

// ChiSquare returns Pearson's chi-square of observed bin counts against
// expected counts, and its degrees of freedom: bins - 1 - fitted, where
// fitted is the number of parameters estimated from the same counts (the
// expected counts are taken to share the observed total). Neighbouring
// bins are merged from the left until each expects at least minExpected
// entries (5 is common practice), so that the statistic follows the
// chi-square distribution; minExpected 0 merges nothing.
func ChiSquare(observed []int, expected []float64, fitted int, minExpected float64) (stat float64, dof int, err error) {
	if len(observed) != len(expected) {
		return 0, 0, fmt.Errorf("resolution: %d observed and %d expected counts", len(observed), len(expected))
	}
	// Merge from the left; a short tail joins the last full bin.
	var mo, me []float64
	var o, e float64
	for i := range observed {
		if observed[i] < 0 {
			return 0, 0, fmt.Errorf("resolution: observed[%d] = %d is negative", i, observed[i])
		}
		if !(expected[i] >= 0) || math.IsInf(expected[i], 0) {
			return 0, 0, fmt.Errorf("resolution: expected[%d] = %v must be finite and non-negative", i, expected[i])
		}
		o += float64(observed[i])
		e += expected[i]
		if e >= minExpected && e > 0 {
			mo, me = append(mo, o), append(me, e)
			o, e = 0, 0
		}
	}
	if len(me) == 0 {
		return 0, 0, fmt.Errorf("resolution: no bin expects %v or more entries", minExpected)
	}
	mo[len(mo)-1] += o
	me[len(me)-1] += e
	dof = len(me) - 1 - fitted
	if dof < 1 {
		return 0, 0, fmt.Errorf("resolution: %d bins after merging leave %d degrees of freedom", len(me), dof)
	}
	for k := range me {
		stat += (mo[k] - me[k]) * (mo[k] - me[k]) / me[k]
	}
	return stat, dof, nil
}

// ChiSquareCritical returns the value a chi-square variable of dof degrees
// of freedom exceeds with probability alpha.
func ChiSquareCritical(dof int, alpha float64) float64 {
	return distuv.ChiSquared{K: float64(dof)}.Quantile(1 - alpha)
}
