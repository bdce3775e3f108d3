package sim

import (
	"fmt"
	"runtime"

	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/setup"
)

// Config describes a simulation: the detector description (the same
// setup.Setup the fitters take: detector, sensor model, water, liner, dead
// sensors, trigger), the transport settings and the run seed.
type Config struct {
	// Setup is the detector description; its defaults (the water) are
	// setup.Setup.Check's, and the simulator also requires a valid
	// Trigger (setup.Setup.CheckTrigger). Sensors listed in Dead make
	// neither signal nor dark hits. Neutrons thermalise at the water's
	// temperature and are captured on H, O and the Setup's
	// GdMassFraction of gadolinium (sim/neutron).
	setup.Setup
	// EM and Muon are the transport settings; zero values mean
	// em.DefaultConfig() and muon.DefaultConfig(). Their Cherenkov
	// threshold index is set from the water (the largest index of the
	// sensors' band) unless given.
	EM   em.Config
	Muon muon.Config
	// NoDarkNoise switches dark pulses off.
	NoDarkNoise bool
	// TraceAllPhotons switches photon pre-scaling and thinning off: every
	// Cherenkov photon is traced and detection is decided at the sensor
	// alone. The results have the same distribution, at several times the
	// cost.
	TraceAllPhotons bool
	// ExtendedWindow (ns) keeps every hit from the end of the primary
	// trigger's readout window to ExtendedWindow after the primary
	// trigger (event.Event.Extended), with dark pulses over that stretch,
	// so that signals below the trigger threshold (a faint neutron
	// capture) can be tagged afterwards. 0, the default, keeps only the
	// triggers' readout windows. At most MaxExtendedWindow; the hits kept
	// grow with it, about nSensors * DarkRate * ExtendedWindow dark hits
	// of 24 bytes each (40 000 hits, 1 MB, for 1 ms in the large tank);
	// the dark pulses are made 10 microseconds at a time, so nothing
	// else grows with it.
	ExtendedWindow float64
	// KeepUntriggered keeps events that do not trigger (with all their
	// hits and Triggered = false); otherwise Run drops them.
	KeepUntriggered bool
	// Seed is the run seed; with the event number it fixes every random
	// draw of an event (EventStream).
	Seed uint64
	// Workers is the number of goroutines of Run; 0 means GOMAXPROCS.
	Workers int
}

// DemoConfig returns the demo detector (setup.Demo: the demo tank at 30%
// coverage with the medium sensor class, pure water at 20 C, the default
// liner and trigger) with the given seed: an invented scenario for
// examples and tests.
func DemoConfig(seed uint64) (Config, error) {
	s, err := setup.Demo()
	if err != nil {
		return Config{}, err
	}
	return Config{Setup: s, Seed: seed}, nil
}

// LargeConfig returns the large reference detector (setup.Large: the
// large tank at 40% coverage with the large sensor class, pure water at
// 20 C, the default liner, a 25-hit trigger) with the given seed: an
// invented scenario for studies and benchmarks.
func LargeConfig(seed uint64) (Config, error) {
	s, err := setup.Large()
	if err != nil {
		return Config{}, err
	}
	return Config{Setup: s, Seed: seed}, nil
}

// validate checks c and fills in its defaults: the setup's
// (setup.Setup.Check) and Workers.
func (c *Config) validate() error {
	if err := c.Setup.Check(); err != nil {
		return fmt.Errorf("sim: %w", err)
	}
	if err := c.Setup.CheckTrigger(); err != nil {
		return fmt.Errorf("sim: %w", err)
	}
	if err := checkExtendedWindow(c.ExtendedWindow); err != nil {
		return err
	}
	if c.Workers < 0 {
		return fmt.Errorf("sim: Config.Workers = %d must not be negative", c.Workers)
	}
	if c.Workers == 0 {
		c.Workers = runtime.GOMAXPROCS(0)
	}
	return nil
}
