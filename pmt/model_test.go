package pmt

import (
	"math"
	"strings"
	"testing"
)

func TestPresetsValidateAndMatchTheirDocs(t *testing.T) {
	// The typical values are common practice (DESIGN notes, "Sensors and
	// electronics"): bialkali QE peaking 20-30% near 380-400 nm, TTS
	// growing with cathode size (a few ns for large tubes, under 1 ns for
	// small), single-pe width 30-50%, dark rates hundreds of Hz to several
	// kHz, a fraction-of-a-pe threshold.
	presets := []struct {
		m            Model
		diamLo, diam float64
		ttsLo, ttsHi float64
	}{
		{Large(), 45, 55, 2, 4},
		{Medium(), 18, 22, 1, 1.6},
		{Small(), 7, 9, 0, 1},
	}
	for _, p := range presets {
		m := p.m
		if err := m.Validate(); err != nil {
			t.Errorf("%s: %v", m.Name, err)
			continue
		}
		if m.CathodeDiameter < p.diamLo || m.CathodeDiameter > p.diam {
			t.Errorf("%s: CathodeDiameter = %v", m.Name, m.CathodeDiameter)
		}
		if m.TTS < p.ttsLo || m.TTS >= p.ttsHi {
			t.Errorf("%s: TTS = %v, want in [%v, %v)", m.Name, m.TTS, p.ttsLo, p.ttsHi)
		}
		if peak := m.QE.Max(); peak < 0.20 || peak > 0.30 {
			t.Errorf("%s: QE peak = %v", m.Name, peak)
		}
		if q := m.QE.At(390); q < 0.95*m.QE.Max() {
			t.Errorf("%s: QE(390 nm) = %v, not near the peak %v", m.Name, q, m.QE.Max())
		}
		if lo, hi := m.QE.Range(); lo != 280 || hi != 660 {
			t.Errorf("%s: QE range = [%v, %v], want [280, 660]", m.Name, lo, hi)
		}
		if w := m.SPE.Width; w < 0.3 || w > 0.5 {
			t.Errorf("%s: SPE.Width = %v", m.Name, w)
		}
		if m.DarkRate < 100 || m.DarkRate > 10000 {
			t.Errorf("%s: DarkRate = %v", m.Name, m.DarkRate)
		}
		if m.Threshold < 0.2 || m.Threshold > 0.5 {
			t.Errorf("%s: Threshold = %v", m.Name, m.Threshold)
		}
		if m.Acceptance.Max() != 1 || m.Acceptance.At(1) != 1 || m.Acceptance.At(-0.1) != 0 {
			t.Errorf("%s: Acceptance must be 1 at normal incidence and 0 from behind", m.Name)
		}
	}
}

func TestModelValidateNamesFieldAndValue(t *testing.T) {
	nan := math.NaN()
	badQE, _ := NewCurve([]float64{300, 400}, []float64{0.2, 1.2})
	negQE, _ := NewCurve([]float64{300, 400}, []float64{-0.1, 0.2})
	wideAcc, _ := NewCurve([]float64{-2, 1}, []float64{0, 1})
	tests := []struct {
		name   string
		mutate func(*Model)
		want   string
	}{
		{"diameter", func(m *Model) { m.CathodeDiameter = -3 }, "Model.CathodeDiameter = -3"},
		{"diameter NaN", func(m *Model) { m.CathodeDiameter = nan }, "Model.CathodeDiameter = NaN"},
		{"QE unset", func(m *Model) { m.QE = Curve{} }, "Model.QE is not set"},
		{"QE > 1", func(m *Model) { m.QE = badQE }, "Model.QE maximum = 1.2"},
		{"QE < 0", func(m *Model) { m.QE = negQE }, "Model.QE minimum = -0.1"},
		{"QE preset bad peak", func(m *Model) { m.QE = BialkaliQE(1.5) }, "Model.QE is not set"},
		{"CE > 1", func(m *Model) { m.CollectionEfficiency = 1.1 }, "Model.CollectionEfficiency = 1.1"},
		{"CE 0", func(m *Model) { m.CollectionEfficiency = 0 }, "Model.CollectionEfficiency = 0"},
		{"acceptance unset", func(m *Model) { m.Acceptance = Curve{} }, "Model.Acceptance is not set"},
		{"acceptance range", func(m *Model) { m.Acceptance = wideAcc }, "Model.Acceptance range [-2, 1]"},
		{"TTS", func(m *Model) { m.TTS = -1 }, "Model.TTS = -1"},
		{"TTS Inf", func(m *Model) { m.TTS = math.Inf(1) }, "Model.TTS = +Inf"},
		{"SPE", func(m *Model) { m.SPE.Width = 2 }, "Model.SPE.Width = 2"},
		{"dark", func(m *Model) { m.DarkRate = nan }, "Model.DarkRate = NaN"},
		{"threshold", func(m *Model) { m.Threshold = -0.25 }, "Model.Threshold = -0.25"},
		{"window", func(m *Model) { m.IntegrationWindow = 0 }, "Model.IntegrationWindow = 0"},
		{"saturation", func(m *Model) { m.Saturation = -1 }, "Model.Saturation = -1"},
		{"saturation below threshold", func(m *Model) { m.Saturation = 0.1 }, "Model.Saturation = 0.1 must not be below Threshold"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m := Medium()
			tc.mutate(&m)
			err := m.Validate()
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("Validate = %v, want one containing %q", err, tc.want)
			}
		})
	}
	// Every bad field is reported, not just the first.
	m := Medium()
	m.TTS, m.Threshold = -1, nan
	err := m.Validate()
	if err == nil || !strings.Contains(err.Error(), "TTS") || !strings.Contains(err.Error(), "Threshold") {
		t.Errorf("Validate with two bad fields = %v", err)
	}
}

