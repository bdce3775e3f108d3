package optics

import (
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/conelight/conelight/sim/phys"
)

// WaterConfig describes the water of a tank. Lengths in cm, wavelengths
// in nm, temperature in Celsius. Start from DefaultWaterConfig: a zero
// scale switches a process off, and a zero band is invalid.
type WaterConfig struct {
	// TemperatureC sets the refractive index (IAPWS 1997 with the Kell
	// density). Absorption and scattering are the tabulated room-
	// temperature values and do not depend on it.
	TemperatureC float64
	// BandLo, BandHi: wavelength band of the tables (nm), within
	// AbsorptionMinWavelength..AbsorptionMaxWavelength.
	BandLo, BandHi float64
	// AbsorptionScale multiplies the pure-water absorption coefficient
	// (PureWaterAbsorption); 1 is pure water, 0 no absorption. Ignored
	// when AttenuationLength is set.
	AbsorptionScale float64
	// RayleighScale multiplies the pure-water Rayleigh scattering
	// coefficient; 1 is pure water, 0 no Rayleigh scattering.
	RayleighScale float64
	// MieLength is the length (cm) of the forward-peaked (Mie-like)
	// scattering component at MieWavelength (nm); 0 or +Inf switches it
	// off. At other wavelengths it is MieLength (lambda/MieWavelength)^MieExponent.
	MieLength, MieWavelength, MieExponent float64
	// MieG is the Henyey-Greenstein asymmetry (mean cosine) of the Mie
	// component, in (-1, 1).
	MieG float64
	// AttenuationLength, when positive, is the total attenuation length
	// (cm) wanted at AttenuationWavelength (nm): it replaces
	// AbsorptionScale by the value s that gives
	//   1/AttenuationLength = s a_pure + b_Rayleigh + b_Mie
	// at that wavelength, with the scattering as configured above.
	// Scattering alone must not already exceed the wanted attenuation.
	AttenuationLength, AttenuationWavelength float64
}

// DefaultWaterConfig returns pure water at 20 C over 250-700 nm with no
// Mie component (g = 0.9 and lambda^1 prepared for when MieLength is set;
// common practice, not a measured property of any water).
func DefaultWaterConfig() WaterConfig {
	return WaterConfig{
		TemperatureC:    20,
		BandLo:          250,
		BandHi:          700,
		AbsorptionScale: 1,
		RayleighScale:   1,
		MieWavelength:   500,
		MieExponent:     1,
		MieG:            0.9,
	}
}

// Optical is the set of optical properties of the water at one wavelength.
type Optical struct {
	Index, GroupIndex float64
	GroupVelocity     float64 // cm/ns
	AbsorptionLength  float64 // cm
	RayleighLength    float64 // cm
	MieLength         float64 // cm
	ScatteringLength  float64 // cm, Rayleigh and Mie together
}

// Quantities tabulated on the wavelength grid. Lengths are stored as
// coefficients (1/cm) so that interpolation is linear in the coefficient,
// as the absorption table is, and a switched-off process is a clean zero.
const (
	qIndex = iota
	qGroupIndex
	qGroupVelocity
	qAbsorption
	qRayleigh
	qMie
	qScattering
	nQuantities
)

// gridStep is the largest spacing (nm) of the precomputed tables.
const gridStep = 1.0

// Water holds the optical tables of one water configuration on a uniform
// wavelength grid (at most 1 nm apart); between grid nodes every quantity
// is interpolated linearly. A *Water is immutable after NewWater and safe
// for concurrent use. The lookup methods take a wavelength in nm inside
// Band() and return NaN outside it; At checks and returns an error.
type Water struct {
	cfg        WaterConfig
	absScale   float64
	lo, invH   float64
	h          float64
	nodes      int // grid nodes; nodes-1 intervals
	tab        [nQuantities][]float64
	maxIndex   float64
	mieG       float64
	mieEnabled bool
}

