package gen

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// chiSquare compares bin counts with expected probabilities (summing to
// 1) by Pearson's chi-square; bins with fewer than 5 expected entries are
// merged into their neighbour. It fails when chi2 exceeds the 1 - 1e-4
// quantile of the chi-square distribution (distuv.ChiSquared).
func chiSquare(t *testing.T, name string, counts []int, probs []float64) {
	t.Helper()
	n := 0
	for _, c := range counts {
		n += c
	}
	var chi2 float64
	dof := -1
	var o, e float64
	for i := range counts {
		o += float64(counts[i])
		e += probs[i] * float64(n)
		if e < 5 && i < len(counts)-1 {
			continue
		}
		chi2 += (o - e) * (o - e) / e
		dof++
		o, e = 0, 0
	}
	if dof < 1 {
		t.Fatalf("%s: too few bins", name)
	}
	crit := distuv.ChiSquared{K: float64(dof)}.Quantile(1 - 1e-4)
	if chi2 > crit || math.IsNaN(chi2) {
		t.Errorf("%s: chi2 = %.1f for %d dof, critical value %.1f", name, chi2, dof, crit)
	}
}
