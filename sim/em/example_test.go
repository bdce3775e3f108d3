package em_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

func ExamplePhysics_CollisionStoppingPower() {
	p, err := em.New(material.Water(), em.DefaultConfig())
	if err != nil {
		fmt.Println(err)
		return
	}
	s, _ := p.CollisionStoppingPower(phys.Electron, 10)
	r, _ := p.CSDARange(phys.Electron, 10)
	fmt.Printf("10 MeV e- in water: %.2f MeV cm2/g, CSDA range %.2f g/cm2\n", s, r)
	// Output:
	// 10 MeV e- in water: 1.98 MeV cm2/g, CSDA range 4.96 g/cm2
}

// lengthSink adds up the track length of the reported segments.
type lengthSink struct{ length, deposited float64 }

func (s *lengthSink) Segment(seg phys.Segment)                 { s.length += seg.Length() }
func (s *lengthSink) Secondary(phys.Particle)                  {}
func (s *lengthSink) Deposit(_ r3.Vector, _, e float64, _ int) { s.deposited += e }
func (infinite) Contains(r3.Vector) bool                       { return true }

type infinite struct{}

func ExamplePhysics_Shower() {
	p, err := em.New(material.Water(), em.DefaultConfig())
	if err != nil {
		fmt.Println(err)
		return
	}
	rng := rand.New(rand.NewPCG(1, 2))
	e := phys.Particle{PDG: phys.Electron, Dir: r3.Vector{Z: 1}, Ekin: 100}
	var sink lengthSink
	if err := p.Shower(e, infinite{}, rng, &sink); err != nil {
		fmt.Println(err)
		return
	}
	// All the kinetic energy ends up deposited; the track length above
	// the Cherenkov threshold is about 0.52 cm per MeV (it fluctuates by a
	// few percent from shower to shower).
	fmt.Printf("deposited %.1f MeV, track length 40-65 cm: %v\n",
		sink.deposited, sink.length > 40 && sink.length < 65)
	// Output:
	// deposited 100.0 MeV, track length 40-65 cm: true
}
