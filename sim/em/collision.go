package em

import (
	"math"
	"math/rand/v2"

	"github.com/conelight/conelight/sim/phys"
)

// Collision loss of electrons and positrons and the Moller and Bhabha
// cross-sections it is split with. tau = T/m, gamma = tau + 1, x is an
// energy transfer as a fraction of T. All brackets are dimensionless; the
// callers multiply by pref = (K/2) (Z/A) rho (MeV/cm).

// kinematics returns gamma and beta^2 for tau = T/m.
func kinematics(tau float64) (gamma, beta2 float64) {
	gamma = tau + 1
	return gamma, tau * (tau + 2) / (gamma * gamma)
}

// maxTransfer is the largest fraction of T a knock-on electron can take:
// 1/2 for Moller (the faster of two identical electrons is called the
// primary), 1 for Bhabha.
func maxTransfer(positron bool) float64 {
	if positron {
		return 1
	}
	return 0.5
}

// collisionBracket returns the ICRU Report 37 (1984) bracket of the
// unrestricted collision stopping power of electrons (F-) or positrons (F+),
//
//	S = pref/beta^2 [ln(tau^2 (tau+2) / (2 (I/m)^2)) + F(tau) - delta],
//	F-(tau) = 1 - beta^2 + [tau^2/8 - (2 tau + 1) ln 2]/gamma^2,
//	F+(tau) = 2 ln 2 - beta^2/12 [23 + 14/(tau+2) + 10/(tau+2)^2 + 4/(tau+2)^3],
//
// (also PDG Review, "Passage of particles through matter"). iM2 is
// (I/m)^2 and delta the density-effect correction.
func collisionBracket(positron bool, tau, iM2, delta float64) float64 {
	gamma, beta2 := kinematics(tau)
	var f float64
	if positron {
		y := 1 / (tau + 2)
		f = 2*math.Ln2 - beta2/12*(23+y*(14+y*(10+y*4)))
	} else {
		f = 1 - beta2 + (tau*tau/8-(2*tau+1)*math.Ln2)/(gamma*gamma)
	}
	return math.Log(tau*tau*(tau+2)/(2*iM2)) + f - delta
}

// restrictedBracket returns the bracket of the collision stopping power
// restricted to energy transfers below x T, in the form of Berger and
// Seltzer (ICRU Report 37, 1984, eqs. for F-(tau, Delta) and
// F+(tau, Delta)): Bethe's soft-collision term ln(2 tau (tau+2) Delta /
// (I/m)^2) - beta^2 - delta with Delta = x tau, plus the exact integral of
// the energy-weighted Moller (e-) or Bhabha (e+) cross-section minus its
// Rutherford part from 0 to x:
//
//	e-: a x^2/2 + 1/(1-x) - 1 + (1+g) ln(1-x),   a = (tau/gamma)^2, g = (2 gamma - 1)/gamma^2
//	e+: beta^2 (-B1 x + B2 x^2/2 - B3 x^3/3 + B4 x^4/4).
//
// For e- this is algebraically the Berger-Seltzer expression
// ln(2(tau+2)/(I/m)^2) - 1 - beta^2 + ln((tau-Delta) Delta) + tau/(tau-Delta)
// + [Delta^2/2 + (2 tau + 1) ln(1 - Delta/tau)]/gamma^2. x is clipped to
// the largest transfer, where the result equals collisionBracket.
func restrictedBracket(positron bool, tau, x, iM2, delta float64) float64 {
	x = math.Min(x, maxTransfer(positron))
	gamma, beta2 := kinematics(tau)
	soft := math.Log(2*tau*(tau+2)*x*tau/iM2) - beta2 - delta
	if positron {
		b1, b2, b3, b4 := bhabhaB(gamma)
		return soft + beta2*x*(-b1+x*(b2/2+x*(-b3/3+x*b4/4)))
	}
	a := tau * tau / (gamma * gamma)
	g := (2*gamma - 1) / (gamma * gamma)
	return soft + a*x*x/2 + 1/(1-x) - 1 + (1+g)*math.Log1p(-x)
}

