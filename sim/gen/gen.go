package gen

import (
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

// Generator makes the primary particles of one event.
//
// Generate appends the primaries of event number to dst[:0] and returns
// them with the generator truth. Every random number comes from rng, which
// the caller derives from (run seed, number), so the same rng stream gives
// the same event. Generators are immutable and safe for concurrent use; a
// generator that reads a file uses number to pick the event (see HepMC).
// String describes the generator and its settings; it is stored in event
// files.
type Generator interface {
	Generate(number uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, Info, error)
	String() string
}

// Reaction says what made the primaries.
type Reaction int

const (
	// NoReaction: primaries given directly (particle gun, event file).
	NoReaction Reaction = iota
	// CCQE: charged-current quasi-elastic neutrino scattering,
	// nu n -> l- p or nubar p -> l+ n.
	CCQE
)

// String returns "none" or "CCQE".
func (r Reaction) String() string {
	switch r {
	case NoReaction:
		return "none"
	case CCQE:
		return "CCQE"
	}
	return "unknown reaction"
}

// Oxygen16Code is the PDG Monte Carlo code of the 16O nucleus
// (10LZZZAAAI form of the PDG numbering scheme).
const Oxygen16Code = 1000080160

// Info is the generator truth of one event. Neutrino fields are zero when
// the generator made no neutrino interaction. Energies MeV, momenta MeV/c,
// Q2 MeV^2, cm, ns.
type Info struct {
	Reaction Reaction

	// Neutrino interaction truth (QE, and files that carry an incoming
	// neutrino).
	Neutrino     int       // PDG code of the incoming neutrino
	NeutrinoEtot float64   // its total energy, MeV
	NeutrinoDir  r3.Vector // unit
	// Target is the PDG code of what was hit: phys.ProtonCode for the
	// free hydrogen of water (phys.NeutronCode for the FreeNucleon study
	// target), Oxygen16Code for a nucleon bound in oxygen; for a file,
	// the target particle it names (a nucleus as 10LZZZAAAI).
	Target int
	// StruckNucleon is the PDG code of the nucleon that took part (QE).
	StruckNucleon int
	// FermiMomentum is the struck nucleon's momentum before the
	// collision (zero for a free nucleon); BindingEnergy the energy
	// removed from it (0 for a free nucleon).
	FermiMomentum r3.Vector
	BindingEnergy float64
	// Q2 = -(k_nu - k_lepton)^2, MeV^2.
	Q2 float64
	// FinalNucleon is the outgoing nucleon (for a file, the final-state
	// proton or neutron of largest momentum). The simulator does not
	// track nucleons, so it is kept here only and not among the
	// primaries.
	FinalNucleon phys.Particle

	// Event-file truth (HepMC2, HepMC3, NuHepMC).
	SourceEvent int // event number written in the file
	// Process is the file's process ID: the NuHepMC "signal_process_id"
	// (or pre-1.0 "ProcID") attribute, or the signal process ID of a
	// HepMC2 E line; 0 when the file gives none. NuHepMC ranges:
	// 200-299 quasi-elastic, 400-499 resonance, 600-699 deep inelastic,
	// charged current X00-X49, neutral current X50-X99.
	Process int
	// Weight is the event weight: the NuHepMC "CV" weight, else the
	// file's first weight. HasWeight is false when the generator gives
	// none (built-in generators make unweighted events: weight 1).
	Weight    float64
	HasWeight bool
	// LabPos and LabTime are the NuHepMC lab position (cm) and time (ns)
	// of the event; HasLabPos says the file gave them.
	LabPos    r3.Vector
	LabTime   float64
	HasLabPos bool
	// Skipped counts the final-state particles not passed on because the
	// simulator does not track them (neutrinos, hadrons, nuclei, unknown
	// codes); SkippedNeutrinos is how many of them were neutrinos.
	Skipped, SkippedNeutrinos int
}

// EventWeight returns Weight, or 1 when the generator gave none.
func (i *Info) EventWeight() float64 {
	if !i.HasWeight {
		return 1
	}
	return i.Weight
}

// tracked reports whether the event simulator transports particles of this
// PDG code: charged leptons e, mu and photons.
func tracked(pdg int) bool {
	switch pdg {
	case phys.Electron, phys.Positron, phys.MuonMinus, phys.MuonPlus, phys.Gamma:
		return true
	}
	return false
}
