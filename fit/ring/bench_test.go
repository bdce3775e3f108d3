package ring

import (
	"math"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/phys"
)

// largeConfig is sim.LargeConfig on one worker.
func largeConfig(tb testing.TB, seed uint64) sim.Config {
	tb.Helper()
	cfg, err := sim.LargeConfig(seed)
	if err != nil {
		tb.Fatal(err)
	}
	cfg.Workers = 1
	return cfg
}

func simAndFitter(tb testing.TB, cfg sim.Config, skipErrors bool) (*sim.Simulator, *Fitter) {
	tb.Helper()
	s, err := sim.New(cfg)
	if err != nil {
		tb.Fatal(err)
	}
	c := s.Config()
	f, err := New(Config{Setup: c.Setup, SkipUncertainties: skipErrors})
	if err != nil {
		tb.Fatal(err)
	}
	return s, f
}

// BenchmarkFit is one two-hypothesis fit (seed, electron and muon fits,
// with Hessians and Cramer-Rao bounds unless "noerrors") of a 500 MeV/c
// event on one core, in the demo and the large tank. The fits cycle over
// benchEvents events at fixed vertices and directions, since the cost of
// one event depends on its path to the minimum.
func BenchmarkFit(b *testing.B) {
	for _, tank := range benchTanks(b) {
		for _, skip := range []bool{false, true} {
			s, f := simAndFitter(b, tank.cfg, skip)
			for _, c := range []struct {
				name string
				pdg  int
				mass float64
			}{{"e", phys.Electron, phys.ElectronMass}, {"mu", phys.MuonMinus, phys.MuonMass}} {
				name := tank.name + "/" + c.name + "-500MeV"
				if skip {
					name += "/noerrors"
				}
				var events [][]pmt.Hit
				for k, tr := range benchTracks(s) {
					ev, err := s.Event(uint64(k+1), []phys.Particle{{PDG: c.pdg, Pos: tr.Vertex, Dir: tr.Dir,
						Ekin: phys.KineticFromMomentum(500, c.mass)}})
					if err != nil {
						b.Fatal(err)
					}
					events = append(events, ev.Hits)
				}
				b.Run(name, func(b *testing.B) {
					b.ReportAllocs()
					evals := 0
					for i := 0; i < b.N; i++ {
						rec, err := f.Fit(events[i%len(events)], Window{})
						if err != nil {
							b.Fatal(err)
						}
						evals += rec.Electron.Evaluations + rec.Muon.Evaluations
					}
					b.ReportMetric(float64(evals)/float64(b.N), "evals/op")
				})
			}
		}
	}
}

// benchTracks are the start points and directions of the benchmark
// events: four tracks 2 m or more inside the sensor surface of the tank
// of s (half its radius and height in the demo tank), pointing different
// ways.
func benchTracks(s *sim.Simulator) []fit.Track {
	t := s.Config().Detector.Tank()
	r := math.Min(t.Radius-t.SensorOffset-200, 0.5*t.Radius)
	h := math.Min(t.Height/2-t.SensorOffset-200, 0.25*t.Height)
	return []fit.Track{
		{Vertex: r3.Vector{X: -0.5 * r, Y: 0.25 * r}, Dir: r3.Vector{X: 0.6, Z: 0.8}},
		{Vertex: r3.Vector{X: 0.7 * r, Z: -0.5 * h}, Dir: r3.Vector{X: -1}},
		{Vertex: r3.Vector{Y: -0.3 * r, Z: 0.6 * h}, Dir: r3.Vector{X: 0.3, Y: 0.5, Z: -0.81}.Normalize()},
		{Vertex: r3.Vector{X: 0.2 * r, Y: 0.6 * r, Z: 0.1 * h}, Dir: r3.Vector{X: 0.1, Y: -0.99}.Normalize()},
	}
}

// BenchmarkLikelihood is one likelihood evaluation (prediction at every
// sensor plus the charge and time terms); it must not allocate.
func BenchmarkLikelihood(b *testing.B) {
	for _, tank := range benchTanks(b) {
		s, f := simAndFitter(b, tank.cfg, true)
		w := f.newWorkspace()
		tr := fit.Track{Vertex: r3.Vector{X: -100, Y: 50}, Dir: r3.Vector{X: 0.6, Z: 0.8}, Ekin: 400}
		ev, err := s.Event(1, []phys.Particle{{PDG: phys.MuonMinus, Pos: tr.Vertex, Dir: tr.Dir, Ekin: tr.Ekin}})
		if err != nil {
			b.Fatal(err)
		}
		if _, _, _, err := w.setEvent(ev.Hits, Window{}); err != nil {
			b.Fatal(err)
		}
		for _, h := range []Hypothesis{Electron, Muon} {
			b.Run(tank.name+"/"+h.String(), func(b *testing.B) {
				b.ReportAllocs()
				for i := 0; i < b.N; i++ {
					w.nll(h, tr)
				}
			})
		}
	}
}

type benchTank struct {
	name string
	cfg  sim.Config
}

// benchTanks returns the demo and the large tank, one simulation worker.
func benchTanks(b *testing.B) []benchTank {
	demo, err := sim.DemoConfig(1)
	if err != nil {
		b.Fatal(err)
	}
	demo.Workers = 1
	return []benchTank{{"demo", demo}, {"large", largeConfig(b, 1)}}
}

// BenchmarkChargeTail is the charge likelihood beyond the tables (mu or q
// above 40 pe), the gamma log density of the library evaluated in the
// per-sensor loop.
func BenchmarkChargeTail(b *testing.B) {
	m := pmt.Large()
	ct, err := newChargeTable(&m, modelSigma)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	var s float64
	for i := 0; i < b.N; i++ {
		s += ct.nllHit(45+float64(i&15), 50)
	}
	if math.IsNaN(s) {
		b.Fatal("NaN")
	}
}
