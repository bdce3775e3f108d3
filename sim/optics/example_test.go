package optics_test

import (
	"fmt"
	"log"

	"github.com/conelight/conelight/sim/optics"
)

func ExampleRefractiveIndex() {
	n, err := optics.RefractiveIndex(589.3, 20)
	if err != nil {
		log.Fatal(err)
	}
	ng, _ := optics.GroupIndex(589.3, 20)
	fmt.Printf("n = %.5f, n_g = %.5f (relative to vacuum)\n", n, ng)
	// Output: n = 1.33335, n_g = 1.35167 (relative to vacuum)
}

func ExampleNewWater() {
	cfg := optics.DefaultWaterConfig()
	// Tank water: 80 m attenuation length at 420 nm sets the absorption.
	cfg.AttenuationLength, cfg.AttenuationWavelength = 8000, 420
	w, err := optics.NewWater(cfg)
	if err != nil {
		log.Fatal(err)
	}
	for _, l := range []float64{350, 420, 550} {
		fmt.Printf("%3.0f nm: absorption %6.0f cm, Rayleigh %6.0f cm, group velocity %.3f cm/ns\n",
			l, w.AbsorptionLength(l), w.RayleighLength(l), w.GroupVelocity(l))
	}
	fmt.Printf("absorption scale %.2f\n", w.AbsorptionScale())
	_, err = w.At(800)
	fmt.Println(err)
	// Output:
	// 350 nm: absorption   1260 cm, Rayleigh   9649 cm, group velocity 21.394 cm/ns
	// 420 nm: absorption  12845 cm, Rayleigh  21210 cm, group velocity 21.788 cm/ns
	// 550 nm: absorption   1032 cm, Rayleigh  67993 cm, group velocity 22.124 cm/ns
	// absorption scale 1.71
	// optics: wavelength 800 nm outside the water band 250..700 nm
}
