package ring

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/sim/phys"
)

// TestCalibratePID feeds CalibratePID electrons with LLR = 300 + 200 p
// and muons with LLR = -100 - 300 p (p in GeV/c), each spread by a
// normal of 20, over 0.2-1.2 GeV/c: the line must lie within the gap,
// near its middle LLR = 100 - 50 p (the quantiles of 500 events per bin
// sit about 2.3 spreads inside, symmetrically); and bad input must give
// errors.
func TestCalibratePID(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	var es, mus []Reconstruction
	for i := 0; i < 5000; i++ {
		p := 0.2 + rng.Float64()
		e := Reconstruction{LLR: 300 + 200*p + 20*rng.NormFloat64()}
		m := Reconstruction{LLR: -100 - 300*p + 20*rng.NormFloat64()}
		for _, r := range []*Reconstruction{&e, &m} {
			r.Electron = Result{Status: fit.Converged, Momentum: 1000 * p}
			r.Muon = Result{Status: fit.Converged, Momentum: 1000 * p}
		}
		es, mus = append(es, e), append(mus, m)
	}
	cut, err := CalibratePID(es, mus, 100)
	if err != nil {
		t.Fatal(err)
	}
	// The bin centres carry the line; the 100 MeV/c bins shift a
	// point's momentum by up to 50 MeV/c, which the slopes (200 and -300
	// per GeV/c) turn into at most 15 in LLR at a bin edge and about
	// zero on average.
	if math.Abs(cut.Offset-100) > 10 || math.Abs(cut.Slope+50) > 15 {
		t.Errorf("cut %+v, want about Offset 100, Slope -50", cut)
	}
	bad := 0
	for _, r := range es {
		if cut.PDG(&r) != phys.Electron {
			bad++
		}
	}
	for _, r := range mus {
		if cut.PDG(&r) != phys.MuonMinus {
			bad++
		}
	}
	if bad != 0 {
		t.Errorf("%d of 10000 separable events on the wrong side", bad)
	}
	if _, err := CalibratePID(es, nil, 100); err == nil {
		t.Error("no muons: want an error")
	}
	if _, err := CalibratePID(es, mus, 0); err == nil {
		t.Error("zero bin width: want an error")
	}
	if _, err := CalibratePID(es, mus, math.NaN()); err == nil {
		t.Error("NaN bin width: want an error")
	}
}

// TestPIDUsesLimitedFits: a hypothesis whose fit stopped at a limit
// (fit.AtLimit, a finite likelihood) still takes part in the identity by
// its likelihood, while one that did not converge or has no finite
// likelihood does not. The case is that of a stopping muon whose fit ran
// to the top of the energy tables with by far the better likelihood
// (LLR -155): the identity must say muon, not the only converged
// hypothesis.
func TestPIDUsesLimitedFits(t *testing.T) {
	limited := "energy 3000 MeV at the edge of the table range 65-3000 MeV"
	for _, c := range []struct {
		name   string
		e, mu  Result
		want   int
		reason string
	}{
		{"muon at the top of the tables", Result{Status: fit.Converged, NLL: 1000}, Result{Status: fit.AtLimit, NLL: 845, Reason: limited}, phys.MuonMinus, limited},
		{"electron at the wall", Result{Status: fit.AtLimit, NLL: 800, Reason: "vertex outside the tank"}, Result{Status: fit.Converged, NLL: 845}, phys.Electron, "vertex outside the tank"},
		{"muon at a limit, worse", Result{Status: fit.Converged, NLL: 800}, Result{Status: fit.AtLimit, NLL: 845, Reason: limited}, phys.Electron, ""},
		{"muon not converged", Result{Status: fit.Converged, NLL: 1000}, Result{Status: fit.NotConverged, NLL: 845}, phys.Electron, ""},
		{"muon at a limit, NaN likelihood", Result{Status: fit.Converged, NLL: 1000}, Result{Status: fit.AtLimit, NLL: math.NaN()}, phys.Electron, ""},
		{"both at limits", Result{Status: fit.AtLimit, NLL: 1000}, Result{Status: fit.AtLimit, NLL: 845, Reason: limited}, phys.MuonMinus, limited},
		{"neither fitted", Result{}, Result{}, 0, ""},
	} {
		c.e.Hypothesis, c.mu.Hypothesis = Electron, Muon
		r := Reconstruction{Electron: c.e, Muon: c.mu, LLR: c.mu.NLL - c.e.NLL}
		if got := (PIDCut{}).PDG(&r); got != c.want {
			t.Errorf("%s: PDG %d, want %d", c.name, got, c.want)
		}
		if got := (PIDCut{}).Best(&r).Reason; got != c.reason {
			t.Errorf("%s: Best().Reason %q, want %q", c.name, got, c.reason)
		}
	}
	// CalibratePID counts events with a hypothesis at a limit.
	var es, mus []Reconstruction
	for i := 0; i < 40; i++ {
		p := 200 + 25*float64(i)
		e := Reconstruction{Electron: Result{Status: fit.Converged, Momentum: p}, Muon: Result{Status: fit.AtLimit, Momentum: p}, LLR: 300}
		m := Reconstruction{Electron: Result{Status: fit.Converged, Momentum: p}, Muon: Result{Status: fit.AtLimit, Momentum: p}, LLR: -300}
		es, mus = append(es, e), append(mus, m)
	}
	cut, err := CalibratePID(es, mus, 200)
	if err != nil {
		t.Fatalf("CalibratePID with muon fits at a limit: %v", err)
	}
	if math.Abs(cut.Offset) > 1e-6 || math.Abs(cut.Slope) > 1e-6 {
		t.Errorf("cut %+v, want the midpoint line LLR = 0", cut)
	}
}
