package main

import (
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/phys"
)

// Cost per event in the demo tank (one core, sim.Event with the demo
// configuration: dark noise over the signal span and readout margins).
// The floor is a 10 MeV electron at the centre, the simulator's cheapest
// whole event; report the others as ratios to it:
//
//	go test -run '^$' -bench . -benchmem ./examples/hadronstudy
func benchEvents(b *testing.B, gd float64, noDark bool, prims func(i int) []phys.Particle) {
	s, err := detflag.Load("")
	if err != nil {
		b.Fatal(err)
	}
	s.GdMassFraction = gd
	cfg := detflag.SimConfig(s, 1)
	cfg.NoDarkNoise, cfg.Workers = noDark, 1
	sm, err := sim.New(cfg)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	failed := 0
	for i := 0; i < b.N; i++ {
		if _, err := sm.Event(uint64(i), prims(i)); err != nil {
			// Counted, not fatal, and logged so that it cannot go
			// unseen: a benchmark must not hide a failing event.
			failed++
			b.Log(err)
		}
	}
	b.ReportMetric(float64(failed)/float64(b.N), "failed/op")
}

func BenchmarkFloorElectron10MeV(b *testing.B) {
	benchEvents(b, 0, false, func(int) []phys.Particle {
		return []phys.Particle{{PDG: phys.Electron, Ekin: 10, Dir: r3.Vector{Z: 1}}}
	})
}

// BenchmarkCCPionLike: the study's mu- 500 MeV + pi+ 200 MeV + p 150 MeV.
func BenchmarkCCPionLike(b *testing.B) {
	s, err := detflag.Load("")
	if err != nil {
		b.Fatal(err)
	}
	g, err := ccPionGun(s)
	if err != nil {
		b.Fatal(err)
	}
	benchEvents(b, 0, false, func(i int) []phys.Particle {
		p, _, err := g.Generate(uint64(i), sim.EventStream(7, uint64(i)), nil)
		if err != nil {
			b.Fatal(err)
		}
		return p
	})
}

func neutron(int) []phys.Particle {
	return []phys.Particle{{PDG: phys.NeutronCode, Ekin: 2, Dir: r3.Vector{Z: 1}}}
}

// BenchmarkNeutronCapture: a 2 MeV neutron to its capture in pure water
// (about 200 us later: the dark noise of that span is most of the cost),
// without dark noise, and in 0.1% Gd water.
func BenchmarkNeutronCapture(b *testing.B)       { benchEvents(b, 0, false, neutron) }
func BenchmarkNeutronCaptureNoDark(b *testing.B) { benchEvents(b, 0, true, neutron) }
func BenchmarkNeutronCaptureGd(b *testing.B)     { benchEvents(b, 0.001, false, neutron) }
