package ring

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/conelight/conelight/pmt"
)

// The charge table must be a normalized probability: P(no hit) plus the
// integral of the hit density above threshold is 1. The tolerance is
// the error of linear interpolation of -log P in log mu between nodes a
// step D apart, D^2/8 times the curvature, which for the Poisson-like
// -log P ~ (q-mu)^2/(2 mu) is about mu/2, plus 2e-3 for the trapezoid rule
// on the 0.05 pe grid.
func TestChargeNormalization(t *testing.T) {
	m := pmt.Medium()
	for _, sigma := range []float64{0, modelSigma} {
		testChargeNormalization(t, &m, sigma)
	}
}

func testChargeNormalization(t *testing.T, m *pmt.Model, sigma float64) {
	ct, err := newChargeTable(m, sigma)
	if err != nil {
		t.Fatal(err)
	}
	for _, mu := range []float64{0.01, 0.3, 1, 3, 10, 20} {
		sum := math.Exp(-ct.nllNone(mu))
		const h = cqStep
		for q := m.Threshold; q < 150; q += h { // beyond 40 pe the Gaussian tail
			sum += 0.5 * h * (math.Exp(-ct.nllHit(q, mu)) + math.Exp(-ct.nllHit(q+h, mu)))
		}
		tol := 2e-3 + cLogMuDx*cLogMuDx/8*math.Max(mu/2, 1)
		if math.Abs(sum-1) > tol {
			t.Errorf("sigma %g, mu %g: total probability %.5f, want 1", sigma, mu, sum)
		}
	}
}

// For small mu, P(hit) = mu (1 - F1(threshold)) to first order, F1 the
// single-pe charge CDF of package pmt (an independent implementation of
// the same spectrum).
func TestChargeSmallMu(t *testing.T) {
	m := pmt.Medium()
	ct, err := newChargeTable(&m, 0)
	if err != nil {
		t.Fatal(err)
	}
	mu := 1e-3
	want := mu * (1 - m.SPE.CDF(m.Threshold))
	got := -math.Expm1(-ct.nllNone(mu))
	if math.Abs(got/want-1) > 2e-3+mu {
		t.Errorf("P(hit | mu=%g) = %.6g, want %.6g", mu, got, want)
	}
}

// Monte Carlo check of the compound Poisson charge: draw n ~ Poisson(mu)
// and sum n single-pe charges with pmt.SPE.Sample; compare P(no hit)
// and the probability of charge bins with the table, each within 4
// binomial standard errors plus 2% of the bin probability for the
// moment-matched convolution of the two single-pe components. With a
// model width sigma the mean is first drawn from mu times a Gamma
// variable of mean 1 and relative width sigma (gonum distuv.Gamma), the
// mixture the negative-binomial table must reproduce.
func TestChargeMonteCarlo(t *testing.T) {
	m := pmt.Medium()
	for _, sigma := range []float64{0, modelSigma} {
		ct, err := newChargeTable(&m, sigma)
		if err != nil {
			t.Fatal(err)
		}
		rng := rand.New(rand.NewPCG(5, 6))
		var gamma distuv.Gamma
		if sigma > 0 {
			gamma = distuv.Gamma{Alpha: 1 / (sigma * sigma), Beta: 1 / (sigma * sigma), Src: rand.NewPCG(7, 8)}
		}
		const N = 200000
		mu := 3.0
		edges := []float64{0.5, 1, 2, 3, 4, 6}
		counts := make([]float64, len(edges)-1)
		none := 0.0
		for i := 0; i < N; i++ {
			mean := mu
			if sigma > 0 {
				mean *= gamma.Rand()
			}
			n := poisson(rng, mean)
			q := 0.0
			for j := 0; j < n; j++ {
				q += m.SPE.Sample(rng)
			}
			if q < m.Threshold {
				none++
				continue
			}
			for b := 0; b+1 < len(edges); b++ {
				if q >= edges[b] && q < edges[b+1] {
					counts[b]++
				}
			}
		}
		check := func(name string, k, p float64) {
			se := math.Sqrt(p * (1 - p) / N)
			if math.Abs(k/N-p) > 4*se+0.02*p {
				t.Errorf("sigma %g: %s: Monte Carlo %.5f, table %.5f (se %.5f)", sigma, name, k/N, p, se)
			}
		}
		check("P(no hit)", none, math.Exp(-ct.nllNone(mu)))
		for b := 0; b+1 < len(edges); b++ {
			var p float64
			const h = 0.01
			for q := edges[b]; q < edges[b+1]-h/2; q += h {
				p += h * math.Exp(-ct.nllHit(q+h/2, mu))
			}
			check("charge bin", counts[b], p)
		}
	}
}

func poisson(rng *rand.Rand, mu float64) int {
	l, k, p := math.Exp(-mu), 0, 1.0
	for {
		p *= rng.Float64()
		if p < l {
			return k
		}
		k++
	}
}

// The time density integrates to 1 over the readout window, and its
// direct part reproduces first-photon statistics: the mean residual of the
// earliest of n ~ Poisson(mu) Gaussian photoelectrons (given n >= 1),
// drawn by Monte Carlo, agrees with the mean of the density within 4
// standard errors.
func TestTimeDensity(t *testing.T) {
	d := demoTank(t)
	w := d.fit.newWorkspace()
	w.window = 1000
	sigma := 2.0
	for _, mu := range []float64{0.2, 3, 30} {
		var sum, mean float64
		const h = 0.01
		for x := -300.0; x < 700; x += h {
			p := math.Exp(-w.timeNLL(x+h/2, sigma, mu, 0.1, 1e-3))
			sum += p * h
		}
		if math.Abs(sum-1) > 1e-3 {
			t.Errorf("mu %g: time density integrates to %.5f", mu, sum)
		}
		// direct light only
		for x := -40.0; x < 40; x += h {
			mean += (x + h/2) * h * math.Exp(-w.timeNLL(x+h/2, sigma, mu, 0, 0))
		}
		rng := rand.New(rand.NewPCG(1, uint64(mu*10)))
		const N = 20000
		var s, s2 float64
		for i := 0; i < N; {
			n := poisson(rng, mu)
			if n == 0 {
				continue
			}
			first := math.Inf(1)
			for j := 0; j < n; j++ {
				first = math.Min(first, sigma*rng.NormFloat64())
			}
			s += first
			s2 += first * first
			i++
		}
		mc := s / N
		se := math.Sqrt((s2/N - mc*mc) / N)
		if math.Abs(mc-mean) > 4*se {
			t.Errorf("mu %g: mean first-photon residual %.4f ns, Monte Carlo %.4f +- %.4f", mu, mean, mc, se)
		}
	}
}
