package ring

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/conelight/conelight/pmt"
)

// chargeTable holds -log P(q | mu) for a hit of charge q (pe) above
// threshold and -log P(no hit | mu) for a sensor with mean mu
// photoelectrons: the photoelectron count (negative binomial about mu,
// see below) convolved with the single-pe charge spectrum of the sensor.
// Read-only after construction.
//
// The n-photoelectron charge is the sum of n single-pe charges, each from
// the gamma main peak (shape 1/w^2) or, with probability LowFraction, the
// exponential low-charge component. With j low-charge photoelectrons the
// sum is a gamma of shape (n-j)/w^2 convolved with a gamma of shape j;
// where both are present the convolution is replaced by the gamma of the
// same mean and variance. The tables cover mu up to muHi and q up to qHi;
// beyond, the compound sum is approximated by a gamma density of mean mu*m1
// and variance mu*m2 + (sigma mu m1)^2 (m1, m2: first and second moments
// of the single-pe charge), with a linear blend between muBlend and muHi
// so that the likelihood stays continuous in mu.
//
// The light model's prediction is itself uncertain from sensor to sensor
// (shower and delta-ray fluctuations, the mean profiles): the true mean
// of a sensor is taken as mu times a Gamma variable of mean 1 and
// relative width sigma (modelSigma for a Fitter), which turns the Poisson
// photoelectron count into the negative binomial of mean mu and variance
// mu + (sigma mu)^2; sigma = 0 is the Poisson count.
type chargeTable struct {
	threshold  float64
	saturation float64
	m1, m2     float64
	sigma2     float64 // squared relative model width
	// hit[i*nq+j]: -log density at log-mu node i, q node j.
	hit []float64
	// none[i]: -log P(no hit) at log-mu node i.
	none []float64
}

const (
	cqStep   = 0.05
	cqHi     = 40.0
	cLogMuLo = -12.0              // mu = 6e-6
	cLogMuHi = 3.6888794541139363 // ln 40
	cMuBlend = 30.0
	cMuHi    = 40.0
	cNMu     = 480
	cNMax    = 110
)

var (
	cNQ      = int(cqHi/cqStep) + 1
	cLogMuDx = (cLogMuHi - cLogMuLo) / (cNMu - 1)
)

// modelSigma is the relative width of the light model's per-sensor
// prediction: the spread of simulated charges about the prediction at
// the true track beyond the Poisson x single-pe spread, for sensors
// predicted to see 5-40 pe, with the prediction scaled to each event's
// total charge (the fit absorbs an overall scale into the energy).
// TestModelSpread measures it in the demo tank on 600 MeV/c electrons
// (0.44) and muons (0.47) and checks this value against both.
const modelSigma = 0.45

func newChargeTable(m *pmt.Model, sigma float64) (*chargeTable, error) {
	if !(sigma >= 0) || math.IsInf(sigma, 0) {
		return nil, fmt.Errorf("ring: model width %g must be finite and non-negative", sigma)
	}
	spe := m.SPE
	if err := spe.Validate(); err != nil {
		return nil, fmt.Errorf("ring: sensor SPE: %w", err)
	}
	width := math.Max(spe.Width, 0.05) // a sharp peak is smoothed to 5% for the density
	theta := width * width             // gamma scale of the main peak
	f, lm := spe.LowFraction, spe.LowMean
	t := &chargeTable{threshold: m.Threshold, saturation: m.Saturation, sigma2: sigma * sigma}
	t.m1 = (1 - f) + f*lm
	t.m2 = (1-f)*(1+theta) + f*2*lm*lm
	// densities[n][j] of the n-pe charge at q_j, and CDF at the threshold.
	dens := make([][]float64, cNMax+1)
	cdfThr := make([]float64, cNMax+1)
	for n := 1; n <= cNMax; n++ {
		dens[n] = make([]float64, cNQ)
		for jl := 0; jl <= n; jl++ {
			wb := binomialPMF(n, jl, f)
			if wb < 1e-12 {
				continue
			}
			mean := float64(n-jl) + float64(jl)*lm
			vr := float64(n-jl)*theta + float64(jl)*lm*lm
			shape, scale := mean*mean/vr, vr/mean
			cdfThr[n] += wb * distuv.Gamma{Alpha: shape, Beta: 1 / scale}.CDF(t.threshold)
			for j := range dens[n] {
				dens[n][j] += wb * gammaPDF(float64(j)*cqStep, shape, scale)
			}
		}
	}
	t.hit = make([]float64, cNMu*cNQ)
	t.none = make([]float64, cNMu)
	for i := 0; i < cNMu; i++ {
		mu := math.Exp(cLogMuLo + float64(i)*cLogMuDx)
		// log P(n=0) and the log ratio P(n)/P(n-1) = (r + n - 1)/n * mu/(r + mu)
		// of the negative binomial with shape r = 1/sigma^2 (Poisson for
		// sigma = 0).
		lp, lr := -mu, math.Log(mu)
		if t.sigma2 > 0 {
			r := 1 / t.sigma2
			lp = -r * math.Log1p(mu/r)
			lr = math.Log(mu / (r + mu))
		}
		p0 := math.Exp(lp)
		row := t.hit[i*cNQ : (i+1)*cNQ]
		for n := 1; n <= cNMax; n++ {
			if t.sigma2 > 0 {
				lp += math.Log((1/t.sigma2+float64(n-1))/float64(n)) + lr
			} else {
				lp += lr - math.Log(float64(n))
			}
			pn := math.Exp(lp)
			p0 += pn * cdfThr[n]
			for j := range row {
				row[j] += pn * dens[n][j]
			}
		}
		for j := range row {
			row[j] = -math.Log(math.Max(row[j], 1e-300))
		}
		t.none[i] = -math.Log(math.Min(math.Max(p0, 1e-300), 1))
	}
	return t, nil
}

