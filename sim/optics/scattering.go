package optics

import (
	"math"
	"math/rand/v2"
)

// Pure-water Rayleigh scattering.
const (
	// WaterDepolarization is the depolarization ratio delta of light
	// scattered by pure water (Morel 1974, in "Optical Aspects of
	// Oceanography", Jerlov and Steemann Nielsen eds.; Farinato and Rowell,
	// J. Chem. Phys. 65 (1976) 593 measured 0.09 too; from memory). It
	// sets the cos^2 weight of the phase function, (1-delta)/(1+delta) = 0.835.
	WaterDepolarization = 0.09
	// RayleighReferenceWavelength (nm) and RayleighReferenceCoefficient
	// (1/cm): total scattering coefficient of pure water b_w(500 nm) =
	// 0.00222 1/m (Morel 1974, pure water; from memory), i.e. a scattering
	// length of 450 m.
	RayleighReferenceWavelength  = 500.0
	RayleighReferenceCoefficient = 0.00222e-2
	// RayleighExponent: b_w goes as lambda^-4.32 (Morel 1974), steeper
	// than lambda^-4 because of the dispersion of the index.
	RayleighExponent = 4.32
)

// rayleighCos2Weight is a in the phase function 1 + a cos^2.
const rayleighCos2Weight = (1 - WaterDepolarization) / (1 + WaterDepolarization)

// pureRayleighCoefficient returns b_w(lambda) in 1/cm.
func pureRayleighCoefficient(lambdaNM float64) float64 {
	return RayleighReferenceCoefficient * math.Pow(lambdaNM/RayleighReferenceWavelength, -RayleighExponent)
}

// RayleighPhase returns the probability density in cos(theta) of the
// pure-water Rayleigh phase function, proportional to
// 1 + ((1-delta)/(1+delta)) cos^2 theta with delta = WaterDepolarization,
// normalized over cos theta in [-1, 1].
func RayleighPhase(cosTheta float64) float64 {
	const a = rayleighCos2Weight
	return (1 + a*cosTheta*cosTheta) / (2 + 2*a/3)
}

// rayleighCDF is the distribution function of RayleighPhase.
func rayleighCDF(mu float64) float64 {
	const a = rayleighCos2Weight
	return ((mu + 1) + a*(mu*mu*mu+1)/3) / (2 + 2*a/3)
}

// rayleighInverseCDF solves rayleighCDF(mu) = u exactly. With
// r = (2 + 2a/3) u - 1 - a/3 the equation is the cubic
// mu^3 + p mu - Q = 0, p = 3/a, Q = 3r/a, with one real root (p > 0).
// Cardano's root is A - p/(3A) with A = cbrt(Q/2 + sqrt(Q^2/4 + p^3/27));
// it is evaluated for |Q| (where the sum has no cancellation) and given
// the sign of Q, the root being odd in Q.
func rayleighInverseCDF(u float64) float64 {
	const a = rayleighCos2Weight
	const p = 3 / a
	r := (2+2*a/3)*u - 1 - a/3
	q := math.Abs(3 * r / a)
	big := math.Cbrt(q/2 + math.Sqrt(q*q/4+p*p*p/27))
	mu := math.Copysign(big-p/(3*big), r)
	return math.Max(-1, math.Min(1, mu))
}

// HenyeyGreensteinPhase returns the Henyey-Greenstein density in
// cos(theta) with asymmetry g (the mean cosine), |g| < 1:
// (1-g^2) / (2 (1 + g^2 - 2 g cos theta)^{3/2}).
func HenyeyGreensteinPhase(cosTheta, g float64) float64 {
	d := 1 + g*g - 2*g*cosTheta
	return (1 - g*g) / (2 * d * math.Sqrt(d))
}

// henyeyGreensteinCDF is the distribution function of the HG density.
func henyeyGreensteinCDF(mu, g float64) float64 {
	if math.Abs(g) < 1e-6 {
		return (mu + 1) / 2
	}
	return (1 - g*g) / (2 * g) * (1/math.Sqrt(1+g*g-2*g*mu) - 1/(1+g))
}

// henyeyGreensteinInverseCDF is the closed-form inverse of
// henyeyGreensteinCDF.
func henyeyGreensteinInverseCDF(u, g float64) float64 {
	if math.Abs(g) < 1e-6 {
		return 2*u - 1
	}
	s := (1 - g*g) / (1 - g + 2*g*u)
	mu := (1 + g*g - s*s) / (2 * g)
	return math.Max(-1, math.Min(1, mu))
}

// sampleLambertCos draws cos(theta) from the cosine-weighted
// (Lambertian) hemisphere, density 2 cos theta on [0, 1]: CDF cos^2.
func sampleLambertCos(rng *rand.Rand) float64 {
	return math.Sqrt(rng.Float64())
}
