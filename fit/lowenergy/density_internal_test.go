package lowenergy

import (
	"math"
	"testing"
)

// A narrow bin smeared by a Gaussian is that Gaussian: check the grid
// against the normal density and its derivative, its normalization, and
// the per-hit statistics against closed forms.
func TestSmearBinsGaussian(t *testing.T) {
	const sigma = 1.5
	g := smearBins([]Bin{{Lo: -1e-3, Hi: 1e-3, Density: 500}, {Lo: 1e-3, Hi: 2e-3, Density: 0}}, sigma, 0.01)
	sum := 0.0
	for i, v := range g.f {
		x := g.lo + float64(i)*g.step
		want := math.Exp(-0.5*x*x/(sigma*sigma)) / (sigma * math.Sqrt(2*math.Pi))
		if math.Abs(v-want) > 1e-6 {
			t.Fatalf("f(%v) = %v, normal density %v", x, v, want)
		}
		if dwant := -x / (sigma * sigma) * want; math.Abs(g.df[i]-dwant) > 1e-6 {
			t.Fatalf("f'(%v) = %v, want %v", x, g.df[i], dwant)
		}
		sum += v * g.step
	}
	// The grid spans +-5 sigma: mass 1 - 5.7e-7 (normal tail), trapezoid error tiny.
	if math.Abs(sum-1) > 1e-4 {
		t.Errorf("integral %v, want 1", sum)
	}
	// The model mixes in at least minDarkFraction of flat density over
	// the window W. Over the peak log f = log phi + log(1-eps) up to
	// eps/(W phi), so with the normal's E[log phi] = -0.5 log(2 pi e
	// sigma^2) and Var[log phi] = Var[z^2/2] = 1/2 (textbook properties of
	// the normal distribution), E[log f] = (1-eps) m + eps L and
	// E[log^2 f] = (1-eps)(1/2 + m^2) + eps L^2 with m = E[log phi] +
	// log(1-eps), L = log(eps/W). The Fisher information of the location
	// is (1-eps) / sigma^2 to the same order.
	const window = 1e9
	m := newResidualModel(g, window)
	meanLog, varLog, fisher := m.stats(0)
	eps := minDarkFraction
	mn := -0.5*math.Log(2*math.Pi*math.E*sigma*sigma) + math.Log(1-eps)
	floor := math.Log(eps / window)
	wantMean := (1-eps)*mn + eps*floor
	wantVar := (1-eps)*(0.5+mn*mn) + eps*floor*floor - wantMean*wantMean
	if want := (1 - eps) / (sigma * sigma); math.Abs(fisher/want-1) > 1e-3 {
		t.Errorf("Fisher information %v, want %v", fisher, want)
	}
	if math.Abs(meanLog-wantMean) > 1e-4 {
		t.Errorf("E[log f] = %v, want %v", meanLog, wantMean)
	}
	if math.Abs(varLog/wantVar-1) > 1e-3 {
		t.Errorf("Var[log f] = %v, want %v", varLog, wantVar)
	}
}

// The log table must agree with the mixture it tabulates, and fall to the
// flat floor outside the grid.
func TestLogTable(t *testing.T) {
	g := smearBins([]Bin{{Lo: 0, Hi: 2, Density: 0.25}, {Lo: 2, Hi: 4, Density: 0.25}}, 1, 0.1)
	m := newResidualModel(g, 300)
	var lt logTable
	const eps = 0.2
	lt.fill(&m, eps)
	for _, r := range []float64{-3.33, 0, 1.05, 2.5, 5.77} {
		s, ds := g.at(r)
		f := (1-eps)*s + eps/300
		lf, dlf := lt.at(r)
		// Linear interpolation of log f versus log of interpolated f:
		// differences of second order in the step (0.1): < 1e-2 relative.
		if math.Abs(lf-math.Log(f)) > 1e-2 || math.Abs(dlf-(1-eps)*ds/f) > 2e-2 {
			t.Errorf("r=%v: log f %v dlog f %v, want %v %v", r, lf, dlf, math.Log(f), (1-eps)*ds/f)
		}
	}
	if lf, dlf := lt.at(1e4); lf != math.Log(eps/300) || dlf != 0 {
		t.Errorf("outside the grid: %v %v, want the floor %v", lf, dlf, math.Log(eps/300))
	}
	if lf, _ := lt.at(math.NaN()); lf != math.Log(eps/300) {
		t.Errorf("NaN residual: %v, want the floor", lf)
	}
}

// The variance model of the energy: spreads at the points are
// Sigma / slope.
func TestEnergySpreads(t *testing.T) {
	cal := []CalibrationPoint{{Ekin: 10, Mean: 100, Sigma: 10}, {Ekin: 20, Mean: 200, Sigma: 14}, {Ekin: 30, Mean: 300, Sigma: 17}}
	s := energySpreads(cal)
	for k, want := range []float64{1, 1.4, 1.7} {
		if math.Abs(s[k]-want) > 1e-12 {
			t.Errorf("spread[%d] = %v, want %v", k, s[k], want)
		}
	}
}
