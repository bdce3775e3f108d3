package pmt

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/conelight/conelight/fit/resolution"
)

func TestDarkCountIsPoisson(t *testing.T) {
	// Statistical: the histogram of dark counts per call over many calls
	// must follow Poisson(nSensors * DarkRate * span * 1e-9): Pearson
	// chi-square with bins merged until each expects >= 5 entries,
	// critical value at p = 1e-4. The two means exercise both branches
	// of the Poisson sampler (below and above 10).
	cases := []struct {
		m        Model
		nSensors int
		span     float64
	}{
		{Large(), 100, 10000},  // mean 4
		{Medium(), 500, 20000}, // mean 15
	}
	const trials = 20000
	for _, c := range cases {
		mean := float64(c.nSensors) * c.m.DarkRate * c.span * 1e-9
		pois := distuv.Poisson{Lambda: mean}
		rng := rand.New(rand.NewPCG(21, 22))
		maxK := int(mean + 20*math.Sqrt(mean) + 20)
		counts := make([]int, maxK+1)
		var buf []Photoelectron
		for range trials {
			var err error
			buf, err = c.m.AddDark(buf[:0], c.nSensors, -c.span/2, c.span/2, rng)
			if err != nil {
				t.Fatal(err)
			}
			counts[min(len(buf), maxK)]++
		}
		obs := make([]int, maxK+1)
		exp := make([]float64, maxK+1)
		for k := range obs {
			obs[k] = counts[k]
			exp[k] = trials * pois.Prob(float64(k))
			if k == maxK {
				exp[k] = trials * pois.Survival(float64(k-1))
			}
		}
		chi2, dof, err := resolution.ChiSquare(obs, exp, 0, 5)
		if err != nil {
			t.Fatal(err)
		}
		bins := dof + 1
		crit := resolution.ChiSquareCritical(bins-1, 1e-4)
		t.Logf("%s: mean %v, chi2 = %.1f over %d bins, critical %.1f", c.m.Name, mean, chi2, bins, crit)
		if chi2 > crit {
			t.Errorf("%s: dark-count chi2 = %.1f over %d bins, critical %.1f (mean %v)", c.m.Name, chi2, bins, crit, mean)
		}
	}
}

func TestDarkUniformOverSensorsAndTime(t *testing.T) {
	// Statistical: dark pulses are uniform in sensor and in time; Pearson
	// chi-square over 20 equal bins of each, p = 1e-4.
	m := Large()
	const nSensors, t0, t1 = 20, 100.0, 1e6
	pes, err := m.AddDark(nil, nSensors, t0, t1, rand.New(rand.NewPCG(23, 24)))
	if err != nil {
		t.Fatal(err)
	}
	var bySensor, byTime [20]int
	for _, pe := range pes {
		if pe.Origin != Dark || pe.Sensor < 0 || pe.Sensor >= nSensors || pe.Time < t0 || pe.Time >= t1 {
			t.Fatalf("bad dark pulse %+v", pe)
		}
		bySensor[pe.Sensor]++
		byTime[int((pe.Time-t0)/(t1-t0)*20)]++
	}
	for name, h := range map[string][20]int{"sensor": bySensor, "time": byTime} {
		exp := make([]float64, 20)
		for k := range exp {
			exp[k] = float64(len(pes)) / 20
		}
		chi2, dof, err := resolution.ChiSquare(h[:], exp, 0, 5)
		if err != nil {
			t.Fatal(err)
		}
		if crit := resolution.ChiSquareCritical(dof, 1e-4); chi2 > crit {
			t.Errorf("%s histogram chi2 = %.1f, critical %.1f", name, chi2, crit)
		}
	}
}

func TestAddDarkErrors(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	m := Small()
	tests := []struct {
		name     string
		m        Model
		nSensors int
		t0, t1   float64
		rng      *rand.Rand
		want     string
	}{
		{"negative sensors", m, -1, 0, 1, rng, "nSensors = -1"},
		{"NaN t0", m, 1, math.NaN(), 1, rng, "t0 = NaN"},
		{"Inf t1", m, 1, 0, math.Inf(1), rng, "t1 = +Inf"},
		{"reversed", m, 1, 5, 1, rng, "t1 = 1 must not be before t0 = 5"},
		{"nil rng", m, 1, 0, 1, nil, "rng is nil"},
		{"bad rate", func() Model { b := Small(); b.DarkRate = -5; return b }(), 1, 0, 1, rng, "Model.DarkRate = -5"},
		{"huge mean", m, 1000, 0, 1e12, rng, "exceeds"},
	}
	for _, tc := range tests {
		got, err := tc.m.AddDark(nil, tc.nSensors, tc.t0, tc.t1, tc.rng)
		if err == nil || !strings.Contains(err.Error(), tc.want) || got != nil {
			t.Errorf("%s: (%v, %v), want error %q", tc.name, got, err, tc.want)
		}
	}
	if got, err := m.AddDark(nil, 0, 0, 1000, rng); err != nil || len(got) != 0 {
		t.Errorf("no sensors: (%v, %v), want nothing", got, err)
	}
}
