package ring_test

import (
	"fmt"
	"log"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/ring"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/phys"
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
