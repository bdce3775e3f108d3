package sim

import (
	"math"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

func TestPhotoelectronsPerMeV(t *testing.T) {
	// Independent estimate of the signal photoelectrons per MeV of an
	// electron at the centre of the demo tank:
	//
	//   pe/MeV = Y_eff x L x f x a x T
	//
	// Y_eff: Frank-Tamm photons per cm at beta = 1 weighted by the
	//   sensor's QE x collection efficiency, by quadrature here with the
	//   water's IAPWS index (Frank-Tamm formula);
	// L: Cherenkov-radiating track length per MeV of an electron shower,
	//   0.38-0.52 cm/MeV (the total track length of a shower is E over the
	//   ~2 MeV cm2/g collision loss, NIST ESTAR, less the sub-threshold
	//   tails and the falling yield of slow tracks; from memory);
	// f: the photocathode coverage reached by the layout;
	// a: mean angular acceptance, 0.85-1 for light from the centre
	//   (incidence mostly within 45 degrees; common practice);
	// T: water transmission over ~5-7 m with absorption and scattering
	//   lengths above 50 m in the blue, 0.85-1.
	//
	// A published figure for a comparable tank (40 m class, 40% coverage
	// of 50 cm tubes) is about 6-7 photoelectrons per MeV (from memory).
	s := demoSim(t, 1, func(c *Config) { c.NoDarkNoise = true })
	cfg := s.Config()
	lo, hi := cfg.Sensor.QE.Range()
	const steps = 2000
	h := (hi - lo) / steps
	var yEff float64
	for i := 0; i < steps; i++ {
		l := lo + (float64(i)+0.5)*h
		n := cfg.Water.Index(l)
		yEff += cfg.Sensor.SpectralEfficiency(l) * (1 - 1/(n*n)) / (l * l) * h
	}
	yEff *= 2 * math.Pi * phys.FineStructure * 1e7 // per cm
	f := cfg.Detector.Coverage()
	low := yEff * 0.38 * f * 0.85 * 0.85
	high := yEff * 0.52 * f * 1 * 1

	const ekin = 20.0
	const n = 40
	var pe float64
	for i := 0; i < n; i++ {
		ev, err := s.Event(uint64(i), []phys.Particle{{PDG: phys.Electron, Dir: r3.Vector{X: 0.6, Z: 0.8}, Ekin: ekin}})
		if err != nil {
			t.Fatal(err)
		}
		pe += float64(ev.Truth.Photoelectrons)
	}
	perMeV := pe / n / ekin
	t.Logf("%.2f pe/MeV; independent estimate %.2f-%.2f (Y_eff %.1f /cm, coverage %.3f)", perMeV, low, high, yEff, f)
	if perMeV < low || perMeV > high {
		t.Errorf("%.2f photoelectrons per MeV outside the estimate %.2f-%.2f", perMeV, low, high)
	}
}

func TestLightLinearInEnergy(t *testing.T) {
	// Visible light is nearly proportional to electron energy (DESIGN
	// section 3): the expected photon count per MeV of the truth must agree
	// between 20 and 200 MeV within 3% plus statistics (shower
	// fluctuations of the light are a few percent per event at these
	// energies; the tolerance takes 5 standard errors of the mean).
	s := demoSim(t, 1, func(c *Config) { c.NoDarkNoise = true })
	perMeV := func(ekin float64, n int) (mean, se float64) {
		vals := make([]float64, n)
		for i := range vals {
			ev, err := s.Event(uint64(i), []phys.Particle{{PDG: phys.Electron, Dir: r3.Vector{Z: 1}, Ekin: ekin}})
			if err != nil {
				t.Fatal(err)
			}
			vals[i] = ev.Truth.Tracks[0].VisiblePhotons / ekin
			mean += vals[i] / float64(n)
		}
		var v float64
		for _, x := range vals {
			v += (x - mean) * (x - mean) / float64(n-1)
		}
		return mean, math.Sqrt(v / float64(n))
	}
	a, sa := perMeV(20, 60)
	b, sb := perMeV(200, 20)
	if d := math.Abs(a/b - 1); d > 0.03+5*math.Hypot(sa/a, sb/b) {
		t.Errorf("visible photons per MeV: %.1f +- %.1f at 20 MeV, %.1f +- %.1f at 200 MeV", a, sa, b, sb)
	}
}
