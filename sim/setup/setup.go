package setup

import (
	"embed"
	"fmt"
	"strings"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/optics"
)

// Setup is a complete detector description.
type Setup struct {
	// Name labels the description ("demo", "large", or the name a
	// description file gives); it is stored in event files.
	Name string
	// Detector is the tank and its sensors (required, at least one
	// sensor).
	Detector *geom.Detector
	// Sensor is the response of every sensor (required). Its
	// CathodeDiameter must equal the detector's.
	Sensor pmt.Model
	// Water is the water's optics. Nil means pure water at 20 C
	// (optics.DefaultWaterConfig); Check fills it in.
	Water *optics.Water
	// Liner is the wall between the sensors. Its zero value is a
	// perfectly black liner; the built-in tanks use optics.DefaultLiner.
	Liner optics.Liner
	// Dead lists the sensors out of service (indices into Detector, no
	// repeats): the simulator makes no hits on them and the fitters leave
	// them out of their likelihoods.
	Dead []int
	// Trigger decides which events are read out and the readout window
	// around the trigger time. The simulator requires a valid trigger;
	// the fitters use only its readout window.
	Trigger pmt.Trigger
}

// DefaultTrigger returns a trigger of 10 hits within 200 ns with a
// readout from 400 ns before to 1000 ns after the trigger time (common
// practice for a tank of a few thousand sensors whose dark hits number a
// few per microsecond).
func DefaultTrigger() pmt.Trigger {
	return pmt.Trigger{Threshold: 10, Window: 200, PreTrigger: 400, PostTrigger: 1000}
}

// Check validates s and fills in its documented defaults (the water). An
// error names the bad field and its value.
func (s *Setup) Check() error {
	if s.Detector == nil {
		return fmt.Errorf("setup: Setup.Detector is nil")
	}
	n := s.Detector.NumSensors()
	if n == 0 {
		return fmt.Errorf("setup: Setup.Detector has no sensors")
	}
	if err := s.Sensor.Validate(); err != nil {
		return fmt.Errorf("setup: Setup.Sensor: %w", err)
	}
	if d := s.Detector.CathodeDiameter(); s.Sensor.CathodeDiameter != d {
		return fmt.Errorf("setup: Setup.Sensor.CathodeDiameter = %g cm differs from the detector's %g cm", s.Sensor.CathodeDiameter, d)
	}
	if s.Water == nil {
		w, err := optics.NewWater(optics.DefaultWaterConfig())
		if err != nil {
			return fmt.Errorf("setup: default water: %w", err)
		}
		s.Water = w
	}
	if err := s.Liner.Validate(); err != nil {
		return fmt.Errorf("setup: Setup.Liner: %w", err)
	}
	seen := make(map[int]bool, len(s.Dead))
	for i, d := range s.Dead {
		if d < 0 || d >= n {
			return fmt.Errorf("setup: Setup.Dead[%d] = %d outside the detector's sensors [0, %d)", i, d, n)
		}
		if seen[d] {
			return fmt.Errorf("setup: Setup.Dead[%d] = %d is listed twice", i, d)
		}
		seen[d] = true
	}
	if len(s.Dead) == n {
		return fmt.Errorf("setup: Setup.Dead lists all %d sensors", n)
	}
	return nil
}

// CheckTrigger validates the trigger, which the simulator needs and the
// fitters do not.
func (s *Setup) CheckTrigger() error {
	if err := s.Trigger.Validate(); err != nil {
		return fmt.Errorf("setup: Setup.Trigger: %w", err)
	}
	return nil
}

// Demo returns the demo tank, read from the embedded description
// builtin/demo.toml: geom.DemoTank lined at 30% photocathode coverage with
// the medium sensor class, pure water at 20 C, the default liner and
// trigger. An invented scenario for examples and tests.
func Demo() (Setup, error) { return Builtin("demo") }

// Large returns the large reference tank, read from the embedded
// description builtin/large.toml: geom.LargeTank lined at 40% photocathode
// coverage with the large sensor class (about 11,000 sensors), pure water
// at 20 C, the default liner, and the default trigger raised to 25 hits:
// 11,000 sensors at 4 kHz give about 9 dark hits in the 200 ns window, so
// 10 hits would fire on noise. An invented scenario for studies and
// benchmarks.
func Large() (Setup, error) { return Builtin("large") }

//go:embed builtin/*.toml
var builtin embed.FS

// BuiltinNames returns the names Builtin accepts.
func BuiltinNames() []string {
	ents, _ := builtin.ReadDir("builtin")
	var names []string
	for _, e := range ents {
		names = append(names, strings.TrimSuffix(e.Name(), ".toml"))
	}
	return names
}

// Builtin returns the embedded description called name ("demo",
// "large"), read by the same parser as a user's file.
func Builtin(name string) (Setup, error) {
	path := "builtin/" + name + ".toml"
	data, err := builtin.ReadFile(path)
	if err != nil {
		return Setup{}, fmt.Errorf("setup: no built-in description %q (built-in: %s)", name, strings.Join(BuiltinNames(), ", "))
	}
	return parse(data, path, options{maxSensors: MaxSensors})
}

// ReadoutWindow returns the length (ns) of the readout window around a
// trigger: PreTrigger + PostTrigger.
func (s *Setup) ReadoutWindow() float64 {
	return s.Trigger.PreTrigger + s.Trigger.PostTrigger
}
