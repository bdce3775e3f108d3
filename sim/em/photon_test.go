package em

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/conelight/conelight/sim/phys"
)

func TestXCOMTotal(t *testing.T) {
	// NIST XCOM, water, total attenuation with coherent scattering
	// (testdata/em/xcom_water.txt, from memory). We leave out coherent
	// scattering (0.1-0.3% of the total at 0.5-1 MeV, less above) and the
	// binding correction of Compton scattering (below 0.5% above 0.5 MeV):
	// 1% up to 5 MeV. From 10 MeV on pair production, from the
	// high-energy Tsai formula, weighs in: 2%.
	p := newPhysics(t, DefaultConfig())
	for _, row := range readTable(t, "xcom_water.txt") {
		k, want := row[0], row[1]
		got, err := p.TotalAttenuation(k)
		if err != nil {
			t.Fatal(err)
		}
		tol := 0.01
		if k >= 10 {
			tol = 0.02
		}
		if d := relDiff(got, want); d > tol {
			t.Errorf("total attenuation at %g MeV = %.5f cm2/g, XCOM %.5f (%.2f%%)", k, got, want, 100*d)
		}
		t.Logf("k = %g MeV: total %.5f (XCOM %.5f)", k, got, want)
	}
}

func TestPairAgainstXCOM(t *testing.T) {
	// Pair production (nuclear + electron field) against the XCOM total
	// minus Klein-Nishina (photoelectric and coherent are below 1e-4 of
	// the total there): XCOM 0.02219 at 10 MeV, 0.01730 at 100 MeV (from
	// memory). The Tsai formula is a high-energy, screened-Born result:
	// 6% at 10 MeV (near-threshold Born error), 3% at 100 MeV.
	p := newPhysics(t, DefaultConfig())
	nelPerGram := p.med.ElectronDensity() / p.density
	for _, c := range []struct{ k, total, tol float64 }{{10, 0.02219, 0.06}, {100, 0.01730, 0.03}} {
		want := c.total - nelPerGram*kleinNishina(c.k)
		got, _ := p.PairAttenuation(c.k)
		if d := relDiff(got, want); d > c.tol {
			t.Errorf("pair attenuation at %g MeV = %.5f cm2/g, XCOM total - KN = %.5f (%.1f%%)", c.k, got, want, 100*d)
		}
	}
	// Triplet share: in complete screening the atomic-electron term is
	// Sum Z L'rad / Sum Z^2 (Lrad - f) = 0.193 of the nuclear one for water
	// (Tsai 1974, the xi of Z(Z + xi)); at 1 GeV the electron term is
	// further from complete screening (its screening variable carries
	// Z^(2/3)), so the ratio must lie between 0.1 and that limit.
	n := p.at(p.gamma.pairNuc, 1000)
	e := p.at(p.gamma.pairEl, 1000)
	if r := e / n; r < 0.1 || r > 0.194 {
		t.Errorf("triplet/nuclear pair ratio at 1 GeV = %.3f", r)
	}
}

func TestKleinNishina(t *testing.T) {
	// The closed-form total cross-section against Simpson integration of
	// the Klein-Nishina differential cross-section (Klein and Nishina
	// 1929): dsigma/dOmega = (r_e^2/2) eps^2 (eps + 1/eps - sin^2 theta)
	// with d cos(theta) = d eps/(c eps^2), i.e.
	// dsigma/deps = (pi r_e^2/c) (eps + 1/eps - sin^2 theta); and the
	// sampler's <eps> against the same distribution (5 standard errors).
	rng := rand.New(rand.NewPCG(13, 14))
	const re2 = phys.ClassicalElectronRadius * phys.ClassicalElectronRadius
	for _, k := range []float64{0.05, 0.4, 2, 30, 1000} {
		c := k / phys.ElectronMass
		diff := func(eps float64) float64 {
			tt := (1 - eps) / (c * eps) // 1 - cos(theta)
			return math.Pi * re2 / c * (eps + 1/eps - tt*(2-tt))
		}
		lo := 1 / (1 + 2*c)
		sigma := integrate(diff, lo, 1, 200000)
		if relDiff(kleinNishina(k), sigma) > 1e-6 {
			t.Errorf("k=%g: closed-form KN %.8g, integral %.8g", k, kleinNishina(k), sigma)
		}
		mean := integrate(func(e float64) float64 { return e * diff(e) }, lo, 1, 200000) / sigma
		m2 := integrate(func(e float64) float64 { return e * e * diff(e) }, lo, 1, 200000) / sigma
		const n = 40000
		var s float64
		for range n {
			eps, cosT := sampleCompton(k, rng)
			if d := cosT - (1 - (1-eps)/(c*eps)); math.Abs(d) > 1e-12 {
				t.Fatalf("Compton kinematics violated: eps %g cos %g", eps, cosT)
			}
			s += eps
		}
		se := math.Sqrt((m2 - mean*mean) / n)
		if got := s / n; math.Abs(got-mean) > 5*se {
			t.Errorf("k=%g: <eps> = %.5f, want %.5f +- %.5f", k, got, mean, se)
		}
	}
}

