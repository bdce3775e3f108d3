package sim

import (
	"context"
	"fmt"
	"math/rand/v2"
	"testing"
	"time"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/internal/floor"
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
	{"e-1GeV", phys.Electron, 1000},
	{"mu-1GeV", phys.MuonMinus, 1000},
}

// floorNs measures the photon floor (sim/internal/floor) in the large tank
// now, ns per photon, for the ratio the event benchmarks report: 200,000
// floor photons, about 10 ms.
func floorNs(b *testing.B) float64 {
	b.StopTimer()
	defer b.StartTimer()
	t := geom.LargeTank()
	rng := rand.New(rand.NewPCG(3, 4))
	const n = 200000
	start := time.Now()
	if floor.Photons(n, rng, r3.Vector{X: 10, Y: -20, Z: 30}, t.SensorRadius(), t.SensorHalfHeight()) == 0 {
		b.Fatal("no distance")
	}
	return float64(time.Since(start).Nanoseconds()) / n
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
// the large tank. It reports events/s; ns/photon, the event's time per
// traced photon (after pre-scaling and thinning), and floor-x, that cost
// over the photon floor (sim/internal/floor) measured in the same run;
// photons/pe, the photons traced per signal photoelectron.
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
				photons, pe := 0, 0
				b.ReportAllocs()
				for i := 0; i < b.N; i++ {
					rng := EventStream(1, uint64(i))
					prims, _, _ := g.Generate(uint64(i), rng, nil)
					ev, err := s.Event(uint64(i), prims)
					if err != nil {
						b.Fatal(err)
					}
					photons += ev.Truth.Photons
					pe += ev.Truth.Photoelectrons
				}
				sec := b.Elapsed().Seconds()
				perPhoton := sec * 1e9 / float64(photons)
				b.ReportMetric(float64(b.N)/sec, "events/s")
				b.ReportMetric(perPhoton, "ns/photon")
				b.ReportMetric(perPhoton/floorNs(b), "floor-x")
				b.ReportMetric(float64(photons)/float64(pe), "photons/pe")
			})
		}
	}
}

// BenchmarkRun is a run of 1 GeV muons in the large tank with 1 and with 2
// workers; the speed-up is the ratio of their events/s (on a machine
// with 2 idle cores).
func BenchmarkRun(b *testing.B) {
	for _, workers := range []int{1, 2} {
		cfg := largeConfig(b)
		cfg.Workers = workers
		cfg.KeepUntriggered = true
		s, err := New(cfg)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprintf("mu-1GeV/workers=%d", workers), func(b *testing.B) {
			photons := 0
			err := s.Run(context.Background(), fixedGun{phys.MuonMinus, 1000}, RunOptions{Count: uint64(b.N)}, func(ev *event.Event) error {
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
