package cherenkov

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/pmt"
)

// TestThinningEmitter: thinning at emission by keep(lambda) gives the same
// photons, in number and spectrum, as emitting at the prescaled rate and
// then keeping each photon with probability keep(lambda) by hand (the
// thinning of a Poisson process). keep is a sensor's QE shape.
func TestThinningEmitter(t *testing.T) {
	w := testWater(t)
	m := pmt.Large()
	lo, hi := m.QE.Range()
	const p = 0.3
	keep := func(l float64) float64 { return m.QE.At(l) / m.QE.Max() }
	thin, err := NewThinningEmitter(w, lo, hi, p, keep)
	if err != nil {
		t.Fatal(err)
	}
	plain := testEmitter(t, w, lo, hi, p)
	const nSteps = 1000
	seg := step(1, 0.99, 0.97, -1)
	a, errA := thin.MeanPhotons(seg)
	b, errB := plain.MeanPhotons(seg)
	if errA != nil || errB != nil || a != b {
		t.Errorf("MeanPhotons %g with thinning, %g without: the mean is the one before thinning", a, b)
	}
	got := wavelengths(emitMany(t, thin, seg, nSteps, 31))
	rng := rand.New(rand.NewPCG(32, 32))
	var want []float64
	expected := 0.0
	for _, ph := range emitMany(t, plain, seg, nSteps, 33) {
		k := keep(ph.Wavelength)
		expected += k
		if rng.Float64() < k {
			want = append(want, ph.Wavelength)
		}
	}
	// Both counts are Poisson with the same mean; their difference has
	// variance n1 + n2.
	n1, n2 := float64(len(got)), float64(len(want))
	if d := math.Abs(n1 - n2); d > 5*math.Sqrt(n1+n2) {
		t.Errorf("thinned at emission %g photons, thinned by hand %g (5 sigma %g)", n1, n2, 5*math.Sqrt(n1+n2))
	}
	slices.Sort(got)
	slices.Sort(want)
	d := stat.KolmogorovSmirnov(got, nil, want, nil)
	if crit := resolution.KSTwoSampleCritical(len(got), len(want), testAlpha); d > crit {
		t.Errorf("wavelengths: two-sample KS D = %g > %g", d, crit)
	}
	t.Logf("%d photons thinned at emission, %d by hand (expected %.0f), KS D = %.4g", len(got), len(want), expected, d)
}

func TestThinningEmitterBadKeep(t *testing.T) {
	w := testWater(t)
	for _, c := range []struct {
		keep func(float64) float64
		msg  string
	}{
		{nil, "keep is nil"},
		{func(float64) float64 { return 1.5 }, "= 1.5 must lie in [0, 1]"},
		{func(float64) float64 { return math.NaN() }, "= NaN must lie in [0, 1]"},
		{func(l float64) float64 { return -l }, "must lie in [0, 1]"},
	} {
		if _, err := NewThinningEmitter(w, 300, 600, 1, c.keep); err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("NewThinningEmitter: error %v, want one containing %q", err, c.msg)
		}
	}
}
