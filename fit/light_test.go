package fit

import (
	"math"
	"strings"
	"testing"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/optics"
)

// TestSpectrumFlatSensor checks the spectrum against closed forms for a
// sensor of flat efficiency q: every emitted photon of the water's band is
// detected with probability q, so Efficiency is q; a function constant in
// wavelength has that constant as mean and harmonic mean and zero spread;
// Survival(0) is Efficiency.
func TestSpectrumFlatSensor(t *testing.T) {
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	const q = 0.3
	lo, hi := w.Band()
	qe, err := pmt.NewCurve([]float64{lo, hi}, []float64{q, q})
	if err != nil {
		t.Fatal(err)
	}
	m := pmt.Model{Name: "flat", QE: qe, CollectionEfficiency: 1}
	s, err := NewSpectrum(w, &m, lo, hi, 300)
	if err != nil {
		t.Fatal(err)
	}
	if e := s.Efficiency(); math.Abs(e-q) > 1e-12 {
		t.Errorf("Efficiency = %v, want %v", e, q)
	}
	if e, sv := s.Efficiency(), s.Survival(0); math.Abs(sv-e) > 1e-15 {
		t.Errorf("Survival(0) = %v, want Efficiency %v", sv, e)
	}
	c := func(float64) float64 { return 2.5 }
	if m, sd := s.MeanSD(c); math.Abs(m-2.5) > 1e-12 || sd > 1e-6 {
		t.Errorf("MeanSD(const 2.5) = %v, %v", m, sd)
	}
	if h := s.HarmonicMean(c); math.Abs(h-2.5) > 1e-12 {
		t.Errorf("HarmonicMean(const 2.5) = %v", h)
	}
	// Twice the band, half of it outside the water: the photons of the
	// outer half are emitted but not detected.
	s2, err := NewSpectrum(w, &m, lo, 2*hi-lo, 600)
	if err != nil {
		t.Fatal(err)
	}
	if e := s2.Efficiency(); !(e < q && e > 0) {
		t.Errorf("Efficiency with half the band outside the water = %v, want in (0, %v)", e, q)
	}
}

// TestSpectrumIntegrals compares the sampled averages with independent
// integrals of the Frank-Tamm spectrum (PDG Review, Passage of particles
// through matter: dN/dlambda proportional to (1 - 1/n^2)/lambda^2) times
// the sensor's efficiency, by the trapezoid rule on a ten times finer
// grid; the midpoint and trapezoid rules agree to O(h^2).
func TestSpectrumIntegrals(t *testing.T) {
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	m := pmt.Large()
	lo, hi := w.Band()
	s, err := NewSpectrum(w, &m, lo, hi, 450)
	if err != nil {
		t.Fatal(err)
	}
	const fine = 4500
	h := (hi - lo) / fine
	var emit, det, detN, detInvV, surv float64
	const d = 3000.0
	for k := 0; k <= fine; k++ {
		l := lo + float64(k)*h
		wt := h
		if k == 0 || k == fine {
			wt = h / 2
		}
		n := w.Index(l)
		e := wt * (1 - 1/(n*n)) / (l * l)
		q := e * m.SpectralEfficiency(l)
		emit += e
		det += q
		detN += q * n
		detInvV += q / w.GroupVelocity(l)
		surv += q * math.Exp(-d*(1/w.AbsorptionLength(l)+1/w.ScatteringLength(l)))
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"efficiency", s.Efficiency(), det / emit},
		{"mean index", s.Mean(w.Index), detN / det},
		{"group velocity", s.HarmonicMean(w.GroupVelocity), det / detInvV},
		{"survival at 30 m", s.Survival(d), surv / emit},
	} {
		if math.Abs(c.got/c.want-1) > 1e-3 {
			t.Errorf("%s = %v, independent integral %v", c.name, c.got, c.want)
		}
	}
}

func TestSpectrumErrors(t *testing.T) {
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	m := pmt.Medium()
	for _, c := range []struct {
		name   string
		w      *optics.Water
		m      *pmt.Model
		lo, hi float64
		bins   int
		want   string
	}{
		{"nil water", nil, &m, 250, 700, 10, "Water is nil"},
		{"nil sensor", w, nil, 250, 700, 10, "sensor model is nil"},
		{"reversed band", w, &m, 700, 250, 10, "band 700-250"},
		{"NaN band", w, &m, math.NaN(), 700, 10, "band NaN-700"},
		{"no bins", w, &m, 250, 700, 0, "bins = 0"},
		{"outside the water", w, &m, 900, 1000, 10, "does not overlap"},
	} {
		_, err := NewSpectrum(c.w, c.m, c.lo, c.hi, c.bins)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want an error containing %q", c.name, err, c.want)
		}
	}
}
