package sim

import (
	"fmt"
	"runtime"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/optics"
)

// Config describes a simulation: the detector, its sensors and water, the
// trigger, the transport settings and the run seed.
type Config struct {
	// Detector is the tank and its sensors.
	Detector *geom.Detector
	// Sensor is the response of every sensor.
	Sensor pmt.Model
	// Water is the water's optics. Nil means optics.DefaultWaterConfig().
	Water *optics.Water
	// Liner is the wall between the sensors.
	Liner optics.Liner
	// Trigger decides which events are read out and the readout window.
	Trigger pmt.Trigger
	// EM and Muon are the transport settings; zero values mean
	// em.DefaultConfig() and muon.DefaultConfig(). Their Cherenkov
	// threshold index is set from the water (the largest index of the
	// sensors' band) unless given.
	EM   em.Config
	Muon muon.Config
	// NoDarkNoise switches dark pulses off.
	NoDarkNoise bool
	// TraceAllPhotons switches photon pre-scaling off: every Cherenkov
	// photon is traced and detection is decided at the sensor alone. The
	// results have the same distribution, at several times the cost.
	TraceAllPhotons bool
	// KeepUntriggered keeps events that do not trigger (with all their
	// hits and Triggered = false); otherwise Run drops them.
	KeepUntriggered bool
	// Seed is the run seed; with the event number it fixes every random
	// draw of an event (EventStream).
	Seed uint64
	// Workers is the number of goroutines of Run; 0 means GOMAXPROCS.
	Workers int
}

// DefaultTrigger returns a trigger of 10 hits within 200 ns with a
// readout from 400 ns before to 1000 ns after the trigger time (common
// practice for a tank of a few thousand sensors whose dark hits number a
// few per microsecond).
func DefaultTrigger() pmt.Trigger {
	return pmt.Trigger{Threshold: 10, Window: 200, PreTrigger: 400, PostTrigger: 1000}
}

// DemoConfig returns the demo tank (geom.DemoTank) lined at 30%
// photocathode coverage with the medium sensor class, pure water at 20 C,
// the default liner and trigger, and the given seed: an invented scenario
// for examples and tests.
func DemoConfig(seed uint64) (Config, error) {
	return pureWaterConfig(geom.DemoTank(), pmt.Medium(), 0.30, DefaultTrigger(), seed)
}

// LargeConfig returns the large reference tank (geom.LargeTank) lined at
// 40% photocathode coverage with the large sensor class (about 11,000
// sensors), pure water at 20 C, the default liner, and the default trigger
// raised to 25 hits: 11,000 sensors at 4 kHz give about 9 dark hits in
// the 200 ns window, so 10 hits would fire on noise. An invented scenario
// for studies and benchmarks.
func LargeConfig(seed uint64) (Config, error) {
	trig := DefaultTrigger()
	trig.Threshold = 25
	return pureWaterConfig(geom.LargeTank(), pmt.Large(), 0.40, trig, seed)
}

// pureWaterConfig lines tank at the given coverage with sensors of model
// m and fills it with pure water at 20 C behind the default liner.
func pureWaterConfig(tank geom.Tank, m pmt.Model, coverage float64, trig pmt.Trigger, seed uint64) (Config, error) {
	det, err := geom.Layout(tank, m.CathodeDiameter, coverage)
	if err != nil {
		return Config{}, err
	}
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		return Config{}, err
	}
	return Config{Detector: det, Sensor: m, Water: w, Liner: optics.DefaultLiner(), Trigger: trig, Seed: seed}, nil
}

func (c *Config) validate() error {
	if c.Detector == nil || c.Detector.NumSensors() == 0 {
		return fmt.Errorf("sim: Config.Detector is nil or has no sensors")
	}
	if err := c.Sensor.Validate(); err != nil {
		return fmt.Errorf("sim: Config.Sensor: %w", err)
	}
	if c.Sensor.CathodeDiameter != c.Detector.CathodeDiameter() {
		return fmt.Errorf("sim: Config.Sensor.CathodeDiameter = %g cm differs from the detector's %g cm",
			c.Sensor.CathodeDiameter, c.Detector.CathodeDiameter())
	}
	if err := c.Liner.Validate(); err != nil {
		return fmt.Errorf("sim: Config.Liner: %w", err)
	}
	if err := c.Trigger.Validate(); err != nil {
		return fmt.Errorf("sim: Config.Trigger: %w", err)
	}
	if c.Workers < 0 {
		return fmt.Errorf("sim: Config.Workers = %d must not be negative", c.Workers)
	}
	if c.Workers == 0 {
		c.Workers = runtime.GOMAXPROCS(0)
	}
	return nil
}
