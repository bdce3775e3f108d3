package lowenergy

import (
	"errors"
	"fmt"
	"math"

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
// to maxPath cm. The Cherenkov photon number per unit wavelength goes as
// 1/lambda^2 (Frank-Tamm, PDG Review, Passage of particles through
// matter); the detected spectrum is that times the sensor's spectral
// efficiency.
func NewLight(water *optics.Water, sensor *pmt.Model, maxPath float64) (Light, error) {
	if water == nil {
		return Light{}, errors.New("fit: Water is nil")
	}
	if !(maxPath > 0) || math.IsInf(maxPath, 0) {
		return Light{}, fmt.Errorf("fit: maximum path = %v must be positive and finite", maxPath)
	}
	lo, hi := water.Band()
	dl := (hi - lo) / lightSteps
	var sumEmit, sumDet, sumInvV float64
	lambdas := make([]float64, 0, lightSteps)
	weights := make([]float64, 0, lightSteps)
	atten := make([]float64, 0, lightSteps)
	for k := range lightSteps {
		l := lo + (float64(k)+0.5)*dl
		emit := 1 / (l * l)
		det := emit * sensor.SpectralEfficiency(l)
		sumEmit += emit
		sumDet += det
		sumInvV += det / water.GroupVelocity(l)
		lambdas = append(lambdas, l)
		weights = append(weights, det)
		a := 1/water.AbsorptionLength(l) + 1/water.ScatteringLength(l)
		atten = append(atten, a)
	}
	if !(sumDet > 0) {
		return Light{}, fmt.Errorf("fit: sensor %q detects nothing in the water band %v-%v nm", sensor.Name, lo, hi)
	}
	lt := Light{
		GroupVelocity: sumDet / sumInvV,
		Efficiency:    sumDet / sumEmit,
		transStep:     5,
	}
	n := int(maxPath/lt.transStep) + 2
	lt.transmission = make([]float64, n)
	for i := range n {
		d := float64(i) * lt.transStep
		s := 0.0
		for k := range lambdas {
			s += weights[k] * math.Exp(-d*atten[k])
		}
		lt.transmission[i] = s / sumDet
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
