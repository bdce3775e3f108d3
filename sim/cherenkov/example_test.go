package cherenkov_test

import (
	"fmt"
	"log"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

func ExampleEmitter_YieldPerCm() {
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		log.Fatal(err)
	}
	e, err := cherenkov.NewEmitter(w, 300, 600, 1)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("threshold beta %.4f, max angle %.1f deg\n", e.Threshold(), e.MaxAngle()*180/math.Pi)
	for _, beta := range []float64{1, 0.9, 0.8} {
		fmt.Printf("beta %.1f: %.1f photons/cm\n", beta, e.YieldPerCm(beta))
	}
	// Output:
	// threshold beta 0.7357, max angle 42.6 deg
	// beta 1.0: 341.3 photons/cm
	// beta 0.9: 242.2 photons/cm
	// beta 0.8: 103.5 photons/cm
}

func ExampleEmitter_Emit() {
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		log.Fatal(err)
	}
	// Keep 30% of the photons: the best detection efficiency of the sensors.
	e, err := cherenkov.NewEmitter(w, 250, 700, 0.3)
	if err != nil {
		log.Fatal(err)
	}
	seg := phys.Segment{
		Start: r3.Vector{}, End: r3.Vector{X: 0, Y: 0, Z: 1},
		T0: 0, T1: 1 / phys.SpeedOfLight, Beta0: 1, Beta1: 1, Charge: -1, PDG: phys.MuonMinus,
	}
	mean, _ := e.MeanPhotons(seg)
	rng := rand.New(rand.NewPCG(1, 2))
	photons, err := e.Emit(seg, rng, nil)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("mean %.1f photons; emitted %d\n", mean, len(photons))
	_, err = e.Emit(phys.Segment{Beta0: 1.2, Beta1: 1}, rng, nil)
	fmt.Println(err)
	// Output:
	// mean 159.4 photons; emitted 166
	// cherenkov: Segment.Beta0 = 1.2 must lie in [0, 1]
}
