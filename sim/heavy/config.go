package heavy

import (
	"fmt"
	"math"
)

// Config holds the transport settings. The zero value of a field means its
// default (DefaultConfig); New validates the result.
type Config struct {
	// DeltaCut is the kinetic energy (MeV) above which knock-on electrons
	// (delta rays) are produced explicitly; transfers below it are part of
	// the continuous restricted loss. Default 1 MeV (common practice: a
	// delta ray below ~1 MeV travels a few mm and gives little light next to
	// its parent track). Valid range [0.01, 1000] MeV.
	DeltaCut float64
	// MaxFracLoss is the largest mean fractional kinetic-energy loss in one
	// step while the particle is above Cherenkov threshold. Default 0.01; valid
	// (0, 0.2].
	MaxFracLoss float64
	// MaxFracLossBelowThreshold is the same limit once the particle is below
	// Cherenkov threshold, where only its stopping point and time matter
	// (both come from the exact range table, not from the step size).
	// Default 0.1; valid (0, 0.5].
	MaxFracLossBelowThreshold float64
	// MaxStep is the longest step in cm. Default 5 cm; valid (0, 1e4].
	MaxStep float64
	// LowCut is the kinetic energy (MeV) below which the particle is stopped:
	// the rest is deposited and the caller decides what happens at rest.
	// Default 1 MeV; valid [1, 50] MeV (the Bethe formula used for the
	// tables holds down to beta*gamma ~ 0.1, T ~ 0.5 MeV).
	LowCut float64
	// ThresholdIndex is the refractive index that defines "above Cherenkov
	// threshold" (beta > 1/n) for reporting segments. Default 1.35, the
	// phase index of water near 300 nm, the short end of the photosensor
	// band, so that no wavelength that can make light is cut (common
	// practice); the Cherenkov emitter applies the exact threshold per
	// wavelength. Valid [1, 2].
	ThresholdIndex float64

	// NoScattering turns multiple Coulomb scattering off (for studies and
	// checks).
	NoScattering bool
	// NoStraggling replaces the sampled restricted loss by its mean.
	NoStraggling bool
	// NoDeltaRays turns explicit delta rays off; their mean loss is then
	// added to the continuous loss (the total stopping power is used), so
	// the range stays right.
	NoDeltaRays bool
}

// DefaultConfig returns the default settings.
func DefaultConfig() Config {
	return Config{
		DeltaCut:                  1,
		MaxFracLoss:               0.01,
		MaxFracLossBelowThreshold: 0.1,
		MaxStep:                   5,
		LowCut:                    1,
		ThresholdIndex:            1.35,
	}
}

// withDefaults fills zero fields from DefaultConfig.
func (c Config) withDefaults() Config {
	d := DefaultConfig()
	fill := func(v *float64, def float64) {
		if *v == 0 {
			*v = def
		}
	}
	fill(&c.DeltaCut, d.DeltaCut)
	fill(&c.MaxFracLoss, d.MaxFracLoss)
	fill(&c.MaxFracLossBelowThreshold, d.MaxFracLossBelowThreshold)
	fill(&c.MaxStep, d.MaxStep)
	fill(&c.LowCut, d.LowCut)
	fill(&c.ThresholdIndex, d.ThresholdIndex)
	return c
}

// Validate reports the first field outside its valid range. Zero fields
// are replaced by their defaults before the check.
func (c Config) Validate() error {
	c = c.withDefaults()
	for _, f := range []struct {
		name   string
		v      float64
		lo, hi float64
		openLo bool
	}{
		{"DeltaCut", c.DeltaCut, 0.01, 1000, false},
		{"MaxFracLoss", c.MaxFracLoss, 0, 0.2, true},
		{"MaxFracLossBelowThreshold", c.MaxFracLossBelowThreshold, 0, 0.5, true},
		{"MaxStep", c.MaxStep, 0, 1e4, true},
		{"LowCut", c.LowCut, 1, 50, false},
		{"ThresholdIndex", c.ThresholdIndex, 1, 2, false},
	} {
		if err := checkRange("Config."+f.name, f.v, f.lo, f.hi, f.openLo); err != nil {
			return err
		}
	}
	return nil
}

// checkRange returns an error naming the value unless lo <= v <= hi (lo < v
// when openLo); NaN and infinities always fail.
func checkRange(name string, v, lo, hi float64, openLo bool) error {
	return checkRangeIn("heavy", name, v, lo, hi, openLo)
}

// checkRangeIn is checkRange with the message prefixed by pkg.
func checkRangeIn(pkg, name string, v, lo, hi float64, openLo bool) error {
	bad := math.IsNaN(v) || math.IsInf(v, 0) || v > hi || v < lo || (openLo && v == lo)
	if !bad {
		return nil
	}
	lb := "["
	if openLo {
		lb = "("
	}
	return fmt.Errorf("%s: %s = %g must be finite and in %s%g, %g]", pkg, name, v, lb, lo, hi)
}
