package phys

import (
	"fmt"
	"math"
)

// OxygenBindingEnergy is the binding energy E_b (MeV) taken off a nucleon
// struck in 16O, in the relativistic Fermi gas of the quasi-elastic
// generator (sim/gen.OxygenFermiGas) and in the neutrino energy the
// reconstruction infers from a lepton: a value commonly used for oxygen in
// neutrino work, close to the fits to quasi-elastic electron scattering of
// Moniz et al., Phys. Rev. Lett. 26 (1971) 445 for neighbouring nuclei
// (from memory; common practice).
const OxygenBindingEnergy = 27.0

// QuasiElasticEnergy returns the neutrino energy (MeV) of a quasi-elastic
// interaction nu N -> l N' reconstructed from the charged lepton alone,
// assuming the struck nucleon at rest with its mass reduced by the binding
// energy, M' = initialMass - bindingEnergy:
//
//	E_nu = (2 M' E_l - (M'^2 + m_l^2 - M_f^2)) / (2 (M' - E_l + p_l cos theta))
//
// from (k + P - k_l)^2 = M_f^2 with P = (M', 0). eLepton is the lepton's
// total energy E_l (MeV), cosTheta the cosine of its angle to the neutrino
// direction, leptonMass m_l, finalMass M_f the outgoing nucleon's mass.
// The same form serves neutrinos (initial neutron, final proton) and
// antineutrinos (initial proton, final neutron); only the masses change.
// With bindingEnergy 0 and the free masses it is exact for a nucleon at
// rest. Errors name the bad argument; an unphysical combination (a
// non-positive denominator or result) is an error too.
func QuasiElasticEnergy(eLepton, cosTheta, leptonMass, initialMass, bindingEnergy, finalMass float64) (float64, error) {
	switch {
	case !isFinite(leptonMass) || leptonMass < 0:
		return 0, fmt.Errorf("phys: QuasiElasticEnergy: leptonMass = %g must be finite and >= 0", leptonMass)
	case !isFinite(eLepton) || eLepton < leptonMass:
		return 0, fmt.Errorf("phys: QuasiElasticEnergy: eLepton = %g must be finite and >= leptonMass %g", eLepton, leptonMass)
	case math.IsNaN(cosTheta) || math.Abs(cosTheta) > 1:
		return 0, fmt.Errorf("phys: QuasiElasticEnergy: cosTheta = %g must be in [-1, 1]", cosTheta)
	case !isFinite(initialMass) || !(initialMass > 0):
		return 0, fmt.Errorf("phys: QuasiElasticEnergy: initialMass = %g must be positive and finite", initialMass)
	case !isFinite(finalMass) || !(finalMass > 0):
		return 0, fmt.Errorf("phys: QuasiElasticEnergy: finalMass = %g must be positive and finite", finalMass)
	case !isFinite(bindingEnergy) || bindingEnergy < 0 || bindingEnergy >= initialMass:
		return 0, fmt.Errorf("phys: QuasiElasticEnergy: bindingEnergy = %g must be finite, >= 0 and below initialMass", bindingEnergy)
	}
	m := initialMass - bindingEnergy
	pl := math.Sqrt((eLepton - leptonMass) * (eLepton + leptonMass))
	den := 2 * (m - eLepton + pl*cosTheta)
	num := 2*m*eLepton - (m*m + leptonMass*leptonMass - finalMass*finalMass)
	if !(den > 0) || !(num > 0) {
		return 0, fmt.Errorf("phys: QuasiElasticEnergy: no quasi-elastic solution for eLepton = %g MeV, cosTheta = %g", eLepton, cosTheta)
	}
	return num / den, nil
}

// QuasiElasticEnergyOf is QuasiElasticEnergy for a charged lepton given by
// its PDG code and kinetic energy ekin (MeV): l- means nu n -> l- p, l+
// means nubar p -> l+ n, with the PDG masses.
func QuasiElasticEnergyOf(lepton int, ekin, cosTheta, bindingEnergy float64) (float64, error) {
	var mi, mf float64
	switch lepton {
	case Electron, MuonMinus:
		mi, mf = NeutronMass, ProtonMass
	case Positron, MuonPlus:
		mi, mf = ProtonMass, NeutronMass
	default:
		return 0, fmt.Errorf("phys: QuasiElasticEnergyOf: lepton = %d is not e-, e+, mu- or mu+", lepton)
	}
	sp, _ := Lookup(lepton)
	if !isFinite(ekin) || ekin < 0 {
		return 0, fmt.Errorf("phys: QuasiElasticEnergyOf: ekin = %g must be finite and >= 0", ekin)
	}
	return QuasiElasticEnergy(ekin+sp.Mass, cosTheta, sp.Mass, mi, bindingEnergy, mf)
}

func isFinite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
