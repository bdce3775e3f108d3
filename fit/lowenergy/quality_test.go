package lowenergy_test

import (
	"math/rand/v2"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/resolution"
)

// TestDarkNoiseIsNoEvent fits events of pure dark noise at each built-in
// tank's own sensor dark rate, made by the sensor model (pmt.AddDark,
// Digitize) over a 1 us readout, and requires fit.NoEvent in at least 99%
// of them: the number that is not must be compatible with 1% at 90%
// confidence (one-sided Clopper-Pearson lower bound below 1%).
func TestDarkNoiseIsNoEvent(t *testing.T) {
	const events = 300
	for _, tank := range []string{"demo", "large"} {
		cfg, f := demoFitter(t)
		if tank == "large" {
			cfg, f = largeFitter(t, 5)
		}
		rng := rand.New(rand.NewPCG(31, 32))
		n := cfg.Detector.NumSensors()
		other := map[fit.Status]int{}
		bad := 0
		for range events {
			pes, err := cfg.Sensor.AddDark(nil, n, 0, 1000, rng)
			if err != nil {
				t.Fatal(err)
			}
			hits, err := cfg.Sensor.Digitize(pes, n, rng, nil)
			if err != nil {
				t.Fatal(err)
			}
			r, err := f.Fit(hits)
			if err != nil {
				t.Fatal(err)
			}
			if r.Status != fit.NoEvent {
				bad++
				other[r.Status]++
			}
		}
		lo, err := resolution.Lower(bad, events, resolution.LimitCL)
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%s tank, dark rate %g Hz: %d of %d dark-noise events not reported as no event %v", tank, cfg.Sensor.DarkRate, bad, events, other)
		if lo.Lo > 0.01 {
			t.Errorf("%s tank: %d of %d dark-noise events not reported as no event (%v), more than 1%% at %.0f%% confidence", tank, bad, events, other, 100*resolution.LimitCL)
		}
	}
}
