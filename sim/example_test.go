package sim_test

import (
	"context"
	"fmt"
	"log"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/phys"
)

// One 10 MeV electron at the centre of the demo tank.
func ExampleSimulator_Event() {
	cfg, err := sim.DemoConfig(2026)
	if err != nil {
		log.Fatal(err)
	}
	s, err := sim.New(cfg)
	if err != nil {
		log.Fatal(err)
	}
	ev, err := s.Event(0, []phys.Particle{{PDG: phys.Electron, Dir: r3.Vector{Z: 1}, Ekin: 10}})
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("triggered:", ev.Truth.Triggered)
	fmt.Println("between 30 and 100 signal photoelectrons:", ev.Truth.Photoelectrons > 30 && ev.Truth.Photoelectrons < 100)
	// Output:
	// triggered: true
	// between 30 and 100 signal photoelectrons: true
}

// muonGun makes one 400 MeV mu- per event from the centre, isotropic.
type muonGun struct{}

func (muonGun) Generate(_ uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, error) {
	dir := r3.Vector{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}.Normalize()
	return append(dst, phys.Particle{PDG: phys.MuonMinus, Dir: dir, Ekin: 400}), nil
}

// A run of 20 events on all cores, streamed in event order.
func ExampleSimulator_Run() {
	cfg, err := sim.DemoConfig(7)
	if err != nil {
		log.Fatal(err)
	}
	s, err := sim.New(cfg)
	if err != nil {
		log.Fatal(err)
	}
	n := 0
	err = s.Run(context.Background(), muonGun{}, sim.RunOptions{Count: 20}, func(ev *event.Event) error {
		n++
		return nil
	})
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("events kept:", n)
	// Output:
	// events kept: 20
}
