package ring

import (
	"fmt"
	"math"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/optics"
)

// response is the water and sensor response the prediction needs,
// averaged over the detected Cherenkov spectrum and tabulated for the hot
// path. Built once per Fitter, read-only afterwards.
type response struct {
	// att[i] is the mean detection efficiency (QE x collection) times the
	// direct-light survival exp(-R/L_att) at R = i*attStep, averaged over
	// the emitted spectrum of the table band (so it multiplies a photon
	// count of that band).
	att     []float64
	attStep float64
	// acc[i] is the angular acceptance at cos = i/accN.
	acc []float64
	// Spectrum-averaged optics of the detected light.
	index      float64 // phase index: the Cherenkov cone
	invGroup   float64 // mean 1/v_g (ns/cm)
	invGroupSD float64 // its spread, the chromatic time dispersion per cm
	scatLength float64 // detected-spectrum mean scattering length (cm)
	absLength  float64 // and absorption length (cm)
}

const accN = 200

func newResponse(w *optics.Water, m *pmt.Model, bandLo, bandHi, maxR float64) (*response, error) {
	// The tables count photons of their band; 1 nm bins.
	bins := int(math.Round(bandHi - bandLo))
	sp, err := fit.NewSpectrum(w, m, bandLo, bandHi, max(bins, 1))
	if err != nil {
		return nil, fmt.Errorf("ring: %w", err)
	}
	r := &response{attStep: 2}
	r.index = sp.Mean(w.Index)
	r.invGroup, r.invGroupSD = sp.MeanSD(func(l float64) float64 { return 1 / w.GroupVelocity(l) })
	r.scatLength = sp.HarmonicMean(w.ScatteringLength)
	r.absLength = sp.HarmonicMean(w.AbsorptionLength)
	nAtt := int(maxR/r.attStep) + 2
	r.att = make([]float64, nAtt)
	for k := range r.att {
		r.att[k] = sp.Survival(float64(k) * r.attStep)
	}
	r.acc = make([]float64, accN+1)
	for k := range r.acc {
		r.acc[k] = m.AngularAcceptance(float64(k) / accN)
	}
	return r, nil
}

// attenuation returns att at distance R (cm), linear between the nodes.
func (r *response) attenuation(R float64) float64 {
	x := R / r.attStep
	k := int(x)
	if k >= len(r.att)-1 {
		return r.att[len(r.att)-1]
	}
	f := x - float64(k)
	return r.att[k] + f*(r.att[k+1]-r.att[k])
}

// acceptance returns the angular acceptance at incidence cosine c in [0, 1].
func (r *response) acceptance(c float64) float64 {
	x := c * accN
	k := int(x)
	if k >= accN {
		return r.acc[accN]
	}
	if k < 0 {
		return 0
	}
	f := x - float64(k)
	return r.acc[k] + f*(r.acc[k+1]-r.acc[k])
}
