package hadron

import (
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

// Nuclear model of 16O: a Fermi gas with Fermi momentum 225 MeV/c and a
// mean removal energy of 27 MeV per nucleon (Moniz et al., Phys. Rev.
// Lett. 26 (1971) 445, values for 12C and 16O from memory).
const (
	fermiMomentum = 225.0
	removalEnergy = 27.0
	// De-excitation gammas of the p3/2-hole states of 15N (6.32 MeV) and
	// 15O (6.18 MeV), the main gamma lines after a nucleon is knocked out
	// of 16O (Ejiri, Phys. Rev. C 48 (1993) 1442; energies from the
	// nuclear data sheets, from memory).
	gamma15N = 6.32
	gamma15O = 6.18
	// p3/2HoleFraction is the chance that the knocked-out nucleon came
	// from the p3/2 shell: 4 of the 8 protons (neutrons) of 16O by shell
	// counting (s1/2: 2, p3/2: 4, p1/2: 2). The s1/2 holes decay mostly
	// by particle emission and the p1/2 hole is the ground state, so they
	// give no gamma here. Ejiri's estimate is close to this (from memory).
	p32HoleFraction = 0.5
	// maxPauliTries bounds the redraws of a Pauli-blocked collision.
	maxPauliTries = 20
)

// nucleonMass returns the mass of a proton or neutron code.
func nucleonMass(pdg int) float64 {
	if pdg == phys.NeutronCode {
		return phys.NeutronMass
	}
	return phys.ProtonMass
}

// fermiNucleon returns a bound nucleon: momentum uniform in the Fermi
// sphere, energy on shell less the removal energy.
func fermiNucleon(m float64, rng *rand.Rand) phys.FourMomentum {
	p := fermiMomentum * math.Cbrt(rng.Float64())
	dir := isotropic(rng)
	return phys.FourMomentum{E: math.Sqrt(m*m+p*p) - removalEnergy, P: dir.Mul(p)}
}

// isotropic returns a unit vector uniform on the sphere.
func isotropic(rng *rand.Rand) r3.Vector {
	return phys.Deflect(r3.Vector{Z: 1}, 2*rng.Float64()-1, 2*math.Pi*rng.Float64())
}

// product is an outgoing particle of an interaction.
type product struct {
	pdg int
	p   phys.FourMomentum
}

// twoBody decays the system tot into masses m1, m2 with the polar angle of
// particle 1 about axis (in the system's rest frame) drawn from cosDist,
// and returns both four-momenta in the laboratory. ok is false below
// threshold.
func twoBody(tot phys.FourMomentum, m1, m2 float64, axis r3.Vector, cosDist func(*rand.Rand) float64, rng *rand.Rand) (a, b phys.FourMomentum, ok bool) {
	w := tot.Mass()
	if w <= m1+m2 {
		return a, b, false
	}
	q := phys.TwoBodyMomentum(w, m1, m2)
	beta := tot.Velocity()
	// The axis in the rest frame: the boosted incoming direction.
	ax := phys.FourMomentum{E: 1, P: axis}.Boost(beta.Mul(-1)).P
	if ax.Norm2() == 0 {
		ax = r3.Vector{Z: 1}
	}
	d := phys.Deflect(ax.Normalize(), cosDist(rng), 2*math.Pi*rng.Float64())
	a = phys.FourMomentum{E: math.Hypot(q, m1), P: d.Mul(q)}.Boost(beta)
	b = phys.FourMomentum{E: math.Hypot(q, m2), P: d.Mul(-q)}.Boost(beta)
	return a, b, true
}

// uniformCos draws an isotropic cos theta.
func uniformCos(rng *rand.Rand) float64 { return 2*rng.Float64() - 1 }

// deltaCos draws cos theta from 1 + 3 cos^2 theta, the angular
// distribution of pi N -> Delta(1232) -> pi N (p-wave, J = 3/2), by
// rejection from the uniform.
func deltaCos(rng *rand.Rand) float64 {
	for {
		c := 2*rng.Float64() - 1
		if 4*rng.Float64() < 1+3*c*c {
			return c
		}
	}
}

// deexcitation returns the gamma left by a nucleon of kind holePDG
// knocked out of 16O (PDG 0 if none).
func deexcitation(holePDG int, rng *rand.Rand) (float64, bool) {
	if rng.Float64() >= p32HoleFraction {
		return 0, false
	}
	if holePDG == phys.ProtonCode {
		return gamma15N, true
	}
	return gamma15O, true
}

// knockOut scatters the projectile (code projPDG, four-momentum proj) off
// a bound nucleon of kind targetPDG in 16O, giving outgoing codes out1
// (the scattered projectile) and out2 (the nucleon), with polar angle
// distribution cosDist in the pair's rest frame, and the de-excitation
// gamma of the hole it leaves. Collisions leaving the nucleon below the
// Fermi momentum are Pauli-blocked and redrawn (at most maxPauliTries
// times, then kept). ok is false when the pair is below threshold for
// every draw.
func knockOut(proj phys.FourMomentum, targetPDG, out1, out2 int, m1 float64, cosDist func(*rand.Rand) float64, rng *rand.Rand, dst []product) ([]product, bool) {
	m2 := nucleonMass(out2)
	for try := 0; try < maxPauliTries; try++ {
		n := fermiNucleon(nucleonMass(targetPDG), rng)
		a, b, ok := twoBody(proj.Add(n), m1, m2, proj.P.Normalize(), cosDist, rng)
		if !ok {
			continue
		}
		if b.P.Norm() < fermiMomentum && try < maxPauliTries-1 {
			continue
		}
		dst = append(dst, product{out1, a}, product{out2, b})
		if g, ok := deexcitation(targetPDG, rng); ok {
			dst = append(dst, product{phys.Gamma, phys.FourMomentum{E: g, P: isotropic(rng).Mul(g)}})
		}
		return dst, true
	}
	return dst, false
}

// pairAbsorb absorbs a pion of four-momentum pi on a nucleon pair of
// 16O, emitting nucleons of codes n1 and n2 isotropically in the
// pair-plus-pion rest frame.
func pairAbsorb(pi phys.FourMomentum, n1, n2 int, rng *rand.Rand, dst []product) []product {
	// A quasi-deuteron (pn pair) for the absorption.
	tot := pi.Add(fermiNucleon(phys.ProtonMass, rng)).Add(fermiNucleon(phys.NeutronMass, rng))
	a, b, ok := twoBody(tot, nucleonMass(n1), nucleonMass(n2), r3.Vector{Z: 1}, uniformCos, rng)
	if !ok {
		return dst
	}
	return append(dst, product{n1, a}, product{n2, b})
}
