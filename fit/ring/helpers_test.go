package ring

import (
	"sync"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/phys"
)

// demoSetup is the demo tank simulator and a fitter for the same
// detector, built once for all tests.
type demoSetup struct {
	sim *sim.Simulator
	fit *Fitter
	cfg sim.Config
}

var (
	demoOnce sync.Once
	demo     demoSetup
	demoErr  error
)

func demoTank(t testing.TB) demoSetup {
	t.Helper()
	demoOnce.Do(func() {
		cfg, err := sim.DemoConfig(7)
		if err != nil {
			demoErr = err
			return
		}
		s, err := sim.New(cfg)
		if err != nil {
			demoErr = err
			return
		}
		cfg = s.Config()
		f, err := New(Config{Setup: cfg.Setup})
		if err != nil {
			demoErr = err
			return
		}
		demo = demoSetup{sim: s, fit: f, cfg: cfg}
	})
	if demoErr != nil {
		t.Fatal(demoErr)
	}
	return demo
}

func simulate(t testing.TB, s *sim.Simulator, number uint64, pdg int, pos, dir r3.Vector, ekin float64) *event.Event {
	t.Helper()
	ev, err := s.Event(number, []phys.Particle{{PDG: pdg, Pos: pos, Dir: dir, Ekin: ekin}})
	if err != nil {
		t.Fatal(err)
	}
	return ev
}
