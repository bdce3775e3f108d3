package heavy

import (
	"errors"
	"fmt"
	"math"

	"github.com/conelight/conelight/sim/phys"
)

// Species describes the heavy charged particle a Physics transports.
type Species struct {
	// Name is used in error messages and String ("muon", "pion").
	Name string
	// Mass is the rest mass, MeV.
	Mass float64
	// Lifetime is the mean life at rest, ns; 0 for a stable particle.
	// The decay point in flight is sampled in proper time.
	Lifetime float64
	// Positive and Negative are the PDG codes of the charge +1 and -1
	// members (0 when the species has no such member).
	Positive, Negative int
	// Radiative adds the muon radiative losses b(E) E (bremsstrahlung,
	// pair production, photonuclear) to the continuous loss. They scale
	// as 1/M^2 (bremsstrahlung) or 1/M (pairs), so for pions and protons
	// they are below 0.1% of the ionization loss up to 10 GeV and are
	// left out.
	Radiative bool
	// Interaction returns the macroscopic hadronic interaction
	// cross-section (1/cm) at kinetic energy T (MeV), or nil for none. It
	// is tabulated once by New; the transport stops the particle with
	// fate phys.Interacted where the accumulated optical depth reaches an
	// exponential draw, and the caller decides what the interaction makes.
	Interaction func(ekin float64) float64

	// mass2 and ratio are M^2 and m_e/M, computed from the constants for
	// the built-in species (the compiler folds constant expressions
	// exactly, runtime arithmetic rounds each operation) and at run time
	// for others.
	mass2, ratio float64
}

// Muon returns the muon species (mu- PDG 13, mu+ PDG -13) with its
// radiative losses and PDG mean life.
func Muon() Species {
	const m = phys.MuonMass
	return Species{Name: "muon", Mass: m, Lifetime: phys.MuonLifetime,
		Positive: phys.MuonPlus, Negative: phys.MuonMinus, Radiative: true,
		mass2: m * m, ratio: phys.ElectronMass / m}
}

// ChargedPion returns the charged pion (pi+ 211, pi- -211) with its PDG
// mean life, without hadronic interactions (set Interaction for them).
func ChargedPion() Species {
	const m = phys.PionMass
	return Species{Name: "pion", Mass: m, Lifetime: phys.PionLifetime,
		Positive: phys.PionPlusCode, Negative: phys.PionMinusCode,
		mass2: m * m, ratio: phys.ElectronMass / m}
}

// Proton returns the proton (2212), stable, without hadronic interactions
// (set Interaction for them).
func Proton() Species {
	const m = phys.ProtonMass
	return Species{Name: "proton", Mass: m, Positive: phys.ProtonCode,
		mass2: m * m, ratio: phys.ElectronMass / m}
}

// withDerived fills the mass terms of a species built by hand.
func (s Species) withDerived() Species {
	if s.mass2 == 0 {
		s.mass2 = s.Mass * s.Mass
		s.ratio = phys.ElectronMass / s.Mass
	}
	return s
}

// check reports an unusable species.
func (s Species) check() error {
	switch {
	case s.Name == "":
		return errors.New("heavy: Species.Name is empty")
	case !(s.Mass >= 50 && s.Mass <= 1e4):
		return fmt.Errorf("heavy: Species.Mass = %g MeV must be in [50, 1e4] (heavy charged particles)", s.Mass)
	case math.IsNaN(s.Lifetime) || math.IsInf(s.Lifetime, 0) || s.Lifetime < 0:
		return fmt.Errorf("heavy: Species.Lifetime = %g ns must be finite and >= 0", s.Lifetime)
	case s.Positive == 0 && s.Negative == 0:
		return errors.New("heavy: Species has neither a Positive nor a Negative PDG code")
	}
	return nil
}

// charge returns the charge of PDG code pdg in the species, or 0 if the
// code is not one of its members.
func (s Species) charge(pdg int) int {
	switch {
	case pdg == 0:
		return 0
	case pdg == s.Positive:
		return 1
	case pdg == s.Negative:
		return -1
	}
	return 0
}
