package ring_test

import (
	"fmt"
	"log"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/ring"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
)

// Example simulates a 600 MeV/c muon in the demo tank and reconstructs it
// under both hypotheses.
func Example() {
	cfg, err := sim.DemoConfig(1)
	if err != nil {
		log.Fatal(err)
	}
	s, err := sim.New(cfg)
	if err != nil {
		log.Fatal(err)
	}
	mu := phys.Particle{PDG: phys.MuonMinus, Pos: r3.Vector{X: -150, Z: -100}, Dir: r3.Vector{X: 0.8, Z: 0.6},
		Ekin: phys.KineticFromMomentum(600, phys.MuonMass)}
	ev, err := s.Event(1, []phys.Particle{mu})
	if err != nil {
		log.Fatal(err)
	}
	c := s.Config()
	f, err := ring.New(ring.Config{Setup: c.Setup, SkipUncertainties: true})
	if err != nil {
		log.Fatal(err)
	}
	rec, err := f.Fit(ev.Hits, ring.Window{})
	if err != nil {
		log.Fatal(err)
	}
	best := ring.PIDCut{}.Best(&rec)
	fmt.Println("identified as:", best.Hypothesis)
	fmt.Println("converged:", best.Status == fit.Converged)
	fmt.Println("momentum within 10%:", best.Momentum > 540 && best.Momentum < 660)
	fmt.Println("vertex within 50 cm:", best.Track.Vertex.Sub(mu.Pos).Norm() < 50)
	// Output:
	// identified as: muon
	// converged: true
	// momentum within 10%: true
	// vertex within 50 cm: true
}

// ExampleFitter_EkinRange builds a fitter for the demo tank with two
// sensors out of service and prints the kinetic-energy range of each
// hypothesis: a caller sends events to the ring fitter by it instead of
// hard-coding a boundary.
func ExampleFitter_EkinRange() {
	s, err := setup.Demo()
	if err != nil {
		log.Fatal(err)
	}
	s.Dead = []int{12, 345}
	f, err := ring.New(ring.Config{Setup: s})
	if err != nil {
		log.Fatal(err)
	}
	for _, h := range []ring.Hypothesis{ring.Electron, ring.Muon} {
		lo, hi := f.EkinRange(h)
		fmt.Printf("%v: %g to %g MeV\n", h, lo, hi)
	}
	// Output:
	// electron: 20 to 3000 MeV
	// muon: 65 to 3000 MeV
}
