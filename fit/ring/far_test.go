package ring

import (
	"math"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
)

// TestFarSensors checks the interpolated geometry of far sensors (see
// farDistance) against the exact sum at every step edge, an independent
// evaluation of the same integral: for electrons and muons of 200, 500
// and 1500 MeV in the demo and the large tank, the direct light of every
// sensor that sees at least 0.05 pe agrees within 1% (the prediction's
// own model width is 45%, modelSigma) and the summed direct light within
// 0.1%.
func TestFarSensors(t *testing.T) {
	for _, tk := range []struct {
		name string
		fit  *Fitter
	}{{"demo", demoTank(t).fit}, {"large", largeFitter(t)}} {
		f := tk.fit
		exact, err := New(f.cfg)
		if err != nil {
			t.Fatal(err)
		}
		exact.farDistance = math.Inf(1)
		wf, we := f.newWorkspace(), exact.newWorkspace()
		for _, h := range []Hypothesis{Electron, Muon} {
			for _, e := range []float64{200, 500, 1500} {
				tr := fit.Track{Vertex: r3.Vector{X: -100, Y: 50, Z: 30}, Dir: r3.Vector{X: 0.6, Z: 0.8}, Ekin: e}
				wf.predict(h, tr)
				we.predict(h, tr)
				var worst, sumF, sumE float64
				far := 0
				for i := 0; i < f.n; i++ {
					sumF += wf.muD[i]
					sumE += we.muD[i]
					if wf.muD[i] != we.muD[i] {
						far++
					}
					if we.muD[i] >= 0.05 {
						worst = math.Max(worst, math.Abs(wf.muD[i]/we.muD[i]-1))
					}
				}
				t.Logf("%s %v %g MeV: %d of %d sensors interpolated, worst %.4f, total %+.5f", tk.name, h, e, far, f.n, worst, sumF/sumE-1)
				if worst > 0.01 || math.Abs(sumF/sumE-1) > 1e-3 {
					t.Errorf("%s %v %g MeV: interpolated direct light off by %.4f at worst, %.5f in total", tk.name, h, e, worst, sumF/sumE-1)
				}
			}
		}
	}
}

// largeFitter is a fitter of the large reference tank.
func largeFitter(t testing.TB) *Fitter {
	t.Helper()
	_, f := simAndFitter(t, largeConfig(t, 1), true)
	return f
}
