package hadron_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/hadron"
	"github.com/conelight/conelight/sim/heavy"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

// tank is a sphere of radius 10 m.
type tank struct{}

func (tank) Contains(p r3.Vector) bool { return p.Norm2() < 1000*1000 }

// products counts the particles an interaction or decay reports.
type products map[int]int

func (c products) Segment(phys.Segment)                     {}
func (c products) Secondary(p phys.Particle)                { c[p.PDG]++ }
func (c products) Deposit(r3.Vector, float64, float64, int) {}

func ExamplePhysics_TrackPion() {
	p, err := hadron.New(material.Water(), heavy.Config{})
	if err != nil {
		panic(err)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	// A pi+ at rest decays to a 4.12 MeV mu+.
	c := products{}
	tr, err := p.TrackPion(phys.Particle{PDG: phys.PionPlusCode, Dir: r3.Vector{Z: 1}, Track: 1}, tank{}, rng, c)
	if err != nil {
		panic(err)
	}
	fmt.Println(tr.Fate, c[phys.MuonPlus], "mu+")
	// A pi- at rest is absorbed by oxygen: two neutrons.
	c = products{}
	tr, err = p.TrackPion(phys.Particle{PDG: phys.PionMinusCode, Dir: r3.Vector{Z: 1}, Track: 1}, tank{}, rng, c)
	if err != nil {
		panic(err)
	}
	fmt.Println(tr.Fate, c[phys.NeutronCode], "neutrons")
	// Output:
	// stopped-decayed 1 mu+
	// stopped-captured 2 neutrons
}

func ExampleDecayPiZero() {
	rng := rand.New(rand.NewPCG(3, 4))
	c := products{}
	n, dalitz := hadron.DecayPiZero(phys.Particle{PDG: phys.NeutralPionCode, Dir: r3.Vector{Z: 1}, Ekin: 200, Track: 1}, rng, c)
	fmt.Println(n, dalitz, c[phys.Gamma], "photons")
	// Output: 2 false 2 photons
}
