package sim

import (
	"context"
	"math/rand/v2"
	"reflect"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// TestHadronEvents: the simulator follows pions, protons, neutrons and
// neutral pions given as primaries. A 2 GeV proton (above the Cherenkov
// threshold of 1.07 GeV/c) and a 500 MeV pi+ make light; a 100 MeV
// proton (below threshold) makes none of its own; a 300 MeV pi0 decays
// to photons that shower; a 2 MeV neutron is captured (its 2.2 MeV gamma
// or a knock-out) and has secondaries; a neutrino primary is not
// followed and says so.
func TestHadronEvents(t *testing.T) {
	s := demoSim(t, 1, func(c *Config) { c.KeepUntriggered = true; c.NoDarkNoise = true })
	up := r3.Vector{Z: 1}
	for i, c := range []struct {
		pdg        int
		ekin       float64
		light      bool
		fates      []phys.Fate
		secondarys bool
	}{
		{phys.ProtonCode, 2000, true, []phys.Fate{phys.Exited, phys.Stopped, phys.Interacted}, false},
		{phys.ProtonCode, 100, false, []phys.Fate{phys.Stopped, phys.Interacted}, false},
		{phys.PionPlusCode, 500, true, []phys.Fate{phys.Exited, phys.Interacted, phys.Absorbed, phys.DecayedInFlight, phys.StoppedDecayed}, true},
		{phys.PionMinusCode, 300, true, []phys.Fate{phys.Exited, phys.Interacted, phys.Absorbed, phys.DecayedInFlight, phys.StoppedCaptured}, true},
		{phys.NeutralPionCode, 300, true, []phys.Fate{phys.DecayedInFlight}, true},
		{phys.NeutronCode, 2, false, []phys.Fate{phys.Captured, phys.Exited}, true},
		{phys.MuonNeu, 500, false, []phys.Fate{phys.NotFollowed}, false},
	} {
		ev, err := s.Event(uint64(i+1), []phys.Particle{{PDG: c.pdg, Dir: up, Ekin: c.ekin}})
		if err != nil {
			t.Fatalf("PDG %d: %v", c.pdg, err)
		}
		tr := ev.Truth.Tracks[0]
		ok := false
		for _, f := range c.fates {
			ok = ok || tr.Fate == f
		}
		if !ok {
			t.Errorf("PDG %d, %g MeV: fate %v, want one of %v", c.pdg, c.ekin, tr.Fate, c.fates)
		}
		if got := tr.VisiblePhotons > 0; got != c.light && c.light {
			t.Errorf("PDG %d, %g MeV: %g visible photons", c.pdg, c.ekin, tr.VisiblePhotons)
		}
		if c.pdg == phys.ProtonCode && c.ekin == 100 && tr.Secondaries == 0 && tr.VisiblePhotons > 0 {
			t.Errorf("100 MeV proton with no secondaries made %g photons", tr.VisiblePhotons)
		}
		if c.secondarys && tr.Secondaries == 0 {
			t.Errorf("PDG %d, %g MeV: no secondaries", c.pdg, c.ekin)
		}
	}
}

// BenchmarkHadronEvent is the cost of whole events with hadrons on one
// core in the large tank, beside a 1 GeV muon (the floor of
// BenchmarkEvent): a charged-current single-pion-like final state of a
// 1 GeV neutrino (mu- 500 MeV, pi+ 250 MeV, proton 200 MeV kinetic, from
// one vertex at invented angles) and a 2 MeV neutron to its capture.
func BenchmarkHadronEvent(b *testing.B) {
	cfg := largeConfig(b)
	cfg.Workers = 1
	s, err := New(cfg)
	if err != nil {
		b.Fatal(err)
	}
	v := r3.Vector{X: -100}
	for _, c := range []struct {
		name  string
		prims []phys.Particle
	}{
		{"mu-1GeV", []phys.Particle{{PDG: phys.MuonMinus, Pos: v, Dir: r3.Vector{X: 0.6, Z: 0.8}, Ekin: 1000}}},
		{"cc1pi-1GeV", []phys.Particle{
			{PDG: phys.MuonMinus, Pos: v, Dir: r3.Vector{X: 0.6, Z: 0.8}, Ekin: 500},
			{PDG: phys.PionPlusCode, Pos: v, Dir: r3.Vector{X: 0.8, Y: 0.6}, Ekin: 250},
			{PDG: phys.ProtonCode, Pos: v, Dir: r3.Vector{Y: -0.6, Z: 0.8}, Ekin: 200},
		}},
		{"n-2MeV", []phys.Particle{{PDG: phys.NeutronCode, Pos: v, Dir: r3.Vector{Z: 1}, Ekin: 2}}},
	} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				if _, err := s.Event(uint64(i), c.prims); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "events/s")
		})
	}
}

// hadronGun makes a pi+, a pi-, a proton and a neutron of event-dependent
// energies from near the centre.
type hadronGun struct{}

func (hadronGun) String() string { return "hadron gun" }

func (hadronGun) Generate(n uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, gen.Info, error) {
	for _, pdg := range []int{phys.PionPlusCode, phys.PionMinusCode, phys.ProtonCode, phys.NeutronCode} {
		dir := phys.Deflect(r3.Vector{Z: 1}, 2*rng.Float64()-1, 6.283185307179586*rng.Float64())
		dst = append(dst, phys.Particle{PDG: pdg, Pos: r3.Vector{X: 20}, Dir: dir, Ekin: 50 + 400*rng.Float64()})
	}
	return dst, gen.Info{}, nil
}

// TestHadronRunWorkerIndependence: hadron events (pions, protons,
// neutrons to their capture) are bit-identical for 1 and 3 workers, so the
// hadron and neutron codes draw only from the event's stream.
func TestHadronRunWorkerIndependence(t *testing.T) {
	run := func(workers int) []*event.Event {
		s := demoSim(t, workers, func(c *Config) { c.KeepUntriggered = true })
		var evs []*event.Event
		if err := s.Run(context.Background(), hadronGun{}, RunOptions{Count: 12}, func(e *event.Event) error {
			evs = append(evs, e)
			return nil
		}); err != nil {
			t.Fatal(err)
		}
		return evs
	}
	a, b := run(1), run(3)
	if len(a) != 12 || !reflect.DeepEqual(a, b) {
		t.Fatalf("1 and 3 workers differ (%d vs %d events)", len(a), len(b))
	}
}
