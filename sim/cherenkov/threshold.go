package cherenkov

import (
	"fmt"
	"math"
)

// ThresholdBeta returns the Cherenkov threshold speed 1/n for phase
// index n > 1.
func ThresholdBeta(n float64) (float64, error) {
	if err := checkIndex(n); err != nil {
		return 0, err
	}
	return 1 / n, nil
}

// ThresholdKinetic returns the kinetic energy (MeV) at which a particle of
// mass (MeV) reaches beta = 1/n: m (gamma_t - 1) with
// gamma_t = 1/sqrt(1 - 1/n^2).
func ThresholdKinetic(mass, n float64) (float64, error) {
	if err := checkThresholdArgs(mass, n); err != nil {
		return 0, err
	}
	return mass * (n/math.Sqrt(n*n-1) - 1), nil
}

// ThresholdMomentum returns the momentum (MeV/c) at which a particle of
// mass (MeV) reaches beta = 1/n: m beta_t gamma_t = m / sqrt(n^2 - 1).
func ThresholdMomentum(mass, n float64) (float64, error) {
	if err := checkThresholdArgs(mass, n); err != nil {
		return 0, err
	}
	return mass / math.Sqrt(n*n-1), nil
}

func checkThresholdArgs(mass, n float64) error {
	if !(mass >= 0) || math.IsInf(mass, 1) {
		return fmt.Errorf("cherenkov: mass = %g MeV must be finite and >= 0", mass)
	}
	return checkIndex(n)
}

func checkIndex(n float64) error {
	if !(n > 1) || math.IsInf(n, 1) {
		return fmt.Errorf("cherenkov: refractive index n = %g must be finite and > 1", n)
	}
	return nil
}
