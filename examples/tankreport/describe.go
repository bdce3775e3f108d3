package main

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
)

// yieldOptions set the reference-electron run of describe.
type yieldOptions struct {
	Events int     // electrons simulated; 0 skips the light yield
	Ekin   float64 // kinetic energy, MeV
	Seed   uint64
}

// describe prints what follows from a detector description: its
// geometry, water mass, light yield, dark noise per readout window and
// which low-energy fitter tables suit it.
func describe(w io.Writer, spec string, s setup.Setup, yo yieldOptions) error {
	d := s.Detector
	t := d.Tank()
	fmt.Fprintf(w, "description %s: valid\n", spec)
	fmt.Fprintf(w, "  name %q\n", s.Name)
	fmt.Fprintf(w, "  tank: vessel radius %g cm, height %g cm; sensor surface %g cm inside it: radius %g cm, height %g cm, area %.1f m2\n",
		t.Radius, t.Height, t.SensorOffset, t.SensorRadius(), 2*t.SensorHalfHeight(), t.InnerArea()*1e-4)

	var parts [4]int
	for _, sn := range d.Sensors() {
		parts[sn.Surface]++
	}
	live := d.NumSensors() - len(s.Dead)
	fmt.Fprintf(w, "  sensors: %d of %q (cathode %g cm): barrel %d, top %d, bottom %d; %d dead, %d live\n",
		d.NumSensors(), s.Sensor.Name, d.CathodeDiameter(), parts[geom.Barrel], parts[geom.Top], parts[geom.Bottom], len(s.Dead), live)
	if detflag.IsEventFile(spec) {
		fmt.Fprintf(w, "    note: event files do not record dead sensors; none are assumed\n")
	}
	fmt.Fprintf(w, "  coverage reached: %.4f (all sensors), %.4f (live sensors)\n",
		d.Coverage(), d.Coverage()*float64(live)/float64(d.NumSensors()))

	wc := s.Water.Config()
	rho, err := optics.WaterDensity(wc.TemperatureC)
	if err != nil {
		return err
	}
	// rho in kg/m^3 is g/L; volumes in cm^3: mass (t) = V * rho * 1e-9.
	fmt.Fprintf(w, "  water at %g C, density %.2f kg/m3 (Kell 1975): %.1f t in the vessel, %.1f t inside the sensor surface\n",
		wc.TemperatureC, rho, t.Volume()*rho*1e-9, t.InnerVolume()*rho*1e-9)
	for _, l := range []float64{400, 450} {
		fmt.Fprintf(w, "    at %g nm: absorption length %.0f cm, scattering length %.0f cm\n", l, s.Water.AbsorptionLength(l), s.Water.ScatteringLength(l))
	}

	if yo.Events > 0 {
		if err := lightYield(w, s, yo); err != nil {
			return err
		}
	}
	darkNoise(w, s, live)
	fitterTables(w, s)
	return nil
}

// lightYield simulates electrons at the centre of the tank, isotropic, and
// prints the mean number of signal photoelectrons per MeV with its
// standard error, and the fraction that triggers. Dark noise is off: it
// is reported apart.
func lightYield(w io.Writer, s setup.Setup, yo yieldOptions) error {
	y, err := simulateYield(s, yo)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "  light yield: %.2f ± %.2f photoelectrons per MeV (%d electrons of %g MeV at the centre, isotropic, no dark noise: %.1f ± %.1f pe each, spread %.1f pe); %d/%d trigger\n",
		y.perMeV, y.perMeVErr, yo.Events, yo.Ekin, y.mean, y.meanErr, y.spread, y.triggered, yo.Events)
	return nil
}

// yield is the result of simulateYield.
type yield struct {
	mean, meanErr, spread float64 // signal photoelectrons per electron: mean, its standard error, standard deviation
	perMeV, perMeVErr     float64
	triggered             int
}

func simulateYield(s setup.Setup, yo yieldOptions) (yield, error) {
	cfg := detflag.SimConfig(s, yo.Seed)
	cfg.NoDarkNoise = true
	sm, err := sim.New(cfg)
	if err != nil {
		return yield{}, err
	}
	pe := make([]float64, yo.Events)
	var y yield
	for i := range yo.Events {
		// The direction comes from a stream of its own, not the simulator's.
		dir := gen.Isotropic().Sample(sim.EventStream(yo.Seed^0x5eed, uint64(i)))
		ev, err := sm.Event(uint64(i), []phys.Particle{{PDG: 11, Pos: r3.Vector{}, Dir: dir, Ekin: yo.Ekin}})
		if err != nil {
			return yield{}, err
		}
		pe[i] = float64(ev.Truth.Photoelectrons)
		if ev.Truth.Triggered {
			y.triggered++
		}
	}
	y.mean, y.spread = stat.MeanStdDev(pe, nil)
	y.meanErr = y.spread / math.Sqrt(float64(yo.Events))
	y.perMeV, y.perMeVErr = y.mean/yo.Ekin, y.meanErr/yo.Ekin
	return y, nil
}

