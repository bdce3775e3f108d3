package ring

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/sim/phys"
)

// TestModelSpread measures the relative width of the light model's
// per-sensor prediction, the modelSigma of the charge likelihood. For
// simulated events in the demo tank (fixed seeds) the prediction mu at
// the true track is scaled to the event's total charge (the fit absorbs
// an overall scale into the energy); over the sensors predicted to see
// 5-40 pe (above threshold effects, inside the charge tables) the
// variance of the charge q beyond the Poisson x single-pe variance,
// relative to the squared mean,
//
//	s^2 = sum[(q - a m1 mu)^2 - a m2 mu] / sum[(a m1 mu)^2],  a = sum q / sum m1 mu,
//
// is formed per event and averaged over events; its standard error comes
// from the spread of the per-event values (events are independent, the
// sensors of one event are not). The test fails when modelSigma^2 lies
// more than 4 standard errors from the measurement (statistical
// expectation).
func TestModelSpread(t *testing.T) {
	if testing.Short() {
		t.Skip("model-spread measurement skipped in -short mode")
	}
	d := demoTank(t)
	w := d.fit.newWorkspace()
	ct := d.fit.charge
	mu := make([]float64, d.fit.n)
	for _, pt := range []point{{"e-600", phys.Electron, 600}, {"mu-600", phys.MuonMinus, 600}} {
		h := Electron
		if pt.pdg == phys.MuonMinus {
			h = Muon
		}
		var per []float64
		for k := 0; k < 24; k++ {
			rng := rand.New(rand.NewPCG(77, uint64(k)))
			var tt trueTrack
			hits := simulateContained(t, d.sim, rng, pt, demoWall, 77, k, nil, &tt)
			if hits == nil {
				continue
			}
			if _, _, _, err := w.setEvent(hits, Window{}); err != nil {
				t.Fatal(err)
			}
			if err := d.fit.Predict(h, fit.Track{Vertex: tt.pos, Dir: tt.dir, Ekin: tt.ekin}, mu, nil); err != nil {
				t.Fatal(err)
			}
			var sq, sm float64
			for i, m := range mu {
				if m >= 5 && m <= 40 && !d.fit.dead[i] {
					sq += math.Max(w.hitQ[i], 0)
					sm += ct.m1 * m
				}
			}
			if !(sm > 0) {
				continue
			}
			a := sq / sm
			var num, den float64
			for i, m := range mu {
				if m < 5 || m > 40 || d.fit.dead[i] {
					continue
				}
				r := math.Max(w.hitQ[i], 0) - a*ct.m1*m
				num += r*r - ct.m2*a*m
				den += a * ct.m1 * m * a * ct.m1 * m
			}
			per = append(per, num/den)
		}
		if len(per) < 10 {
			t.Fatalf("%s: only %d events", pt.name, len(per))
		}
		mean, se := meanSE(per)
		t.Logf("%s: relative excess variance %.4f +- %.4f (%d events): sigma_model %.3f", pt.name, mean, se, len(per), math.Sqrt(math.Max(mean, 0)))
		if math.Abs(mean-modelSigma*modelSigma) > 4*se {
			t.Errorf("%s: modelSigma^2 = %.4f, measured %.4f +- %.4f", pt.name, modelSigma*modelSigma, mean, se)
		}
	}
}

// meanSE returns the mean of xs and its standard error.
func meanSE(xs []float64) (mean, se float64) {
	var s, s2 float64
	for _, v := range xs {
		s += v
		s2 += v * v
	}
	n := float64(len(xs))
	mean = s / n
	return mean, math.Sqrt((s2/n - mean*mean) / (n - 1))
}