// bhabhaB returns the coefficients of the Bhabha cross-section
// dsigma/deps = (2 pi r_e^2 m / T) [1/(beta^2 eps^2) - B1/eps + B2 - B3 eps + B4 eps^2]
// with y = 1/(gamma+1) (Bhabha 1936, in the form of the ICRU Report 37
// derivation): B1 = 2 - y^2, B2 = (1-2y)(3+y^2), B4 = (1-2y)^3,
// B3 = B4 + (1-2y)^2.
func bhabhaB(gamma float64) (b1, b2, b3, b4 float64) {
	y := 1 / (gamma + 1)
	c := 1 - 2*y
	b1 = 2 - y*y
	b2 = c * (3 + y*y)
	b4 = c * c * c
	b3 = b4 + c*c
	return
}

// mollerDiff returns the Moller cross-section in units of
// 2 pi r_e^2 m/(beta^2 T) per unit energy fraction eps (Moller 1932):
// a + 1/eps^2 + 1/(1-eps)^2 - g/eps - g/(1-eps).
func mollerDiff(gamma, eps float64) float64 {
	a := (gamma - 1) * (gamma - 1) / (gamma * gamma)
	g := (2*gamma - 1) / (gamma * gamma)
	return a + 1/(eps*eps) + 1/((1-eps)*(1-eps)) - g/eps - g/(1-eps)
}

// bhabhaDiff returns the Bhabha cross-section in units of 2 pi r_e^2 m/T
// per unit energy fraction eps.
func bhabhaDiff(gamma, eps float64) float64 {
	_, beta2 := kinematics(gamma - 1)
	b1, b2, b3, b4 := bhabhaB(gamma)
	return 1/(beta2*eps*eps) - b1/eps + b2 - eps*(b3-eps*b4)
}

// deltaCrossBracket returns the integral of the Moller or Bhabha
// cross-section over transfers x..max, in units of 2 pi r_e^2 m / T (so
// the Moller value includes its 1/beta^2). Zero when x >= max.
func deltaCrossBracket(positron bool, tau, x float64) float64 {
	if x >= maxTransfer(positron) {
		return 0
	}
	gamma, beta2 := kinematics(tau)
	if positron {
		b1, b2, b3, b4 := bhabhaB(gamma)
		return (1/x-1)/beta2 + b1*math.Log(x) + b2*(1-x) - b3*(1-x*x)/2 + b4*(1-x*x*x)/3
	}
	a := tau * tau / (gamma * gamma)
	g := (2*gamma - 1) / (gamma * gamma)
	return (a*(0.5-x) + 1/x - 1/(1-x) - g*math.Log((1-x)/x)) / beta2
}

// sampleDeltaFraction draws the energy fraction of a knock-on electron
// above x: from 1/eps^2 by inversion, accepted with the ratio of the exact
// cross-section to the 1/eps^2 majorant. For Moller eps^2 times the
// cross-section is 1 + a eps^2 + q^2 - g q (q = eps/(1-eps) <= 1), below
// 2 + a/4; for Bhabha beta^2 eps^2 times it is
// 1 - beta^2 eps (B1 - B2 eps + B3 eps^2 - B4 eps^3), below 1.
func sampleDeltaFraction(positron bool, tau, x float64, rng *rand.Rand) float64 {
	gamma, beta2 := kinematics(tau)
	if positron {
		b1, b2, b3, b4 := bhabhaB(gamma)
		for {
			eps := x / (1 - rng.Float64()*(1-x))
			h := 1 - beta2*eps*(b1-eps*(b2-eps*(b3-eps*b4)))
			if rng.Float64() <= h {
				return eps
			}
		}
	}
	a := tau * tau / (gamma * gamma)
	g := (2*gamma - 1) / (gamma * gamma)
	hmax := 2 + a/4
	for {
		eps := x / (1 - rng.Float64()*(1-2*x))
		q := eps / (1 - eps)
		h := 1 + a*eps*eps + q*q - g*q
		if rng.Float64()*hmax <= h {
			return eps
		}
	}
}

// deltaCosTheta is the cosine of the knock-on electron's angle to the
// primary for a transfer w out of kinetic energy t (two-body kinematics on
// an electron at rest).
func deltaCosTheta(t, w float64) float64 {
	const m = phys.ElectronMass
	return math.Min(1, math.Sqrt(w*(t+2*m)/(t*(w+2*m))))
}
