package sim

import (
	"math"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/stat"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
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

// Published values for the stopped mu- in water (oxygen): the free muon
// mean life phys.MuonLifetime (PDG Review 2024), the total nuclear
// capture rate of mu- on 16O, 102.6e3 /s (Suzuki, Measday and Roalsvig,
// Phys. Rev. C 35 (1987) 2212; from memory), and the Huff factor 0.998
// for the bound decay rate (as used there; from memory). A muon caught by
// hydrogen in water passes to oxygen quickly, so the oxygen values apply
// to every stopped mu-.
const (
	captureRateO16  = 102.6e3 * 1e-9 // per ns
	huffFactorO16   = 0.998
	boundDecayRate  = huffFactorO16 / phys.MuonLifetime // per ns
	lifetimeInWater = 1 / (boundDecayRate + captureRateO16)
	decayFraction   = boundDecayRate / (boundDecayRate + captureRateO16)
)

// TestDecayElectronSubEvent: a 300 MeV mu- stopping in the demo tank
// gives its decay electron as a sub-event. Checked: the fraction of
// stopped muons that decay (truth vertices) against the published
// capture rate; every decay later than the primary readout window
// tagged by a sub-event at the decay time; no sub-event without a decay;
// and the sub-event times after a cut t0 (exponential, memoryless)
// against the mu- lifetime in water, the maximum-likelihood mean life
// with its error tau/sqrt(n).
func TestDecayElectronSubEvent(t *testing.T) {
	n := 3000
	if testing.Short() {
		n = 800
	}
	s := demoSim(t, 1, nil)
	tg := s.Config().Trigger
	t0 := tg.PostTrigger + 300 // ns after the primary trigger: past its readout window
	var stopped, decayed, eligible, tagged, fakes int
	var late []float64
	for i := range n {
		mu := phys.Particle{PDG: phys.MuonMinus, Dir: r3.Vector{Z: 1}, Ekin: 300}
		ev, err := s.Event(uint64(i), []phys.Particle{mu})
		if err != nil {
			t.Fatal(err)
		}
		if !ev.Truth.Triggered {
			t.Fatalf("event %d: the muon did not trigger", i)
		}
		trig := ev.Truth.TriggerTime
		var decay *event.Vertex
		for j := range ev.Truth.Vertices {
			v := &ev.Truth.Vertices[j]
			if v.Track != 1 {
				continue
			}
			switch v.Process {
			case phys.StoppedDecayed:
				stopped++
				decayed++
				decay = v
			case phys.StoppedCaptured:
				stopped++
			case phys.DecayedInFlight:
				decay = v
			}
		}
		if decay != nil && (len(decay.Products) != 1 || decay.Products[0].PDG != phys.Electron) {
			t.Fatalf("event %d: decay vertex products %v, want one electron", i, decay.Products)
		}
		matched := false
		for _, sub := range ev.SubEvents {
			// The electron's light reaches the sensors 0 to ~60 ns after
			// the decay (demo tank), its scattered and reflected light
			// later: a decay at the end of the primary window can leave a
			// sub-event on that tail.
			if dt := trig + sub.Time - decay.Time; decay != nil && dt > -20 && dt < 300 {
				matched = true
				if sub.Time > t0 {
					late = append(late, sub.Time-t0)
				}
			} else {
				fakes++
			}
		}
		if decay != nil && decay.Time-trig > t0 {
			eligible++
			if matched {
				tagged++
			}
		}
	}
	// Truth: the share of stopped muons that decay.
	p := decayFraction
	fd := float64(decayed) / float64(stopped)
	sd := math.Sqrt(p * (1 - p) / float64(stopped))
	t.Logf("stopped mu-: %d, decayed %.4f (published %.4f +- %.4f for this sample)", stopped, fd, p, sd)
	if math.Abs(fd-p) > 3*sd {
		t.Errorf("decayed fraction %.4f, want %.4f +- 3 x %.4f", fd, p, sd)
	}
	// Readout: every decay after the primary window is tagged.
	eff := float64(tagged) / float64(eligible)
	t.Logf("decays after %.0f ns: %d, tagged by a sub-event: %d (%.4f); sub-events without a decay: %d", t0, eligible, tagged, eff, fakes)
	if eligible < n/4 || eff < 0.99 {
		t.Errorf("%d of %d decays after %.0f ns tagged, want at least 99%%", tagged, eligible, t0)
	}
	if fakes > 0 {
		t.Errorf("%d sub-events match no decay", fakes)
	}
	// Time distribution: maximum-likelihood mean life of the sub-event
	// times after t0.
	tau := stat.Mean(late, nil)
	stau := tau / math.Sqrt(float64(len(late)))
	t.Logf("mean life from %d sub-events: %.0f +- %.0f ns (mu- in water %.1f ns, free %.1f ns)", len(late), tau, stau, lifetimeInWater, phys.MuonLifetime)
	if math.Abs(tau-lifetimeInWater) > 3*stau {
		t.Errorf("mean life %.0f +- %.0f ns, want %.1f ns within 3 sigma", tau, stau, lifetimeInWater)
	}
}
