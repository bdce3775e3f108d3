package muon_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/phys"
)

func ExamplePhysics_StoppingPower() {
	p, err := muon.New(material.Water(), muon.Config{})
	if err != nil {
		panic(err)
	}
	s, err := p.StoppingPower(1000) // 1 GeV kinetic energy
	if err != nil {
		panic(err)
	}
	fmt.Printf("%.3f MeV cm2/g\n", s)
	// Output: 2.110 MeV cm2/g
}

func ExamplePhysics_CSDARange() {
	p, err := muon.New(material.Water(), muon.Config{})
	if err != nil {
		panic(err)
	}
	for _, ekin := range []float64{100, 1000} {
		r, err := p.CSDARange(ekin)
		if err != nil {
			panic(err)
		}
		fmt.Printf("%4.0f MeV: %.1f g/cm2\n", ekin, r)
	}
	// Output:
	//  100 MeV: 31.0 g/cm2
	// 1000 MeV: 470.6 g/cm2
}

// tank is a vertical cylinder of radius 10 m and height 20 m.
type tank struct{}

func (tank) Contains(p r3.Vector) bool {
	return p.X*p.X+p.Y*p.Y < 1000*1000 && p.Z > -1000 && p.Z < 1000
}

// counter counts what the transport reports.
type counter struct{ segments, secondaries int }

func (c *counter) Segment(phys.Segment)                     { c.segments++ }
func (c *counter) Secondary(phys.Particle)                  { c.secondaries++ }
func (c *counter) Deposit(r3.Vector, float64, float64, int) {}

func ExamplePhysics_Track() {
	p, err := muon.New(material.Water(), muon.Config{})
	if err != nil {
		panic(err)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	mu := phys.Particle{PDG: phys.MuonPlus, Dir: r3.Vector{Z: 1}, Ekin: 500, Track: 1}
	var c counter
	tr, err := p.Track(mu, tank{}, rng, &c)
	if err != nil {
		panic(err)
	}
	fmt.Println(tr.Fate)
	fmt.Printf("track length %.0f cm, decay positron %.1f MeV\n", tr.TrackLength, tr.Decay.Ekin)
	// Output:
	// stopped-decayed
	// track length 226 cm, decay positron 38.9 MeV
}
