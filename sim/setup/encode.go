package setup

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/geom/safefile"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/optics"
)

// ErrNeedsCSV is returned (wrapped) by Encode for a Setup whose sensors
// geom.Layout cannot reproduce from a coverage: its layout must be written
// as a sensor CSV, which Save does.
var ErrNeedsCSV = errors.New("setup: the sensor layout is not a coverage layout; use Save, which writes it to a sensor CSV beside the description")

// Encode writes s as a description file in its canonical form: every key
// that differs from its default, in the order of the package
// documentation, each with a comment saying what it is; the sensor as the
// nearest preset with the keys that edit it; the layout as the shortest
// coverage from which geom.Layout rebuilds exactly s's sensors. Parse of
// the result gives a Setup equal to s, and Encode of that the same bytes.
// s must pass Check and CheckTrigger and have a Name.
func Encode(w io.Writer, s Setup) error {
	return encode(w, s, "")
}

// Save writes s to path atomically (geom/safefile) as Encode does. A
// layout that is not a coverage layout is written, also atomically, to
// the sensor CSV path+".sensors.csv" beside it, which the description
// names relative to itself.
func Save(path string, s Setup) error {
	var buf bytes.Buffer
	err := encode(&buf, s, "")
	if err != nil && !isNeedsCSV(err) {
		return err
	}
	if err != nil {
		csv := filepath.Base(path) + ".sensors.csv"
		buf.Reset()
		if err := encode(&buf, s, csv); err != nil {
			return err
		}
		if err := geom.SaveSensorCSV(filepath.Join(filepath.Dir(path), csv), s.Detector); err != nil {
			return fmt.Errorf("setup: %w", err)
		}
	}
	if err := safefile.Write(path, func(w io.Writer) error { _, err := w.Write(buf.Bytes()); return err }); err != nil {
		return fmt.Errorf("setup: %w", err)
	}
	return nil
}

func isNeedsCSV(err error) bool { return errors.Is(err, ErrNeedsCSV) }

// encode writes s; csv, if not empty, is the sensor CSV the layout is
// written as.
func encode(w io.Writer, s Setup, csv string) error {
	if err := s.Check(); err != nil {
		return err
	}
	if err := s.CheckTrigger(); err != nil {
		return err
	}
	if err := checkName(s.Name); err != nil {
		return fmt.Errorf("setup: Setup.Name %q %v", s.Name, err)
	}
	var cov string
	if csv == "" {
		var ok bool
		if cov, ok = coverageOf(s.Detector); !ok {
			return ErrNeedsCSV
		}
	}

	e := &encoder{docs: make(map[string]string)}
	for _, d := range schema() {
		e.docs[d.key] = d.doc
	}
	e.comment("conelight detector description; the keys left out take their defaults (see the sim/setup package documentation, or testdata/setup/example.toml for every key)")
	e.buf.WriteString("\n")
	e.int("format_version", FormatVersion)
	e.str("name", s.Name)

	t := s.Detector.Tank()
	e.table("tank")
	e.float("tank.vessel_radius_cm", t.Radius)
	e.float("tank.vessel_height_cm", t.Height)
	if t.SensorOffset != 0 {
		e.float("tank.sensor_offset_cm", t.SensorOffset)
	}

	e.table("sensor")
	e.sensor(s.Sensor)

	e.table("layout")
	if csv != "" {
		e.str("layout.sensor_csv", csv)
	} else {
		e.raw("layout.coverage", cov)
	}
	if len(s.Dead) > 0 {
		parts := make([]string, len(s.Dead))
		for i, d := range s.Dead {
			parts[i] = strconv.Itoa(d)
		}
		e.raw("layout.dead_sensors", "["+strings.Join(parts, ", ")+"]")
	}

	wc, dw := s.Water.Config(), optics.DefaultWaterConfig()
	e.lazyTable("water")
	for _, f := range []struct {
		key     string
		v, def  float64
		include bool
	}{
		{"water.temperature_c", wc.TemperatureC, dw.TemperatureC, false},
		{"water.band_lo_nm", wc.BandLo, dw.BandLo, false},
		{"water.band_hi_nm", wc.BandHi, dw.BandHi, false},
		// With an attenuation length the absorption scale is derived, not given.
		{"water.absorption_scale", wc.AbsorptionScale, dw.AbsorptionScale, false},
		{"water.rayleigh_scale", wc.RayleighScale, dw.RayleighScale, false},
		{"water.mie_length_cm", wc.MieLength, dw.MieLength, false},
		{"water.mie_wavelength_nm", wc.MieWavelength, dw.MieWavelength, false},
		{"water.mie_exponent", wc.MieExponent, dw.MieExponent, false},
		{"water.mie_g", wc.MieG, dw.MieG, false},
		{"water.attenuation_length_cm", wc.AttenuationLength, dw.AttenuationLength, false},
		{"water.attenuation_wavelength_nm", wc.AttenuationWavelength, dw.AttenuationWavelength, wc.AttenuationLength > 0},
	} {
		if f.v != f.def || f.include {
			e.float(f.key, f.v)
		}
	}

	dl := optics.DefaultLiner()
	e.lazyTable("liner")
	if s.Liner.Reflectivity != dl.Reflectivity {
		e.float("liner.reflectivity", s.Liner.Reflectivity)
	}
	if s.Liner.DiffuseFraction != dl.DiffuseFraction {
		e.float("liner.diffuse_fraction", s.Liner.DiffuseFraction)
	}

	dt := DefaultTrigger()
	e.lazyTable("trigger")
	if s.Trigger.Threshold != dt.Threshold {
		e.int("trigger.hits", s.Trigger.Threshold)
	}
	for _, f := range []struct {
		key    string
		v, def float64
	}{{"trigger.window_ns", s.Trigger.Window, dt.Window}, {"trigger.pre_trigger_ns", s.Trigger.PreTrigger, dt.PreTrigger},
		{"trigger.post_trigger_ns", s.Trigger.PostTrigger, dt.PostTrigger}} {
		if f.v != f.def {
			e.float(f.key, f.v)
		}
	}
	if e.err != nil {
		return e.err
	}
	_, err := w.Write(e.buf.Bytes())
	return err
}

