package muon

import (
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/heavy"
	"github.com/conelight/conelight/sim/phys"
)

// Decay and capture constants.
const (
	// MichelEndpoint is the largest decay-electron total energy W =
	// (m_mu^2 + m_e^2)/(2 m_mu) = 52.83 MeV, from two-body kinematics with
	// massless neutrinos.
	MichelEndpoint = (phys.MuonMass*phys.MuonMass + phys.ElectronMass*phys.ElectronMass) / (2 * phys.MuonMass)

	// OxygenLifetime is the total mean life (ns) of a negative muon bound
	// in oxygen, decay plus nuclear capture (Suzuki, Measday and
	// Roalsvig, Phys. Rev. C 35 (1987) 2212). In water a muon caught by
	// hydrogen is passed on to oxygen quickly, so this value applies to
	// every stopped mu-.
	OxygenLifetime = 1795.4
	// HuffFactorOxygen is the ratio of the bound to the free decay rate
	// for a muon in the 1s orbit of oxygen (Huff, Ann. Phys. 16 (1961)
	// 288, as used by Suzuki et al.; 0.998 from memory).
	HuffFactorOxygen = 0.998
	// CaptureFraction is the fraction of stopped mu- captured by the
	// oxygen nucleus: 1 - Q tau_O / tau_free = 0.184 with the rates above
	// (Lambda_total = Lambda_capture + Q Lambda_free).
	CaptureFraction = 1 - HuffFactorOxygen*OxygenLifetime/phys.MuonLifetime
)

// SampleMichel returns x = E_e/MichelEndpoint for one muon decay, drawn
// from the Michel spectrum dN/dx ~ x^2 (3 - 2x) on [m_e/W, 1]: the V-A
// shape with the Michel parameters rho = 3/4, eta = 0, the electron mass
// neglected in the shape and radiative corrections neglected (they soften
// the spectrum by a few per cent near the endpoint). x is proposed from
// 3x^2 (x = U^(1/3)) and kept with probability (3 - 2x)/3, so half of the
// proposals are kept.
func SampleMichel(rng *rand.Rand) float64 {
	const xMin = phys.ElectronMass / MichelEndpoint
	for {
		x := math.Cbrt(rng.Float64())
		if x > xMin && 3*rng.Float64() < 3-2*x {
			return x
		}
	}
}

// MichelElectron returns the kinetic energy and direction of the decay
// electron of a muon moving along dir with kinematics k (k.Ekin() = 0 for
// a decay at rest): energy from SampleMichel and an isotropic direction in
// the muon rest frame (muon polarization neglected), boosted to the
// laboratory along dir.
func MichelElectron(k heavy.Kinematics, dir r3.Vector, rng *rand.Rand) (ekin float64, eDir r3.Vector) {
	const me = phys.ElectronMass
	eStar := SampleMichel(rng) * MichelEndpoint
	pStar := math.Sqrt(eStar*eStar - me*me)
	c := 2*rng.Float64() - 1
	nStar := phys.Deflect(dir, c, 2*math.Pi*rng.Float64())
	if k.Ekin() <= 0 {
		return eStar - me, nStar
	}
	gamma := k.Etot() / phys.MuonMass
	bg := k.Momentum() / phys.MuonMass
	// Lorentz boost along dir: E = gamma E* + bg p*_par, p_par = gamma p*_par + bg E*,
	// the transverse momentum unchanged.
	pPar := pStar * c
	e := gamma*eStar + bg*pPar
	pParLab := gamma*pPar + bg*eStar
	pv := dir.Mul(pParLab).Add(nStar.Sub(dir.Mul(c)).Mul(pStar))
	return e - me, pv.Normalize()
}
