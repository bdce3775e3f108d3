package neutron

import (
	"math"

	"github.com/conelight/conelight/sim/hadron"
)

// barn is 1 b in cm^2.
const barn = 1e-24

// thermalEnergy is the reference thermal energy kT at 293.6 K, 0.0253 eV
// (2200 m/s), in MeV: the energy at which thermal cross-sections are
// quoted.
const thermalEnergy = 0.0253e-6

// Thermal (2200 m/s) capture cross-sections, barn, and the capture gamma
// energies. Capture cross-sections follow 1/v below ~1 keV (the Gd-157
// resonance at 0.031 eV makes Gd deviate from 1/v by tens of per cent
// across the thermal peak: neglected).
const (
	// HydrogenCapture is the n p -> d gamma cross-section, 0.3326 b
	// (ENDF/B thermal value; measured 0.332 b with 2% by pile
	// oscillation, and 0.329 +- 0.004 b by activation in boron-loaded
	// water, Phys. Rev. literature cited in the package tests).
	HydrogenCapture = 0.3326
	// OxygenCapture is the 16O(n, gamma) cross-section, 0.19 mb (from
	// memory, atlas of neutron resonances).
	OxygenCapture = 0.19e-3
	// GadoliniumCapture is natural gadolinium's capture cross-section,
	// 48 800 b (from memory; 157Gd 254 000 b and 155Gd 60 900 b weighted
	// by abundance).
	GadoliniumCapture = 48800.0
	// DeuteronGamma is the gamma of n p -> d gamma: the deuteron binding
	// energy less the recoil, 2.2246 MeV (from memory, AME).
	DeuteronGamma = 2.2246
	// Oxygen17Gamma is the total capture energy of 16O(n, gamma)17O,
	// 4.143 MeV (from memory, AME), emitted here as one gamma.
	Oxygen17Gamma = 4.143
	// Gd157Q and Gd155Q are the capture energies of 157Gd and 155Gd (from
	// memory: 7.937 and 8.536 MeV), and Gd157Share the share of captures
	// on natural Gd that are on 157Gd (81%, from memory).
	Gd157Q     = 7.937
	Gd155Q     = 8.536
	Gd157Share = 0.81
)

// HydrogenElastic returns the n-p elastic cross-section (barn) of a free
// proton at neutron kinetic energy e (MeV): below 20 MeV the effective-range
// form of the singlet and triplet S waves,
//
//	sigma = 3 pi / (1.206 E + (-1.86 + 0.09415 E + 0.0001306 E^2)^2)
//	      + pi / (1.206 E + (0.4223 + 0.13 E)^2)
//
// (E in MeV, sigma in barn; Segre, Nuclei and Particles, 2nd ed., from
// memory), which gives 20.4 b at thermal energies and 4.26 b at 1 MeV;
// above 20 MeV a table of the n-p elastic cross-section from memory of the
// evaluations (0.17 b at 50 MeV, 0.073 b at 100 MeV, 0.043 b at 200 MeV,
// 0.035 b at 500 MeV and above).
func HydrogenElastic(e float64) float64 {
	if e <= 20 {
		a := -1.86 + 0.09415*e + 0.0001306*e*e
		b := 0.4223 + 0.13*e
		return 3*math.Pi/(1.206*e+a*a) + math.Pi/(1.206*e+b*b)
	}
	return hadron.InterpLog([]float64{20, 50, 100, 200, 500}, []float64{HydrogenElastic(20), 0.17, 0.073, 0.043, 0.035}, e)
}

// OxygenElastic returns the n-16O elastic cross-section (barn): 3.888 b
// below 0.3 MeV, the free-atom value of the ENDF/B thermal scattering law
// for water (3.8883 b for O beside 20.449 b for H, the LEAPR input for H in
// H2O of the NJOY2016 test suite, looked up), then a smooth curve through
// the resonances from memory of the evaluations (3.0 b at 1 MeV, 1.5 b at
// 3 MeV, 1.0 b at 10-20 MeV, falling to 0.3 b at 1 GeV). The resonances (e.g. 0.43 and 1.0 MeV) are not
// modelled: they change where a fast neutron scatters, not whether it is
// moderated and captured.
func OxygenElastic(e float64) float64 {
	if e <= 0.3 {
		return 3.888
	}
	return hadron.InterpLog([]float64{0.3, 1, 3, 10, 20, 100, 1000}, []float64{3.888, 3.0, 1.5, 1.0, 1.0, 0.5, 0.3}, e)
}

// OxygenInelastic returns the 16O(n, n' gamma 6.13 MeV) cross-section
// (barn) from its threshold 6.5 MeV to 20 MeV: a flat 0.2 b (from memory,
// rough). Above 20 MeV oxygen's non-elastic cross-section is the nucleon
// model of sim/hadron.
func OxygenInelastic(e float64) float64 {
	if e < 6.5 || e > 20 {
		return 0
	}
	return 0.2
}