// coverageOf returns the shortest decimal coverage from which geom.Layout
// rebuilds d exactly, trying 1 to 17 significant digits of d's coverage
// and, at each, the neighbours one unit of the last digit away (the
// coverage reached differs from the one asked for by up to a few
// percent).
func coverageOf(d *geom.Detector) (string, bool) {
	t, diam := d.Tank(), d.CathodeDiameter()
	most, err := geom.MaxCoverage(t, diam)
	if err != nil {
		return "", false
	}
	c := d.Coverage()
	tried := make(map[float64]bool)
	for digits := 1; digits <= 17; digits++ {
		base, err := strconv.ParseFloat(strconv.FormatFloat(c, 'e', digits-1, 64), 64)
		if err != nil {
			return "", false
		}
		step := math.Pow(10, math.Floor(math.Log10(math.Abs(base)))-float64(digits-1))
		cands := []float64{base, base - step, base + step}
		if c > base {
			cands[1], cands[2] = cands[2], cands[1]
		}
		for _, v := range cands {
			// Round away the binary noise of base ± step.
			v, _ = strconv.ParseFloat(strconv.FormatFloat(v, 'e', digits-1, 64), 64)
			if tried[v] || !(v > 0 && v <= most) {
				continue
			}
			tried[v] = true
			if l, err := geom.Layout(t, diam, v); err == nil && reflect.DeepEqual(l, d) {
				return fmtFloat(v), true
			}
		}
		if digits >= 4 && len(tried) > 12 {
			// Past a few digits, only c itself is left to try.
			if l, err := geom.Layout(t, diam, c); err == nil && reflect.DeepEqual(l, d) {
				return fmtFloat(c), true
			}
			return "", false
		}
	}
	return "", false
}

// sensor writes the sensor as the preset it differs least from plus the
// keys that edit it.
func (e *encoder) sensor(m pmt.Model) {
	name, edits := nearestPreset(m)
	e.str("sensor.preset", name)
	defName := name
	if len(edits) > 0 {
		defName += " (edited)"
	}
	if m.Name != defName {
		e.str("sensor.name", m.Name)
	}
	for _, f := range edits {
		e.raw(f.key, f.val)
	}
}

// NearestPreset returns the sensor preset (pmt.PresetNames) that m differs
// least from, by the number of description keys of [sensor] it would take
// to turn the preset into m, and those keys ("tts_sigma_ns", ...), names
// aside. Ties go to the first preset in pmt.PresetNames order.
func NearestPreset(m pmt.Model) (preset string, keys []string) {
	name, edits := nearestPreset(m)
	for _, e := range edits {
		keys = append(keys, strings.TrimPrefix(e.key, "sensor."))
	}
	return name, keys
}