// NewWater validates cfg and builds the tables.
func NewWater(cfg WaterConfig) (*Water, error) {
	if err := cfg.validate(); err != nil {
		return nil, err
	}
	w := &Water{cfg: cfg, absScale: cfg.AbsorptionScale, mieG: cfg.MieG}
	w.mieEnabled = cfg.MieLength > 0 && !math.IsInf(cfg.MieLength, 1)
	if cfg.AttenuationLength > 0 {
		a0, err := PureWaterAbsorption(cfg.AttenuationWavelength)
		if err != nil {
			return nil, fmt.Errorf("optics: WaterConfig.AttenuationWavelength: %w", err)
		}
		scat := w.scatteringCoefficients(cfg.AttenuationWavelength)
		s := (1/cfg.AttenuationLength - scat) / a0
		if s < 0 {
			return nil, fmt.Errorf("optics: WaterConfig.AttenuationLength = %g cm at %g nm is longer than the scattering length %g cm alone",
				cfg.AttenuationLength, cfg.AttenuationWavelength, 1/scat)
		}
		w.absScale = s
	}
	intervals := int(math.Ceil((cfg.BandHi - cfg.BandLo) / gridStep))
	w.nodes = intervals + 1
	w.lo = cfg.BandLo
	w.h = (cfg.BandHi - cfg.BandLo) / float64(intervals)
	w.invH = 1 / w.h
	for q := range w.tab {
		w.tab[q] = make([]float64, w.nodes)
	}
	for i := range w.nodes {
		l := w.lo + float64(i)*w.h
		if i == intervals {
			l = cfg.BandHi
		}
		n, ld := iapwsIndex(l, cfg.TemperatureC)
		a, err := PureWaterAbsorption(l)
		if err != nil {
			return nil, err
		}
		ray := cfg.RayleighScale * pureRayleighCoefficient(l)
		mie := w.mieCoefficient(l)
		w.tab[qIndex][i] = n
		w.tab[qGroupIndex][i] = n - ld
		w.tab[qGroupVelocity][i] = phys.SpeedOfLight / (n - ld)
		w.tab[qAbsorption][i] = w.absScale * a
		w.tab[qRayleigh][i] = ray
		w.tab[qMie][i] = mie
		w.tab[qScattering][i] = ray + mie
		w.maxIndex = math.Max(w.maxIndex, n)
	}
	return w, nil
}

func (w *Water) mieCoefficient(lambdaNM float64) float64 {
	if !w.mieEnabled {
		return 0
	}
	c := w.cfg
	return 1 / (c.MieLength * math.Pow(lambdaNM/c.MieWavelength, c.MieExponent))
}

func (w *Water) scatteringCoefficients(lambdaNM float64) float64 {
	return w.cfg.RayleighScale*pureRayleighCoefficient(lambdaNM) + w.mieCoefficient(lambdaNM)
}

