package neutron_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/hadron"
	"github.com/conelight/conelight/sim/heavy"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/neutron"
	"github.com/conelight/conelight/sim/phys"
)

// tank is a sphere of radius 10 m.
type tank struct{}

func (tank) Contains(p r3.Vector) bool { return p.Norm2() < 1000*1000 }

type gammas struct{ energies []float64 }

func (g *gammas) Segment(phys.Segment) {}
func (g *gammas) Secondary(p phys.Particle) {
	if p.PDG == phys.Gamma {
		g.energies = append(g.energies, p.Ekin)
	}
}
func (g *gammas) Deposit(r3.Vector, float64, float64, int) {}

func ExamplePhysics_Track() {
	had, err := hadron.New(material.Water(), heavy.Config{})
	if err != nil {
		panic(err)
	}
	p, err := neutron.New(material.Water(), had, neutron.Config{})
	if err != nil {
		panic(err)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	var g gammas
	tr, err := p.Track(phys.Particle{PDG: phys.NeutronCode, Dir: r3.Vector{Z: 1}, Ekin: 2, Track: 1}, tank{}, rng, &g)
	if err != nil {
		panic(err)
	}
	fmt.Printf("%v on Z = %d, gamma %.4f MeV\n", tr.Fate, tr.Target, g.energies[len(g.energies)-1])
	// Output: captured on Z = 1, gamma 2.2246 MeV
}
