package sim_test

import (
	"context"
	"fmt"
	"log"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
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
	// 400 MeV mu- from the centre, isotropic.
	gun, err := gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{{PDG: phys.MuonMinus, Ekin: gen.FixedEnergy(400), Direction: gen.Isotropic()}},
		Vertex:    gen.AtPoint(r3.Vector{}),
	})
	if err != nil {
		log.Fatal(err)
	}
	n := 0
	err = s.Run(context.Background(), gun, sim.RunOptions{Count: 20}, func(ev *event.Event) error {
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
