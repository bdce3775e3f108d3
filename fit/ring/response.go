package ring

import (
	"fmt"
	"math"

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
	wlo, whi := w.Band()
	lo, hi := math.Max(bandLo, wlo), math.Min(bandHi, whi)
	if !(lo < hi) {
		return nil, fmt.Errorf("ring: water band %g-%g nm does not overlap the table band %g-%g nm", wlo, whi, bandLo, bandHi)
	}
	const dl = 1.0
	var lams, wts, effs, latt []float64
	var norm float64
	// The Frank-Tamm spectrum at beta = 1 over the whole table band sets
	// the normalization: the tables count photons of that band.
	for l := bandLo + dl/2; l < bandHi; l += dl {
		lw := math.Min(math.Max(l, wlo), whi)
		n := w.Index(lw)
		f := (1 - 1/(n*n)) / (l * l)
		norm += f
		if l < lo || l > hi {
			continue
		}
		lams = append(lams, l)
		wts = append(wts, f)
		effs = append(effs, m.SpectralEfficiency(l))
		latt = append(latt, 1/(1/w.AbsorptionLength(l)+1/w.ScatteringLength(l)))
	}
	r := &response{attStep: 2}
	var sw, sn, sg, sg2, sls, sla float64
	for i, l := range lams {
		we := wts[i] * effs[i] / norm
		sw += we
		sn += we * w.Index(l)
		ig := 1 / w.GroupVelocity(l)
		sg += we * ig
		sg2 += we * ig * ig
		sls += we / w.ScatteringLength(l)
		sla += we / w.AbsorptionLength(l)
	}
	if !(sw > 0) {
		return nil, fmt.Errorf("ring: sensor %q detects nothing in the band %g-%g nm", m.Name, lo, hi)
	}
	r.index = sn / sw
	r.invGroup = sg / sw
	r.invGroupSD = math.Sqrt(math.Max(sg2/sw-r.invGroup*r.invGroup, 0))
	r.scatLength = sw / sls
	r.absLength = sw / sla
	nAtt := int(maxR/r.attStep) + 2
	r.att = make([]float64, nAtt)
	for k := range r.att {
		R := float64(k) * r.attStep
		var s float64
		for i := range lams {
			s += wts[i] * effs[i] / norm * math.Exp(-R/latt[i])
		}
		r.att[k] = s
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
