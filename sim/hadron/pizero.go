package hadron

import (
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

// DalitzFraction is the pi0 -> e+ e- gamma branching fraction, 1.174%
// (PDG Review 2024); the rest, 98.823%, is pi0 -> gamma gamma (other modes
// below 1e-4 are neglected).
const DalitzFraction = 0.01174

// DecayPiZero decays a pi0 (111) at its starting point and time (its mean
// life, 8.4e-17 s, is a c tau of 25 nm) and reports the products to sink:
// two photons isotropic in the pi0 rest frame, or for the Dalitz decay
// an e+ e- pair and a photon, the pair mass drawn from the Kroll-Wada
// spectrum
//
//	dN/dx ~ (1 - x)^3 / x (1 + 2r/x) sqrt(1 - 4r/x),  x = m_ee^2/m_pi^2, r = m_e^2/m_pi^2
//
// (QED, point-like pi0: the transition form factor, a 3% slope, is
// neglected), the pair isotropic in its rest frame. It returns the number
// of products (2 or 3) and whether the decay was a Dalitz decay.
func DecayPiZero(part phys.Particle, rng *rand.Rand, sink phys.Sink) (n int, dalitz bool) {
	pi := phys.OnShell(phys.PionZeroMass, part.Ekin, part.Dir)
	var prods [3]product
	out := prods[:0]
	if rng.Float64() >= DalitzFraction {
		a, b, _ := twoBody(pi, 0, 0, r3.Vector{Z: 1}, uniformCos, rng)
		out = append(out, product{phys.Gamma, a}, product{phys.Gamma, b})
	} else {
		dalitz = true
		mee := math.Sqrt(sampleKrollWada(rng)) * phys.PionZeroMass
		g, virt, _ := twoBody(pi, 0, mee, r3.Vector{Z: 1}, uniformCos, rng)
		em, ep, _ := twoBody(virt, phys.ElectronMass, phys.ElectronMass, r3.Vector{Z: 1}, uniformCos, rng)
		out = append(out, product{phys.Gamma, g}, product{phys.Electron, em}, product{phys.Positron, ep})
	}
	return emit(out, part.Pos, part.Time, part.Track, sink), dalitz
}

// sampleKrollWada draws x = m_ee^2/m_pi^2 from the Kroll-Wada spectrum:
// x from 1/x on [4r, 1] by inversion, kept with probability
// (1-x)^3 (1 + 2r/x) sqrt(1 - 4r/x), which is at most 1.
func sampleKrollWada(rng *rand.Rand) float64 {
	const r = phys.ElectronMass * phys.ElectronMass / (phys.PionZeroMass * phys.PionZeroMass)
	xmin := 4 * r
	for {
		x := xmin * math.Pow(1/xmin, rng.Float64())
		w := (1 - x) * (1 - x) * (1 - x) * (1 + 2*r/x) * math.Sqrt(math.Max(0, 1-4*r/x))
		if rng.Float64() < w {
			return x
		}
	}
}
