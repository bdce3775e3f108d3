package gen

import (
	"math"
	"testing"

	"github.com/conelight/conelight/sim/phys"
)

// llewellynSmith is the published closed form for equal nucleon masses M:
// d sigma/dQ2 = G^2 cos^2 M^2/(8 pi E^2) [A -+ B (s-u)/M^2 + C (s-u)^2/M^4],
// s-u = 4 M E - Q2 - m^2 (Llewellyn Smith, Phys. Rep. 3 (1972) 261, section 3;
// the A, B, C below as given there, from memory).
func llewellynSmith(m qeModel, e, q2 float64) float64 {
	f1, xf2, fa, fp := m.formFactors(q2)
	mm := nucleonMass * nucleonMass
	ml2 := m.lepMass * m.lepMass
	tau := q2 / (4 * mm)
	a := (ml2 + q2) / mm * ((1+tau)*fa*fa - (1-tau)*f1*f1 + tau*(1-tau)*xf2*xf2 + 4*tau*f1*xf2 -
		ml2/(4*mm)*((f1+xf2)*(f1+xf2)+(fa+2*fp)*(fa+2*fp)-4*(1+tau)*fp*fp))
	b := q2 / mm * fa * (f1 + xf2)
	c := (fa*fa + f1*f1 + tau*xf2*xf2) / 4
	su := (4*nucleonMass*e - q2 - ml2) / mm
	if m.anti {
		b = -b
	}
	g := fermiCoupling * cosCabibbo
	return g * g * mm / (8 * math.Pi * e * e) * (a - b*su + c*su*su) * cm2PerInvMeV2
}

// TestMatrixElementEqualMasses checks the production d sigma/dQ2, with equal
// nucleon masses, against two independent computations: Llewellyn Smith's
// closed-form A, B, C and the explicit Dirac traces of trace_test.go.
// Both agree to rounding (1e-10 relative).
func TestMatrixElementEqualMasses(t *testing.T) {
	for _, anti := range []bool{false, true} {
		for _, ml := range []float64{phys.ElectronMass, phys.MuonMass} {
			m := qeModel{anti: anti, lepMass: ml, ma2: DefaultAxialMass * DefaultAxialMass,
				mi: nucleonMass, mf: nucleonMass}
			for _, e := range []float64{250, 600, 1500, 8000} {
				ch := channel{model: m}
				lo, hi, ok := ch.q2Range(e)
				if !ok {
					t.Fatalf("no range at %g MeV", e)
				}
				for _, f := range []float64{0.001, 0.1, 0.4, 0.7, 0.999} {
					q2 := lo + f*(hi-lo)
					got := m.dSigma(e, q2)
					ls := llewellynSmith(m, e, q2)
					tr := traceDSigma(m, anti, e, q2, nucleonMass, nucleonMass)
					if math.Abs(got/ls-1) > 1e-10 || math.Abs(got/tr-1) > 1e-10 {
						t.Errorf("anti=%v m=%g E=%g Q2=%g: dSigma %g, Llewellyn Smith %g, traces %g", anti, ml, e, q2, got, ls, tr)
					}
				}
			}
		}
	}
}

// TestMatrixElementPhysicalMasses checks the production form (Strumia and
// Vissani's A, B, C with the mass difference) against the Dirac traces
// with the physical proton and neutron masses, from 5 MeV to 10 GeV:
// agreement to rounding (1e-9 relative).
func TestMatrixElementPhysicalMasses(t *testing.T) {
	for _, nu := range []int{phys.ElectronNeu, phys.AntiElecNeu, phys.MuonNeu, phys.AntiMuonNeu} {
		ch, err := newChannel(nu, DefaultAxialMass)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range []float64{5, 30, 150, 300, 1000, 10000} {
			lo, hi, ok := ch.q2Range(e)
			if !ok {
				continue // below the muon threshold
			}
			for _, f := range []float64{0.001, 0.3, 0.6, 0.999} {
				q2 := lo + f*(hi-lo)
				got := ch.model.dSigma(e, q2)
				tr := traceDSigma(ch.model, ch.model.anti, e, q2, ch.model.mi, ch.model.mf)
				if math.Abs(got/tr-1) > 1e-9 {
					t.Errorf("%d E=%g Q2=%g: dSigma %g, traces %g (ratio %g)", nu, e, q2, got, tr, got/tr)
				}
			}
		}
	}
}

