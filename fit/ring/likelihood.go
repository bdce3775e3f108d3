package ring

import (
	"errors"
	"fmt"
	"math"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
)

// Window is the readout window of an event (ns, event clock): hits outside
// it are ignored, and its length sets the dark-noise level of the time
// likelihood. The zero Window means the span of the hits.
type Window struct {
	Lo, Hi float64
}

// setEvent loads the hits into the workspace: the first hit of each live
// sensor inside the window. It returns the number of hits used and the
// number dropped (outside the window, on dead sensors or later hits of a
// sensor already hit), or the status and error of an event that cannot
// be fitted.
func (w *workspace) setEvent(hits []pmt.Hit, win Window) (used, dropped int, st fit.Status, err error) {
	f := w.f
	for _, i := range w.hits {
		w.hitQ[i] = -1
	}
	w.hits = w.hits[:0]
	if len(hits) == 0 {
		return 0, 0, fit.NoHits, errors.New("ring: event has no hits")
	}
	if err := fit.CheckHits(hits, f.n, f.cfg.Sensor.IntegrationWindow); err != nil {
		return 0, 0, fit.BadInput, fmt.Errorf("ring: %w", err)
	}
	if win == (Window{}) {
		win.Lo, win.Hi = math.Inf(1), math.Inf(-1)
		for _, h := range hits {
			win.Lo, win.Hi = math.Min(win.Lo, h.Time), math.Max(win.Hi, h.Time)
		}
		win.Hi = math.Max(win.Hi, win.Lo+1)
	}
	if !finite(win.Lo) || !finite(win.Hi) || !(win.Hi > win.Lo) {
		return 0, 0, fit.BadInput, fmt.Errorf("ring: Window {Lo: %g, Hi: %g} must be finite with Hi > Lo", win.Lo, win.Hi)
	}
	w.window = win.Hi - win.Lo
	for _, h := range hits {
		if h.Time < win.Lo || h.Time > win.Hi || f.dead[h.Sensor] {
			dropped++
			continue
		}
		i := h.Sensor
		if w.hitQ[i] < 0 {
			w.hits = append(w.hits, i)
			w.hitQ[i], w.hitT[i] = h.Charge, h.Time
			continue
		}
		dropped++
		if h.Time < w.hitT[i] {
			w.hitQ[i], w.hitT[i] = h.Charge, h.Time
		}
	}
	if len(w.hits) == 0 {
		return 0, dropped, fit.NoHits, fmt.Errorf("ring: no hit of the %d lies inside the readout window [%g, %g] ns on a live sensor", len(hits), win.Lo, win.Hi)
	}
	return len(w.hits), dropped, fit.Converged, nil
}

// restrict keeps only the hits with times in [lo, hi]: light before the
// event or long after it (a decay electron, the next interaction) is not
// part of the ring. It returns the number removed.
func (w *workspace) restrict(lo, hi float64) int {
	return w.dropHits(func(i int) bool { t := w.hitT[i]; return t < lo || t > hi })
}

// dropHits removes from the loaded event the hit sensors for which drop
// is true (they count as unhit from then on) and returns their number.
func (w *workspace) dropHits(drop func(i int) bool) int {
	kept := w.hits[:0]
	removed := 0
	for _, i := range w.hits {
		if drop(i) {
			w.hitQ[i] = -1
			removed++
			continue
		}
		kept = append(kept, i)
	}
	w.hits = kept
	return removed
}

// arrival is hit sensor i's time less the light's travel time from v at
// the spectrum-averaged group velocity: the emission time of a point
// source at v that the hit implies.
func (w *workspace) arrival(i int, v r3.Vector) float64 {
	f := w.f
	dx, dy, dz := f.px[i]-v.X, f.py[i]-v.Y, f.pz[i]-v.Z
	return w.hitT[i] - math.Sqrt(dx*dx+dy*dy+dz*dz)*f.resp.invGroup
}

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
