package resolution

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"
)

// TestKSCriticalTable checks the critical values against the published
// table of the exact one-sample statistic (Miller, J. Am. Stat. Assoc. 51
// (1956) 111; values from memory): n = 10, alpha = 0.05 (two-sided):
// 0.409; n = 20: 0.294, to the table's three digits. TestKSRejectionRate
// checks the rate directly.
func TestKSCriticalTable(t *testing.T) {
	for _, c := range []struct {
		n     int
		alpha float64
		want  float64
	}{{10, 0.05, 0.409}, {20, 0.05, 0.294}} {
		if got := KSCritical(c.n, c.alpha); math.Abs(got-c.want) > 0.003 {
			t.Errorf("KSCritical(%d, %v) = %.4f, want %.3f", c.n, c.alpha, got, c.want)
		}
	}
}

// TestKSRejectionRate: on uniform samples of 20 values D exceeds the
// critical value at alpha = 0.05 in 5% of trials, within 4 binomial
// standard errors of 4000 trials; the same for the two-sample test.
func TestKSRejectionRate(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	const trials, n, alpha = 4000, 20, 0.05
	one, two := 0, 0
	for range trials {
		x, y := make([]float64, n), make([]float64, 2*n)
		for i := range x {
			x[i] = rng.Float64()
		}
		for i := range y {
			y[i] = rng.Float64()
		}
		if KSStatistic(x, func(v float64) float64 { return v }) > KSCritical(n, alpha) {
			one++
		}
		if kolmogorovSmirnov(x, y) > KSTwoSampleCritical(n, 2*n, alpha) {
			two++
		}
	}
	sd := math.Sqrt(alpha * (1 - alpha) / trials)
	for name, k := range map[string]int{"one-sample": one, "two-sample": two} {
		// The two-sample statistic is discrete at these sizes, so its
		// test is conservative: allow any rate below alpha + 4 sd.
		r := float64(k) / trials
		if r > alpha+4*sd || (name == "one-sample" && r < alpha-4*sd) {
			t.Errorf("%s: rejected %.4f of %d, want %.3f +- %.4f", name, r, trials, alpha, sd)
		}
	}
}

// TestChiSquareRate: Poisson-mean-3 counts histogrammed in 0..9 and above,
// tested against the exact Poisson probabilities, exceed the 5% critical
// value in 5% of trials (within 4 binomial standard errors), with the
// sparse tail merged.
func TestChiSquareRate(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	pois := distuv.Poisson{Lambda: 3, Src: rng}
	probs := make([]float64, 11)
	for k := range 10 {
		probs[k] = distuv.Poisson{Lambda: 3}.Prob(float64(k))
	}
	probs[10] = 1 - distuv.Poisson{Lambda: 3}.CDF(9)
	const trials, n, alpha = 2000, 200, 0.05
	rejected := 0
	for range trials {
		counts := make([]int, 11)
		for range n {
			counts[min(int(pois.Rand()), 10)]++
		}
		expected := make([]float64, len(probs))
		for i, p := range probs {
			expected[i] = p * n
		}
		stat, dof, err := ChiSquare(counts, expected, 0, 5)
		if err != nil {
			t.Fatal(err)
		}
		if stat > ChiSquareCritical(dof, alpha) {
			rejected++
		}
	}
	sd := math.Sqrt(alpha * (1 - alpha) / trials)
	if r := float64(rejected) / trials; math.Abs(r-alpha) > 4*sd {
		t.Errorf("rejected %.4f of %d, want %.3f +- %.4f", r, trials, alpha, sd)
	}
}

func TestChiSquareRefuses(t *testing.T) {
	if _, _, err := ChiSquare([]int{1, 2}, []float64{1}, 0, 5); err == nil {
		t.Error("length mismatch accepted")
	}
	if _, _, err := ChiSquare([]int{1, -2}, []float64{0.5, 0.5}, 0, 5); err == nil {
		t.Error("negative count accepted")
	}
	if _, _, err := ChiSquare([]int{10, 10}, []float64{0.5, 0.5}, 1, 5); err == nil {
		t.Error("zero degrees of freedom accepted")
	}
}

func kolmogorovSmirnov(x, y []float64) float64 {
	a, b := slices.Clone(x), slices.Clone(y)
	slices.Sort(a)
	slices.Sort(b)
	return stat.KolmogorovSmirnov(a, nil, b, nil)
}