// darkNoise prints the dark hits expected in the readout window and in
// the trigger window, and the Poisson chance that noise alone reaches the
// trigger threshold in one trigger window. A dark pulse is one
// photoelectron; it makes a hit when its charge reaches the threshold.
func darkNoise(w io.Writer, s setup.Setup, live int) {
	m := s.Sensor
	pHit := 1 - m.SPE.CDF(m.Threshold)
	rate := float64(live) * m.DarkRate * pHit // hits per second
	readout := s.ReadoutWindow()
	fmt.Fprintf(w, "  dark noise: %d live sensors x %g Hz x P(charge >= %g pe) = %.3f -> %.3g hits per %g ns readout window\n",
		live, m.DarkRate, m.Threshold, pHit, rate*readout*1e-9, readout)
	mu := rate * s.Trigger.Window * 1e-9
	k := s.Trigger.Threshold
	p := distuv.Poisson{Lambda: mu}.Survival(float64(k - 1))
	fmt.Fprintf(w, "    %.3g noise hits expected in the %g ns trigger window; P(>= %d of them) = %.3g (Poisson)\n",
		mu, s.Trigger.Window, k, p)
}

// Tolerances of fitterTables: how far a detector may be from the one a
// table set was made for and still use it. Choices of this program, not
// measurements: the energy calibration scales with the light collected
// (coverage), the time-residual tail with the tank size; 10% keeps either
// effect at the level of the fitter's energy resolution at 10 MeV.
const (
	tankTolerance     = 0.10 // relative, on sensor-surface radius and half height
	coverageTolerance = 0.10 // relative
)

// fitterTables prints, for each embedded table set of the low-energy
// fitter, whether it suits the detector and if not why.
func fitterTables(w io.Writer, s setup.Setup) {
	fmt.Fprintf(w, "  low-energy fitter tables (fit/lowenergy; tank within %.0f%%, same sensor class, coverage within %.0f%%):\n",
		100*tankTolerance, 100*coverageTolerance)
	t := s.Detector.Tank()
	class, edits := setup.NearestPreset(s.Sensor)
	// Edits that change the light collected move the energy calibration;
	// the fitter convolves a larger TTS itself and models dark noise.
	var lightEdits []string
	for _, k := range edits {
		switch k {
		case "cathode_diameter_cm", "qe_peak", "qe_wavelength_nm", "qe_fraction", "collection_efficiency",
			"acceptance_cos_incidence", "acceptance_relative":
			lightEdits = append(lightEdits, k)
		}
	}
	for _, name := range lowenergy.EmbeddedTableNames() {
		tb, err := lowenergy.EmbeddedTables(name)
		if err != nil {
			fmt.Fprintf(w, "    %-8s unreadable: %v\n", name, err)
			continue
		}
		var why []string
		if r := t.SensorRadius()/tb.TankRadius - 1; math.Abs(r) > tankTolerance {
			why = append(why, fmt.Sprintf("sensor-surface radius %g cm, table %g cm", t.SensorRadius(), tb.TankRadius))
		}
		if r := t.SensorHalfHeight()/tb.TankHalfHeight - 1; math.Abs(r) > tankTolerance {
			why = append(why, fmt.Sprintf("half height %g cm, table %g cm", t.SensorHalfHeight(), tb.TankHalfHeight))
		}
		if ts := tb.Meta["sensor"]; ts != class {
			why = append(why, fmt.Sprintf("sensor class %q, table %q", class, ts))
		} else if len(lightEdits) > 0 {
			why = append(why, fmt.Sprintf("sensor edited from %s in what sets the light collected (%s)", class, strings.Join(lightEdits, ", ")))
		}
		if c, err := strconv.ParseFloat(tb.Meta["coverage"], 64); err != nil {
			why = append(why, fmt.Sprintf("table states no coverage (%q)", tb.Meta["coverage"]))
		} else if r := s.Detector.Coverage()/c - 1; math.Abs(r) > coverageTolerance {
			why = append(why, fmt.Sprintf("coverage %.3f, table %.3f", s.Detector.Coverage(), c))
		}
		if tb.TTS > s.Sensor.TTS {
			why = append(why, fmt.Sprintf("table already holds a TTS of %g ns, more than the sensor's %g ns", tb.TTS, s.Sensor.TTS))
		}
		if len(why) == 0 {
			fmt.Fprintf(w, "    %-8s suits\n", name)
		} else {
			fmt.Fprintf(w, "    %-8s does not suit: %s\n", name, strings.Join(why, "; "))
		}
	}
	if f, err := lowenergy.New(lowenergy.Config{Setup: s}); err != nil {
		fmt.Fprintf(w, "    the fitter cannot be built for this detector: %v\n", err)
	} else {
		fmt.Fprintf(w, "    without tables of its own the fitter takes %q, the set closest in tank size\n", f.Tables().Name)
	}
	fmt.Fprintf(w, "  ring fitter (fit/ring): its emission profiles are per particle in water, not per tank; it takes any description\n")
}