func (c WaterConfig) validate() error {
	if err := checkTemperature("WaterConfig.TemperatureC", c.TemperatureC); err != nil {
		return err
	}
	inTable := func(field string, v float64) error {
		if !(v >= AbsorptionMinWavelength && v <= AbsorptionMaxWavelength) {
			return fmt.Errorf("optics: WaterConfig.%s = %g nm outside %g..%g nm", field, v, AbsorptionMinWavelength, AbsorptionMaxWavelength)
		}
		return nil
	}
	if err := inTable("BandLo", c.BandLo); err != nil {
		return err
	}
	if err := inTable("BandHi", c.BandHi); err != nil {
		return err
	}
	if !(c.BandHi > c.BandLo) {
		return fmt.Errorf("optics: WaterConfig.BandHi = %g nm must exceed BandLo = %g nm", c.BandHi, c.BandLo)
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"AbsorptionScale", c.AbsorptionScale}, {"RayleighScale", c.RayleighScale}} {
		if !(f.v >= 0) || math.IsInf(f.v, 1) {
			return fmt.Errorf("optics: WaterConfig.%s = %g must be finite and >= 0", f.name, f.v)
		}
	}
	if !(c.MieLength >= 0) {
		return fmt.Errorf("optics: WaterConfig.MieLength = %g cm must be >= 0 (0 or +Inf: no Mie component)", c.MieLength)
	}
	if c.MieLength > 0 && !math.IsInf(c.MieLength, 1) {
		if err := positiveFinite("MieWavelength", c.MieWavelength); err != nil {
			return err
		}
		if math.IsNaN(c.MieExponent) || math.IsInf(c.MieExponent, 0) {
			return fmt.Errorf("optics: WaterConfig.MieExponent = %g must be finite", c.MieExponent)
		}
	}
	// Fields that only matter when their feature is on must still not be
	// NaN or infinite: such a value is a mistake even while unused.
	for _, f := range []struct {
		name string
		v    float64
	}{{"MieWavelength", c.MieWavelength}, {"MieExponent", c.MieExponent}, {"AttenuationWavelength", c.AttenuationWavelength}} {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			return fmt.Errorf("optics: WaterConfig.%s = %g must be finite", f.name, f.v)
		}
	}
	if !(c.MieG > -1 && c.MieG < 1) {
		return fmt.Errorf("optics: WaterConfig.MieG = %g must lie in (-1, 1)", c.MieG)
	}
	if !(c.AttenuationLength >= 0) || math.IsInf(c.AttenuationLength, 1) {
		return fmt.Errorf("optics: WaterConfig.AttenuationLength = %g cm must be finite and >= 0 (0: use AbsorptionScale)", c.AttenuationLength)
	}
	if c.AttenuationLength > 0 {
		if err := inTable("AttenuationWavelength", c.AttenuationWavelength); err != nil {
			return err
		}
	}
	return nil
}

func positiveFinite(field string, v float64) error {
	if !(v > 0) || math.IsInf(v, 1) {
		return fmt.Errorf("optics: WaterConfig.%s = %g must be positive and finite", field, v)
	}
	return nil
}

// lookup interpolates quantity q at lambda (nm); NaN outside the band.
func (w *Water) lookup(q int, lambda float64) float64 {
	f := (lambda - w.lo) * w.invH
	last := w.nodes - 1
	if !(f >= 0 && f <= float64(last)) {
		return math.NaN()
	}
	i := int(f)
	if i == last {
		i--
	}
	f -= float64(i)
	t := w.tab[q]
	return t[i] + f*(t[i+1]-t[i])
}

// Coefficients are the interaction coefficients (1/cm) and group velocity
// of one wavelength: what a photon's flight needs, looked up once.
type Coefficients struct {
	Absorption    float64 // 1/AbsorptionLength
	Scattering    float64 // 1/ScatteringLength, Rayleigh and Mie together
	Mie           float64 // 1/MieLength
	GroupVelocity float64 // cm/ns
}

// CoefficientsAt returns the coefficients at lambda (nm), each exactly the
// value the single lookups interpolate (NaN outside the band), for one
// search of the grid instead of four.
func (w *Water) CoefficientsAt(lambda float64) Coefficients {
	f := (lambda - w.lo) * w.invH
	last := w.nodes - 1
	if !(f >= 0 && f <= float64(last)) {
		nan := math.NaN()
		return Coefficients{nan, nan, nan, nan}
	}
	i := int(f)
	if i == last {
		i--
	}
	f -= float64(i)
	at := func(t []float64) float64 { return t[i] + f*(t[i+1]-t[i]) }
	return Coefficients{
		Absorption:    at(w.tab[qAbsorption]),
		Scattering:    at(w.tab[qScattering]),
		Mie:           at(w.tab[qMie]),
		GroupVelocity: at(w.tab[qGroupVelocity]),
	}
}

// Index returns the phase refractive index at lambda (nm).
func (w *Water) Index(lambda float64) float64 { return w.lookup(qIndex, lambda) }

// GroupIndex returns n - lambda dn/dlambda at lambda (nm).
func (w *Water) GroupIndex(lambda float64) float64 { return w.lookup(qGroupIndex, lambda) }

