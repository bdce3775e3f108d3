package fit

import (
	"errors"
	"fmt"
	"math"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/optics"
)

// Spectrum is the Cherenkov light a sensor model detects in a water,
// sampled at the centres of equal wavelength bins. Both fitters average
// the water's optics over it (the cone's index, the group velocity, the
// attenuation) so that each spectrum-averaged quantity is computed one
// way.
//
// The emitted spectrum is the Frank-Tamm one at beta = 1: photons per
// unit wavelength proportional to (1 - 1/n(lambda)^2) / lambda^2 (PDG
// Review, Passage of particles through matter, Cherenkov radiation). The
// detected spectrum is that times the sensor's spectral efficiency
// (quantum efficiency times collection).
//
// A Spectrum is read-only after NewSpectrum.
type Spectrum struct {
	// Lambda (nm) are the bin centres that lie inside the water's band.
	Lambda []float64
	// Weight[i] is the fraction of the photons emitted over the whole
	// band [lo, hi] of NewSpectrum that are emitted in bin i and
	// detected. Its sum is the mean detection efficiency.
	Weight []float64
	// AttLength[i] (cm) is the total attenuation length (absorption and
	// scattering) at Lambda[i]: the direct light survives a path d with
	// probability exp(-d/AttLength[i]).
	AttLength []float64
}

// NewSpectrum samples the spectrum of water w and sensor model m on bins
// equal bins over [lo, hi] nm. The band is the one a photon count refers
// to (the emission band of tabulated photon numbers, or the water's band):
// Weight is normalized to the photons emitted over all of it. Bins
// outside the water's band emit (with the index at the nearer band edge)
// but are not detected, since the water describes no propagation there.
func NewSpectrum(w *optics.Water, m *pmt.Model, lo, hi float64, bins int) (*Spectrum, error) {
	if w == nil {
		return nil, errors.New("fit: spectrum: Water is nil")
	}
	if m == nil {
		return nil, errors.New("fit: spectrum: sensor model is nil")
	}
	if !(lo > 0) || !(hi > lo) || math.IsInf(hi, 0) {
		return nil, fmt.Errorf("fit: spectrum band %g-%g nm must be positive, finite and ordered", lo, hi)
	}
	if bins < 1 || bins > 1e6 {
		return nil, fmt.Errorf("fit: spectrum bins = %d must be in [1, 1e6]", bins)
	}
	wlo, whi := w.Band()
	if !(math.Max(lo, wlo) < math.Min(hi, whi)) {
		return nil, fmt.Errorf("fit: water band %g-%g nm does not overlap the band %g-%g nm", wlo, whi, lo, hi)
	}
	step := (hi - lo) / float64(bins)
	var lams, emit []float64
	var norm float64
	for k := range bins {
		l := lo + (float64(k)+0.5)*step
		n := w.Index(math.Min(math.Max(l, wlo), whi))
		f := (1 - 1/(n*n)) / (l * l)
		norm += f
		if l < wlo || l > whi {
			continue
		}
		lams = append(lams, l)
		emit = append(emit, f)
	}
	s := &Spectrum{
		Lambda:    lams,
		Weight:    make([]float64, len(lams)),
		AttLength: make([]float64, len(lams)),
	}
	var sum float64
	for i, l := range lams {
		s.Weight[i] = emit[i] * m.SpectralEfficiency(l) / norm
		s.AttLength[i] = 1 / (1/w.AbsorptionLength(l) + 1/w.ScatteringLength(l))
		sum += s.Weight[i]
	}
	if !(sum > 0) {
		return nil, fmt.Errorf("fit: sensor %q detects nothing in the band %g-%g nm", m.Name, math.Max(lo, wlo), math.Min(hi, whi))
	}
	return s, nil
}

// Efficiency returns the mean detection efficiency: the fraction of the
// photons emitted over the band that the sensor detects, before any
// attenuation or angular acceptance.
func (s *Spectrum) Efficiency() float64 {
	var sum float64
	for _, w := range s.Weight {
		sum += w
	}
	return sum
}

// Mean returns the mean of f(lambda) over the detected spectrum.
func (s *Spectrum) Mean(f func(lambda float64) float64) float64 {
	m, _ := s.MeanSD(f)
	return m
}

// MeanSD returns the mean of f(lambda) over the detected spectrum and its
// standard deviation.
func (s *Spectrum) MeanSD(f func(lambda float64) float64) (mean, sd float64) {
	var sw, s1, s2 float64
	for i, l := range s.Lambda {
		w, x := s.Weight[i], f(l)
		sw += w
		s1 += w * x
		s2 += w * x * x
	}
	mean = s1 / sw
	return mean, math.Sqrt(math.Max(s2/sw-mean*mean, 0))
}

// HarmonicMean returns 1/<1/f> over the detected spectrum: the mean of a
// rate (a velocity, an inverse length) whose inverse is what adds up.
func (s *Spectrum) HarmonicMean(f func(lambda float64) float64) float64 {
	var sw, si float64
	for i, l := range s.Lambda {
		sw += s.Weight[i]
		si += s.Weight[i] / f(l)
	}
	return sw / si
}

// Survival returns the fraction of the photons emitted over the band that
// are detected after a direct path of d cm: the sum over the bins of
// Weight times exp(-d/AttLength). Survival(0) is Efficiency.
func (s *Spectrum) Survival(d float64) float64 {
	var sum float64
	for i, w := range s.Weight {
		sum += w * math.Exp(-d/s.AttLength[i])
	}
	return sum
}
