package pmt

import (
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"
)

func newDigitizer(t testing.TB, m Model) *Digitizer {
	t.Helper()
	d, err := NewDigitizer(&m)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

func TestDigitizeGatesAndCharge(t *testing.T) {
	// Hand-built case with no jitter and unit single-pe charges, so the
	// expected hits follow from the documented gate rule alone.
	m := Medium()
	m.TTS, m.SPE, m.IntegrationWindow, m.Threshold = 0, SPE{}, 30, 0.5
	pes := []Photoelectron{
		{Sensor: 2, Time: 12},
		{Sensor: 1, Time: 100},
		{Sensor: 2, Time: 40}, // exactly at the gate end: opens a new gate
		{Sensor: 2, Time: 10},
		{Sensor: 0, Time: 5, Origin: Dark},
		{Sensor: 2, Time: 45},
	}
	got, err := newDigitizer(t, m).Digitize(pes, 3, rand.New(rand.NewPCG(1, 2)), nil)
	if err != nil {
		t.Fatal(err)
	}
	want := []Hit{{0, 5, 1}, {2, 10, 2}, {2, 40, 2}, {1, 100, 1}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("hits = %v, want %v", got, want)
	}

	// Saturation clips the integrated charge.
	m.Saturation = 5
	pes = pes[:0]
	for range 12 {
		pes = append(pes, Photoelectron{Sensor: 0, Time: 1})
	}
	got, err = newDigitizer(t, m).Digitize(pes, 1, rand.New(rand.NewPCG(1, 2)), nil)
	if err != nil || len(got) != 1 || got[0].Charge != 5 {
		t.Errorf("saturated hits = %v, err %v, want one hit of 5 pe", got, err)
	}
}

func TestDigitizeErrors(t *testing.T) {
	m := Small()
	d := newDigitizer(t, m)
	rng := rand.New(rand.NewPCG(1, 2))
	tests := []struct {
		name     string
		pes      []Photoelectron
		nSensors int
		rng      *rand.Rand
		want     string
	}{
		{"sensor too large", []Photoelectron{{0, 1, Direct}, {5, 1, Direct}}, 5, rng, "pes[1].Sensor = 5 must be in [0, 5)"},
		{"negative sensor", []Photoelectron{{-1, 1, Direct}}, 5, rng, "pes[0].Sensor = -1"},
		{"NaN time", []Photoelectron{{0, math.NaN(), Direct}}, 5, rng, "pes[0].Time = NaN"},
		{"negative nSensors", nil, -1, rng, "nSensors = -1"},
		{"nil rng", nil, 5, nil, "rng is nil"},
	}
	for _, tc := range tests {
		dst := []Hit{{7, 7, 7}}
		got, err := d.Digitize(tc.pes, tc.nSensors, tc.rng, dst)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error = %v, want %q", tc.name, err, tc.want)
		}
		if !reflect.DeepEqual(got, dst) {
			t.Errorf("%s: dst changed to %v", tc.name, got)
		}
	}
	bad := Small()
	bad.TTS = -2
	if _, err := bad.Digitize(nil, 1, rng, nil); err == nil || !strings.Contains(err.Error(), "Model.TTS = -2") {
		t.Errorf("Digitize with a bad model: %v", err)
	}
	if _, err := NewDigitizer(&bad); err == nil {
		t.Error("NewDigitizer accepted a bad model")
	}
}