// TestInverseBetaDecay compares nubar_e p -> e+ n at 3-100 MeV with the fit
// to the full tree-level-plus-radiative result of Strumia and Vissani,
// Phys. Lett. B 564 (2003) 42 (from memory):
// sigma = 1e-43 cm^2 p_e E_e E^(-0.07056 + 0.02018 ln E - 0.001953 ln^3 E),
// E_e = E - (M_n - M_p), energies in MeV. This formula leaves out
// radiative corrections (a few per cent, raising the cross-section) and
// uses g_A = -1.2754 where the fit used about -1.27 (0.8% in 1 + 3 g_A^2):
// the ratio must lie in [0.95, 1.01].
func TestInverseBetaDecay(t *testing.T) {
	for _, e := range []float64{3, 5, 10, 20, 40, 70, 100} {
		got, err := FreeCrossSection(phys.AntiElecNeu, e, DefaultAxialMass)
		if err != nil {
			t.Fatal(err)
		}
		ee := e - (phys.NeutronMass - phys.ProtonMass)
		pe := math.Sqrt(ee*ee - phys.ElectronMass*phys.ElectronMass)
		l := math.Log(e)
		want := 1e-43 * pe * ee * math.Pow(e, -0.07056+0.02018*l-0.001953*l*l*l)
		if r := got / want; r < 0.95 || r > 1.01 {
			t.Errorf("E = %g MeV: sigma = %.4g cm^2, Strumia-Vissani fit %.4g (ratio %.4f)", e, got, want, r)
		}
	}
}

// TestPlateau checks the free-neutron nu_mu n -> mu- p cross-section with
// M_A about 1 GeV against the known plateau of the Llewellyn Smith curve:
// about 1.0e-38 cm^2 from 1.5 GeV up (from memory; we allow 0.9-1.15e-38);
// and that nubar_mu p -> mu+ n is smaller (destructive V-A interference)
// but tends to the same limit, the interference term falling as 1/E.
func TestPlateau(t *testing.T) {
	for _, e := range []float64{1500, 2000, 3000, 5000} {
		s, _ := FreeCrossSection(phys.MuonNeu, e, DefaultAxialMass)
		if s < 0.9e-38 || s > 1.15e-38 {
			t.Errorf("nu_mu n at %g MeV: %.4g cm^2, want 0.9-1.15e-38", e, s)
		}
		sb, _ := FreeCrossSection(phys.AntiMuonNeu, e, DefaultAxialMass)
		if !(sb < s) {
			t.Errorf("nubar_mu p at %g MeV: %.4g cm^2 not below nu_mu n %.4g", e, sb, s)
		}
	}
	d1, d2 := relDiff(t, 1e4), relDiff(t, 1e5)
	// 1/E fall-off: a tenfold energy must cut the difference by about 10 (>5).
	if !(d2 < d1/5) || d2 > 0.03 {
		t.Errorf("nu - nubar relative difference %g at 10 GeV, %g at 100 GeV: not falling as 1/E", d1, d2)
	}
	if _, err := FreeCrossSection(phys.Electron, 1000, DefaultAxialMass); err == nil {
		t.Error("FreeCrossSection accepted PDG 11")
	}
	if _, err := FreeCrossSection(phys.MuonNeu, math.NaN(), DefaultAxialMass); err == nil {
		t.Error("FreeCrossSection accepted a NaN energy")
	}
	if s, _ := FreeCrossSection(phys.MuonNeu, 100, DefaultAxialMass); s != 0 {
		t.Errorf("nu_mu below the muon threshold: %g", s)
	}
}

func relDiff(t *testing.T, e float64) float64 {
	s, _ := FreeCrossSection(phys.MuonNeu, e, DefaultAxialMass)
	sb, _ := FreeCrossSection(phys.AntiMuonNeu, e, DefaultAxialMass)
	return (s - sb) / s
}

// TestQuadrature checks the panel integration against a closed form: the
// integral of the dipole squared (1+x/a)^-4 over [0, b] is
// a/3 (1 - (1+b/a)^-3).
func TestQuadrature(t *testing.T) {
	a, b := 1.03e6, 1.8e7
	got := integratePanels(func(x float64) float64 { return math.Pow(1+x/a, -4) }, 0, b)
	want := a / 3 * (1 - math.Pow(1+b/a, -3))
	if math.Abs(got/want-1) > 1e-10 {
		t.Errorf("integral %g, closed form %g", got, want)
	}
}
