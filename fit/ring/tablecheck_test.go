package ring

import (
	"strings"
	"testing"

	"github.com/conelight/conelight/sim/optics"
)

// TestNewChecksWater: the emission tables fix the Cherenkov cone through
// the refractive index of the water they were made with, so New accepts
// the default water and water a few degrees warmer (IAPWS index change
// about 1e-4 per kelvin near 20 C, far below the 0.003 allowed), and
// refuses water near boiling (index lower by about 0.01), naming the
// indices and the command that makes tables.
func TestNewChecksWater(t *testing.T) {
	d := demoTank(t)
	for _, c := range []struct {
		temp float64
		ok   bool
	}{{20, true}, {25, true}, {95, false}} {
		wc := optics.DefaultWaterConfig()
		wc.TemperatureC = c.temp
		w, err := optics.NewWater(wc)
		if err != nil {
			t.Fatal(err)
		}
		s := d.cfg.Setup
		s.Water = w
		_, err = New(Config{Setup: s})
		switch {
		case c.ok && err != nil:
			t.Errorf("water at %g C: %v", c.temp, err)
		case !c.ok && (err == nil || !strings.Contains(err.Error(), "refractive index") || !strings.Contains(err.Error(), "go generate ./fit/ring")):
			t.Errorf("water at %g C: error %v, want one naming the refractive index and the command", c.temp, err)
		}
	}
}
