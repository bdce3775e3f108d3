package lowenergy

import (
	"math"
)

// minSmear (ns) is the smallest Gaussian width the residual histogram is
// convolved with, so that the density and its derivative are smooth even
// for a sensor without transit-time spread.
const minSmear = 0.3

// gridStep (ns) is the step of the fine residual grid.
const gridStep = 0.1

// grid is a density tabulated on a uniform grid with its derivative;
// lookups interpolate linearly and return 0 outside.
type grid struct {
	lo, step float64
	f, df    []float64
}

// at returns the density and its derivative at x.
func (g *grid) at(x float64) (f, df float64) {
	u := (x - g.lo) / g.step
	if !(u >= 0) {
		return 0, 0
	}
	i := int(u)
	if i >= len(g.f)-1 {
		return 0, 0
	}
	w := u - float64(i)
	return g.f[i] + w*(g.f[i+1]-g.f[i]), g.df[i] + w*(g.df[i+1]-g.df[i])
}

func (g *grid) hi() float64 { return g.lo + g.step*float64(len(g.f)-1) }

// smearBins convolves a histogram density (uniform inside each bin) with
// a Gaussian of width sigma exactly, on a grid of the given step from
// lo-5 sigma to hi+5 sigma, normalized to unit integral over the bins.
func smearBins(bins []Bin, sigma, step float64) grid {
	lo := bins[0].Lo - 5*sigma
	hi := bins[len(bins)-1].Hi + 5*sigma
	n := int(math.Ceil((hi-lo)/step)) + 1
	g := grid{lo: lo, step: step, f: make([]float64, n), df: make([]float64, n)}
	norm := 0.0
	for _, b := range bins {
		norm += b.Density * (b.Hi - b.Lo)
	}
	s2 := sigma * math.Sqrt2
	gauss := func(z float64) float64 { return math.Exp(-0.5*z*z) / (sigma * math.Sqrt(2*math.Pi)) }
	for i := range n {
		x := lo + float64(i)*step
		var f, df float64
		for _, b := range bins {
			if b.Density == 0 || b.Lo > x+8*sigma || b.Hi < x-8*sigma {
				continue
			}
			// Uniform density d on [a, b) convolved with N(0, sigma):
			// d * (Phi((x-a)/sigma) - Phi((x-b)/sigma)).
			f += b.Density * 0.5 * (math.Erf((x-b.Lo)/s2) - math.Erf((x-b.Hi)/s2))
			df += b.Density * (gauss((x-b.Lo)/sigma) - gauss((x-b.Hi)/sigma))
		}
		g.f[i] = f / norm
		g.df[i] = df / norm
	}
	return g
}

// residualModel is the per-hit time-residual density of a fitter: the
// smeared signal density s(r) mixed with a flat dark-noise density over
// the selection window, f(r) = (1-eps) s(r) + eps/window. The dark
// fraction eps is set per event; the expectations the goodness-of-fit and
// the Cramer-Rao bound need are tabulated against eps at setup.
type residualModel struct {
	signal grid
	window float64
	// Tabulated against eps = k/(len-1) for k = 0..len-1 over [0, epsMax].
	meanLog, varLog, fisher []float64
	epsMax                  float64
}

const epsTable = 101

func newResidualModel(signal grid, window float64) residualModel {
	m := residualModel{signal: signal, window: window, epsMax: 1}
	m.meanLog = make([]float64, epsTable)
	m.varLog = make([]float64, epsTable)
	m.fisher = make([]float64, epsTable)
	for k := range epsTable {
		eps := m.epsMax * float64(k) / (epsTable - 1)
		if eps < minDarkFraction {
			eps = minDarkFraction
		}
		flat := eps / window
		// Integrate over the signal grid; outside it f = flat with weight
		// (window - grid length)*flat where the window is longer.
		var e1, e2, fi, mass float64
		for i, s := range signal.f {
			f := (1-eps)*s + flat
			lf := math.Log(f)
			w := f * signal.step
			e1 += w * lf
			e2 += w * lf * lf
			d := (1 - eps) * signal.df[i]
			fi += d * d / f * signal.step
			mass += w
		}
		if rest := 1 - mass; rest > 0 {
			lf := math.Log(flat)
			e1 += rest * lf
			e2 += rest * lf * lf
		}
		m.meanLog[k] = e1
		m.varLog[k] = math.Max(e2-e1*e1, 0)
		m.fisher[k] = fi
	}
	return m
}

// minDarkFraction is the smallest flat fraction of the residual density:
// it keeps the likelihood finite for outliers when the sensors have no
// dark noise.
const minDarkFraction = 1e-3

// stats interpolates the per-hit expectation and variance of log f and
// the Fisher information of the location of f at dark fraction eps.
func (m *residualModel) stats(eps float64) (meanLog, varLog, fisher float64) {
	u := eps / m.epsMax * (epsTable - 1)
	i := int(u)
	if i >= epsTable-1 {
		i = epsTable - 2
	}
	w := u - float64(i)
	lerp := func(t []float64) float64 { return t[i] + w*(t[i+1]-t[i]) }
	return lerp(m.meanLog), lerp(m.varLog), lerp(m.fisher)
}

// directionGrid tabulates the cosine density of the direction table,
// smoothed by a small Gaussian, on [-1, 1]. Outside the bins it is 0.
func directionGrid(bins []Bin) grid {
	g := smearBins(bins, 0.01, 0.002)
	return g
}

// logTable is log f and d log f / dr of a residual model at one dark
// fraction, on the signal grid; outside it f is the flat floor.
type logTable struct {
	lo, step float64
	floor    float64
	lf, dlf  []float64
}

// fill tabulates the residual model at dark fraction eps into t, reusing
// its slices.
func (t *logTable) fill(m *residualModel, eps float64) {
	t.fillGrid(&m.signal, eps, 1/m.window)
}

// fillGrid tabulates log((1-eps) g + eps flat) with its derivative.
func (t *logTable) fillGrid(g *grid, eps, flatDensity float64) {
	t.lo, t.step = g.lo, g.step
	flat := eps * flatDensity
	t.floor = math.Log(flat)
	t.lf = append(t.lf[:0], g.f...)
	t.dlf = append(t.dlf[:0], g.df...)
	for i, s := range g.f {
		f := (1-eps)*s + flat
		t.lf[i] = math.Log(f)
		t.dlf[i] = (1 - eps) * g.df[i] / f
	}
}

// at returns log f(r) and d log f / dr, interpolated linearly.
func (t *logTable) at(r float64) (lf, dlf float64) {
	u := (r - t.lo) / t.step
	if !(u >= 0) {
		return t.floor, 0
	}
	i := int(u)
	if i >= len(t.lf)-1 {
		return t.floor, 0
	}
	w := u - float64(i)
	return t.lf[i] + w*(t.lf[i+1]-t.lf[i]), t.dlf[i] + w*(t.dlf[i+1]-t.dlf[i])
}