func TestTransitTimeSpread(t *testing.T) {
	// Statistical: single-pe hits (one pe per sensor) have time minus
	// true time ~ N(0, TTS); the sample standard deviation must be within
	// 5 standard errors, SE = sigma/sqrt(2(n-1)) for a Gaussian, and the
	// mean within 5 sigma/sqrt(n).
	for _, m := range []Model{Large(), Medium(), Small()} {
		m.Threshold = 0
		const n = 20000
		pes := make([]Photoelectron, n)
		for i := range pes {
			pes[i] = Photoelectron{Sensor: i, Time: float64(i % 97)}
		}
		hits, err := newDigitizer(t, m).Digitize(pes, n, rand.New(rand.NewPCG(3, 4)), nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(hits) != n {
			t.Fatalf("%s: %d hits, want %d", m.Name, len(hits), n)
		}
		dt := make([]float64, n)
		for i, h := range hits {
			dt[i] = h.Time - pes[h.Sensor].Time
		}
		mean, std := stat.MeanStdDev(dt, nil)
		if se := m.TTS / math.Sqrt(2*(n-1)); math.Abs(std-m.TTS) > 5*se {
			t.Errorf("%s: jitter std = %v, want %v +- %v", m.Name, std, m.TTS, 5*se)
		}
		if se := m.TTS / math.Sqrt(n); math.Abs(mean) > 5*se {
			t.Errorf("%s: jitter mean = %v, want 0 +- %v", m.Name, mean, 5*se)
		}
	}
}

// expectedMinStdNormal returns E[min of n iid standard normals] by
// integrating x n phi(x) (1-Phi(x))^(n-1) (the density of the smallest
// order statistic) with Gauss-Legendre quadrature on [-12, 12].
func expectedMinStdNormal(n int) float64 {
	norm := distuv.UnitNormal
	f := func(x float64) float64 {
		return x * float64(n) * norm.Prob(x) * math.Pow(norm.Survival(x), float64(n-1))
	}
	return quad.Fixed(f, -12, 12, 400, nil, 0)
}

func TestFirstPhotonTime(t *testing.T) {
	// The hit time of n simultaneous photoelectrons is the earliest of n
	// jittered times, so its mean is sigma * E[min of n standard
	// normals]. Closed forms: E[min] = -1/sqrt(pi) for n = 2 and
	// -3/(2 sqrt(pi)) for n = 3 (expected extreme order statistics of the
	// normal distribution, David and Nagaraja, "Order Statistics");
	// n = 1 gives 0 and larger n use the order-statistic integral.
	if got, want := expectedMinStdNormal(2), -1/math.Sqrt(math.Pi); math.Abs(got-want) > 1e-10 {
		t.Fatalf("quadrature E[min of 2] = %v, closed form %v", got, want)
	}
	m := Medium()
	m.SPE, m.IntegrationWindow, m.Threshold = SPE{}, 1000, 0
	d := newDigitizer(t, m)
	rng := rand.New(rand.NewPCG(5, 6))
	cases := []struct {
		n    int
		want float64
	}{
		{1, 0},
		{2, -1 / math.Sqrt(math.Pi)},
		{3, -3 / (2 * math.Sqrt(math.Pi))},
		{10, expectedMinStdNormal(10)},
	}
	const trials = 10000
	var pes []Photoelectron
	var hits []Hit
	for _, c := range cases {
		pes = pes[:0]
		for range c.n {
			pes = append(pes, Photoelectron{Sensor: 0, Time: 50})
		}
		first := make([]float64, trials)
		for i := range first {
			var err error
			hits, err = d.Digitize(pes, 1, rng, hits[:0])
			if err != nil {
				t.Fatal(err)
			}
			if len(hits) != 1 || hits[0].Charge != float64(c.n) {
				t.Fatalf("n=%d: hits %v, want one hit of %d pe", c.n, hits, c.n)
			}
			first[i] = (hits[0].Time - 50) / m.TTS
		}
		// Statistical: within 5 standard errors of the sample mean.
		mean, std := stat.MeanStdDev(first, nil)
		if se := std / math.Sqrt(trials); math.Abs(mean-c.want) > 5*se {
			t.Errorf("n=%d: mean first time = %v sigma, want %v +- %v", c.n, mean, c.want, 5*se)
		}
	}
}

func TestThresholdRemovesExactlyBelow(t *testing.T) {
	// The threshold does not change the random stream, so digitizing the
	// same photoelectrons with the same seed with and without a threshold
	// must give exactly the unthresholded hits with Charge >= Threshold.
	m := Large()
	m.Threshold = 0
	const nSensors = 3000
	rng := rand.New(rand.NewPCG(7, 8))
	var pes []Photoelectron
	for s := range nSensors {
		for k := range 1 + s%3 {
			pes = append(pes, Photoelectron{Sensor: s, Time: 100*rng.Float64() + 300*float64(k)})
		}
	}
	all, err := newDigitizer(t, m).Digitize(pes, nSensors, rand.New(rand.NewPCG(9, 10)), nil)
	if err != nil {
		t.Fatal(err)
	}
	m.Threshold = 0.5
	kept, err := newDigitizer(t, m).Digitize(pes, nSensors, rand.New(rand.NewPCG(9, 10)), nil)
	if err != nil {
		t.Fatal(err)
	}
	var want []Hit
	for _, h := range all {
		if h.Charge >= m.Threshold {
			want = append(want, h)
		}
	}
	if len(want) == len(all) {
		t.Fatal("no hit below threshold: the test cannot fail")
	}
	if !reflect.DeepEqual(kept, want) {
		t.Errorf("threshold kept %d hits, want exactly the %d of %d with charge >= %v", len(kept), len(want), len(all), m.Threshold)
	}
}

func TestDigitizeSortedDeterministicAppends(t *testing.T) {
	m := Medium()
	rng := rand.New(rand.NewPCG(1, 1))
	pes := make([]Photoelectron, 2000)
	for i := range pes {
		pes[i] = Photoelectron{Sensor: rng.IntN(300), Time: 500 * rng.Float64()}
	}
	prefix := []Hit{{Sensor: 99, Time: 1e9, Charge: 3}}
	a, err := m.Digitize(pes, 300, rand.New(rand.NewPCG(2, 2)), slices.Clone(prefix))
	if err != nil {
		t.Fatal(err)
	}
	b, err := newDigitizer(t, m).Digitize(pes, 300, rand.New(rand.NewPCG(2, 2)), nil)
	if err != nil {
		t.Fatal(err)
	}
	if a[0] != prefix[0] || !reflect.DeepEqual(a[1:], b) {
		t.Error("Model.Digitize and Digitizer.Digitize differ, or dst prefix was changed")
	}
	if !slices.IsSortedFunc(b, compareHitTime) {
		t.Error("hits not sorted by time")
	}
}

func TestDigitizeNoAllocsAfterWarmUp(t *testing.T) {
	d := newDigitizer(t, Large())
	rng := rand.New(rand.NewPCG(1, 2))
	pes := benchPhotoelectrons(10000, 1000)
	hits := make([]Hit, 0, 2000)
	hits, _ = d.Digitize(pes, 1000, rng, hits[:0])
	allocs := testing.AllocsPerRun(20, func() {
		hits, _ = d.Digitize(pes, 1000, rng, hits[:0])
	})
	if allocs != 0 {
		t.Errorf("Digitize allocates %v times per call after warm-up", allocs)
	}
}

// benchPhotoelectrons returns n photoelectrons spread over nSensors
// sensors and a 100 ns interval, from a fixed seed.
func benchPhotoelectrons(n, nSensors int) []Photoelectron {
	rng := rand.New(rand.NewPCG(42, 43))
	pes := make([]Photoelectron, n)
	for i := range pes {
		pes[i] = Photoelectron{Sensor: rng.IntN(nSensors), Time: 100 * rng.Float64()}
	}
	return pes
}
