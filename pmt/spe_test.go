package pmt

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/conelight/conelight/fit/resolution"
)

func TestSPECDFMatchesGonumGamma(t *testing.T) {
	// Independent calculation: the gamma peak of mean 1 and relative width
	// w is distuv.Gamma{Alpha: 1/w^2, Beta: 1/w^2} (rate parametrisation).
	for _, w := range []float64{0.3, 0.45, 1} {
		s := SPE{Width: w}
		g := distuv.Gamma{Alpha: 1 / (w * w), Beta: 1 / (w * w)}
		for q := 0.0; q < 4; q += 0.05 {
			if got, want := s.CDF(q), g.CDF(q); math.Abs(got-want) > 1e-12 {
				t.Errorf("w=%v: CDF(%v) = %v, want %v", w, q, got, want)
			}
		}
	}
}

func TestSPESampleKS(t *testing.T) {
	// Statistical: Kolmogorov-Smirnov of sampled single-pe charges against
	// the model CDF, alpha = 1e-4, critical value from the asymptotic
	// Kolmogorov formula for n.
	const n = 20000
	cases := map[string]SPE{
		"Large":   Large().SPE,
		"Medium":  Medium().SPE,
		"Small":   Small().SPE,
		"width 1": {Width: 1},
	}
	for name, s := range cases {
		rng := rand.New(rand.NewPCG(11, 12))
		q := make([]float64, n)
		var sum float64
		for i := range q {
			q[i] = s.Sample(rng)
			sum += q[i]
		}
		slices.Sort(q)
		d := resolution.KSStatistic(q, s.CDF)
		if crit := resolution.KSCritical(n, 1e-4); d > crit {
			t.Errorf("%s: KS D = %.4g exceeds critical %.4g", name, d, crit)
		}
		if q[0] < 0 {
			t.Errorf("%s: negative charge %v", name, q[0])
		}
		// Statistical: sample mean within 5 standard errors of Mean(); the
		// mixture variance is (1-f)(w^2+1) + f 2 mu^2 - Mean^2.
		f, mu, w := s.LowFraction, s.LowMean, s.Width
		variance := (1-f)*(w*w+1) + f*2*mu*mu - s.Mean()*s.Mean()
		if se := math.Sqrt(variance / n); math.Abs(sum/n-s.Mean()) > 5*se {
			t.Errorf("%s: mean charge %v, want %v +- %v", name, sum/n, s.Mean(), 5*se)
		}
	}
}

func TestSPEZeroWidth(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	s := SPE{}
	for range 10 {
		if q := s.Sample(rng); q != 1 {
			t.Fatalf("Width 0 sample = %v, want 1", q)
		}
	}
	if s.CDF(0.999) != 0 || s.CDF(1) != 1 || s.Mean() != 1 {
		t.Error("Width 0 CDF/Mean wrong")
	}
}

func TestSPEValidate(t *testing.T) {
	tests := []struct {
		s    SPE
		want string
	}{
		{SPE{Width: -0.1}, "SPE.Width = -0.1"},
		{SPE{Width: math.NaN()}, "SPE.Width = NaN"},
		{SPE{Width: 1.5}, "SPE.Width = 1.5"},
		{SPE{Width: 0.3, LowFraction: 1}, "SPE.LowFraction = 1"},
		{SPE{Width: 0.3, LowFraction: -0.1}, "SPE.LowFraction = -0.1"},
		{SPE{Width: 0.3, LowMean: math.Inf(1)}, "SPE.LowMean = +Inf"},
		{SPE{Width: 0.3, LowFraction: 0.1}, "SPE.LowMean = 0 must be positive"},
	}
	for _, tc := range tests {
		if err := tc.s.Validate(); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%+v: Validate = %v, want %q", tc.s, err, tc.want)
		}
	}
	if err := (SPE{Width: 0.3, LowFraction: 0.1, LowMean: 0.2}).Validate(); err != nil {
		t.Errorf("good SPE: %v", err)
	}
}
