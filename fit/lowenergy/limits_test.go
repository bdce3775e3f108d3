package lowenergy_test

import (
	"strings"
	"testing"
	"time"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/sim"
)

func TestOptimizerLimits(t *testing.T) {
	// A fit cut short by an iteration or time limit is marked not
	// converged and says which limit stopped it; no NaN leaks out.
	cfg, err := sim.DemoConfig(7)
	if err != nil {
		t.Fatal(err)
	}
	_, good := demoFitter(t)
	evs := study(t, cfg, good, 10, 100, 500, 3)
	for _, c := range []struct {
		cfg  lowenergy.Config
		want string
	}{
		{lowenergy.Config{MaxIterations: 1}, "IterationLimit"},
		{lowenergy.Config{MaxDuration: time.Nanosecond}, "RuntimeLimit"},
	} {
		c.cfg.Setup = cfg.Setup
		f, err := lowenergy.New(c.cfg)
		if err != nil {
			t.Fatal(err)
		}
		stopped := 0
		for _, ev := range evs {
			r, err := f.Fit(ev.hits)
			if err != nil {
				t.Fatal(err)
			}
			if r.Status != fit.Converged {
				stopped++
				if !strings.Contains(r.Reason, c.want) {
					t.Errorf("%s: reason %q", c.want, r.Reason)
				}
			}
		}
		if stopped == 0 {
			t.Errorf("%s: no fit was stopped", c.want)
		}
	}
	if _, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup, MaxDuration: -time.Second}); err == nil || !strings.Contains(err.Error(), "MaxDuration") {
		t.Errorf("negative MaxDuration: %v", err)
	}
}
