package optics

import (
	"fmt"
	"math"
)

// Validity of the refractive-index formulation for liquid water at
// 0.1 MPa as conelight uses it. The IAPWS release covers 0.2-1.1 um and
// -12..500 C over its whole density range; liquid water at 0.1 MPa needs
// the density fit below, which conelight uses over 0..100 C.
const (
	IndexMinWavelength  = 200.0  // nm
	IndexMaxWavelength  = 1100.0 // nm
	IndexMinTemperature = 0.0    // C
	IndexMaxTemperature = 100.0  // C
)

// Coefficients of the IAPWS Release on the Refractive Index of Ordinary
// Water Substance as a Function of Wavelength, Temperature and Pressure
// (Erlangen, 1997; Harvey, Gallagher, Levelt Sengers, J. Phys. Chem. Ref.
// Data 27 (1998) 761). Reference values T* = 273.15 K, rho* = 1000 kg/m^3,
// lambda* = 0.589 um.
const (
	iapwsA0       = 0.244257733
	iapwsA1       = 9.74634476e-3
	iapwsA2       = -3.73234996e-3
	iapwsA3       = 2.68678472e-4
	iapwsA4       = 1.58920570e-3
	iapwsA5       = 2.45934259e-3
	iapwsA6       = 0.900704920
	iapwsA7       = -1.66626219e-2
	iapwsLambdaUV = 0.2292020 // reduced
	iapwsLambdaIR = 5.432937  // reduced
	iapwsTRef     = 273.15    // K
	iapwsRhoRef   = 1000.0    // kg/m^3
	iapwsLamRef   = 589.0     // nm
)

// WaterDensity returns the density (kg/m^3) of air-free liquid water at
// 0.1 MPa and temperature tempC (Celsius) from the fit of Kell, J. Chem.
// Eng. Data 20 (1975) 97, eq. 16 (valid 0..150 C at 1 atm); conelight
// accepts 0..100 C.
func WaterDensity(tempC float64) (float64, error) {
	if err := checkTemperature("WaterDensity tempC", tempC); err != nil {
		return 0, err
	}
	return kellDensity(tempC), nil
}

func kellDensity(t float64) float64 {
	num := 999.83952 + t*(16.945176+t*(-7.9870401e-3+t*(-46.170461e-6+t*(105.56302e-9+t*(-280.54253e-12)))))
	return num / (1 + 16.879850e-3*t)
}

// RefractiveIndex returns the phase refractive index, relative to vacuum,
// of liquid water at 0.1 MPa for vacuum wavelength lambdaNM (nm) and
// temperature tempC (Celsius), from the IAPWS 1997 formulation with the
// Kell (1975) density. Handbook tables quote the index relative to air,
// which is lower by a factor n_air (about 1.00027 in the visible).
// It returns an error naming the argument outside 200..1100 nm or
// 0..100 C, or NaN.
func RefractiveIndex(lambdaNM, tempC float64) (float64, error) {
	if err := checkIndexArgs(lambdaNM, tempC); err != nil {
		return 0, err
	}
	n, _ := iapwsIndex(lambdaNM, tempC)
	return n, nil
}

// GroupIndex returns the group index n_g = n - lambda dn/dlambda of
// liquid water at 0.1 MPa (same formulation and validity as
// RefractiveIndex). Light pulses travel at c/n_g.
func GroupIndex(lambdaNM, tempC float64) (float64, error) {
	if err := checkIndexArgs(lambdaNM, tempC); err != nil {
		return 0, err
	}
	n, ld := iapwsIndex(lambdaNM, tempC)
	return n - ld, nil
}

func checkIndexArgs(lambdaNM, tempC float64) error {
	if !(lambdaNM >= IndexMinWavelength && lambdaNM <= IndexMaxWavelength) {
		return fmt.Errorf("optics: lambdaNM = %g outside the IAPWS 1997 range %g..%g nm", lambdaNM, IndexMinWavelength, IndexMaxWavelength)
	}
	return checkTemperature("tempC", tempC)
}

func checkTemperature(field string, tempC float64) error {
	if !(tempC >= IndexMinTemperature && tempC <= IndexMaxTemperature) {
		return fmt.Errorf("optics: %s = %g outside %g..%g C (liquid water at 0.1 MPa)", field, tempC, IndexMinTemperature, IndexMaxTemperature)
	}
	return nil
}

// iapwsIndex evaluates the IAPWS formulation: with L = (n^2-1)/(n^2+2),
//
//	L/rho = a0 + a1 rho + a2 T + a3 x T + a4/x + a5/(x - uv^2) + a6/(x - ir^2) + a7 rho^2,
//
// x = lambda^2 (all reduced). It returns n and lambda dn/dlambda, the
// latter analytically: n^2 = (1+2L)/(1-L) gives dn/dL = 3/(2n(1-L)^2)
// and lambda d/dlambda = 2x d/dx.
func iapwsIndex(lambdaNM, tempC float64) (n, lambdaDnDlambda float64) {
	rho := kellDensity(tempC) / iapwsRhoRef
	tr := (tempC + iapwsTRef) / iapwsTRef
	lr := lambdaNM / iapwsLamRef
	x := lr * lr
	uv := x - iapwsLambdaUV*iapwsLambdaUV
	ir := x - iapwsLambdaIR*iapwsLambdaIR
	l := rho * (iapwsA0 + iapwsA1*rho + iapwsA2*tr + iapwsA3*x*tr + iapwsA4/x +
		iapwsA5/uv + iapwsA6/ir + iapwsA7*rho*rho)
	dldx := rho * (iapwsA3*tr - iapwsA4/(x*x) - iapwsA5/(uv*uv) - iapwsA6/(ir*ir))
	n = math.Sqrt((1 + 2*l) / (1 - l))
	lambdaDnDlambda = 2 * x * dldx * 3 / (2 * n * (1 - l) * (1 - l))
	return n, lambdaDnDlambda
}