// GroupVelocity returns c/n_g (cm/ns) at lambda (nm).
func (w *Water) GroupVelocity(lambda float64) float64 { return w.lookup(qGroupVelocity, lambda) }

// AbsorptionLength returns the absorption length (cm) at lambda (nm);
// +Inf when absorption is off.
func (w *Water) AbsorptionLength(lambda float64) float64 { return 1 / w.lookup(qAbsorption, lambda) }

// RayleighLength returns the Rayleigh scattering length (cm).
func (w *Water) RayleighLength(lambda float64) float64 { return 1 / w.lookup(qRayleigh, lambda) }

// MieLength returns the Mie-like scattering length (cm); +Inf when off.
func (w *Water) MieLength(lambda float64) float64 { return 1 / w.lookup(qMie, lambda) }

// ScatteringLength returns the length (cm) for scattering of either kind.
func (w *Water) ScatteringLength(lambda float64) float64 { return 1 / w.lookup(qScattering, lambda) }

// At returns all properties at lambda, or an error naming lambda when it
// is outside Band() or NaN.
func (w *Water) At(lambda float64) (Optical, error) {
	lo, hi := w.Band()
	if !(lambda >= lo && lambda <= hi) {
		return Optical{}, fmt.Errorf("optics: wavelength %g nm outside the water band %g..%g nm", lambda, lo, hi)
	}
	return Optical{
		Index:            w.Index(lambda),
		GroupIndex:       w.GroupIndex(lambda),
		GroupVelocity:    w.GroupVelocity(lambda),
		AbsorptionLength: w.AbsorptionLength(lambda),
		RayleighLength:   w.RayleighLength(lambda),
		MieLength:        w.MieLength(lambda),
		ScatteringLength: w.ScatteringLength(lambda),
	}, nil
}

// Band returns the wavelength band (nm) of the tables.
func (w *Water) Band() (lo, hi float64) { return w.cfg.BandLo, w.cfg.BandHi }

// MaxIndex returns the largest phase index over the band (at its short
// end for water): it sets the lowest Cherenkov threshold.
func (w *Water) MaxIndex() float64 { return w.maxIndex }

// Config returns the configuration the water was built from.
func (w *Water) Config() WaterConfig { return w.cfg }

// AbsorptionScale returns the factor applied to the pure-water absorption:
// AbsorptionScale of the config, or the value derived from
// AttenuationLength when that is set.
func (w *Water) AbsorptionScale() float64 { return w.absScale }

// MieG returns the Henyey-Greenstein asymmetry of the Mie component.
func (w *Water) MieG() float64 { return w.mieG }

// SampleRayleighCos draws cos(theta) from the Rayleigh phase function
// (RayleighPhase) by its exact inverse CDF.
func (w *Water) SampleRayleighCos(rng *rand.Rand) float64 {
	return rayleighInverseCDF(rng.Float64())
}

// SampleMieCos draws cos(theta) from the Henyey-Greenstein phase function
// with asymmetry MieG by its closed-form inverse CDF.
func (w *Water) SampleMieCos(rng *rand.Rand) float64 {
	return henyeyGreensteinInverseCDF(rng.Float64(), w.mieG)
}

// SampleScatterCos draws the cosine of the scattering angle of a photon of
// wavelength lambda (nm) that scatters: Rayleigh or Mie in proportion to
// their coefficients there, then that component's phase function.
func (w *Water) SampleScatterCos(lambda float64, rng *rand.Rand) float64 {
	return w.SampleScatterCosWith(Coefficients{Scattering: w.lookup(qScattering, lambda), Mie: w.lookup(qMie, lambda)}, rng)
}

// SampleScatterCosWith is SampleScatterCos with the coefficients of the
// photon's wavelength already looked up (CoefficientsAt); it draws the
// same numbers.
func (w *Water) SampleScatterCosWith(c Coefficients, rng *rand.Rand) float64 {
	if w.mieEnabled && rng.Float64()*c.Scattering < c.Mie {
		return w.SampleMieCos(rng)
	}
	return w.SampleRayleighCos(rng)
}
