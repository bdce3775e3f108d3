package pmt

import (
	"errors"
	"fmt"
	"math"
)

// Model is the response of one photosensor class: detection efficiency,
// timing, charge, noise and the front-end integration. Units: cm, ns, pe,
// Hz; wavelengths in nm.
//
// A Model is plain data; once validated and no longer modified it is safe
// for concurrent use by any number of goroutines (all its methods only
// read it).
type Model struct {
	Name string

	// CathodeDiameter is the diameter (cm) of the photocathode disk that
	// geom places on the wall.
	CathodeDiameter float64

	// QE is the quantum efficiency (0..1) against wavelength (nm).
	QE Curve

	// CollectionEfficiency is the probability (0..1] that a
	// photoelectron reaches the first dynode.
	CollectionEfficiency float64

	// Acceptance is the relative detection probability (0..1, max 1)
	// against the cosine of the angle between the incoming photon and
	// the sensor's inward axis, over and above the projected-area
	// (cosine) factor that the flat cathode disk in geom already gives.
	Acceptance Curve

	// TTS is the transit-time spread: the Gaussian standard deviation
	// sigma (ns, not FWHM) of each photoelectron's transit-time jitter.
	TTS float64

	// SPE is the single-photoelectron charge spectrum.
	SPE SPE

	// DarkRate is the rate (Hz) of dark pulses, each a single
	// photoelectron.
	DarkRate float64

	// Threshold (pe) is the smallest integrated charge that makes a hit.
	Threshold float64

	// IntegrationWindow (ns) is the charge-integration gate opened by the
	// first photoelectron of a hit.
	IntegrationWindow float64

	// Saturation (pe), if positive, is the largest charge the front end
	// records: larger charges are clipped to it. Zero means no limit.
	Saturation float64
}

// Validate checks every field and returns all problems found, each naming
// the field and its value, or nil.
func (m *Model) Validate() error {
	if m == nil {
		return errors.New("pmt: Model is nil")
	}
	var errs []error
	bad := func(field string, v float64, want string) {
		errs = append(errs, fmt.Errorf("pmt: Model.%s = %v %s", field, v, want))
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

	if !(m.CathodeDiameter > 0) || !finite(m.CathodeDiameter) {
		bad("CathodeDiameter", m.CathodeDiameter, "must be positive and finite (cm)")
	}
	errs = append(errs, checkFractionCurve("QE", m.QE)...)
	if lo, _ := m.QE.Range(); m.QE.Valid() && !(lo > 0) {
		bad("QE lowest wavelength", lo, "must be positive (nm)")
	}
	if !(m.CollectionEfficiency > 0 && m.CollectionEfficiency <= 1) {
		bad("CollectionEfficiency", m.CollectionEfficiency, "must be in (0, 1]")
	}
	errs = append(errs, checkFractionCurve("Acceptance", m.Acceptance)...)
	if lo, hi := m.Acceptance.Range(); lo < -1 || hi > 1 {
		errs = append(errs, fmt.Errorf("pmt: Model.Acceptance range [%v, %v] must lie within [-1, 1] (cosine)", lo, hi))
	}
	if !(m.TTS >= 0) || !finite(m.TTS) {
		bad("TTS", m.TTS, "must be non-negative and finite (ns, Gaussian sigma)")
	}
	if err := m.SPE.validate("Model.SPE"); err != nil {
		errs = append(errs, err)
	}
	if !(m.DarkRate >= 0) || !finite(m.DarkRate) {
		bad("DarkRate", m.DarkRate, "must be non-negative and finite (Hz)")
	}
	if !(m.Threshold >= 0) || !finite(m.Threshold) {
		bad("Threshold", m.Threshold, "must be non-negative and finite (pe)")
	}
	if !(m.IntegrationWindow > 0) || !finite(m.IntegrationWindow) {
		bad("IntegrationWindow", m.IntegrationWindow, "must be positive and finite (ns)")
	}
	if !(m.Saturation >= 0) || !finite(m.Saturation) {
		bad("Saturation", m.Saturation, "must be non-negative and finite (pe; 0 = none)")
	} else if m.Saturation > 0 && m.Saturation < m.Threshold {
		bad("Saturation", m.Saturation, fmt.Sprintf("must not be below Threshold = %v", m.Threshold))
	}
	if len(errs) == 0 {
		return nil
	}
	if m.Name != "" {
		return fmt.Errorf("pmt: model %q: %w", m.Name, errors.Join(errs...))
	}
	return errors.Join(errs...)
}

// checkFractionCurve reports whether the curve of Model field name is set
// and its values are probabilities with a positive maximum.
func checkFractionCurve(name string, c Curve) []error {
	if !c.Valid() {
		return []error{fmt.Errorf("pmt: Model.%s is not set (build it with NewCurve)", name)}
	}
	var errs []error
	if lo := c.Min(); lo < 0 {
		errs = append(errs, fmt.Errorf("pmt: Model.%s minimum = %v must be non-negative", name, lo))
	}
	if hi := c.Max(); !(hi > 0 && hi <= 1) {
		errs = append(errs, fmt.Errorf("pmt: Model.%s maximum = %v must be in (0, 1]", name, hi))
	}
	return errs
}

// MaxEfficiency returns the largest detection probability of a photon
// over all wavelengths and incidence angles, max QE(lambda) times
// CollectionEfficiency (the acceptance peaks at 1 or below). A simulator
// may emit only this fraction of the photons and accept each arriving one
// with probability Efficiency/MaxEfficiency.
func (m *Model) MaxEfficiency() float64 {
	return m.QE.Max() * m.CollectionEfficiency
}

// Efficiency returns the probability that a photon of wavelength lambdaNM
// (nm) arriving with incidence cosine cosIncidence on the cathode yields
// a photoelectron: QE(lambda) * CollectionEfficiency * Acceptance(cos).
// It does not allocate.
func (m *Model) Efficiency(lambdaNM, cosIncidence float64) float64 {
	return m.QE.At(lambdaNM) * m.CollectionEfficiency * m.AngularAcceptance(cosIncidence)
}

// SpectralEfficiency returns QE(lambda) * CollectionEfficiency, the
// wavelength-only part of Efficiency. A photon loop may apply
// SpectralEfficiency/MaxEfficiency at emission, before tracking, and
// AngularAcceptance at the wall.
func (m *Model) SpectralEfficiency(lambdaNM float64) float64 {
	return m.QE.At(lambdaNM) * m.CollectionEfficiency
}

// AngularAcceptance returns the relative acceptance (at most 1) at
// incidence cosine cosIncidence, the angle-only part of Efficiency. A
// cosine above 1 is taken as 1: a dot product of unit vectors can round
// past 1 at normal incidence, and that photon must not fall outside the
// table.
func (m *Model) AngularAcceptance(cosIncidence float64) float64 {
	return m.Acceptance.At(min(cosIncidence, 1))
}
