// Command quickstart is the README's first program: read a detector
// description file, simulate five 10 MeV electrons in that tank and
// reconstruct them with the low-energy fitter.
//
//	go run ./examples/quickstart
//	go run ./examples/quickstart -detector testdata/setup/example.toml
package main

import (
	"flag"
	"fmt"
	"log"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
)

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "quickstart",
	Does:    "The README's first program: reads a detector description file, simulates five 10 MeV electrons in that tank and reconstructs them.",
	Reads:   "the detector description file -detector (TOML)",
	Writes:  "one line per event on standard output",
	Example: "go run ./examples/quickstart -detector testdata/setup/example.toml",
}

func main() {
	path := flag.String("detector", "sim/setup/builtin/demo.toml", "detector description file (TOML; testdata/setup/example.toml shows every key)")
	cli.Parse(usage)
	tank, err := setup.Load(*path) // tank, sensors, layout, water, liner, trigger
	if err != nil {
		log.Fatal(err)
	}
	s, err := sim.New(sim.Config{Setup: tank, Seed: 2026})
	if err != nil {
		log.Fatal(err)
	}
	f, err := lowenergy.New(lowenergy.Config{Setup: tank})
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
