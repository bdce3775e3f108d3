// Package sample simulates the electron samples the fit tables and the
// fit tests are made from: electrons uniform in a fiducial volume with
// isotropic directions, in the demo tank or the large reference tank.
// It imports the simulator, so only tests and the table generator use it;
// package fit itself does not.
package sample

import (
	"math"
	"math/rand/v2"
	"runtime"
	"sync"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
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

// Electron draws an electron of kinetic energy e (MeV) uniform in the
// volume fid cm inside the sensor surface, with an isotropic direction.
func Electron(rng *rand.Rand, tank geom.Tank, fid, e float64) phys.Particle {
	r := tank.SensorRadius() - fid
	h := tank.SensorHalfHeight() - fid
	var p r3.Vector
	for {
		p = r3.Vector{X: (2*rng.Float64() - 1) * r, Y: (2*rng.Float64() - 1) * r, Z: (2*rng.Float64() - 1) * h}
		if math.Hypot(p.X, p.Y) <= r {
			break
		}
	}
	cz := 2*rng.Float64() - 1
	phi := 2 * math.Pi * rng.Float64()
	sz := math.Sqrt(1 - cz*cz)
	return phys.Particle{PDG: phys.Electron, Pos: p, Dir: r3.Vector{X: sz * math.Cos(phi), Y: sz * math.Sin(phi), Z: cz}, Ekin: e}
}

// Simulate runs events first..first+n-1 of electrons with energies
// energy(i) on all cores. Event number k draws its electron from the
// stream PCG(cfg.Seed, k) and is simulated with the simulator's own
// stream for (cfg.Seed, k), so the sample does not depend on the number
// of cores.
func Simulate(cfg sim.Config, fid float64, first uint64, n int, energy func(i int) float64) ([]*event.Event, error) {
	s, err := sim.New(cfg)
	if err != nil {
		return nil, err
	}
	evs := make([]*event.Event, n)
	errs := make([]error, n)
	var wg sync.WaitGroup
	next := make(chan int)
	for range runtime.GOMAXPROCS(0) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				num := first + uint64(i)
				rng := rand.New(rand.NewPCG(cfg.Seed, num))
				p := Electron(rng, cfg.Detector.Tank(), fid, energy(i))
				evs[i], errs[i] = s.Event(num, []phys.Particle{p})
			}
		}()
	}
	for i := range n {
		next <- i
	}
	close(next)
	wg.Wait()
	for _, e := range errs {
		if e != nil {
			return nil, e
		}
	}
	return evs, nil
}
