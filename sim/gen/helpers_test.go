package gen

import (
	"math"
	"testing"

	"github.com/conelight/conelight/fit/resolution"
)

// chiSquare compares bin counts with expected probabilities (summing to
// 1) by Pearson's chi-square, bins with fewer than 5 expected entries
// merged (resolution.ChiSquare); it fails when chi2 exceeds the 1 - 1e-4
// quantile of the chi-square distribution.
func chiSquare(t *testing.T, name string, counts []int, probs []float64) {
	t.Helper()
	n := 0
	for _, c := range counts {
		n += c
	}
	want := make([]float64, len(probs))
	for i, p := range probs {
		want[i] = p * float64(n)
	}
	chi2, dof, err := resolution.ChiSquare(counts, want, 0, 5)
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	if crit := resolution.ChiSquareCritical(dof, 1e-4); chi2 > crit || math.IsNaN(chi2) {
		t.Errorf("%s: chi2 = %.1f for %d dof, critical value %.1f", name, chi2, dof, crit)
	}
}
