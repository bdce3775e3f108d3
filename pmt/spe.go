package pmt

import (
	"fmt"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// SPE describes the single-photoelectron charge spectrum: the charge, in
// units of the mean single-pe peak charge ("pe"), that one photoelectron
// deposits after multiplication.
//
// The main component is a gamma distribution of mean 1 and relative rms
// width Width (shape k = 1/Width^2, scale Width^2). A gamma shape is chosen
// over a Gaussian truncated at zero because the charge is strictly
// positive and right-skewed, as the product of a chain of multiplication
// stages with Poisson-distributed gain each is (the Polya/gamma form is the
// common-practice description of multiplication gain); it needs no
// truncation, so its mean is exactly 1 and its CDF is closed-form. Width = 0
// gives every photoelectron a charge of exactly 1 pe.
//
// An optional exponential low-charge component of weight LowFraction and
// mean LowMean (pe) models photoelectrons that skip part of the first
// multiplication stage (common practice). The overall mean charge is then
// (1-LowFraction) + LowFraction*LowMean (see Mean).
type SPE struct {
	Width       float64 // relative rms width of the gamma peak, in [0, 1]
	LowFraction float64 // weight of the exponential component, in [0, 1)
	LowMean     float64 // mean of the exponential component (pe); > 0 when LowFraction > 0
}

// Validate reports the first bad field of s, naming it and its value.
func (s SPE) Validate() error { return s.validate("SPE") }

// validate is Validate with the field path (e.g. "Model.SPE") to name.
func (s SPE) validate(path string) error {
	switch {
	case !(s.Width >= 0 && s.Width <= 1):
		return fmt.Errorf("pmt: %s.Width = %v must be in [0, 1]", path, s.Width)
	case !(s.LowFraction >= 0 && s.LowFraction < 1):
		return fmt.Errorf("pmt: %s.LowFraction = %v must be in [0, 1)", path, s.LowFraction)
	case math.IsNaN(s.LowMean) || math.IsInf(s.LowMean, 0) || s.LowMean < 0:
		return fmt.Errorf("pmt: %s.LowMean = %v must be non-negative and finite", path, s.LowMean)
	case s.LowFraction > 0 && s.LowMean == 0:
		return fmt.Errorf("pmt: %s.LowMean = 0 must be positive when LowFraction = %v", path, s.LowFraction)
	}
	return nil
}

// Mean returns the mean single-pe charge (pe).
func (s SPE) Mean() float64 {
	return (1 - s.LowFraction) + s.LowFraction*s.LowMean
}

// CDF returns the probability that one photoelectron's charge is at most q.
func (s SPE) CDF(q float64) float64 {
	if q < 0 {
		return 0
	}
	var peak float64
	if s.Width == 0 {
		if q >= 1 {
			peak = 1
		}
	} else {
		k := 1 / (s.Width * s.Width)
		peak = mathext.GammaIncReg(k, q/(s.Width*s.Width))
	}
	if s.LowFraction == 0 {
		return peak
	}
	low := -math.Expm1(-q / s.LowMean)
	return (1-s.LowFraction)*peak + s.LowFraction*low
}

// Sample draws one single-pe charge (pe). It does not allocate.
func (s SPE) Sample(rng *rand.Rand) float64 {
	if s.LowFraction > 0 && rng.Float64() < s.LowFraction {
		return s.LowMean * rng.ExpFloat64()
	}
	if s.Width == 0 {
		return 1
	}
	w2 := s.Width * s.Width
	return w2 * gammaUnitScale(1/w2, rng)
}

// gammaUnitScale draws from the gamma distribution of shape k and scale 1
// (gonum's distuv.Gamma, rate Beta = 1).
func gammaUnitScale(k float64, rng *rand.Rand) float64 {
	return distuv.Gamma{Alpha: k, Beta: 1, Src: rng}.Rand()
}
