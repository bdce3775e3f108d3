package cherenkov

import (
	"math"
	"math/rand/v2"
	"testing"
)

func TestPoissonChiSquare(t *testing.T) {
	// Pearson chi-square of the drawn counts against the Poisson pmf;
	// neighbouring counts are merged until a bin expects at least 5, and
	// the last bin takes the whole upper tail.
	for _, mu := range []float64{0.5, 4, 9.99, 10, 25, 300} {
		rng := rand.New(rand.NewPCG(21, uint64(mu*100)))
		const n = 100000
		kmax := int(mu + 12*math.Sqrt(mu) + 20)
		hist := make([]int, kmax+1)
		sum := 0.0
		for range n {
			k := poisson(rng, mu)
			hist[min(k, kmax)]++
			sum += float64(k)
		}
		var obs []int
		var exp []float64
		acc, accObs, cdf := 0.0, 0, 0.0
		for k := 0; k < kmax; k++ {
			lg, _ := math.Lgamma(float64(k + 1))
			p := math.Exp(-mu + float64(k)*math.Log(mu) - lg)
			cdf += p
			acc += p * n
			accObs += hist[k]
			if acc >= 5 {
				obs, exp = append(obs, accObs), append(exp, acc)
				acc, accObs = 0, 0
			}
		}
		obs[len(obs)-1] += accObs + hist[kmax]
		exp[len(exp)-1] += acc + (1-cdf)*n
		stat, crit := chiSquare(t, obs, exp)
		if stat > crit {
			t.Errorf("Poisson(%g): chi2 = %g > %g over %d bins", mu, stat, crit, len(obs))
		}
		// Mean within 5 sigma (sigma = sqrt(mu/n)).
		if m := sum / n; math.Abs(m-mu) > 5*math.Sqrt(mu/n) {
			t.Errorf("Poisson(%g): mean %g", mu, m)
		}
	}
	if poisson(rand.New(rand.NewPCG(1, 1)), 0) != 0 {
		t.Error("Poisson(0) != 0")
	}
}
