package lowenergy_test

import (
	"math"
	"math/rand/v2"
	"strings"
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

// TestFarMissesFlagged checks the quality flag on the regression sample
// (demo tank, 5-50 MeV electrons 1 m inside the wall): among converged
// fits not flagged Suspect, the fraction more than 3 m from the true
// vertex must be compatible with less than 0.1% (one-sided 90%
// Clopper-Pearson lower bound below 0.1%). The flag's efficiency (far
// fits flagged / far fits) is logged.
func TestFarMissesFlagged(t *testing.T) {
	s := demoSample(t)
	far, farFlagged, unflagged := 0, 0, 0
	for _, e := range regressionEnergies {
		for _, ev := range s[e] {
			if ev.res.Status != fit.Converged {
				continue
			}
			miss := ev.res.Track.Vertex.Sub(ev.truth.Vertex).Norm() > 300
			if miss {
				far++
			}
			if ev.res.Suspect {
				if miss {
					farFlagged++
				}
				continue
			}
			unflagged++
		}
	}
	bad := far - farFlagged
	lo, err := resolution.Lower(bad, unflagged, resolution.LimitCL)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("far (> 3 m) fits: %d, flagged %d; unflagged far %d of %d unflagged converged fits", far, farFlagged, bad, unflagged)
	if lo.Lo > 0.001 {
		t.Errorf("%d of %d unflagged converged fits miss by more than 3 m: more than 0.1%% at %.0f%% confidence", bad, unflagged, 100*resolution.LimitCL)
	}
}

// TestEnergyOutsideCalibration fits 150 MeV electrons, beyond the demo
// calibration's 100 MeV: every converged fit whose energy lies outside
// the calibration must say so (EkinOutside, Reason) and no other, and the
// errors of those must cover the truth (no pull beyond 3.5: for honest
// errors P(|pull| > 3.5) = 5e-4 each); most fits must be outside.
func TestEnergyOutsideCalibration(t *testing.T) {
	cfg, f := demoFitter(t)
	lo, hi := f.EkinRange()
	outside, conv := 0, 0
	for _, ev := range study(t, cfg, f, 150, 100, 70000, 30) {
		r := ev.res
		if r.Status != fit.Converged {
			continue
		}
		conv++
		out := r.Track.Ekin < lo || r.Track.Ekin > hi
		if r.EkinOutside != out || out != strings.Contains(r.Reason, "outside the calibration") {
			t.Errorf("fit at %.1f MeV (calibration %g-%g MeV): EkinOutside %v reason %q", r.Track.Ekin, lo, hi, r.EkinOutside, r.Reason)
		}
		if !out {
			continue
		}
		outside++
		if p := (r.Track.Ekin - 150) / r.Errors.Ekin; math.Abs(p) > 3.5 {
			t.Errorf("fit %.1f ± %.1f MeV of a 150 MeV electron: pull %.1f", r.Track.Ekin, r.Errors.Ekin, p)
		}
	}
	t.Logf("%d of %d converged fits outside the calibration", outside, conv)
	if 2*outside < conv {
		t.Errorf("only %d of %d fits of 150 MeV electrons outside the calibration", outside, conv)
	}
}
