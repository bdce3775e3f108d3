package optics

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/conelight/conelight/sim/phys"
)

func newTestWater(t testing.TB, cfg WaterConfig) *Water {
	t.Helper()
	w, err := NewWater(cfg)
	if err != nil {
		t.Fatal(err)
	}
	return w
}

func TestWaterTablesAgreeWithFunctions(t *testing.T) {
	w := newTestWater(t, DefaultWaterConfig())
	lo, hi := w.Band()
	// At grid nodes (integer nm for the default band) the tables hold the
	// direct values.
	for l := lo; l <= hi; l += 7 {
		n, _ := RefractiveIndex(l, 20)
		ng, _ := GroupIndex(l, 20)
		a, _ := PureWaterAbsorption(l)
		if math.Abs(w.Index(l)-n) > 1e-14 || math.Abs(w.GroupIndex(l)-ng) > 1e-14 ||
			math.Abs(w.GroupVelocity(l)-phys.SpeedOfLight/ng) > 1e-12 {
			t.Errorf("index tables at %g nm: %g %g %g vs %g %g", l, w.Index(l), w.GroupIndex(l), w.GroupVelocity(l), n, ng)
		}
		if math.Abs(w.AbsorptionLength(l)*a-1) > 1e-12 {
			t.Errorf("absorption length at %g nm = %g cm, want %g", l, w.AbsorptionLength(l), 1/a)
		}
		if want := 1 / pureRayleighCoefficient(l); math.Abs(w.RayleighLength(l)/want-1) > 1e-12 {
			t.Errorf("Rayleigh length at %g nm = %g, want %g", l, w.RayleighLength(l), want)
		}
	}
	// Between nodes the linear interpolation error of a smooth function is
	// at most h^2/8 max|f''|; bound f'' by a second difference with 1 nm
	// spacing (h = 1 nm), times 2 for safety against its variation.
	for l := lo + 0.5; l < hi; l += 13 {
		n, _ := RefractiveIndex(l, 20)
		np, _ := RefractiveIndex(l+1, 20)
		nm, _ := RefractiveIndex(l-1, 20)
		tol := 2 * math.Abs(np-2*n+nm) / 8
		if d := math.Abs(w.Index(l) - n); d > tol+1e-15 {
			t.Errorf("index at %g nm off by %g (bound %g)", l, d, tol)
		}
	}
	// Rayleigh length of pure water at 500 nm: 1/0.00222 /m = 450 m
	// (Morel 1974, from memory).
	if got := w.RayleighLength(500); math.Abs(got-45045.045) > 0.01 {
		t.Errorf("Rayleigh length at 500 nm = %g cm", got)
	}
	if !math.IsInf(w.MieLength(500), 1) || w.ScatteringLength(500) != w.RayleighLength(500) {
		t.Errorf("Mie off: MieLength %g, ScatteringLength %g", w.MieLength(500), w.ScatteringLength(500))
	}
	if n1, _ := RefractiveIndex(250, 20); w.MaxIndex() != n1 {
		t.Errorf("MaxIndex %g, want n(250 nm) = %g", w.MaxIndex(), n1)
	}
}

func TestWaterScalesAndMie(t *testing.T) {
	cfg := DefaultWaterConfig()
	cfg.AbsorptionScale, cfg.RayleighScale = 3, 0.5
	cfg.MieLength, cfg.MieWavelength, cfg.MieExponent = 10000, 400, 1.5
	w := newTestWater(t, cfg)
	a, _ := PureWaterAbsorption(420)
	if math.Abs(w.AbsorptionLength(420)*3*a-1) > 1e-12 {
		t.Errorf("scaled absorption length %g", w.AbsorptionLength(420))
	}
	if want := 2 / pureRayleighCoefficient(420); math.Abs(w.RayleighLength(420)/want-1) > 1e-12 {
		t.Errorf("scaled Rayleigh length %g want %g", w.RayleighLength(420), want)
	}
	if math.Abs(w.MieLength(400)-10000) > 1e-9 || math.Abs(w.MieLength(600)-10000*math.Pow(1.5, 1.5)) > 1e-6 {
		t.Errorf("Mie lengths %g %g", w.MieLength(400), w.MieLength(600))
	}
	inv := 1/w.RayleighLength(500) + 1/w.MieLength(500)
	if math.Abs(w.ScatteringLength(500)*inv-1) > 1e-12 {
		t.Errorf("scattering length %g, want %g", w.ScatteringLength(500), 1/inv)
	}
	if w.AbsorptionScale() != 3 || w.MieG() != 0.9 || w.Config().RayleighScale != 0.5 {
		t.Error("accessors do not return the configuration")
	}
}

func TestWaterAttenuationLength(t *testing.T) {
	// The absorption scale is solved so that the total attenuation at the
	// reference wavelength equals the requested length.
	cfg := DefaultWaterConfig()
	cfg.MieLength = 50000
	cfg.AttenuationLength, cfg.AttenuationWavelength = 8000, 420
	w := newTestWater(t, cfg)
	att := 1 / (1/w.AbsorptionLength(420) + 1/w.ScatteringLength(420))
	if math.Abs(att-8000) > 1e-6 {
		t.Errorf("attenuation length at 420 nm = %g cm, want 8000", att)
	}
	a, _ := PureWaterAbsorption(420)
	if s := w.AbsorptionScale(); math.Abs(s*a+1/w.ScatteringLength(420)-1.0/8000) > 1e-15 {
		t.Errorf("absorption scale %g", s)
	}
	// Asking for more attenuation length than scattering allows fails.
	cfg.AttenuationLength = 40000
	if _, err := NewWater(cfg); err == nil || !strings.Contains(err.Error(), "AttenuationLength = 40000") {
		t.Errorf("too long attenuation: err = %v", err)
	}
}

