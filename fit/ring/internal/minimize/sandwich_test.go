package minimize

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestSandwichMisspecified fits the mean of n normal values with a model
// that assumes unit variance while the data have variance v: the inverse
// Hessian says 1/n whatever v is, while the sandwich must give v/n (the
// variance of the sample mean) within the sampling error of the variance,
// sqrt(2/n) relative; with v = 1 the two agree.
func TestSandwichMisspecified(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	const n = 20000
	for _, v := range []float64{1, 4} {
		x := make([]float64, n)
		var mean float64
		for i := range x {
			x[i] = math.Sqrt(v) * rng.NormFloat64()
			mean += x[i] / n
		}
		// Terms (x_i - m)^2 / 2: score at the fitted m is -(x_i - m),
		// Hessian n.
		scores := [][]float64{make([]float64, n)}
		for i := range x {
			scores[0][i] = -(x[i] - mean)
		}
		hinv := mat.NewSymDense(1, []float64{1.0 / n})
		got := Sandwich(hinv, scores).At(0, 0) * n
		if tol := 4 * v * math.Sqrt(2.0/n); math.Abs(got-v) > tol {
			t.Errorf("variance %g: sandwich gives %g/n, want %g/n within %.3g", v, got, v, tol)
		}
	}
}