func TestHeitlerAnnihilation(t *testing.T) {
	// Heitler's total cross-section against Simpson integration of his
	// differential one, and the sampler's <eps> against it (5 standard
	// errors). Also the non-relativistic limit: sigma -> pi r_e^2 / beta
	// (Dirac), checked at gamma = 1.0001 to 1%.
	rng := rand.New(rand.NewPCG(15, 16))
	const re2 = phys.ClassicalElectronRadius * phys.ClassicalElectronRadius
	for _, gamma := range []float64{1.5, 5, 100, 1e4} {
		b := math.Sqrt((gamma - 1) / (gamma + 1))
		lo, hi := (1-b)/2, (1+b)/2
		s := func(e float64) float64 {
			return math.Pi * re2 / ((gamma + 1) * (gamma*gamma - 1)) *
				(-(gamma+1)*(gamma+1) + (gamma*gamma+4*gamma+1)/e - 1/(e*e))
		}
		// integrate in ln eps: the 1/eps^2 term is steep at large gamma
		g := func(u float64) float64 { e := math.Exp(u); return s(e) * e }
		sigma := integrate(g, math.Log(lo), math.Log(hi), 200000)
		if relDiff(heitler(gamma), sigma) > 1e-6 {
			t.Errorf("gamma=%g: Heitler %.8g, integral %.8g", gamma, heitler(gamma), sigma)
		}
		mean := integrate(func(u float64) float64 { return math.Exp(u) * g(u) }, math.Log(lo), math.Log(hi), 200000) / sigma
		m2 := integrate(func(u float64) float64 { return math.Exp(2*u) * g(u) }, math.Log(lo), math.Log(hi), 200000) / sigma
		const n = 40000
		var sum float64
		for range n {
			sum += sampleAnnihilation(gamma, rng)
		}
		se := math.Sqrt((m2 - mean*mean) / n)
		if got := sum / n; math.Abs(got-mean) > 5*se {
			t.Errorf("gamma=%g: <eps> = %.5f, want %.5f +- %.5f", gamma, got, mean, se)
		}
	}
	gamma := 1.0001
	beta := math.Sqrt(1 - 1/(gamma*gamma))
	if relDiff(heitler(gamma), math.Pi*re2/beta) > 0.01 {
		t.Errorf("Heitler at gamma=%g: %g, Dirac limit %g", gamma, heitler(gamma), math.Pi*re2/beta)
	}
}

func TestPhotoelectricNegligibleAboveCut(t *testing.T) {
	// The claim behind the default photon cut: above it photoabsorption is
	// under 1e-3 of the attenuation (NIST XCOM, water, table in photon.go),
	// so a photon above the cut makes light through Compton electrons.
	// And below 30 keV it dominates (XCOM: photoelectric equals Compton
	// near 30 keV in water, from memory).
	p := newPhysics(t, DefaultConfig())
	k := p.cfg.PhotonCut
	pe, _ := p.PhotoelectricAttenuation(k)
	tot, _ := p.TotalAttenuation(k)
	if pe/tot > 1e-3 {
		t.Errorf("photoelectric fraction at the photon cut %g MeV = %g", k, pe/tot)
	}
	pe, _ = p.PhotoelectricAttenuation(0.02)
	c, _ := p.ComptonAttenuation(0.02)
	if pe < c {
		t.Errorf("at 20 keV photoelectric %g below Compton %g", pe, c)
	}
}
