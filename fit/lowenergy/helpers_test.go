package lowenergy_test

import (
	"math/rand/v2"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/internal/sample"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// fitted is one simulated and fitted event.
type fitted struct {
	truth resolution.Sample
	res   lowenergy.Result
	time  float64
	hits  []pmt.Hit
}

// study simulates n electrons of energy e uniform in the fiducial volume
// (fid cm inside the sensor surface), isotropic, and fits the triggered
// ones. Events are numbered from first.
func study(t testing.TB, cfg sim.Config, f *lowenergy.Fitter, e, fid float64, first uint64, n int) []fitted {
	t.Helper()
	evs, err := sample.Simulate(cfg, fid, first, n, func(int) float64 { return e })
	if err != nil {
		t.Fatal(err)
	}
	var kept []fitted
	for _, ev := range evs {
		if !ev.Truth.Triggered {
			continue
		}
		r, err := f.Fit(ev.Hits)
		if err != nil {
			t.Fatal(err)
		}
		p := ev.Truth.Primaries[0]
		kept = append(kept, fitted{truth: resolution.Sample{Vertex: p.Pos, Dir: p.Dir, Energy: e}, res: r, time: p.Time, hits: ev.Hits})
	}
	return kept
}

// electronIn draws an electron of kinetic energy e (MeV) with the
// simulator's samplers: uniform at least fid cm inside the sensor surface
// (gen.InFiducial), isotropic (gen.Isotropic).
func electronIn(rng *rand.Rand, tank geom.Tank, fid, e float64) phys.Particle {
	return phys.Particle{PDG: phys.Electron, Pos: gen.InFiducial(tank, fid).Sample(rng), Dir: gen.Isotropic().Sample(rng), Ekin: e}
}

// summarize returns the resolution summary of the converged fits and the
// number of converged fits.
func summarize(t testing.TB, evs []fitted) (resolution.Summary, int) {
	t.Helper()
	var fs, ts []resolution.Sample
	for _, ev := range evs {
		if ev.res.Status != fit.Converged {
			continue
		}
		fs = append(fs, resolution.Sample{Vertex: ev.res.Track.Vertex, Dir: ev.res.Track.Dir, Energy: ev.res.Track.Ekin})
		ts = append(ts, ev.truth)
	}
	s, err := resolution.Summarize(fs, ts)
	if err != nil {
		t.Fatal(err)
	}
	return s, len(fs)
}

// demoFitter returns the demo configuration (seed 7) and its fitter.
func demoFitter(t testing.TB) (sim.Config, *lowenergy.Fitter) {
	t.Helper()
	cfg, err := sim.DemoConfig(7)
	return fitterFor(t, cfg, err)
}

// largeFitter returns the large-tank configuration and its fitter.
func largeFitter(t testing.TB, seed uint64) (sim.Config, *lowenergy.Fitter) {
	t.Helper()
	cfg, err := sample.LargeConfig(seed)
	return fitterFor(t, cfg, err)
}

func fitterFor(t testing.TB, cfg sim.Config, err error) (sim.Config, *lowenergy.Fitter) {
	t.Helper()
	if err != nil {
		t.Fatal(err)
	}
	f, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup})
	if err != nil {
		t.Fatal(err)
	}
	return cfg, f
}
