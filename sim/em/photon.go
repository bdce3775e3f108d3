package em

import (
	"math"
	"math/rand/v2"

	"github.com/conelight/conelight/sim/phys"
)

// kleinNishina returns the Klein-Nishina total cross-section per free
// electron (cm^2) for a photon of energy k (MeV) (Klein and Nishina 1929;
// e.g. PDG Review, "Passage of particles through matter"):
//
//	sigma = 2 pi r_e^2 {(1+c)/c^2 [2(1+c)/(1+2c) - ln(1+2c)/c] + ln(1+2c)/(2c) - (1+3c)/(1+2c)^2},  c = k/m.
//
// Below c = 1e-3 the Thomson limit with its first correction is used to
// avoid cancellation.
func kleinNishina(k float64) float64 {
	const re2 = phys.ClassicalElectronRadius * phys.ClassicalElectronRadius
	c := k / phys.ElectronMass
	if c < 1e-3 {
		return 8 * math.Pi / 3 * re2 * (1 - 2*c)
	}
	l := math.Log1p(2 * c)
	d := 1 + 2*c
	return 2 * math.Pi * re2 * ((1+c)/(c*c)*(2*(1+c)/d-l/c) + l/(2*c) - (1+3*c)/(d*d))
}

// sampleCompton draws eps = k'/k of the scattered photon from the
// Klein-Nishina distribution by the composition and rejection method of
// Butcher and Messel (Nucl. Phys. 20 (1960) 15): eps from 1/eps on
// [eps0, 1] or from eps on [eps0, 1] with weights ln(1/eps0) and
// (1 - eps0^2)/2, accepted with 1 - eps sin^2(theta)/(1 + eps^2). It
// returns eps and cos(theta) of the photon. Exact for free electrons at
// rest.
func sampleCompton(k float64, rng *rand.Rand) (eps, cosTheta float64) {
	c := k / phys.ElectronMass
	eps0 := 1 / (1 + 2*c)
	a1 := -math.Log(eps0)
	a2 := (1 - eps0*eps0) / 2
	for {
		if rng.Float64()*(a1+a2) < a1 {
			eps = math.Exp(-a1 * rng.Float64())
		} else {
			eps = math.Sqrt(eps0*eps0 + (1-eps0*eps0)*rng.Float64())
		}
		t := (1 - eps) / (c * eps) // 1 - cos(theta)
		sin2 := t * (2 - t)
		if rng.Float64() <= 1-eps*sin2/(1+eps*eps) {
			return eps, 1 - t
		}
	}
}

// heitler returns the cross-section (cm^2) per electron at rest for
// two-photon annihilation in flight of a positron with Lorentz factor
// gamma (Heitler, The Quantum Theory of Radiation, 3rd ed. 1954):
//
//	sigma = pi r_e^2/(gamma+1) [(gamma^2+4 gamma+1)/(gamma^2-1) ln(gamma + sqrt(gamma^2-1)) - (gamma+3)/sqrt(gamma^2-1)].
func heitler(gamma float64) float64 {
	const re2 = phys.ClassicalElectronRadius * phys.ClassicalElectronRadius
	g2 := gamma*gamma - 1
	if g2 <= 0 {
		return 0
	}
	sq := math.Sqrt(g2)
	return math.Pi * re2 / (gamma + 1) * ((gamma*gamma+4*gamma+1)/g2*math.Log(gamma+sq) - (gamma+3)/sq)
}

// sampleAnnihilation draws the fraction eps = k1/(E + m) of the available
// energy taken by one photon from the Heitler differential cross-section
//
//	dsigma/deps = pi r_e^2 / ((gamma+1)(gamma^2-1)) S(eps),  S = -(gamma+1)^2 + (gamma^2+4 gamma+1)/eps - 1/eps^2,
//
// on [eps_min, eps_max] = [1 -+ sqrt((gamma-1)/(gamma+1))]/2 (its
// integral is heitler). eps is drawn from 1/eps and accepted with
// eps S(eps)/(gamma^2+4 gamma+1) < 1.
func sampleAnnihilation(gamma float64, rng *rand.Rand) float64 {
	b := math.Sqrt((gamma - 1) / (gamma + 1))
	lo, hi := (1-b)/2, (1+b)/2
	g1 := (gamma + 1) * (gamma + 1)
	c := gamma*gamma + 4*gamma + 1
	ratio := hi / lo
	for {
		eps := lo * math.Pow(ratio, rng.Float64())
		if rng.Float64()*c <= c-g1*eps-1/eps {
			return eps
		}
	}
}

// Photoelectric absorption in water: the NIST XCOM photoelectric
// cross-section of water (cm^2/g) on the XCOM standard energy grid,
// entered from memory (no download was possible): good to a few percent
// up to 0.1 MeV, to perhaps 20% above, where it is below 1e-3 of the
// attenuation and hardly matters (the default photon cut is 0.415 MeV).
// Interpolated log-log, extrapolated with the end slopes.
var photoTableE = [...]float64{
	1e-3, 1.5e-3, 2e-3, 3e-3, 4e-3, 5e-3, 6e-3, 8e-3, 1e-2, 1.5e-2, 2e-2, 3e-2, 4e-2,
	5e-2, 6e-2, 8e-2, 0.1, 0.15, 0.2, 0.3, 0.4, 0.5, 0.6, 0.8, 1.0, 1.25, 1.5, 2.0,
}

var photoTableMu = [...]float64{
	4.076e3, 1.372e3, 6.169e2, 1.917e2, 8.191e1, 4.188e1, 2.413e1, 1.004e1, 4.944, 1.374, 5.503e-1, 1.557e-1, 6.246e-2,
	3.066e-2, 1.708e-2, 6.810e-3, 2.760e-3, 7.475e-4, 3.014e-4, 8.578e-5, 3.727e-5, 2.040e-5, 1.298e-5, 6.693e-6, 4.289e-6, 2.894e-6, 2.167e-6, 1.446e-6,
}

// photoelectricMassAtt returns the photoelectric mass attenuation of water
// (cm^2/g) at photon energy k (MeV).
func photoelectricMassAtt(k float64) float64 {
	n := len(photoTableE)
	i := 0
	switch {
	case k <= photoTableE[0]:
		i = 0
	case k >= photoTableE[n-1]:
		i = n - 2
	default:
		for photoTableE[i+1] < k {
			i++
		}
	}
	x0, x1 := math.Log(photoTableE[i]), math.Log(photoTableE[i+1])
	y0, y1 := math.Log(photoTableMu[i]), math.Log(photoTableMu[i+1])
	return math.Exp(y0 + (y1-y0)*(math.Log(k)-x0)/(x1-x0))
}

// oxygenKBinding is the K-shell binding energy of oxygen (MeV), 0.53 keV
// (X-ray data booklet value, from memory): a photoelectron leaves with the
// photon energy minus it, and it is deposited on the spot (the Auger
// electrons and fluorescence that follow are far below any cut).
const oxygenKBinding = 0.53e-3
