package lowenergy_test

import (
	"fmt"
	"log"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
)

// Fit a simulated 10 MeV electron in the demo tank.
func Example() {
	cfg, err := sim.DemoConfig(42)
	if err != nil {
		log.Fatal(err)
	}
	s, err := sim.New(cfg)
	if err != nil {
		log.Fatal(err)
	}
	start := r3.Vector{X: 100, Y: -50, Z: 200}
	ev, err := s.Event(1, []phys.Particle{{PDG: phys.Electron, Pos: start, Dir: r3.Vector{X: 1}, Ekin: 10}})
	if err != nil {
		log.Fatal(err)
	}
	f, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup})
	if err != nil {
		log.Fatal(err)
	}
	r, err := f.Fit(ev.Hits)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("status:", r.Status)
	fmt.Println("vertex within 1 m:", r.Track.Vertex.Sub(start).Norm() < 100)
	fmt.Println("direction within 60 degrees:", r.Track.Dir.Angle(r3.Vector{X: 1}).Degrees() < 60)
	fmt.Println("energy within 5-15 MeV:", r.Track.Ekin > 5 && r.Track.Ekin < 15)
	// Output:
	// status: converged
	// vertex within 1 m: true
	// direction within 60 degrees: true
	// energy within 5-15 MeV: true
}

// Build a fitter from the demo detector description, with two sensors out
// of service, and ask for the energy range its calibration covers.
func ExampleFitter_EkinRange() {
	s, err := setup.Demo()
	if err != nil {
		log.Fatal(err)
	}
	s.Dead = []int{12, 345}
	f, err := lowenergy.New(lowenergy.Config{Setup: s})
	if err != nil {
		log.Fatal(err)
	}
	lo, hi := f.EkinRange()
	fmt.Printf("tables %q, calibrated from %g to %g MeV\n", f.Tables().Name, lo, hi)
	// Output:
	// tables "demo", calibrated from 3 to 100 MeV
}
