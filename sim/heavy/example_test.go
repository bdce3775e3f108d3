package heavy_test

import (
	"fmt"

	"github.com/conelight/conelight/sim/heavy"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

func ExampleNew() {
	// The same Bethe tables for a muon and a pion at the same beta gamma:
	// the ranges scale with the mass.
	mu, err := heavy.New(material.Water(), heavy.Muon(), heavy.Config{})
	if err != nil {
		panic(err)
	}
	pi, err := heavy.New(material.Water(), heavy.ChargedPion(), heavy.Config{})
	if err != nil {
		panic(err)
	}
	rMu, _ := mu.CSDARange(100)
	rPi, _ := pi.CSDARange(100 * phys.PionMass / phys.MuonMass)
	fmt.Printf("muon %.1f g/cm2, pion %.1f g/cm2, ratio %.3f (mass ratio %.3f)\n", rMu, rPi, rPi/rMu, phys.PionMass/phys.MuonMass)
	// Output: muon 31.0 g/cm2, pion 41.0 g/cm2, ratio 1.321 (mass ratio 1.321)
}
