package em

import (
	"fmt"
	"math"

	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/phys"
)

// MaxEkin is the upper end of the model range (MeV; kinetic energy of
// electrons and positrons, the energy of photons): the tables stop
// there, and above it the LPM suppression of bremsstrahlung and pair
// production in water (onset at several TeV) would still be negligible,
// but nothing here has been checked beyond it.
const MaxEkin = 1e5

// minCut is the lowest cut or tracking energy accepted (MeV). Below about
// 10 keV the Bethe theory of the collision stopping power with I = 75 eV
// is no longer accurate (shell corrections), so the condensed-history
// picture built on it is not either.
const minCut = 0.01

// Config holds the cuts and step limits of the transport. Build one with
// DefaultConfig and change what you need; New validates it.
type Config struct {
	// RefractiveIndex is the phase index n used for the Cherenkov
	// threshold beta = 1/n of the tracking cuts. The default 1.34 is the
	// index of water near 400 nm, where photocathode quantum efficiency
	// peaks (IAPWS 1997 formulation, n(400 nm, 20 C) ~ 1.339, from
	// memory); the index rises to ~1.35 near 320 nm, so the threshold
	// falls only by a few keV over the band.
	RefractiveIndex float64
	// ChargedCut is the kinetic energy (MeV) below which an electron or
	// positron is stopped and its energy deposited (a positron then
	// annihilates at rest). Default: the Cherenkov threshold for
	// RefractiveIndex, 0.2567 MeV for n = 1.34: below it a track makes no
	// light, so following it further only costs time.
	ChargedCut float64
	// DeltaCut is the kinetic energy (MeV) above which knock-on electrons
	// (Moller, Bhabha) are produced explicitly; softer collisions make up
	// the restricted, continuous loss. Default: ChargedCut, so that every
	// delta ray able to radiate Cherenkov light is made.
	DeltaCut float64
	// BremsCut is the photon energy (MeV) above which bremsstrahlung
	// photons are produced explicitly; softer emission is continuous loss.
	// Default: PhotonCut.
	BremsCut float64
	// PhotonCut is the energy (MeV) below which a photon is absorbed on
	// the spot. Default: the energy whose Compton edge equals ChargedCut
	// (0.415 MeV for n = 1.34): a softer photon cannot make a Compton
	// electron above the Cherenkov threshold. Photoabsorption could, down
	// to ChargedCut, but it is below 1e-3 of the attenuation there (NIST
	// XCOM, water) and is neglected for this choice.
	PhotonCut float64
	// MaxStep is the longest charged step (cm).
	MaxStep float64
	// MaxEnergyLossFraction is the largest fraction of its kinetic energy
	// a charged particle may lose continuously in one step. It bounds the
	// error of the mid-step stopping power and of the mid-step Highland
	// width, and the change of the cross-sections along a step.
	MaxEnergyLossFraction float64
}

// DefaultConfig returns the cuts tied to the Cherenkov threshold of water
// with n = 1.34, steps of at most 1 cm and 3% continuous energy loss.
func DefaultConfig() Config {
	// 1.34 is a valid index: ConfigForIndex cannot fail (TestThresholds
	// checks the cuts).
	c, _ := ConfigForIndex(1.34)
	return c
}

// ConfigForIndex returns DefaultConfig with the cuts tied to the
// Cherenkov threshold of refractive index n instead: charged and delta
// cuts at the threshold kinetic energy, photon and brems cuts at the
// photon energy whose Compton edge reaches it.
func ConfigForIndex(n float64) (Config, error) {
	tc, err := cherenkov.ThresholdKinetic(phys.ElectronMass, n)
	if err != nil {
		return Config{}, fmt.Errorf("em: %w", err)
	}
	kc := ComptonThreshold(tc)
	return Config{
		RefractiveIndex:       n,
		ChargedCut:            tc,
		DeltaCut:              tc,
		BremsCut:              kc,
		PhotonCut:             kc,
		MaxStep:               1,
		MaxEnergyLossFraction: 0.03,
	}, nil
}

// ComptonThreshold returns the photon energy k (MeV) whose Compton edge,
// the largest electron kinetic energy 2k^2/(m + 2k), equals ekin (MeV):
// k = (ekin/2)(1 + sqrt(1 + 2m/ekin)).
func ComptonThreshold(ekin float64) float64 {
	return ekin / 2 * (1 + math.Sqrt(1+2*phys.ElectronMass/ekin))
}

// Validate reports the first field that is out of range.
func (c Config) Validate() error {
	if !(c.RefractiveIndex > 1) || math.IsInf(c.RefractiveIndex, 0) {
		return fmt.Errorf("em: Config.RefractiveIndex = %g must be finite and above 1", c.RefractiveIndex)
	}
	cuts := []struct {
		name string
		v    float64
	}{
		{"ChargedCut", c.ChargedCut}, {"DeltaCut", c.DeltaCut},
		{"BremsCut", c.BremsCut}, {"PhotonCut", c.PhotonCut},
	}
	for _, cut := range cuts {
		if !(cut.v >= minCut && cut.v <= MaxEkin/10) {
			return fmt.Errorf("em: Config.%s = %g MeV must lie in [%g, %g] MeV", cut.name, cut.v, minCut, MaxEkin/10)
		}
	}
	if !(c.MaxStep > 0) || math.IsInf(c.MaxStep, 0) {
		return fmt.Errorf("em: Config.MaxStep = %g cm must be positive and finite", c.MaxStep)
	}
	if !(c.MaxEnergyLossFraction > 0 && c.MaxEnergyLossFraction <= 0.2) {
		return fmt.Errorf("em: Config.MaxEnergyLossFraction = %g must lie in (0, 0.2]", c.MaxEnergyLossFraction)
	}
	return nil
}
