package ring

import (
	"sync"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// TestConcurrentFits fits the same events serially and from several
// goroutines at once on one Fitter: the pooled scratch must give
// identical results (run with -race to check the pool too).
func TestConcurrentFits(t *testing.T) {
	d := demoTank(t)
	cfg := Config{Setup: d.cfg.Setup, SkipUncertainties: true}
	f, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	tracks := []struct {
		pdg  int
		pos  r3.Vector
		dir  r3.Vector
		ekin float64
	}{
		{phys.MuonMinus, r3.Vector{X: -100, Y: 50}, r3.Vector{X: 0.6, Z: 0.8}, 300},
		{phys.Electron, r3.Vector{X: 80, Z: -60}, r3.Vector{X: -1}, 400},
		{phys.MuonMinus, r3.Vector{Y: -90, Z: 40}, r3.Vector{X: 0.3, Y: 0.5, Z: -0.81}.Normalize(), 500},
	}
	var events [][]pmt.Hit
	for k, tt := range tracks {
		events = append(events, simulate(t, d.sim, uint64(900+k), tt.pdg, tt.pos, tt.dir, tt.ekin).Hits)
	}
	serial := make([]Reconstruction, len(events))
	for i, hits := range events {
		if serial[i], err = f.Fit(hits, Window{}); err != nil {
			t.Fatal(err)
		}
	}
	par := make([]Reconstruction, len(events))
	errs := make([]error, len(events))
	var wg sync.WaitGroup
	for i, hits := range events {
		wg.Add(1)
		go func() {
			defer wg.Done()
			par[i], errs[i] = f.Fit(hits, Window{})
		}()
	}
	wg.Wait()
	for i := range events {
		if errs[i] != nil {
			t.Fatal(errs[i])
		}
		if par[i].Electron.Track != serial[i].Electron.Track || par[i].Muon.Track != serial[i].Muon.Track || par[i].LLR != serial[i].LLR {
			t.Errorf("event %d: concurrent fit %+v differs from serial %+v", i, par[i].Muon.Track, serial[i].Muon.Track)
		}
	}
}
