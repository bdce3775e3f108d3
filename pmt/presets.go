package pmt

import (
	"fmt"
	"strings"
)

// BialkaliQE returns the quantum efficiency of a bialkali photocathode
// behind borosilicate glass against wavelength (nm), tabulated every 20 nm
// from 280 to 660 nm and scaled so that its maximum (at 380 nm) is peak.
// The shape is common practice, values from memory: the glass cuts the
// response off below about 300 nm, it peaks near 380-400 nm, and it falls
// by an order of magnitude by 600 nm. It is not a measurement of any one
// device. It returns the zero Curve if peak is not in (0, 1]; Model.Validate
// then reports the problem.
func BialkaliQE(peak float64) Curve {
	if !(peak > 0 && peak <= 1) {
		return Curve{}
	}
	lambda := []float64{
		280, 300, 320, 340, 360, 380, 400, 420, 440, 460,
		480, 500, 520, 540, 560, 580, 600, 620, 640, 660,
	}
	relative := []float64{
		0.03, 0.25, 0.60, 0.84, 0.96, 1.00, 0.98, 0.92, 0.84, 0.74,
		0.63, 0.52, 0.40, 0.29, 0.19, 0.12, 0.075, 0.04, 0.02, 0.008,
	}
	for i := range relative {
		relative[i] *= peak
	}
	return mustCurve(lambda, relative)
}

// DefaultAcceptance returns a relative angular acceptance against the
// cosine of the incidence angle: flat from normal incidence to 45 degrees
// and falling towards grazing incidence, where reflection at the glass,
// the curvature of the cathode and shadowing by neighbouring sensors
// reduce the response. The shape is common practice; the values are
// illustrative (from memory), not a measurement. Incidence from behind
// (cos < 0) gives 0.
func DefaultAcceptance() Curve {
	cos := []float64{0, 0.1, 0.2, 0.3, 0.5, 0.7, 1}
	rel := []float64{0.30, 0.50, 0.70, 0.85, 0.95, 1, 1}
	return mustCurve(cos, rel)
}

// Large returns a ~50 cm photocathode tube. Typical values, common
// practice (from memory): bialkali QE peaking at 22%, collection
// efficiency 0.70 over the large dome, TTS sigma 2.9 ns, a broad single-pe
// peak (relative width 0.45) with a 10% low-charge tail, dark rate 4 kHz,
// threshold 0.25 pe, 200 ns integration gate, clipping at 2000 pe.
func Large() Model {
	return Model{
		Name:                 "Large",
		CathodeDiameter:      50.8,
		QE:                   BialkaliQE(0.22),
		CollectionEfficiency: 0.70,
		Acceptance:           DefaultAcceptance(),
		TTS:                  2.9,
		SPE:                  SPE{Width: 0.45, LowFraction: 0.10, LowMean: 0.2},
		DarkRate:             4000,
		Threshold:            0.25,
		IntegrationWindow:    200,
		Saturation:           2000,
	}
}

// Medium returns a ~20 cm photocathode tube. Typical values, common
// practice (from memory): bialkali QE peaking at 25%, collection
// efficiency 0.85, TTS sigma 1.3 ns, single-pe relative width 0.35 with a
// 5% low-charge tail, dark rate 1.5 kHz, threshold 0.3 pe, 100 ns
// integration gate, clipping at 1000 pe.
func Medium() Model {
	return Model{
		Name:                 "Medium",
		CathodeDiameter:      20.3,
		QE:                   BialkaliQE(0.25),
		CollectionEfficiency: 0.85,
		Acceptance:           DefaultAcceptance(),
		TTS:                  1.3,
		SPE:                  SPE{Width: 0.35, LowFraction: 0.05, LowMean: 0.2},
		DarkRate:             1500,
		Threshold:            0.3,
		IntegrationWindow:    100,
		Saturation:           1000,
	}
}

// Small returns a ~8 cm photocathode tube. Typical values, common
// practice (from memory): high-QE bialkali peaking at 27%, collection
// efficiency 0.95, TTS sigma 0.7 ns, single-pe relative width 0.30 with no
// low-charge tail, dark rate 300 Hz, threshold 0.3 pe, 50 ns integration
// gate, clipping at 300 pe.
func Small() Model {
	return Model{
		Name:                 "Small",
		CathodeDiameter:      7.6,
		QE:                   BialkaliQE(0.27),
		CollectionEfficiency: 0.95,
		Acceptance:           DefaultAcceptance(),
		TTS:                  0.7,
		SPE:                  SPE{Width: 0.30},
		DarkRate:             300,
		Threshold:            0.3,
		IntegrationWindow:    50,
		Saturation:           300,
	}
}

// PresetNames returns the names Preset accepts, largest sensor first.
func PresetNames() []string { return []string{"Large", "Medium", "Small"} }

// Preset returns a fresh copy of the preset model called name (exactly as
// PresetNames spells it; the model's Name is the same). A caller that
// edits the copy should rename it, so that an edited sensor is never
// mistaken for the preset.
func Preset(name string) (Model, error) {
	switch name {
	case "Large":
		return Large(), nil
	case "Medium":
		return Medium(), nil
	case "Small":
		return Small(), nil
	}
	return Model{}, fmt.Errorf("pmt: no sensor preset %q (presets: %s)", name, strings.Join(PresetNames(), ", "))
}
