package setup

import (
	"fmt"

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

// Demo returns the demo tank (geom.DemoTank) lined at 30% photocathode
// coverage with the medium sensor class, pure water at 20 C, the default
// liner and trigger: an invented scenario for examples and tests.
func Demo() (Setup, error) {
	return pureWater("demo", geom.DemoTank(), pmt.Medium(), 0.30, DefaultTrigger())
}

// Large returns the large reference tank (geom.LargeTank) lined at 40%
// photocathode coverage with the large sensor class (about 11,000
// sensors), pure water at 20 C, the default liner, and the default
// trigger raised to 25 hits: 11,000 sensors at 4 kHz give about 9 dark
// hits in the 200 ns window, so 10 hits would fire on noise. An invented
// scenario for studies and benchmarks.
func Large() (Setup, error) {
	trig := DefaultTrigger()
	trig.Threshold = 25
	return pureWater("large", geom.LargeTank(), pmt.Large(), 0.40, trig)
}

// pureWater lines tank at the given coverage with sensors of model m and
// fills it with pure water at 20 C behind the default liner.
func pureWater(name string, tank geom.Tank, m pmt.Model, coverage float64, trig pmt.Trigger) (Setup, error) {
	det, err := geom.Layout(tank, m.CathodeDiameter, coverage)
	if err != nil {
		return Setup{}, err
	}
	s := Setup{Name: name, Detector: det, Sensor: m, Liner: optics.DefaultLiner(), Trigger: trig}
	if err := s.Check(); err != nil {
		return Setup{}, err
	}
	return s, nil
}

// ReadoutWindow returns the length (ns) of the readout window around a
// trigger: PreTrigger + PostTrigger.
func (s *Setup) ReadoutWindow() float64 {
	return s.Trigger.PreTrigger + s.Trigger.PostTrigger
}
