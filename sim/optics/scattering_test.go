package optics

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"github.com/conelight/conelight/fit/resolution"
)

const ksAlpha = 1e-4

func TestRayleighConstants(t *testing.T) {
	// Morel (1974): the pure-water phase function is 1 + 0.835 cos^2.
	if math.Abs(rayleighCos2Weight-0.835) > 5e-4 {
		t.Errorf("cos^2 weight %g, want 0.835", rayleighCos2Weight)
	}
	// b_w(500 nm) = 0.00222 /m (Morel 1974, from memory) and lambda^-4.32.
	if b := pureRayleighCoefficient(500) * 100; math.Abs(b-0.00222) > 1e-12 {
		t.Errorf("b_w(500) = %g /m", b)
	}
	if r := pureRayleighCoefficient(400) / pureRayleighCoefficient(500); math.Abs(r-math.Pow(1.25, 4.32)) > 1e-12 {
		t.Errorf("b(400)/b(500) = %g", r)
	}
}

func TestPhaseNormalization(t *testing.T) {
	// Independent quadrature of the densities and of their CDFs.
	if v := quad.Fixed(RayleighPhase, -1, 1, 20, nil, 0); math.Abs(v-1) > 1e-12 {
		t.Errorf("Rayleigh phase integrates to %g", v)
	}
	for _, g := range []float64{-0.5, 0.3, 0.9} {
		f := func(mu float64) float64 { return HenyeyGreensteinPhase(mu, g) }
		if v := quad.Fixed(f, -1, 1, 2000, nil, 0); math.Abs(v-1) > 1e-6 {
			t.Errorf("HG(g=%g) integrates to %g", g, v)
		}
		// Mean cosine equals g (definition of the asymmetry parameter).
		m := quad.Fixed(func(mu float64) float64 { return mu * f(mu) }, -1, 1, 2000, nil, 0)
		if math.Abs(m-g) > 1e-6 {
			t.Errorf("HG(g=%g) mean cosine %g", g, m)
		}
		for _, x := range []float64{-0.7, 0, 0.5, 0.95} {
			want := quad.Fixed(f, -1, x, 2000, nil, 0)
			if math.Abs(henyeyGreensteinCDF(x, g)-want) > 1e-6 {
				t.Errorf("HG CDF(%g, g=%g) = %g, quadrature %g", x, g, henyeyGreensteinCDF(x, g), want)
			}
		}
	}
	for _, x := range []float64{-0.7, 0, 0.5} {
		if want := quad.Fixed(RayleighPhase, -1, x, 20, nil, 0); math.Abs(rayleighCDF(x)-want) > 1e-12 {
			t.Errorf("Rayleigh CDF(%g) = %g, quadrature %g", x, rayleighCDF(x), want)
		}
	}
}

func TestInverseCDFRoundTrip(t *testing.T) {
	for u := 0.0; u <= 1; u += 1.0 / 64 {
		if d := rayleighCDF(rayleighInverseCDF(u)) - u; math.Abs(d) > 1e-13 {
			t.Errorf("Rayleigh F(F^-1(%g)) - u = %g", u, d)
		}
		for _, g := range []float64{-0.4, 0.9} {
			if d := henyeyGreensteinCDF(henyeyGreensteinInverseCDF(u, g), g) - u; math.Abs(d) > 1e-12 {
				t.Errorf("HG(g=%g) F(F^-1(%g)) - u = %g", g, u, d)
			}
		}
	}
}

func TestScatterSamplersKS(t *testing.T) {
	cfg := DefaultWaterConfig()
	cfg.MieLength, cfg.MieG = 20000, 0.9
	w, err := NewWater(cfg)
	if err != nil {
		t.Fatal(err)
	}
	const n = 100000
	x := make([]float64, n)
	check := func(name string, draw func(*rand.Rand) float64, cdf func(float64) float64) {
		rng := rand.New(rand.NewPCG(11, 12))
		for i := range x {
			x[i] = draw(rng)
		}
		if d, crit := resolution.KSStatistic(x, cdf), resolution.KSCritical(n, ksAlpha); d > crit {
			t.Errorf("%s: KS D = %g > %g (alpha %g)", name, d, crit, ksAlpha)
		}
	}
	check("Rayleigh", w.SampleRayleighCos, rayleighCDF)
	check("HG g=0.9", w.SampleMieCos, func(mu float64) float64 { return henyeyGreensteinCDF(mu, 0.9) })
	check("Lambert", sampleLambertCos, func(c float64) float64 { return c * c })
	// The mixture at 400 nm: Rayleigh and Mie in proportion to their
	// coefficients.
	fm := w.ScatteringLength(400) / w.MieLength(400)
	check("mixture 400 nm", func(r *rand.Rand) float64 { return w.SampleScatterCos(400, r) },
		func(mu float64) float64 { return fm*henyeyGreensteinCDF(mu, 0.9) + (1-fm)*rayleighCDF(mu) })
}
