package heavy

import (
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/conelight/conelight/sim/phys"
)

// sampleDeltaEnergy draws the kinetic energy T (MeV) of a delta ray above
// tcut from the spin-1/2 differential cross-section
//
//	d sigma/dT = 2 pi r_e^2 m_e c^2 z^2 (Z/A) N_A rho / beta^2 / T^2 [1 - beta^2 T/W + T^2/(2E^2)]
//
// (PDG Review, "Passage of particles through matter", delta rays; E the
// particle's total energy, W = W_max): T from 1/T^2 on [tcut, W] by inversion,
// kept with probability equal to the bracket. The bracket is convex in T,
// 1 at T = 0 and 1 - beta^2 + W^2/(2E^2) <= 1 at T = W (W < E), so it never
// exceeds 1 and the rejection is exact. Requires k.tmax > tcut.
func sampleDeltaEnergy(k kinematics, tcut float64, rng *rand.Rand) float64 {
	w := k.tmax
	for {
		t := tcut * w / (w - rng.Float64()*(w-tcut))
		if rng.Float64() < 1-k.beta2*t/w+t*t/(2*k.e*k.e) {
			return t
		}
	}
}

// deltaCosTheta returns the cosine of the angle between a delta ray of
// kinetic energy t and the muon, from two-body kinematics on an electron
// at rest: cos theta = (T/p_e)(p_max/T_max) with p_max/T_max = (E + m_e)/p
// (PDG Review, "Passage of particles through matter", delta-ray angle).
func deltaCosTheta(k kinematics, t float64) float64 {
	pe := math.Sqrt(t * (t + 2*phys.ElectronMass))
	return math.Min(1, t/pe*(k.e+phys.ElectronMass)/k.p)
}

// emitDelta samples a delta ray for a particle of kinematics k moving along
// dir and returns the electron's kinetic energy and direction and the
// muon's new direction from momentum conservation (its new kinetic energy
// is k.ekin - T by energy conservation).
func emitDelta(k kinematics, dir r3.Vector, tcut float64, rng *rand.Rand) (t float64, eDir, muDir r3.Vector) {
	t = sampleDeltaEnergy(k, tcut, rng)
	eDir = phys.Deflect(dir, deltaCosTheta(k, t), 2*math.Pi*rng.Float64())
	pe := math.Sqrt(t * (t + 2*phys.ElectronMass))
	muDir = dir.Mul(k.p).Sub(eDir.Mul(pe)).Normalize()
	return t, eDir, muDir
}

// sampleGamma draws from the Gamma distribution of shape a > 0 and unit
// scale (gonum's distuv.Gamma, rate Beta = 1).
func sampleGamma(a float64, rng *rand.Rand) float64 {
	return distuv.Gamma{Alpha: a, Beta: 1, Src: rng}.Rand()
}

// bohrVariance returns the variance (MeV^2) of the loss to collisions
// below tup over a path of length s (cm): the second moment of the
// spin-1/2 cross-section,
//
//	(K/2)(Z/A) rho s / beta^2 [T_up - beta^2 T_up^2/(2W) + T_up^3/(6E^2)],
//
// which for T_up = W is Bohr's variance with its (1 - beta^2/2) factor
// (Bohr 1915; PDG Review, "Passage of particles through matter",
// fluctuations in energy loss).
func (p *Physics) bohrVariance(k kinematics, tup, s float64) float64 {
	if tup > k.tmax {
		tup = k.tmax
	}
	return p.deltaNorm * s / k.beta2 * (tup - k.beta2*tup*tup/(2*k.tmax) + tup*tup*tup/(6*k.e*k.e))
}

// sampleLoss draws the restricted loss over a step with the given mean
// and variance: a Gamma distribution with those two moments. The transfers
// above the cut are explicit, so the loss left is a sum of many collisions
// each below the cut: its mean (restricted Bethe) and variance (restricted
// Bohr) are exact, and the Gamma form keeps it positive and skewed towards
// large losses as the Vavilov distribution is when a step holds few
// collisions near the cut (kappa = xi/T_cut < 1); for many collisions it
// tends to the Gaussian of Bohr's theory. Range and stopping point add up
// tens to hundreds of steps, so only the first two moments matter there.
func sampleLoss(mean, variance float64, rng *rand.Rand) float64 {
	if !(variance > 0) || !(mean > 0) {
		return mean
	}
	scale := variance / mean
	return scale * sampleGamma(mean/scale, rng)
}
