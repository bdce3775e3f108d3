package sim

import (
	"fmt"
	"math"
	"reflect"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/photon"
	"github.com/conelight/conelight/sim/setup"
	"github.com/conelight/conelight/sim/transport"
)

// badFloats are the values every float option is tried with: NaN and the
// infinities must always be refused; a negative value or zero only where
// the field's documentation says so (checked as "no panic, and any error
// names the field").
var badFloats = []float64{math.NaN(), math.Inf(1), math.Inf(-1), -1, 0}

// floatFields lists the paths ("A.B") of the float64 fields of v, a
// struct, recursing into nested structs but not into types with
// unexported fields (curves, distributions), which are audited through
// their own constructors.
func floatFields(v reflect.Value, prefix string) []string {
	var paths []string
	t := v.Type()
	for i := range t.NumField() {
		f := t.Field(i)
		if !f.IsExported() {
			continue
		}
		switch f.Type.Kind() {
		case reflect.Float64:
			paths = append(paths, prefix+f.Name)
		case reflect.Struct:
			exported := true
			for j := range f.Type.NumField() {
				exported = exported && f.Type.Field(j).IsExported()
			}
			if exported {
				paths = append(paths, floatFields(v.Field(i), prefix+f.Name+".")...)
			}
		}
	}
	return paths
}

func setPath(v reflect.Value, path string, x float64) {
	for _, name := range strings.Split(path, ".") {
		v = v.FieldByName(name)
	}
	v.SetFloat(x)
}

// auditFloats sets each float field of good (a struct value) in turn to
// each bad value and calls check, which must not panic. NaN and
// infinities must give an error; every error must name the field (its
// last path element) and the value. allowed lists "Field=value" pairs the
// documentation permits (e.g. "MieLength=+Inf": off).
func auditFloats[T any](t *testing.T, what string, good T, allowed []string, check func(T) error) {
	t.Helper()
	for _, path := range floatFields(reflect.ValueOf(good), "") {
		name := path[strings.LastIndex(path, ".")+1:]
		for _, x := range badFloats {
			cfg := good
			setPath(reflect.ValueOf(&cfg).Elem(), path, x)
			err := callNoPanic(t, fmt.Sprintf("%s.%s = %v", what, path, x), func() error { return check(cfg) })
			key := fmt.Sprintf("%s=%v", name, x)
			ok := false
			for _, a := range allowed {
				ok = ok || a == key
			}
			switch {
			case err == nil && (math.IsNaN(x) || math.IsInf(x, 0)) && !ok:
				t.Errorf("%s.%s = %v accepted", what, path, x)
			case err != nil && (!strings.Contains(err.Error(), name) || !strings.Contains(err.Error(), fmt.Sprint(x))):
				t.Errorf("%s.%s = %v: error %q does not name the field and the value", what, path, x, err)
			}
		}
	}
}

func callNoPanic(t *testing.T, what string, fn func() error) (err error) {
	t.Helper()
	defer func() {
		if r := recover(); r != nil {
			t.Errorf("%s: panic: %v", what, r)
			err = fmt.Errorf("panic")
		}
	}()
	return fn()
}

func TestValidationAudit(t *testing.T) {
	cfg, err := DemoConfig(1)
	if err != nil {
		t.Fatal(err)
	}
	water, model := cfg.Water, cfg.Sensor

	auditFloats(t, "geom.Tank", geom.DemoTank(), []string{"SensorOffset=0"}, func(tk geom.Tank) error { return tk.Validate() })
	auditFloats(t, "pmt.Model", model, []string{"TTS=0", "DarkRate=0", "Threshold=0", "Saturation=0", "Width=0", "LowFraction=0", "LowMean=0"},
		func(m pmt.Model) error { return m.Validate() })
	auditFloats(t, "pmt.Trigger", setup.DefaultTrigger(), []string{"PreTrigger=0", "PostTrigger=0"}, func(tr pmt.Trigger) error { return tr.Validate() })
	auditFloats(t, "optics.Liner", optics.DefaultLiner(), []string{"Reflectivity=0", "DiffuseFraction=0"}, func(l optics.Liner) error { return l.Validate() })
	auditFloats(t, "optics.WaterConfig", optics.DefaultWaterConfig(),
		[]string{"TemperatureC=0", "AbsorptionScale=0", "RayleighScale=0", "MieLength=0", "MieLength=+Inf", "MieG=0",
			"AttenuationLength=0", "AttenuationLength=-1", "AttenuationWavelength=0", "AttenuationWavelength=-1"},
		func(c optics.WaterConfig) error { _, err := optics.NewWater(c); return err })
	mie := optics.DefaultWaterConfig()
	mie.MieLength, mie.AttenuationLength, mie.AttenuationWavelength = 5000, 3000, 400
	auditFloats(t, "optics.WaterConfig with Mie and attenuation", mie,
		[]string{"TemperatureC=0", "AbsorptionScale=0", "RayleighScale=0", "MieLength=0", "MieLength=+Inf", "MieG=0", "MieExponent=0", "MieExponent=-1"},
		func(c optics.WaterConfig) error { _, err := optics.NewWater(c); return err })
	auditFloats(t, "photon.Config", photon.Config{Liner: optics.DefaultLiner(), Prescale: 1}, []string{"Reflectivity=0", "DiffuseFraction=0"},
		func(c photon.Config) error { _, err := photon.NewTracer(cfg.Detector, &model, water, c); return err })
	auditFloats(t, "em.Config", em.DefaultConfig(), nil, func(c em.Config) error { _, err := em.New(material.Water(), c); return err })
	auditFloats(t, "muon.Config", muon.DefaultConfig(), nil, func(c muon.Config) error { _, err := muon.New(material.Water(), c); return err })
	auditFloats(t, "gen.FermiGas", gen.OxygenFermiGas(), nil, func(fg gen.FermiGas) error {
		_, err := gen.NewQE(gen.QEConfig{Neutrino: 14, Etot: gen.FixedEnergy(600), Beam: r3.Vector{Z: 1},
			Vertex: gen.AtPoint(r3.Vector{}), Nucleus: fg})
		return err
	})
	_ = cherenkov.ThresholdBeta
	_ = transport.New
}

