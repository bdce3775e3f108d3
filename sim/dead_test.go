package sim

import (
	"math"
	"slices"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// TestDeadSensors: sensors listed in Setup.Dead make no hit, signal or
// dark. Dead sensors are dropped after digitization, so the same events
// simulated with and without them have exactly the same hits on the live
// sensors; the trigger is set never to fire so that every hit is read out
// in both. The dark pulses counted in the truth follow the live fraction
// of the sensors: of N dark pulses spread uniformly over the sensors, a
// binomial (N, 1 - f) number land on live ones (f the dead fraction); the
// test allows 5 standard deviations.
func TestDeadSensors(t *testing.T) {
	mod := func(dead bool) func(*Config) {
		return func(c *Config) {
			c.Trigger.Threshold = math.MaxInt32 // never fires
			c.KeepUntriggered = true
			c.Sensor.DarkRate = 2e5 // Hz: hundreds of dark pulses per event
			if dead {
				for i := 0; i < c.Detector.NumSensors(); i += 3 {
					c.Dead = append(c.Dead, i)
				}
			}
		}
	}
	all, some := demoSim(t, 1, mod(false)), demoSim(t, 1, mod(true))
	nSensors := all.cfg.Detector.NumSensors()
	isDead := func(i int) bool { return i%3 == 0 }
	f := float64(len(some.cfg.Dead)) / float64(nSensors)
	var darkAll, darkLive, onDead int
	for i := range uint64(10) {
		p := []phys.Particle{{PDG: phys.Electron, Ekin: 20 + 10*float64(i), Dir: r3.Vector{X: 0.6, Z: 0.8}}}
		a, err := all.Event(i, p)
		if err != nil {
			t.Fatal(err)
		}
		b, err := some.Event(i, p)
		if err != nil {
			t.Fatal(err)
		}
		if a.Truth.Triggered || b.Truth.Triggered {
			t.Fatalf("event %d triggered", i)
		}
		want := slices.DeleteFunc(slices.Clone(a.Hits), func(h pmt.Hit) bool { return isDead(h.Sensor) })
		onDead += len(a.Hits) - len(want)
		if !slices.Equal(b.Hits, want) {
			t.Errorf("event %d: %d hits with dead sensors, want the %d live hits of the event without", i, len(b.Hits), len(want))
		}
		for _, h := range b.Hits {
			if isDead(h.Sensor) {
				t.Fatalf("event %d: hit on dead sensor %d", i, h.Sensor)
			}
		}
		if b.Truth.Photoelectrons > a.Truth.Photoelectrons {
			t.Errorf("event %d: %d photoelectrons with dead sensors, %d without", i, b.Truth.Photoelectrons, a.Truth.Photoelectrons)
		}
		darkAll += a.Truth.DarkPE
		darkLive += b.Truth.DarkPE
	}
	if onDead == 0 {
		t.Fatal("no hit on the dead sensors in the run without them: the test checks nothing")
	}
	mean := float64(darkAll) * (1 - f)
	sigma := math.Sqrt(float64(darkAll) * f * (1 - f))
	if math.Abs(float64(darkLive)-mean) > 5*sigma {
		t.Errorf("%d dark pulses on live sensors, want %.0f +- %.0f (binomial, %d pulses, dead fraction %.3f)", darkLive, mean, sigma, darkAll, f)
	}
}
