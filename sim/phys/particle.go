package phys

import (
	"fmt"
	"math"
	"strings"

	"github.com/golang/geo/r3"
)

// PDG Monte Carlo particle codes used by conelight.
const (
	Electron    = 11
	Positron    = -11
	ElectronNeu = 12
	AntiElecNeu = -12
	MuonMinus   = 13
	MuonPlus    = -13
	MuonNeu     = 14
	AntiMuonNeu = -14
	Gamma       = 22
	ProtonCode  = 2212
	NeutronCode = 2112
)

// Species describes one particle kind.
type Species struct {
	PDG    int
	Name   string
	Mass   float64 // MeV
	Charge int     // in units of the positron charge
}

// Lookup returns the species of a PDG code, or an error naming the code
// when conelight does not know it.
func Lookup(pdg int) (Species, error) {
	switch pdg {
	case Electron:
		return Species{pdg, "e-", ElectronMass, -1}, nil
	case Positron:
		return Species{pdg, "e+", ElectronMass, +1}, nil
	case MuonMinus:
		return Species{pdg, "mu-", MuonMass, -1}, nil
	case MuonPlus:
		return Species{pdg, "mu+", MuonMass, +1}, nil
	case Gamma:
		return Species{pdg, "gamma", 0, 0}, nil
	case ElectronNeu:
		return Species{pdg, "nu_e", 0, 0}, nil
	case AntiElecNeu:
		return Species{pdg, "anti-nu_e", 0, 0}, nil
	case MuonNeu:
		return Species{pdg, "nu_mu", 0, 0}, nil
	case AntiMuonNeu:
		return Species{pdg, "anti-nu_mu", 0, 0}, nil
	case ProtonCode:
		return Species{pdg, "p", ProtonMass, +1}, nil
	case NeutronCode:
		return Species{pdg, "n", NeutronMass, 0}, nil
	case PionPlusCode:
		return Species{pdg, "pi+", PionMass, +1}, nil
	case PionMinusCode:
		return Species{pdg, "pi-", PionMass, -1}, nil
	case NeutralPionCode:
		return Species{pdg, "pi0", PionZeroMass, 0}, nil
	}
	return Species{}, fmt.Errorf("phys: unknown PDG code %d", pdg)
}

// KnownPDG returns the PDG codes Lookup knows, in the order of the
// constants above.
func KnownPDG() []int {
	return []int{Electron, Positron, ElectronNeu, AntiElecNeu, MuonMinus, MuonPlus, MuonNeu, AntiMuonNeu, Gamma, ProtonCode, NeutronCode, PionPlusCode, PionMinusCode, NeutralPionCode}
}

// ParsePDG returns the PDG code of a particle name of the table ("e-",
// "e+", "mu-", "mu+", "gamma", "nu_e", "anti-nu_e", "nu_mu", "anti-nu_mu",
// "p", "n", "pi+", "pi-", "pi0"): the inverse of PDGName. An unknown name is an error listing
// the known ones.
func ParsePDG(name string) (int, error) {
	var names []string
	for _, pdg := range KnownPDG() {
		sp, _ := Lookup(pdg)
		if sp.Name == name {
			return pdg, nil
		}
		names = append(names, sp.Name)
	}
	return 0, fmt.Errorf("phys: unknown particle name %q (known: %s)", name, strings.Join(names, ", "))
}

// PDGName returns the name of a PDG code for labels ("mu-" for 13), or
// "PDG <code>" for a code conelight does not know.
func PDGName(pdg int) string {
	if sp, err := Lookup(pdg); err == nil {
		return sp.Name
	}
	return fmt.Sprintf("PDG %d", pdg)
}

// Beta returns v/c of a particle of the given mass with kinetic energy
// ekin (both MeV). Massless particles give 1.
func Beta(ekin, mass float64) float64 {
	if mass == 0 {
		return 1
	}
	gamma := 1 + ekin/mass
	return math.Sqrt(1 - 1/(gamma*gamma))
}

// Momentum returns |p| (MeV/c) for kinetic energy ekin and mass (MeV).
func Momentum(ekin, mass float64) float64 {
	return math.Sqrt(ekin * (ekin + 2*mass))
}

// KineticFromMomentum returns the kinetic energy (MeV) for momentum p
// (MeV/c) and mass (MeV).
func KineticFromMomentum(p, mass float64) float64 {
	return math.Hypot(p, mass) - mass
}

// Particle is the state of one particle at a point: the input of every
// transport routine and the form secondaries are reported in.
type Particle struct {
	PDG  int
	Pos  r3.Vector // cm
	Dir  r3.Vector // unit vector
	Time float64   // ns
	Ekin float64   // kinetic energy, MeV
	// Parent is the track number of the particle that made this one
	// (0 for a primary); Track is this particle's own number, assigned
	// by the transport engine.
	Parent, Track int
}

// Segment is a straight piece of a charged track, the unit handed to the
// Cherenkov emitter. The speed changes linearly in path length from Beta0
// at Start to Beta1 at End; T0 and T1 are the times at the two ends.
type Segment struct {
	Start, End   r3.Vector
	T0, T1       float64 // ns
	Beta0, Beta1 float64
	Charge       int // in units of the positron charge; the yield goes as Charge^2
	PDG          int
	Track        int
}

// Length returns the straight-line length of the segment in cm.
func (s Segment) Length() float64 { return s.End.Sub(s.Start).Norm() }

// Sink receives what transport produces. Implementations decide what to
// keep: the event simulator turns segments into Cherenkov photons and
// pushes secondaries on its stack; tests may only count.
type Sink interface {
	// Segment reports a charged step.
	Segment(s Segment)
	// Secondary reports a new particle to be transported later.
	Secondary(p Particle)
	// Deposit reports energy (MeV) given to the water at a point and time,
	// e.g. a particle stopped below its tracking cut.
	Deposit(pos r3.Vector, t, energy float64, track int)
}

// Volume is the region in which particles are tracked; transport stops a
// particle when it leaves it. geom.Tank satisfies it.
type Volume interface {
	Contains(p r3.Vector) bool
}