// binomialPMF is the binomial probability of k successes in n trials of
// probability p; p = 0 is handled here because the library's log form
// evaluates 0 * log(0).
func binomialPMF(n, k int, p float64) float64 {
	if p == 0 {
		if k == 0 {
			return 1
		}
		return 0
	}
	return distuv.Binomial{N: float64(n), P: p}.Prob(float64(k))
}

// gammaPDF is the gamma density of the given shape and scale at x >= 0.
// At x = 0 only the exponential (shape 1) has a finite non-zero density;
// a shape below 1, whose density diverges there, counts as zero, as for
// a charge bin edge that carries no probability.
func gammaPDF(x, shape, scale float64) float64 {
	if x <= 0 && shape != 1 {
		return 0
	}
	return distuv.Gamma{Alpha: shape, Beta: 1 / scale}.Prob(x)
}

// moments returns the mean and variance of the charge for mean mu.
func (t *chargeTable) moments(mu float64) (mean, variance float64) {
	m := mu * t.m1
	return m, mu*t.m2 + t.sigma2*m*m
}

// tailHit is -log of the approximation of the charge density beyond the
// tables: the gamma density of the same mean and variance, which keeps
// the right skew of the compound sum (a Gaussian loses a few percent of
// the probability above 40 pe at a mean of 20 pe with the model width).
func (t *chargeTable) tailHit(q, mu float64) float64 {
	m, v := t.moments(mu)
	if q <= 0 {
		q = 1e-9
	}
	return -distuv.Gamma{Alpha: m * m / v, Beta: m / v}.LogProb(q)
}

// gaussNone is -log of the Gaussian approximation of P(q < threshold).
func (t *chargeTable) gaussNone(mu float64) float64 {
	m, v := t.moments(mu)
	return -logNormCDF((t.threshold - m) / math.Sqrt(v))
}

// logNormCDF is log Phi(x), accurate far in the lower tail.
func logNormCDF(x float64) float64 {
	if x > -5 {
		return math.Log(0.5 * math.Erfc(-x/math.Sqrt2))
	}
	// Asymptotic series of the Mills ratio.
	x2 := x * x
	return -0.5*x2 - math.Log(-x) - 0.5*math.Log(2*math.Pi) + math.Log(1-1/x2+3/(x2*x2))
}

// muNode returns the log-mu node and fraction for mu.
func muNode(mu float64) (int, float64) {
	x := (math.Log(mu) - cLogMuLo) / cLogMuDx
	if x <= 0 {
		return 0, 0
	}
	i := int(x)
	if i >= cNMu-1 {
		return cNMu - 2, 1
	}
	return i, x - float64(i)
}

// nllHit is -log P(q | mu) for a hit of charge q; a charge at the
// saturation limit counts as P(Q >= saturation).
func (t *chargeTable) nllHit(q, mu float64) float64 {
	if t.saturation > 0 && q >= t.saturation*(1-1e-9) {
		m, v := t.moments(mu)
		return -logNormCDF((m - t.saturation) / math.Sqrt(v))
	}
	if mu >= cMuBlend || q >= cqHi {
		g := t.tailHit(q, mu)
		if mu >= cMuHi || q >= cqHi {
			return g
		}
		w := (mu - cMuBlend) / (cMuHi - cMuBlend)
		return w*g + (1-w)*t.tableHit(q, mu)
	}
	return t.tableHit(q, mu)
}

func (t *chargeTable) tableHit(q, mu float64) float64 {
	i, fm := muNode(mu)
	x := q / cqStep
	j := int(x)
	if j >= cNQ-1 {
		j = cNQ - 2
	}
	fq := x - float64(j)
	a := t.hit[i*cNQ+j]*(1-fq) + t.hit[i*cNQ+j+1]*fq
	b := t.hit[(i+1)*cNQ+j]*(1-fq) + t.hit[(i+1)*cNQ+j+1]*fq
	return a*(1-fm) + b*fm
}

// nllNone is -log P(no hit | mu).
func (t *chargeTable) nllNone(mu float64) float64 {
	if mu >= cMuBlend {
		g := t.gaussNone(mu)
		if mu >= cMuHi {
			return g
		}
		w := (mu - cMuBlend) / (cMuHi - cMuBlend)
		return w*g + (1-w)*t.tableNone(mu)
	}
	return t.tableNone(mu)
}

func (t *chargeTable) tableNone(mu float64) float64 {
	i, f := muNode(mu)
	return t.none[i]*(1-f) + t.none[i+1]*f
}
