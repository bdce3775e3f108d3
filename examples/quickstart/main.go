// Command quickstart is the README's first program: simulate 10 MeV
// electrons in the demo tank and reconstruct them.
package main

import (
	"fmt"
	"log"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/phys"
)

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "quickstart",
	Does:    "The README's first program: simulates five 10 MeV electrons in the demo tank and reconstructs them.",
	Reads:   "nothing",
	Writes:  "one line per event on standard output",
	Example: "go run ./examples/quickstart",
}

func main() {
	cli.Parse(usage)
	cfg, err := sim.DemoConfig(2026) // demo tank, 30% coverage of 20 cm sensors, pure water
	if err != nil {
		log.Fatal(err)
	}
	s, err := sim.New(cfg)
	if err != nil {
		log.Fatal(err)
	}
	f, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup})
	if err != nil {
		log.Fatal(err)
	}
	start := r3.Vector{X: 150, Y: -80, Z: 200} // cm
	for n := uint64(0); n < 5; n++ {
		ev, err := s.Event(n, []phys.Particle{{PDG: phys.Electron, Pos: start, Dir: r3.Vector{Z: 1}, Ekin: 10}})
		if err != nil {
			log.Fatal(err)
		}
		r, err := f.Fit(ev.Hits)
		if err != nil || r.Status != fit.Converged {
			fmt.Println("event", n, "not reconstructed:", err, r.Reason)
			continue
		}
		fmt.Printf("event %d: %3d hits, vertex off by %5.1f cm, direction off by %4.1f deg, E = %4.1f +- %3.1f MeV\n",
			n, len(ev.Hits), r.Track.Vertex.Sub(start).Norm(), r.Track.Dir.Angle(r3.Vector{Z: 1}).Degrees(), r.Track.Ekin, r.Errors.Ekin)
	}
}
