package cherenkov

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

const testAlpha = 1e-4 // significance of every statistical test here

// chiSquare returns Pearson's statistic for observed counts against
// expected counts and the critical value at testAlpha for len-1-fitted
// degrees of freedom (quantile of the chi-square distribution).
func chiSquare(observed []int, expected []float64, fitted int) (stat, crit float64) {
	for i, o := range observed {
		d := float64(o) - expected[i]
		stat += d * d / expected[i]
	}
	dof := float64(len(observed) - 1 - fitted)
	return stat, distuv.ChiSquared{K: dof}.Quantile(1 - testAlpha)
}

// ksTwoSampleCritical is the two-sample Kolmogorov-Smirnov critical D at
// testAlpha for sample sizes n, m: the leading term of the Kolmogorov
// limit, P(K > c) = 2 exp(-2 c^2), times sqrt((n+m)/(n m)).
func ksTwoSampleCritical(n, m int) float64 {
	c := math.Sqrt(-math.Log(testAlpha/2) / 2)
	return c * math.Sqrt(float64(n+m)/float64(n*m))
}
