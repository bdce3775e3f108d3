package em

import (
	"fmt"
	"math"

	"github.com/conelight/conelight/sim/phys"
)

// checkEnergy validates an energy argument of the reference functions.
func checkEnergy(name string, e float64) error {
	if !(e >= gridMin && e <= MaxEkin) {
		return fmt.Errorf("em: %s = %g MeV outside the model range [%g, %g] MeV", name, e, gridMin, MaxEkin)
	}
	return nil
}

func isPositron(pdg int) (bool, error) {
	switch pdg {
	case phys.Electron:
		return false, nil
	case phys.Positron:
		return true, nil
	}
	return false, fmt.Errorf("em: PDG code %d is not an electron (11) or positron (-11)", pdg)
}

// CollisionStoppingPower returns the unrestricted mass collision stopping
// power (MeV cm^2/g) of an electron (pdg 11) or positron (-11) of kinetic
// energy ekin (MeV): the ICRU Report 37 formula with the Sternheimer
// density effect of the medium.
func (p *Physics) CollisionStoppingPower(pdg int, ekin float64) (float64, error) {
	return p.RestrictedCollisionStoppingPower(pdg, ekin, math.Inf(1))
}

// RestrictedCollisionStoppingPower returns the mass collision stopping
// power (MeV cm^2/g) counting only energy transfers below cut (MeV): the
// Berger-Seltzer restricted formula of ICRU Report 37. A cut above the
// largest transfer (T/2 for e-, T for e+) gives the unrestricted value.
func (p *Physics) RestrictedCollisionStoppingPower(pdg int, ekin, cut float64) (float64, error) {
	pos, err := isPositron(pdg)
	if err != nil {
		return 0, err
	}
	if err := checkEnergy("ekin", ekin); err != nil {
		return 0, err
	}
	if !(cut > 0) {
		return 0, fmt.Errorf("em: cut = %g MeV must be positive", cut)
	}
	return p.collision(pos, ekin, cut) / p.density, nil
}

// RadiativeStoppingPower returns the mass radiative stopping power
// (MeV cm^2/g) of an electron of kinetic energy ekin (MeV), integrated
// over the whole photon spectrum of the Tsai cross-section. The same
// value is used for positrons (the e+/e- difference, a few percent below
// 1 MeV, is neglected).
func (p *Physics) RadiativeStoppingPower(ekin float64) (float64, error) {
	if err := checkEnergy("ekin", ekin); err != nil {
		return 0, err
	}
	return p.at(p.radTotal, ekin) / p.density, nil
}

// CSDARange returns the continuous-slowing-down range (g/cm^2; divide by
// the density for cm) of an electron or positron of kinetic energy ekin
// (MeV): the integral of 1/(collision + radiative stopping power) from 0.
func (p *Physics) CSDARange(pdg int, ekin float64) (float64, error) {
	pos, err := isPositron(pdg)
	if err != nil {
		return 0, err
	}
	if err := checkEnergy("ekin", ekin); err != nil {
		return 0, err
	}
	c := &p.eminus
	if pos {
		c = &p.eplus
	}
	return p.at(c.csda, ekin) * p.density, nil
}

// ComptonAttenuation returns the mass attenuation coefficient (cm^2/g)
// of incoherent scattering for a photon of energy k (MeV): Klein-Nishina
// on free electrons (no binding correction).
func (p *Physics) ComptonAttenuation(k float64) (float64, error) {
	return p.photonCoef(p.gamma.compton, k)
}

// PairAttenuation returns the mass attenuation coefficient (cm^2/g) of
// pair production in the nuclear field plus triplet production in the
// field of the atomic electrons (Tsai 1974 with screening).
func (p *Physics) PairAttenuation(k float64) (float64, error) {
	nuc, err := p.photonCoef(p.gamma.pairNuc, k)
	if err != nil {
		return 0, err
	}
	el, _ := p.photonCoef(p.gamma.pairEl, k)
	return nuc + el, nil
}

// PhotoelectricAttenuation returns the photoelectric mass attenuation
// coefficient (cm^2/g) at photon energy k (MeV) (NIST XCOM, water).
func (p *Physics) PhotoelectricAttenuation(k float64) (float64, error) {
	return p.photonCoef(p.gamma.photo, k)
}

// TotalAttenuation returns the sum of the Compton, pair and photoelectric
// mass attenuation coefficients (cm^2/g); coherent (Rayleigh) scattering
// is not included (see the package documentation).
func (p *Physics) TotalAttenuation(k float64) (float64, error) {
	return p.photonCoef(p.gamma.total, k)
}

func (p *Physics) photonCoef(tab []float64, k float64) (float64, error) {
	if err := checkEnergy("photon energy", k); err != nil {
		return 0, err
	}
	return p.at(tab, k) / p.density, nil
}

// CriticalEnergy returns the electron critical energy (MeV) in Rossi's
// definition, the one of the PDG tables: the energy at which the
// collision loss per radiation length equals the energy,
// X0 dE/dx_coll(E) = E (bisection on the ICRU 37 stopping power).
func (p *Physics) CriticalEnergy() float64 {
	lo, hi := 1.0, 1e4
	for range 60 {
		mid := math.Sqrt(lo * hi)
		if p.x0*p.collision(false, mid, math.Inf(1)) > mid {
			lo = mid
		} else {
			hi = mid
		}
	}
	return math.Sqrt(lo * hi)
}

// ScaleEnergy is E_s = m sqrt(4 pi/alpha) = 21.2052 MeV (MeV), the energy
// of the Moliere radius (PDG Review, "Passage of particles through
// matter"); TestScaleEnergy recomputes it from the phys constants.
const ScaleEnergy = 21.2052

// MoliereRadius returns R_M = X0 E_s / E_c (cm) with the Rossi critical
// energy (PDG Review, "Passage of particles through matter").
func (p *Physics) MoliereRadius() float64 {
	return p.x0 * ScaleEnergy / p.CriticalEnergy()
}

// RadiationLength returns X0 of the medium (cm).
func (p *Physics) RadiationLength() float64 { return p.x0 }