func nearestPreset(m pmt.Model) (string, []kv) {
	var best []kv
	bestName := ""
	for _, name := range pmt.PresetNames() {
		p, _ := pmt.Preset(name)
		edits := sensorEdits(m, p)
		if bestName == "" || len(edits) < len(best) {
			best, bestName = edits, name
		}
	}
	return bestName, best
}

type kv struct{ key, val string }

// sensorEdits lists the [sensor] keys, with values, that turn preset p
// into m (names aside).
func sensorEdits(m, p pmt.Model) []kv {
	var out []kv
	num := func(key string, v, def float64) {
		if v != def {
			out = append(out, kv{"sensor." + key, fmtFloat(v)})
		}
	}
	num("cathode_diameter_cm", m.CathodeDiameter, p.CathodeDiameter)
	if !reflect.DeepEqual(m.QE, p.QE) {
		if peak := m.QE.Max(); peak > 0 && reflect.DeepEqual(m.QE, scaledQE(p.QE, peak)) {
			out = append(out, kv{"sensor.qe_peak", fmtFloat(peak)})
		} else {
			xs, ys := m.QE.Points()
			out = append(out, kv{"sensor.qe_wavelength_nm", fmtArray(xs)}, kv{"sensor.qe_fraction", fmtArray(ys)})
		}
	}
	num("collection_efficiency", m.CollectionEfficiency, p.CollectionEfficiency)
	if !reflect.DeepEqual(m.Acceptance, p.Acceptance) {
		xs, ys := m.Acceptance.Points()
		out = append(out, kv{"sensor.acceptance_cos_incidence", fmtArray(xs)}, kv{"sensor.acceptance_relative", fmtArray(ys)})
	}
	num("tts_sigma_ns", m.TTS, p.TTS)
	num("spe_width", m.SPE.Width, p.SPE.Width)
	num("spe_low_fraction", m.SPE.LowFraction, p.SPE.LowFraction)
	num("spe_low_mean_pe", m.SPE.LowMean, p.SPE.LowMean)
	num("dark_rate_hz", m.DarkRate, p.DarkRate)
	num("threshold_pe", m.Threshold, p.Threshold)
	num("gate_ns", m.IntegrationWindow, p.IntegrationWindow)
	num("saturation_pe", m.Saturation, p.Saturation)
	return out
}

// fmtArray writes a TOML array of numbers, ten to a line.
func fmtArray(v []float64) string {
	var b strings.Builder
	b.WriteString("[")
	for i, x := range v {
		switch {
		case i > 0 && i%10 == 0:
			b.WriteString(",\n  ")
		case i > 0:
			b.WriteString(", ")
		}
		b.WriteString(fmtFloat(x))
	}
	b.WriteString("]")
	return b.String()
}

// encoder writes the canonical text.
type encoder struct {
	buf     bytes.Buffer
	docs    map[string]string
	pending string // a table header not yet written: only if a key follows
	err     error
}

func (e *encoder) comment(text string) {
	for _, line := range wrap(text, 76) {
		e.buf.WriteString("# " + line + "\n")
	}
}

func (e *encoder) table(name string) {
	e.pending = ""
	e.buf.WriteString("\n[" + name + "]\n")
}

// lazyTable opens a table whose header is written with its first key.
func (e *encoder) lazyTable(name string) { e.pending = name }

func (e *encoder) raw(key, val string) {
	if e.pending != "" {
		e.table(e.pending)
	}
	doc, ok := e.docs[key]
	if !ok {
		e.err = fmt.Errorf("setup: internal error: key %q is not in the schema", key)
		return
	}
	e.comment(doc)
	name := key
	if i := strings.LastIndexByte(key, '.'); i >= 0 {
		name = key[i+1:]
	}
	e.buf.WriteString(name + " = " + val + "\n")
}

func (e *encoder) float(key string, v float64) { e.raw(key, fmtFloat(v)) }
func (e *encoder) int(key string, v int)       { e.raw(key, strconv.Itoa(v)) }
func (e *encoder) str(key, v string)           { e.raw(key, strconv.Quote(v)) }

// wrap splits text into lines of at most width bytes at blanks.
func wrap(text string, width int) []string {
	var lines []string
	sc := bufio.NewScanner(strings.NewReader(text))
	sc.Split(bufio.ScanWords)
	line := ""
	for sc.Scan() {
		w := sc.Text()
		if line != "" && len(line)+1+len(w) > width {
			lines = append(lines, line)
			line = ""
		}
		if line != "" {
			line += " "
		}
		line += w
	}
	return append(lines, line)
}
