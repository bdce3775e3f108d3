package lowenergy

import (
	"math"
)

// minAcceptance bounds the incidence correction: hits at grazing
// incidence are weighted at most 1/minAcceptance.
const minAcceptance = 0.2

// effectiveHits returns the effective hit count of the prompt hits at the
// fitted vertex: each hit weighted by the occupancy correction
// -ln(1-x)/x (x the hit fraction of the sensor and its neighbours, the
// Poisson estimate of photoelectrons per hit sensor), the inverse
// transmission of its light path and the inverse angular acceptance at its
// incidence angle; the expected dark hits in the prompt window subtracted
// at the mean weight; divided by the photocathode coverage and the mean
// spectral efficiency. The result estimates the Cherenkov photons emitted
// in the band, so one calibration serves sensors of other coverage and
// efficiency.
func (f *Fitter) effectiveHits(sc *scratch, x candidate) float64 {
	if len(sc.prompt) == 0 {
		return 0
	}
	v := x.q.Mul(f.vg)
	for _, i := range sc.prompt {
		sc.hitFlag[sc.sel[i].sensor] = true
	}
	sum := 0.0
	for _, i := range sc.prompt {
		k := sc.sel[i].sensor
		nb := f.nb[f.nbStart[k]:f.nbStart[k+1]]
		hit := 1
		for _, j := range nb {
			if sc.hitFlag[j] {
				hit++
			}
		}
		tot := float64(len(nb) + 1)
		occ := float64(hit) / tot
		if occ >= 1 {
			occ = 1 - 0.5/tot
		}
		w := -math.Log1p(-occ) / occ
		d := f.pos[k].Sub(v)
		dist := d.Norm()
		cosInc := 1.0
		if dist > 0 {
			cosInc = math.Min(math.Max(-f.dir[k].Dot(d)/dist, 0), 1)
		}
		acc := math.Max(f.sensor.AngularAcceptance(cosInc), minAcceptance)
		sum += w / (f.light.Transmission(dist) * acc)
	}
	for _, i := range sc.prompt {
		sc.hitFlag[sc.sel[i].sensor] = false
	}
	n := float64(len(sc.prompt))
	dark := f.darkPerNs * (f.promptHi - f.promptLo)
	neff := sum * (1 - math.Min(dark/n, 1))
	return neff / (f.coverage * f.light.Efficiency)
}

// energyFromNeff inverts the calibration (linear between its points,
// extended linearly beyond the ends, not below 0) and returns the energy,
// its uncertainty, the vertex shift at that energy and the calibration
// interpolated there (Ekin, Shift, DirSpread, ShiftSpread set). The uncertainty is
// interpolated between the calibration points' energy spreads,
// Sigma / (dMean/dEkin) with the slope from central differences.
func (f *Fitter) energyFromNeff(neff float64) (e, sigma, shift float64, cp CalibrationPoint) {
	cal := f.tables.Energy
	k := 0
	for k < len(cal)-2 && neff > cal[k+1].Mean {
		k++
	}
	a, b := cal[k], cal[k+1]
	slope := (b.Mean - a.Mean) / (b.Ekin - a.Ekin)
	e = a.Ekin + (neff-a.Mean)/slope
	if e < 0 {
		e = 0
	}
	w := math.Min(math.Max((e-a.Ekin)/(b.Ekin-a.Ekin), 0), 1)
	sigma = f.energySigma[k] + w*(f.energySigma[k+1]-f.energySigma[k])
	// Outside the calibration the spread is not frozen at the end
	// point's: the photon count's Poisson spread scales as sqrt(E), and
	// the unknown shape of the calibration beyond its range adds the
	// whole distance to it (a straight-line extrapolation may be off by
	// as much as it extends).
	if lo, hi := cal[0].Ekin, cal[len(cal)-1].Ekin; e > hi {
		sigma = math.Hypot(f.energySigma[len(cal)-1]*math.Sqrt(e/hi), e-hi)
	} else if e < lo {
		sigma = math.Hypot(f.energySigma[0]*math.Sqrt(math.Max(e, 0)/lo), lo-e)
	}
	cp = CalibrationPoint{
		Ekin:         e,
		Shift:        a.Shift + w*(b.Shift-a.Shift),
		DirSpread:    a.DirSpread + w*(b.DirSpread-a.DirSpread),
		ShiftSpread:  a.ShiftSpread + w*(b.ShiftSpread-a.ShiftSpread),
		VertexSpread: a.VertexSpread + w*(b.VertexSpread-a.VertexSpread),
	}
	return e, sigma, cp.Shift, cp
}

// energySpreads returns the energy spread at each calibration point: the
// spread of Neff over the local slope of the calibration (central
// differences inside, one-sided at the ends).
func energySpreads(cal []CalibrationPoint) []float64 {
	out := make([]float64, len(cal))
	for k := range cal {
		lo, hi := max(k-1, 0), min(k+1, len(cal)-1)
		slope := (cal[hi].Mean - cal[lo].Mean) / (cal[hi].Ekin - cal[lo].Ekin)
		out[k] = cal[k].Sigma / slope
	}
	return out
}
