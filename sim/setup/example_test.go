package setup_test

import (
	"fmt"
	"log"

	"github.com/conelight/conelight/sim/setup"
)

// A tank described in a few lines: the medium sensor preset with a faster
// timing edit, 25% coverage, slightly murky water.
func ExampleParse() {
	const text = `
name = "pool"

[tank]
vessel_radius_cm = 400
vessel_height_cm = 800
sensor_offset_cm = 50

[sensor]
preset = "Medium"
tts_sigma_ns = 1.0

[layout]
coverage = 0.25

[water]
attenuation_length_cm = 6000
attenuation_wavelength_nm = 420
`
	s, err := setup.Parse([]byte(text), "pool.toml")
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%s: %d sensors of %q, coverage %.3f\n", s.Name, s.Detector.NumSensors(), s.Sensor.Name, s.Detector.Coverage())
	// Output:
	// pool: 1782 sensors of "Medium (edited)", coverage 0.250
}

// An unknown key is an error that names it, its line and the keys allowed
// there.
func ExampleParse_error() {
	const text = `[tank]
vessel_radius_m = 4
`
	_, err := setup.Parse([]byte(text), "pool.toml")
	fmt.Println(err)
	// Output:
	// setup: pool.toml line 2: tank.vessel_radius_m: unknown key; did you mean vessel_radius_cm (the unit is part of the name)? [tank] takes vessel_radius_cm, vessel_height_cm, sensor_offset_cm
}