func TestWaterAt(t *testing.T) {
	w := newTestWater(t, DefaultWaterConfig())
	o, err := w.At(432.1)
	if err != nil {
		t.Fatal(err)
	}
	if o.Index != w.Index(432.1) || o.GroupVelocity != w.GroupVelocity(432.1) || o.AbsorptionLength != w.AbsorptionLength(432.1) ||
		o.ScatteringLength != w.ScatteringLength(432.1) || o.GroupIndex != w.GroupIndex(432.1) ||
		o.RayleighLength != w.RayleighLength(432.1) || o.MieLength != w.MieLength(432.1) {
		t.Errorf("At(432.1) = %+v disagrees with the lookups", o)
	}
	for _, l := range []float64{249.9, 700.1, math.NaN()} {
		if _, err := w.At(l); err == nil {
			t.Errorf("At(%g) gave no error", l)
		}
		if !math.IsNaN(w.Index(l)) || !math.IsNaN(w.AbsorptionLength(l)) {
			t.Errorf("lookup at %g nm outside the band is not NaN", l)
		}
	}
	// Band edges are inside.
	if math.IsNaN(w.Index(250)) || math.IsNaN(w.Index(700)) {
		t.Error("band edges gave NaN")
	}
}

func TestWaterConfigErrors(t *testing.T) {
	cases := []struct {
		field string
		mod   func(*WaterConfig)
	}{
		{"TemperatureC = -3", func(c *WaterConfig) { c.TemperatureC = -3 }},
		{"TemperatureC = NaN", func(c *WaterConfig) { c.TemperatureC = math.NaN() }},
		{"BandLo = 150", func(c *WaterConfig) { c.BandLo = 150 }},
		{"BandHi = 800", func(c *WaterConfig) { c.BandHi = 800 }},
		{"BandHi = 300", func(c *WaterConfig) { c.BandLo, c.BandHi = 400, 300 }},
		{"AbsorptionScale = -1", func(c *WaterConfig) { c.AbsorptionScale = -1 }},
		{"RayleighScale = NaN", func(c *WaterConfig) { c.RayleighScale = math.NaN() }},
		{"RayleighScale = +Inf", func(c *WaterConfig) { c.RayleighScale = math.Inf(1) }},
		{"MieLength = -5", func(c *WaterConfig) { c.MieLength = -5 }},
		{"MieWavelength = 0", func(c *WaterConfig) { c.MieLength, c.MieWavelength = 100, 0 }},
		{"MieExponent = NaN", func(c *WaterConfig) { c.MieLength, c.MieExponent = 100, math.NaN() }},
		{"MieG = 1", func(c *WaterConfig) { c.MieG = 1 }},
		{"AttenuationLength = -2", func(c *WaterConfig) { c.AttenuationLength = -2 }},
		{"AttenuationWavelength = 0", func(c *WaterConfig) { c.AttenuationLength = 100 }},
	}
	for _, c := range cases {
		cfg := DefaultWaterConfig()
		c.mod(&cfg)
		_, err := NewWater(cfg)
		if err == nil || !strings.Contains(err.Error(), c.field) {
			t.Errorf("%s: err = %v", c.field, err)
		}
	}
}

func TestWaterNoAllocation(t *testing.T) {
	cfg := DefaultWaterConfig()
	cfg.MieLength = 20000
	w := newTestWater(t, cfg)
	rng := rand.New(rand.NewPCG(1, 1))
	l := 400.3
	var sink float64
	allocs := testing.AllocsPerRun(100, func() {
		sink += w.Index(l) + w.GroupIndex(l) + w.GroupVelocity(l) + w.AbsorptionLength(l) +
			w.RayleighLength(l) + w.MieLength(l) + w.ScatteringLength(l) +
			w.SampleScatterCos(l, rng) + w.SampleRayleighCos(rng) + w.SampleMieCos(rng)
	})
	if allocs != 0 {
		t.Errorf("lookups allocate %g times", allocs)
	}
	_ = sink
}

// TestCoefficientsAt: the combined lookup gives exactly the values of the
// single lookups across the band, and NaN outside it.
func TestCoefficientsAt(t *testing.T) {
	w, err := NewWater(DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := w.Band()
	for k := 0; k <= 10000; k++ {
		l := lo + (hi-lo)*float64(k)/10000
		c := w.CoefficientsAt(l)
		if c.Absorption != w.lookup(qAbsorption, l) || c.Scattering != w.lookup(qScattering, l) ||
			c.Mie != w.lookup(qMie, l) || c.GroupVelocity != w.GroupVelocity(l) {
			t.Fatalf("CoefficientsAt(%v) = %+v differs from the single lookups", l, c)
		}
	}
	for _, l := range []float64{lo - 1e-9, hi + 1e-9, math.NaN()} {
		if c := w.CoefficientsAt(l); !math.IsNaN(c.Absorption) || !math.IsNaN(c.GroupVelocity) {
			t.Errorf("CoefficientsAt(%v) = %+v, want NaN outside the band", l, c)
		}
	}
}
