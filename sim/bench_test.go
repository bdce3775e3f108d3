package sim

import (
	"context"
	"math/rand/v2"
	"runtime"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// largeConfig is LargeConfig with seed 1.
func largeConfig(b testing.TB) Config {
	b.Helper()
	cfg, err := LargeConfig(1)
	if err != nil {
		b.Fatal(err)
	}
	return cfg
}

var eventCases = []struct {
	name string
	pdg  int
	ekin float64
}{
	{"e-10MeV", phys.Electron, 10},
	{"e-500MeV", phys.Electron, 500},
	{"mu-1GeV", phys.MuonMinus, 1000},
}

// fixedGun is a benchmark generator: one particle from near the centre.
type fixedGun struct {
	pdg  int
	ekin float64
}

func (g fixedGun) String() string { return "fixed gun" }

func (g fixedGun) Generate(_ uint64, _ *rand.Rand, dst []phys.Particle) ([]phys.Particle, gen.Info, error) {
	return append(dst, phys.Particle{PDG: g.pdg, Pos: r3.Vector{X: -100}, Dir: r3.Vector{X: 0.6, Z: 0.8}, Ekin: g.ekin}), gen.Info{}, nil
}

// BenchmarkEvent is one whole event (transport, Cherenkov light, photon
// transport, sensors, dark noise, trigger) on one core, in the demo and
// the large tank. photons/s counts traced (pre-scaled) photons.
func BenchmarkEvent(b *testing.B) {
	demo, err := DemoConfig(1)
	if err != nil {
		b.Fatal(err)
	}
	for _, tank := range []struct {
		name string
		cfg  Config
	}{{"demo", demo}, {"large", largeConfig(b)}} {
		tank.cfg.Workers = 1
		s, err := New(tank.cfg)
		if err != nil {
			b.Fatal(err)
		}
		for _, c := range eventCases {
			b.Run(tank.name+"/"+c.name, func(b *testing.B) {
				g := fixedGun{c.pdg, c.ekin}
				photons := 0
				b.ReportAllocs()
				for i := 0; i < b.N; i++ {
					rng := EventStream(1, uint64(i))
					prims, _, _ := g.Generate(uint64(i), rng, nil)
					ev, err := s.Event(uint64(i), prims)
					if err != nil {
						b.Fatal(err)
					}
					photons += ev.Truth.Photons
				}
				sec := b.Elapsed().Seconds()
				b.ReportMetric(float64(b.N)/sec, "events/s")
				b.ReportMetric(float64(photons)/sec, "photons/s")
				b.ReportMetric(sec*1e9/float64(photons), "ns/photon")
			})
		}
	}
}

// BenchmarkRun is a run on all cores (GOMAXPROCS workers) in the large
// tank; compare events/s with BenchmarkEvent's single core.
func BenchmarkRun(b *testing.B) {
	cfg := largeConfig(b)
	cfg.Workers = runtime.GOMAXPROCS(0)
	cfg.KeepUntriggered = true
	s, err := New(cfg)
	if err != nil {
		b.Fatal(err)
	}
	for _, c := range eventCases {
		b.Run(c.name, func(b *testing.B) {
			photons := 0
			err := s.Run(context.Background(), fixedGun{c.pdg, c.ekin}, RunOptions{Count: uint64(b.N)}, func(ev *event.Event) error {
				photons += ev.Truth.Photons
				return nil
			})
			if err != nil {
				b.Fatal(err)
			}
			sec := b.Elapsed().Seconds()
			b.ReportMetric(float64(b.N)/sec, "events/s")
			b.ReportMetric(float64(photons)/sec, "photons/s")
		})
	}
}
