package sim

import (
	"strings"
	"testing"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

func TestNewErrors(t *testing.T) {
	cases := []struct {
		mod  func(*Config)
		want string
	}{
		{func(c *Config) { c.Detector = nil }, "Detector"},
		{func(c *Config) { c.Sensor = pmt.Large() }, "CathodeDiameter"},
		{func(c *Config) { c.Sensor.TTS = -1 }, "TTS"},
		{func(c *Config) { c.Liner.Reflectivity = 3 }, "Reflectivity"},
		{func(c *Config) { c.Trigger.Threshold = 0 }, "Trigger"},
		{func(c *Config) { c.Workers = -2 }, "Workers = -2"},
		{func(c *Config) { c.Dead = []int{3, 1 << 20} }, "Dead[1] = 1048576"},
		{func(c *Config) { c.Dead = []int{3, 3} }, "Dead[1] = 3"},
	}
	for _, c := range cases {
		cfg, err := DemoConfig(1)
		if err != nil {
			t.Fatal(err)
		}
		c.mod(&cfg)
		if _, err := New(cfg); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New: error %v, want it to mention %q", err, c.want)
		}
	}
	s := demoSim(t, 1, nil)
	if _, err := s.Event(0, nil); err == nil {
		t.Error("event with no primaries accepted")
	}
	if _, err := s.Event(0, []phys.Particle{{PDG: 4242, Ekin: 1}}); err == nil || !strings.Contains(err.Error(), "4242") {
		t.Errorf("unknown PDG code: error %v", err)
	}
}