func TestEfficiency(t *testing.T) {
	// Independent calculation from the tabulated points: the product
	// QE * CE * Acceptance at table knots, where interpolation is exact.
	m := Large()
	qx, qy := m.QE.Points()
	ax, ay := m.Acceptance.Points()
	for i := range qx {
		for j := range ax {
			want := qy[i] * m.CollectionEfficiency * ay[j]
			if got := m.Efficiency(qx[i], ax[j]); math.Abs(got-want) > 1e-15 {
				t.Errorf("Efficiency(%v, %v) = %v, want %v", qx[i], ax[j], got, want)
			}
			split := m.SpectralEfficiency(qx[i]) * m.AngularAcceptance(ax[j])
			if math.Abs(split-want) > 1e-15 {
				t.Errorf("split efficiency at (%v, %v) = %v, want %v", qx[i], ax[j], split, want)
			}
		}
	}
	// MaxEfficiency bounds Efficiency and is reached at the QE peak at
	// normal incidence.
	maxEff := m.MaxEfficiency()
	for l := 270.0; l < 670; l += 0.7 {
		for c := -0.05; c <= 1; c += 0.05 {
			if e := m.Efficiency(l, c); e > maxEff || e < 0 {
				t.Fatalf("Efficiency(%v, %v) = %v outside [0, MaxEfficiency = %v]", l, c, e, maxEff)
			}
		}
	}
	if got := m.Efficiency(380, 1); got != maxEff {
		t.Errorf("Efficiency at the peak = %v, want MaxEfficiency %v", got, maxEff)
	}
	if got := m.Efficiency(380, math.Nextafter(1, 2)); got != maxEff {
		t.Errorf("Efficiency at cos rounded above 1 = %v, want %v", got, maxEff)
	}
	if m.Efficiency(380, math.NaN()) != 0 {
		t.Error("Efficiency at NaN cosine must be 0")
	}
	if m.Efficiency(250, 1) != 0 || m.Efficiency(700, 1) != 0 {
		t.Error("Efficiency outside the QE band must be 0")
	}
}

func TestPreset(t *testing.T) {
	for _, name := range PresetNames() {
		m, err := Preset(name)
		if err != nil {
			t.Fatalf("Preset(%q): %v", name, err)
		}
		if m.Name != name {
			t.Errorf("Preset(%q).Name = %q", name, m.Name)
		}
		if err := m.Validate(); err != nil {
			t.Errorf("Preset(%q): %v", name, err)
		}
		// A fresh copy: editing it leaves the next one untouched.
		m.TTS = 99
		if again, _ := Preset(name); again.TTS == 99 {
			t.Errorf("Preset(%q) shares state between calls", name)
		}
	}
	if _, err := Preset("medium"); err == nil || !strings.Contains(err.Error(), "Medium") {
		t.Errorf("Preset(\"medium\") error %v, want one listing the presets", err)
	}
}