// TestBadArguments: constructors and entry points given nil, negative,
// out-of-range or non-finite arguments return an error naming what is
// wrong, never panic.
func TestBadArguments(t *testing.T) {
	cfg, err := DemoConfig(1)
	if err != nil {
		t.Fatal(err)
	}
	model, water, det := cfg.Sensor, cfg.Water, cfg.Detector
	gunWith := func(p gen.GunParticle, v gen.VertexDist) func() error {
		return func() error {
			_, err := gen.NewGun(gen.GunConfig{Particles: []gen.GunParticle{p}, Vertex: v})
			return err
		}
	}
	electron := func(e gen.Spectrum, d gen.DirDist) gen.GunParticle {
		return gen.GunParticle{PDG: 11, Ekin: e, Direction: d}
	}
	center := gen.AtPoint(r3.Vector{})
	iso := gen.Isotropic()
	ten := gen.FixedEnergy(10)
	nan, inf := math.NaN(), math.Inf(1)
	withCfg := func(edit func(*Config)) func() error {
		return func() error { c := cfg; edit(&c); _, err := New(c); return err }
	}
	for _, tc := range []struct {
		name, want string
		call       func() error
	}{
		{"geom.Layout NaN coverage", "coverage = NaN", func() error { _, err := geom.Layout(geom.DemoTank(), 20, nan); return err }},
		{"geom.Layout Inf diameter", "diameter = +Inf", func() error { _, err := geom.Layout(geom.DemoTank(), inf, 0.3); return err }},
		{"geom.MaxCoverage bad tank", "Tank.Height = -1", func() error { _, err := geom.MaxCoverage(geom.Tank{Radius: 1, Height: -1}, 1); return err }},
		{"pmt.NewCurve NaN", "x[1] = NaN", func() error { _, err := pmt.NewCurve([]float64{0, nan}, []float64{0, 1}); return err }},
		{"pmt.NewDigitizer nil", "nil", func() error { _, err := pmt.NewDigitizer(nil); return err }},
		{"pmt.SPE width", "SPE.Width = 2", func() error { return pmt.SPE{Width: 2}.Validate() }},
		{"optics.RefractiveIndex NaN", "NaN", func() error { _, err := optics.RefractiveIndex(nan, 20); return err }},
		{"optics.RefractiveIndex Inf temperature", "+Inf", func() error { _, err := optics.RefractiveIndex(400, inf); return err }},
		{"optics.NewWater zero band", "Band", func() error { _, err := optics.NewWater(optics.WaterConfig{}); return err }},
		{"cherenkov.NewEmitter nil water", "nil", func() error { _, err := cherenkov.NewEmitter(nil, 300, 600, 1); return err }},
		{"cherenkov.NewEmitter NaN band", "NaN", func() error { _, err := cherenkov.NewEmitter(water, nan, 600, 1); return err }},
		{"cherenkov.NewEmitter prescale 0", "0", func() error { _, err := cherenkov.NewEmitter(water, 300, 600, 0); return err }},
		{"cherenkov.NewEmitter prescale NaN", "NaN", func() error { _, err := cherenkov.NewEmitter(water, 300, 600, nan); return err }},
		{"cherenkov.ThresholdBeta NaN", "NaN", func() error { _, err := cherenkov.ThresholdBeta(nan); return err }},
		{"cherenkov.ThresholdKinetic negative mass", "-1", func() error { _, err := cherenkov.ThresholdKinetic(-1, 1.33); return err }},
		{"photon.NewTracer nil detector", "nil", func() error { _, err := photon.NewTracer(nil, &model, water, photon.Config{Prescale: 1}); return err }},
		{"photon.NewTracer nil model", "nil", func() error { _, err := photon.NewTracer(det, nil, water, photon.Config{Prescale: 1}); return err }},
		{"photon.NewTracer nil water", "nil", func() error { _, err := photon.NewTracer(det, &model, nil, photon.Config{Prescale: 1}); return err }},
		{"photon.Config.MaxInteractions negative", "MaxInteractions = -1", func() error {
			_, err := photon.NewTracer(det, &model, water, photon.Config{Prescale: 1, MaxInteractions: -1})
			return err
		}},
		{"em.ConfigForIndex NaN", "NaN", func() error { _, err := em.ConfigForIndex(nan); return err }},
		{"transport.NewTracker nil", "nil", func() error { _, err := transport.NewTracker(nil); return err }},
		{"gen.NewGun no particles", "Particles", func() error { _, err := gen.NewGun(gen.GunConfig{Vertex: center}); return err }},
		{"gen.NewGun unset vertex", "Vertex", gunWith(electron(ten, iso), gen.VertexDist{})},
		{"gen.NewGun NaN point", "NaN", gunWith(electron(ten, iso), gen.AtPoint(r3.Vector{X: nan}))},
		{"gen.NewGun negative fiducial wall", "minWall = -5", gunWith(electron(ten, iso), gen.InFiducial(geom.DemoTank(), -5))},
		{"gen.NewGun NaN energy", "NaN", gunWith(electron(gen.FixedEnergy(nan), iso), center)},
		{"gen.NewGun negative energy", "-3", gunWith(electron(gen.FixedEnergy(-3), iso), center)},
		{"gen.NewGun reversed range", "5", gunWith(electron(gen.UniformEnergy(5, 1), iso), center)},
		{"gen.NewGun Inf range", "+Inf", gunWith(electron(gen.UniformEnergy(1, inf), iso), center)},
		{"gen.NewGun power law NaN index", "NaN", gunWith(electron(gen.PowerLaw(nan, 1, 10), iso), center)},
		{"gen.NewGun unset energy", "Ekin", gunWith(electron(gen.Spectrum{}, iso), center)},
		{"gen.NewGun zero direction", "Direction: direction (0.0", gunWith(electron(ten, gen.Along(r3.Vector{})), center)},
		{"gen.NewGun NaN cone", "halfAngle = NaN", gunWith(electron(ten, gen.InCone(r3.Vector{Z: 1}, nan)), center)},
		{"gen.NewGun unset direction", "Direction", gunWith(electron(ten, gen.DirDist{}), center)},
		{"gen.NewGun unknown particle", "2212", gunWith(gen.GunParticle{PDG: 2212, Ekin: ten, Direction: iso}, center)},
		{"gen.NewGun Inf time", "Time = +Inf", func() error {
			_, err := gen.NewGun(gen.GunConfig{Particles: []gen.GunParticle{electron(ten, iso)}, Vertex: center, Time: inf})
			return err
		}},
		{"gen.HistogramSpectrum NaN weight", "weights[0] = NaN", func() error { _, err := gen.HistogramSpectrum([]float64{1, 2}, []float64{nan}); return err }},
		{"gen.NewQE zero beam", "Beam", func() error {
			_, err := gen.NewQE(gen.QEConfig{Neutrino: 14, Etot: gen.FixedEnergy(600), Vertex: center})
			return err
		}},
		{"gen.NewQE bad neutrino", "Neutrino = 13", func() error {
			_, err := gen.NewQE(gen.QEConfig{Neutrino: 13, Etot: gen.FixedEnergy(600), Beam: r3.Vector{Z: 1}, Vertex: center})
			return err
		}},
		{"gen.NewQE NaN axial mass", "AxialMass = NaN", func() error {
			_, err := gen.NewQE(gen.QEConfig{Neutrino: 14, Etot: gen.FixedEnergy(600), Beam: r3.Vector{Z: 1}, Vertex: center, AxialMass: nan})
			return err
		}},
		{"gen.NewQE below threshold", "60", func() error {
			_, err := gen.NewQE(gen.QEConfig{Neutrino: 14, Etot: gen.FixedEnergy(60), Beam: r3.Vector{Z: 1}, Vertex: center})
			return err
		}},
		{"gen.HepMCOptions NaN time", "Time = NaN", func() error {
			_, err := gen.ReadHepMC(strings.NewReader(""), "x", gen.HepMCOptions{Time: nan})
			return err
		}},
		{"sim.New nil detector", "Detector", withCfg(func(c *Config) { c.Detector = nil })},
		{"sim.New negative workers", "Workers = -2", withCfg(func(c *Config) { c.Workers = -2 })},
		{"sim.New bad trigger", "Threshold = 0", withCfg(func(c *Config) { c.Trigger.Threshold = 0 })},
		{"sim.New bad liner", "Reflectivity = NaN", withCfg(func(c *Config) { c.Liner.Reflectivity = nan })},
		{"sim.New sensor mismatch", "CathodeDiameter", withCfg(func(c *Config) { c.Sensor = pmt.Large() })},
		{"sim.New bad em config", "MaxStep = NaN", withCfg(func(c *Config) { c.EM = em.DefaultConfig(); c.EM.MaxStep = nan })},
		{"sim.New bad muon config", "NaN", withCfg(func(c *Config) { c.Muon = muon.DefaultConfig(); c.Muon.MaxStep = nan })},
	} {
		err := callNoPanic(t, tc.name, tc.call)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.want)
		}
	}
}
