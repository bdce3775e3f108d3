package cherenkov

import (
	"testing"

	"github.com/conelight/conelight/fit/resolution"
)

const testAlpha = 1e-4 // significance of every statistical test here

// chiSquare returns Pearson's statistic for observed counts against
// expected counts (no bins merged, no parameters fitted) and its critical
// value at testAlpha (resolution.ChiSquare).
func chiSquare(t *testing.T, observed []int, expected []float64) (stat, crit float64) {
	t.Helper()
	stat, dof, err := resolution.ChiSquare(observed, expected, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	return stat, resolution.ChiSquareCritical(dof, testAlpha)
}
