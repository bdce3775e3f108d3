package ring

import (
	"math"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/sim/phys"
)

// lightModelAccuracy is the documented accuracy of the predicted total
// charge (common practice for a tabulated light model; the indirect-light
// term is a smooth approximation).
const lightModelAccuracy = 0.05

// TestPredictedTotal compares the predicted mean number of photoelectrons
// summed over the detector with the simulator's mean signal
// photoelectron count (truth, all origins) for electrons, whose light is
// all prompt (a muon's decay electron, microseconds later, is in the
// simulator's count but not in the ring). Tolerance: the documented model
// accuracy plus 4 standard errors of the simulated mean.
func TestPredictedTotal(t *testing.T) {
	d := demoTank(t)
	w := d.fit
	mu := make([]float64, d.fit.n)
	for _, c := range []struct {
		ekin     float64
		pos, dir r3.Vector
	}{
		{150, r3.Vector{X: 100, Y: -50}, r3.Vector{Y: 1}},
		{500, r3.Vector{X: -100, Y: 50, Z: 30}, r3.Vector{X: 0.6, Z: 0.8}},
		{1200, r3.Vector{Z: -200}, r3.Vector{X: 0.3, Y: 0.3, Z: 0.9}},
	} {
		c.dir = c.dir.Normalize()
		if err := w.Predict(Electron, fit.Track{Vertex: c.pos, Dir: c.dir, Ekin: c.ekin}, mu, nil); err != nil {
			t.Fatal(err)
		}
		var pred float64
		for _, m := range mu {
			pred += m
		}
		const N = 12
		var s, s2 float64
		for k := 0; k < N; k++ {
			ev := simulate(t, d.sim, uint64(500+k), phys.Electron, c.pos, c.dir, c.ekin)
			x := float64(ev.Truth.Photoelectrons)
			s += x
			s2 += x * x
		}
		mean := s / N
		se := math.Sqrt((s2/N - mean*mean) / (N - 1))
		tol := lightModelAccuracy*mean + 4*se
		if math.Abs(pred-mean) > tol {
			t.Errorf("electron %g MeV: predicted %.1f pe, simulated %.1f +- %.1f (tolerance %.1f)", c.ekin, pred, mean, se, tol)
		}
	}
}

// TestProfileCone checks the muon tables against the Cherenkov relation
// cos theta = 1/(n beta) (PDG Review, Passage of particles through
// matter, Cherenkov radiation): near the start of a 2 GeV muon (beta >
// 0.999) the light peaks at the cosine 1/n averaged over the spectrum,
// within the 0.005 bin width plus the spread of n over the table band
// (about 1.335 to 1.349 at 650 and 300 nm, IAPWS formulation in
// sim/optics: cosines 0.741 to 0.749).
func TestProfileCone(t *testing.T) {
	d := demoTank(t)
	var p profileAt
	d.fit.species(Muon).interpolate(2000, &p)
	best, bj := 0.0, 0
	for j := 0; j < uniNC; j++ {
		if v := p.dens[j]; v > best {
			best, bj = v, j
		}
	}
	c := -1 + (float64(bj)+0.5)*2/uniNC
	if c < 0.736 || c > 0.754 {
		t.Errorf("muon cone peaks at cos %.4f, want within 0.741-0.749 (1/n of water) +- 0.005", c)
	}
	// The Frank-Tamm yield per cm of a muon at beta ~ 1 over the table
	// band, 2 pi alpha (1/lambda1 - 1/lambda2)(1 - 1/n^2) ~ 410 photons
	// per cm for 280-660 nm and n = 1.34; delta rays add light, so the
	// first step must carry at least that much (from memory: delta rays
	// add of order 10-20%).
	perCm := p.total[0] / p.ds
	n := 1.34
	ft := 2 * math.Pi * phys.FineStructure * (1/280e-7 - 1/660e-7) * (1 - 1/(n*n))
	if perCm < 0.97*ft || perCm > 1.4*ft {
		t.Errorf("muon light near the start %.0f photons/cm, Frank-Tamm %.0f", perCm, ft)
	}
}
