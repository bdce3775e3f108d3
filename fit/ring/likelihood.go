package ring

import (
	"math"

	"github.com/conelight/conelight/fit"
)

// nll is the negative log likelihood of the loaded event for hypothesis h
// and a valid track (unit direction, energy in the table range).
func (w *workspace) nll(h Hypothesis, tr fit.Track) float64 {
	w.evals++
	w.predict(h, tr)
	return w.sensorTerms(nil)
}

// sensorTerms is nll for the current prediction as a sum over the live
// sensors: the charge term of every sensor plus the time term of a hit
// one. When terms is not nil it receives each sensor's share (zero for
// dead sensors), from which the fit takes the per-sensor scores.
func (w *workspace) sensorTerms(terms []float64) float64 {
	f := w.f
	ct := f.charge
	var sum float64
	for i := 0; i < f.n; i++ {
		var v float64
		if !f.dead[i] && w.hitQ[i] < 0 {
			v = ct.nllNone(w.muD[i] + w.muI[i] + f.darkGate)
		}
		sum += v
		if terms != nil {
			terms[i] = v
		}
	}
	muN := w.darkMean()
	for _, i := range w.hits {
		v := ct.nllHit(w.hitQ[i], w.muD[i]+w.muI[i]+f.darkGate) +
			w.timeNLL(w.hitT[i]-w.tDir[i], w.sgT[i], w.muD[i], w.muI[i], muN)
		sum += v
		if terms != nil {
			terms[i] = v
		}
	}
	return sum
}

// darkMean is the mean number of dark hits of a sensor over the readout
// window, floored so that the time mixture keeps a noise component.
func (w *workspace) darkMean() float64 { return math.Max(w.f.darkRate*w.window, 1e-9) }

// timeShiftNLL is the time part of nll for the current prediction with
// every predicted time later by shift (ns): the likelihood of a time
// step, which leaves the charges unchanged.
func (w *workspace) timeShiftNLL(shift float64) float64 {
	muN := w.darkMean()
	var sum float64
	for _, i := range w.hits {
		sum += w.timeNLL(w.hitT[i]-w.tDir[i]-shift, w.sgT[i], w.muD[i], w.muI[i], muN)
	}
	return sum
}

// timeNLL is -log of the density of a hit's time residual dt (ns) about
// the predicted direct-light time, a mixture of
//   - the earliest of a Poisson number (mean muD) of direct photoelectrons,
//     each Gaussian with spread sigma: muD phi(x) exp(-muD Phi(x)) /
//     (sigma (1 - exp(-muD))), x = dt/sigma, which narrows and moves early
//     as muD grows (first-photon statistics);
//   - scattered and reflected light, delayed exponentially with lateTau and
//     smeared by sigma;
//   - dark noise, flat over the readout window,
//
// weighted by the probability that the first photoelectron of the hit is of
// each kind.
func (w *workspace) timeNLL(dt, sigma, muD, muI, muN float64) float64 {
	pd := -math.Expm1(-muD)
	ps := math.Exp(-muD) * -math.Expm1(-muI)
	pn := math.Exp(-muD-muI) * -math.Expm1(-muN)
	norm := pd + ps + pn
	x := dt / sigma
	var fd float64
	if pd > 0 {
		phi := math.Exp(-0.5*x*x) / (sigma * math.Sqrt(2*math.Pi))
		cdf := 0.5 * math.Erfc(-x/math.Sqrt2)
		fd = muD * phi * math.Exp(-muD*cdf) / pd
	}
	tau := w.f.lateTau
	// exponentially modified Gaussian, in logs so that its far tails
	// neither overflow nor underflow
	fs := math.Exp(0.5*sigma*sigma/(tau*tau)-dt/tau+logNormCDF(x-sigma/tau)) / tau
	dens := (pd*fd + ps*fs + pn/w.window) / norm
	return -math.Log(math.Max(dens, 1e-300))
}
