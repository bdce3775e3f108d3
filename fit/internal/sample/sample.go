// Package sample simulates the electron samples the fit tables and the
// fit tests are made from: electrons uniform in a fiducial volume with
// isotropic directions, in the demo tank or the large reference tank. The
// primaries come from the simulator's own samplers (gen.InFiducial,
// gen.Isotropic) drawn from the event's own stream through sim.Run, so a
// sample is exactly what a user's run with those samplers makes.
// It imports the simulator, so only tests, examples and the table
// generator use it; the fitters themselves do not.
package sample

import (
	"context"
	"fmt"
	"math/rand/v2"

	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
)

// LargeConfig is the large reference tank lined at 40% coverage with the
// large sensor class, pure water, the default liner and trigger
// (sim.LargeConfig with the 10-hit default trigger).
func LargeConfig(seed uint64) (sim.Config, error) {
	cfg, err := sim.LargeConfig(seed)
	// The embedded large-tank tables were made with the default 10-hit
	// trigger, not sim.LargeConfig's 25 hits; keep them reproducible.
	cfg.Trigger = setup.DefaultTrigger()
	return cfg, err
}

// electrons is a gen.Generator of one electron per event: vertex from
// gen.InFiducial, direction from gen.Isotropic, kinetic energy
// energy(number - first).
type electrons struct {
	vertex gen.VertexDist
	dir    gen.DirDist
	first  uint64
	energy func(i int) float64
}

func (g electrons) String() string {
	return fmt.Sprintf("electrons: %v, %v", g.vertex, g.dir)
}

func (g electrons) Generate(number uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, gen.Info, error) {
	p := phys.Particle{PDG: phys.Electron, Pos: g.vertex.Sample(rng), Dir: g.dir.Sample(rng), Ekin: g.energy(int(number - g.first))}
	return append(dst[:0], p), gen.Info{}, nil
}

// Simulate runs events first..first+n-1 of electrons with energies
// energy(i) (i = event number - first), uniform at least fid cm inside
// the sensor surface with isotropic directions, on cfg.Workers
// goroutines. Every event is returned, triggered or not (Truth.Triggered
// says which), in event-number order; the sample does not depend on the
// number of workers.
func Simulate(cfg sim.Config, fid float64, first uint64, n int, energy func(i int) float64) ([]*event.Event, error) {
	cfg.KeepUntriggered = true
	s, err := sim.New(cfg)
	if err != nil {
		return nil, err
	}
	vd := gen.InFiducial(cfg.Detector.Tank(), fid)
	if err := vd.Validate(); err != nil {
		return nil, fmt.Errorf("sample: %w", err)
	}
	g := electrons{vertex: vd, dir: gen.Isotropic(), first: first, energy: energy}
	evs := make([]*event.Event, 0, n)
	err = s.Run(context.Background(), g, sim.RunOptions{First: first, Count: uint64(n)}, func(ev *event.Event) error {
		evs = append(evs, ev)
		return nil
	})
	if err != nil {
		return nil, err
	}
	if len(evs) != n {
		return nil, fmt.Errorf("sample: %d of %d events simulated", len(evs), n)
	}
	return evs, nil
}
