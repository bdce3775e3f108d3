package phys

import (
	"math"
	"testing"
)

func TestQuasiElasticEnergyErrors(t *testing.T) {
	for _, args := range [][6]float64{
		{100, 0.5, MuonMass, NeutronMass, 0, ProtonMass},  // E below mass
		{500, 1.5, MuonMass, NeutronMass, 0, ProtonMass},  // |cos| > 1
		{500, 0.5, MuonMass, math.NaN(), 0, ProtonMass},   // NaN mass
		{500, 0.5, MuonMass, NeutronMass, -1, ProtonMass}, // negative binding
		{5000, -1, MuonMass, NeutronMass, 0, ProtonMass},  // no solution
		{500, 0.5, MuonMass, NeutronMass, 0, math.Inf(1)}, // Inf mass
	} {
		if e, err := QuasiElasticEnergy(args[0], args[1], args[2], args[3], args[4], args[5]); err == nil {
			t.Errorf("QuasiElasticEnergy%v = %g, want an error", args, e)
		}
	}
	if _, err := QuasiElasticEnergyOf(Gamma, 100, 0.5, 0); err == nil {
		t.Error("QuasiElasticEnergyOf accepted a photon")
	}
}

// TestQuasiElasticEnergyTwoBody checks the formula against two-body
// kinematics built independently: a neutrino of energy E on a free neutron
// at rest makes a lepton whose energy at angle theta follows from
// (k + P - k_l)^2 = M_p^2 solved for E_l by bisection; the formula must
// return E.
func TestQuasiElasticEnergyTwoBody(t *testing.T) {
	ml, mn, mp := MuonMass, NeutronMass, ProtonMass
	solved := 0
	for _, e := range []float64{300, 700, 2000} {
		for _, cos := range []float64{0.99, 0.5, 0, -0.7} {
			// Invariant mass of the final nucleon for lepton energy el.
			mf2 := func(el float64) float64 {
				pl := math.Sqrt(el*el - ml*ml)
				// (E + M_n - E_l)^2 - |k - k_l|^2
				en := e + mn - el
				p2 := e*e + pl*pl - 2*e*pl*cos
				return en*en - p2
			}
			lo, hi := ml, e+mn-mp
			if (mf2(lo)-mp*mp)*(mf2(hi)-mp*mp) > 0 {
				continue // no solution at this angle
			}
			for range 200 {
				mid := (lo + hi) / 2
				if (mf2(lo)-mp*mp)*(mf2(mid)-mp*mp) <= 0 {
					hi = mid
				} else {
					lo = mid
				}
			}
			el := (lo + hi) / 2
			solved++
			got, err := QuasiElasticEnergyOf(MuonMinus, el-ml, cos, 0)
			if err != nil || math.Abs(got/e-1) > 1e-9 {
				t.Errorf("E = %g MeV, cos = %g: E_l = %g MeV gives %g (%v)", e, cos, el, got, err)
			}
		}
	}
	if solved < 10 {
		t.Errorf("only %d of 12 energy-angle pairs have a two-body solution", solved)
	}
}
