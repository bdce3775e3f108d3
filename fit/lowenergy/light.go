package lowenergy

import (
	"errors"
	"fmt"
	"math"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

// Light summarizes the water and sensor optics the fit needs: the
// detected Cherenkov spectrum, its mean group velocity, its mean spectral
// efficiency and the transmission against path length. It is computed
// from the water and the sensor model alone.
type Light struct {
	// GroupVelocity (cm/ns) is 1/<1/v_g> over the detected spectrum: the
	// mean time of flight per cm of the detected photons.
	GroupVelocity float64
	// Efficiency is the mean spectral detection efficiency (QE times
	// collection) over the Cherenkov spectrum in the water's band.
	Efficiency float64
	// transmission[k] is the mean transmission of detected light over the
	// path length k*transStep (total attenuation: absorption plus
	// scattering).
	transmission []float64
	transStep    float64
}

// lightSteps is the number of wavelength samples over the band.
const lightSteps = 200

// NewLight computes the Light of the water and sensor model for paths up
// to maxPath cm, from the detected Cherenkov spectrum of the water's band
// (fit.Spectrum: Frank-Tamm emission times the sensor's spectral
// efficiency).
func NewLight(water *optics.Water, sensor *pmt.Model, maxPath float64) (Light, error) {
	if water == nil {
		return Light{}, errors.New("fit: Water is nil")
	}
	if !(maxPath > 0) || math.IsInf(maxPath, 0) {
		return Light{}, fmt.Errorf("fit: maximum path = %v must be positive and finite", maxPath)
	}
	lo, hi := water.Band()
	sp, err := fit.NewSpectrum(water, sensor, lo, hi, lightSteps)
	if err != nil {
		return Light{}, err
	}
	eff := sp.Efficiency()
	lt := Light{
		GroupVelocity: sp.HarmonicMean(water.GroupVelocity),
		Efficiency:    eff,
		transStep:     5,
	}
	n := int(maxPath/lt.transStep) + 2
	lt.transmission = make([]float64, n)
	for i := range n {
		lt.transmission[i] = sp.Survival(float64(i)*lt.transStep) / eff
	}
	if !(lt.GroupVelocity > 0 && lt.GroupVelocity < phys.SpeedOfLight) {
		return Light{}, fmt.Errorf("fit: group velocity %v cm/ns out of range", lt.GroupVelocity)
	}
	return lt, nil
}

// Transmission returns the mean fraction of detected light that crosses a
// path of d cm without absorption or scattering.
func (l *Light) Transmission(d float64) float64 {
	if !(d > 0) {
		return 1
	}
	x := d / l.transStep
	i := int(x)
	if i >= len(l.transmission)-1 {
		return l.transmission[len(l.transmission)-1]
	}
	f := x - float64(i)
	return l.transmission[i]*(1-f) + l.transmission[i+1]*f
}
