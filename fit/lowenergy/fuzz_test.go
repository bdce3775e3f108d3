package lowenergy_test

import (
	"math"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/internal/fuzzhits"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
)

// FuzzFit feeds the low-energy fitter arbitrary hit lists: it must never
// panic, and a result marked converged must be finite throughout.
func FuzzFit(f *testing.F) {
	cfg, err := sim.DemoConfig(3)
	if err != nil {
		f.Fatal(err)
	}
	fitter, err := lowenergy.New(lowenergy.Config{Setup: setupOf(cfg)})
	if err != nil {
		f.Fatal(err)
	}
	// Seeds: two simulated events and a few hand-made oddities.
	evs := study(f, cfg, fitter, 10, 100, 0, 2)
	for _, ev := range evs {
		f.Add(fuzzhits.Encode(ev.hits))
	}
	f.Add(fuzzhits.Encode([]pmt.Hit{{Sensor: 0, Time: 1, Charge: 1}}))
	f.Add(fuzzhits.Encode([]pmt.Hit{{Sensor: 3, Time: math.NaN(), Charge: 1}, {Sensor: 4, Time: 2, Charge: math.Inf(1)}}))
	f.Add(fuzzhits.Encode([]pmt.Hit{{Sensor: -1, Time: 0, Charge: 0}, {Sensor: 1 << 30, Time: 0, Charge: 0}}))
	f.Add([]byte{})
	f.Fuzz(func(t *testing.T, b []byte) {
		hits := fuzzhits.Decode(b)
		if len(hits) > 2000 {
			hits = hits[:2000]
		}
		r, err := fitter.Fit(hits)
		if err != nil || r.Status != fit.Converged {
			return
		}
		vals := []float64{r.Track.Vertex.X, r.Track.Vertex.Y, r.Track.Vertex.Z, r.Track.Time, r.Track.Dir.X, r.Track.Dir.Y, r.Track.Dir.Z, r.Track.Ekin,
			r.Errors.Vertex.X, r.Errors.Vertex.Y, r.Errors.Vertex.Z, r.Errors.Time, r.Errors.Angle[0], r.Errors.Angle[1], r.Errors.Ekin, r.LogLikelihood}
		for i, v := range vals {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("converged result has non-finite value %d: %+v", i, r)
			}
		}
	})
}
