package ring

import (
	"math"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/internal/fuzzhits"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// FuzzFit feeds the single-ring fitter arbitrary hit lists: it must never
// panic, and a hypothesis marked converged must hold only finite numbers.
// The evaluation budget is small so that each input is cheap.
func FuzzFit(f *testing.F) {
	d := demoTank(f)
	fitter, err := New(Config{Setup: d.cfg.Setup,
		SkipUncertainties: true, MaxEvaluations: 60})
	if err != nil {
		f.Fatal(err)
	}
	ev := simulate(f, d.sim, 1, phys.MuonMinus, r3.Vector{X: 100}, r3.Vector{Y: 1}, 300)
	f.Add(fuzzhits.Encode(ev.Hits))
	f.Add(fuzzhits.Encode([]pmt.Hit{{Sensor: 0, Time: 1, Charge: 1}}))
	f.Add(fuzzhits.Encode([]pmt.Hit{{Sensor: 2, Time: math.NaN(), Charge: 3}, {Sensor: -5, Time: 1, Charge: math.Inf(1)}}))
	f.Add([]byte{})
	ws := fitter
	f.Fuzz(func(t *testing.T, b []byte) {
		hits := fuzzhits.Decode(b)
		if len(hits) > 3000 {
			hits = hits[:3000]
		}
		rec, err := ws.Fit(hits, Window{})
		if err != nil {
			return
		}
		for _, r := range []Result{rec.Electron, rec.Muon} {
			if r.Status != fit.Converged {
				continue
			}
			tr := r.Track
			for i, v := range []float64{tr.Vertex.X, tr.Vertex.Y, tr.Vertex.Z, tr.Time, tr.Dir.X, tr.Dir.Y, tr.Dir.Z, tr.Ekin, r.Momentum, r.NLL} {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("converged %v result has non-finite value %d: %+v", r.Hypothesis, i, r)
				}
			}
		}
		if math.IsNaN(rec.LLR) && (rec.Electron.Status == fit.Converged && rec.Muon.Status == fit.Converged) {
			t.Fatalf("NaN likelihood ratio with both hypotheses converged")
		}
	})
}
