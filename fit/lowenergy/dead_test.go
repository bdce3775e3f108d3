package lowenergy_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/pmt"
)

// Dead sensors: a tenth of the demo tank's sensors, drawn at random, give
// no hits. The fitter told of them leaves their hits out (a hit list with
// them gives the same fit as one without, and counts them), and its
// energy, corrected for the lost coverage, agrees with the fit of the
// full detector on the same events: the mean ratio is 1 within 4 standard
// errors of the mean of the per-event ratios. A fitter not told of them
// sees the coverage loss as a lower energy, which the same test detects.
func TestDeadSensors(t *testing.T) {
	cfg, full := demoFitter(t)
	n := cfg.Detector.NumSensors()
	rng := rand.New(rand.NewPCG(41, 42))
	dead := rng.Perm(n)[:n/10]
	isDead := make([]bool, n)
	for _, d := range dead {
		isDead[d] = true
	}
	s := cfg.Setup
	s.Dead = dead
	withDead, err := lowenergy.New(lowenergy.Config{Setup: s})
	if err != nil {
		t.Fatal(err)
	}
	// An event seen only by dead sensors has no usable hits.
	onlyDead := []pmt.Hit{{Sensor: dead[0], Time: 1, Charge: 1}, {Sensor: dead[1], Time: 2, Charge: 1}}
	if r, err := withDead.Fit(onlyDead); err != nil || r.Status != fit.NoHits || r.DeadHits != 2 || r.Reason == "" {
		t.Errorf("hits on dead sensors only: %v, status %v, %d dead hits, reason %q", err, r.Status, r.DeadHits, r.Reason)
	}
	const e = 10
	var told, naive []float64
	for _, ev := range demoSample(t)[e] {
		var live []pmt.Hit
		for _, h := range ev.hits {
			if !isDead[h.Sensor] {
				live = append(live, h)
			}
		}
		a, err := withDead.Fit(ev.hits)
		if err != nil {
			t.Fatal(err)
		}
		b, err := withDead.Fit(live)
		if err != nil {
			t.Fatal(err)
		}
		if a.DeadHits != len(ev.hits)-len(live) || b.DeadHits != 0 {
			t.Fatalf("DeadHits = %d and %d, want %d and 0", a.DeadHits, b.DeadHits, len(ev.hits)-len(live))
		}
		if a.Track != b.Track || a.Status != b.Status {
			t.Fatalf("fit with the dead sensors' hits %+v differs from the fit without %+v", a.Track, b.Track)
		}
		c, err := full.Fit(live)
		if err != nil {
			t.Fatal(err)
		}
		if b.Status != fit.Converged || c.Status != fit.Converged || ev.res.Status != fit.Converged {
			continue
		}
		told = append(told, b.Track.Ekin/ev.res.Track.Ekin)
		naive = append(naive, c.Track.Ekin/ev.res.Track.Ekin)
	}
	mean := func(x []float64) (m, se float64) {
		for _, v := range x {
			m += v
		}
		m /= float64(len(x))
		var ss float64
		for _, v := range x {
			ss += (v - m) * (v - m)
		}
		return m, math.Sqrt(ss / float64(len(x)-1) / float64(len(x)))
	}
	mt, st := mean(told)
	mn, sn := mean(naive)
	t.Logf("%d events, %d of %d sensors dead: energy ratio to the full detector %.4f +- %.4f (told), %.4f +- %.4f (not told)", len(told), len(dead), n, mt, st, mn, sn)
	if math.Abs(mt-1) > 4*st {
		t.Errorf("energy with dead sensors / full detector = %.4f +- %.4f, want 1", mt, st)
	}
	if !(mn < 1-4*sn) {
		t.Errorf("a fitter not told of the dead sensors gives %.4f +- %.4f: the test cannot see the coverage loss", mn, sn)
	}
}
