package sim

import (
	"strings"
	"testing"

	"github.com/conelight/conelight/sim/optics"
)

// TestRunDescriptionsInWords: the run record's water and option strings
// are settings in words, not Go struct dumps, and name no setting that
// does not act (an attenuation length of 0 cm at 0 nm).
func TestRunDescriptionsInWords(t *testing.T) {
	for _, tc := range []struct {
		name string
		mod  func(*Config)
		want []string
	}{
		{"demo", nil, []string{"absorption of pure water", "no Mie-like scattering", "dark noise on", "extended window off"}},
		{"attenuation", func(c *Config) {
			wc := optics.DefaultWaterConfig()
			wc.AttenuationLength, wc.AttenuationWavelength = 5000, 400
			wc.MieLength = 20000
			w, err := optics.NewWater(wc)
			if err != nil {
				t.Fatal(err)
			}
			c.Water = w
			c.NoDarkNoise = true
			c.ExtendedWindow = 5e5
			c.Muon.NoStraggling = true
		}, []string{"attenuation length 5000 cm at 400 nm", "Mie-like scattering length 20000 cm", "dark noise off",
			"extended window 500000 ns after the primary trigger", "switched off: straggling"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := demoSim(t, 1, tc.mod)
			ri, err := s.RunInfo(reproGun(t, s), RunOptions{Count: 1})
			if err != nil {
				t.Fatal(err)
			}
			all := ri.Water + "\n" + ri.Options
			for _, bad := range []string{"{", "}", ":0 ", "0 cm at 0 nm"} {
				if strings.Contains(all, bad) {
					t.Errorf("description holds %q:\n%s", bad, all)
				}
			}
			for _, w := range tc.want {
				if !strings.Contains(all, w) {
					t.Errorf("description lacks %q:\n%s", w, all)
				}
			}
			if ri.Setup != s.Config().Name || ri.Setup == "" {
				t.Errorf("RunInfo.Setup = %q, want the setup's name %q", ri.Setup, s.Config().Name)
			}
		})
	}
}
