package setup

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"unicode"

	"github.com/BurntSushi/toml"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/optics"
)

// FormatVersion is the format_version a description file may state, and
// the one Encode writes.
const FormatVersion = 1

// MaxFileSize (bytes) bounds a description file that Load reads: a full
// description with tabulated curves is a few kB.
const MaxFileSize = 1 << 20

// MaxSensors bounds the number of sensors a description may ask for
// through layout.coverage: a million, far beyond any tank built, which
// bounds the memory (about 100 MB) and the seconds of a layout a file can
// demand.
const MaxSensors = 1_000_000

// Error is one problem of a description file: the key it is about, the
// line the key is set on (0 when the key is not in the file, e.g. a
// missing required key) and what is wrong, with the allowed values.
type Error struct {
	File string // the file's name as given to Parse or Load
	Line int    // line of Key, from 1; 0 if the key is not in the file
	Key  string // dotted key, e.g. "tank.vessel_radius_cm"
	Msg  string
}

func (e *Error) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("setup: %s line %d: %s: %s", e.File, e.Line, e.Key, e.Msg)
	}
	return fmt.Sprintf("setup: %s: %s: %s", e.File, e.Key, e.Msg)
}

// Load reads the description file at path; see Parse.
func Load(path string) (Setup, error) {
	f, err := os.Open(path)
	if err != nil {
		return Setup{}, fmt.Errorf("setup: %w", err)
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, MaxFileSize+1))
	if err != nil {
		return Setup{}, fmt.Errorf("setup: %s: %w", path, err)
	}
	if len(data) > MaxFileSize {
		return Setup{}, fmt.Errorf("setup: %s is larger than %d bytes, too large for a detector description", path, MaxFileSize)
	}
	return Parse(data, path)
}

// Parse reads a description file (format in the package documentation)
// and builds its Setup, checked (Setup.Check and Setup.CheckTrigger pass).
// path names the file in errors, gives the default name, and is the
// directory a layout.sensor_csv is found relative to; the file itself is
// not read.
//
// Every problem is reported, each as an *Error naming the key, its line
// and the allowed values, joined with errors.Join: unknown keys, values of
// the wrong type or out of range, missing required keys, a layout that
// does not fit the tank. Nothing is ignored silently.
func Parse(data []byte, path string) (Setup, error) {
	return parse(data, path, options{maxSensors: MaxSensors, loadCSV: func(rel string) (*geom.Detector, error) {
		if !filepath.IsAbs(rel) {
			rel = filepath.Join(filepath.Dir(path), rel)
		}
		return geom.LoadSensorCSV(rel)
	}})
}

// options are what Parse fixes and the built-in descriptions and the
// fuzz target change.
type options struct {
	// loadCSV reads a layout.sensor_csv; nil refuses one.
	loadCSV func(rel string) (*geom.Detector, error)
	// maxSensors bounds the sensors of a coverage layout.
	maxSensors int
}

func parse(data []byte, path string, opt options) (Setup, error) {
	var raw rawFile
	md, err := toml.Decode(string(data), &raw)
	if err != nil {
		return Setup{}, tomlError(path, err)
	}
	p := &parser{file: path, lines: keyLines(data)}
	p.unknownKeys(md.Undecoded())
	if len(p.errs) > 0 {
		return Setup{}, p.err()
	}
	s := p.build(&raw, opt)
	if err := p.err(); err != nil {
		return Setup{}, err
	}
	// The checks above cover Check's; this is the last line of defence.
	if err := s.Check(); err != nil {
		return Setup{}, fmt.Errorf("setup: %s: %w", path, err)
	}
	if err := s.CheckTrigger(); err != nil {
		return Setup{}, fmt.Errorf("setup: %s: %w", path, err)
	}
	return s, nil
}

// tomlError words a syntax or type error of the TOML library with the
// file name; the library's message already gives the line and the key.
func tomlError(path string, err error) error {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		e := &Error{File: path, Line: pe.Position.Line, Key: pe.LastKey, Msg: pe.Message}
		if e.Key == "" {
			e.Key = "syntax"
		}
		return e
	}
	// Type errors come as text: toml: line N (last key "k"): message.
	if m := typeError.FindStringSubmatch(err.Error()); m != nil {
		line, _ := strconv.Atoi(m[1])
		e := &Error{File: path, Line: line, Key: m[2], Msg: m[3]}
		for _, d := range schema() {
			if d.key == e.Key {
				e.Msg += "; the key is the " + d.doc
			}
		}
		return e
	}
	return fmt.Errorf("setup: %s: %w", path, err)
}

// typeError matches the TOML library's wording of a value of the wrong type.
var typeError = regexp.MustCompile(`^toml: line (\d+) \(last key "([^"]*)"\): (.*)$`)

// parser collects the problems of one file.
type parser struct {
	file  string
	lines map[string]int
	errs  []*Error
}

// fail records a problem of key; the message follows "key: ".
func (p *parser) fail(key, format string, args ...any) {
	line, ok := p.lines[key]
	if !ok {
		if i := strings.LastIndexByte(key, '.'); i > 0 {
			line = p.lines[key[:i]] // the table's header
		}
	}
	p.errs = append(p.errs, &Error{File: p.file, Line: line, Key: key, Msg: fmt.Sprintf(format, args...)})
}

func (p *parser) err() error {
	if len(p.errs) == 0 {
		return nil
	}
	slices.SortStableFunc(p.errs, func(a, b *Error) int { return a.Line - b.Line })
	errs := make([]error, len(p.errs))
	for i, e := range p.errs {
		errs[i] = e
	}
	if len(errs) == 1 {
		return errs[0]
	}
	return errors.Join(errs...)
}

// unknownKeys reports the keys the schema does not know, naming the keys
// it would take in that place.
func (p *parser) unknownKeys(keys []toml.Key) {
	known := make(map[string]bool)
	for _, k := range schema() {
		known[k.key] = true
	}
	seen := make(map[string]bool)
	for _, k := range keys {
		// Report an unknown table once, not each key below it.
		top := k.String()
		for i := 1; i < len(k); i++ {
			if pre := k[:i].String(); seen[pre] {
				top = ""
				break
			}
		}
		if top == "" {
			continue
		}
		seen[top] = true
		table := ""
		if len(k) > 1 {
			table = k[:len(k)-1].String()
		}
		var options []string
		for _, d := range schema() {
			if table == "" && !strings.Contains(d.key, ".") {
				options = append(options, d.key)
			} else if t, name, ok := strings.Cut(d.key, "."); ok && t == table {
				options = append(options, name)
			}
		}
		where := "[" + table + "]"
		if table == "" {
			where = "the top level"
			for _, s := range sections() {
				options = append(options, "["+s+"]")
			}
		}
		msg := fmt.Sprintf("unknown key; %s takes %s", where, strings.Join(options, ", "))
		if len(options) == 0 {
			msg = "unknown key"
		}
		if near := sameStem(k[len(k)-1], options); near != "" {
			msg = fmt.Sprintf("unknown key; did you mean %s (the unit is part of the name)? %s takes %s",
				near, where, strings.Join(options, ", "))
		}
		p.fail(top, "%s", msg)
	}
}

// sameStem returns the option that shares key's name up to its last
// underscore (vessel_radius_m and vessel_radius_cm: a key in other units),
// or "".
func sameStem(key string, options []string) string {
	stem := func(k string) string {
		if i := strings.LastIndexByte(k, '_'); i > 0 {
			return k[:i]
		}
		return k
	}
	for _, o := range options {
		if o != key && (stem(o) == stem(key) || stem(o) == key) {
			return o
		}
	}
	return ""
}

// interval is an allowed range of a number, with its unit for messages.
type interval struct {
	lo, hi         float64
	loOpen, hiOpen bool
	unit           string
}

func (r interval) contains(v float64) bool {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return false
	}
	return (v > r.lo || !r.loOpen && v == r.lo) && (v < r.hi || !r.hiOpen && v == r.hi)
}

func (r interval) String() string {
	lb, rb := "[", "]"
	if r.loOpen {
		lb = "("
	}
	if r.hiOpen {
		rb = ")"
	}
	hi := fmtFloat(r.hi)
	if math.IsInf(r.hi, 1) {
		hi, rb = "inf", ")"
	}
	s := lb + fmtFloat(r.lo) + ", " + hi + rb
	if r.unit != "" {
		s += " " + r.unit
	}
	return s
}

func fmtFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// Common ranges.
func positive(unit string) interval {
	return interval{lo: 0, hi: math.Inf(1), loOpen: true, unit: unit}
}
func nonNegative(unit string) interval { return interval{lo: 0, hi: math.Inf(1), unit: unit} }
func fraction() interval               { return interval{lo: 0, hi: 1} }

// num returns *v checked against r, or def if v is nil (a default is
// valid by construction).
func (p *parser) num(key string, v *float64, def float64, r interval) float64 {
	if v == nil {
		return def
	}
	if !r.contains(*v) {
		p.fail(key, "%s is outside the allowed range %s", fmtFloat(*v), r)
		return def
	}
	return *v
}

func (p *parser) build(raw *rawFile, opt options) Setup {
	if v := raw.FormatVersion; v != nil && *v != FormatVersion {
		p.fail("format_version", "%d is not a known format; allowed: %d", *v, FormatVersion)
	}
	var s Setup
	s.Name = defaultName(p.file)
	if raw.Name != nil {
		s.Name = *raw.Name
		if err := checkName(s.Name); err != nil {
			p.fail("name", "%q %v", s.Name, err)
		}
	}
	tank, tankOK := p.tank(&raw.Tank)
	m, sensorOK := p.sensor(&raw.Sensor)
	s.Sensor = m
	s.Water = p.water(&raw.Water)
	s.Liner = optics.DefaultLiner()
	s.Liner.Reflectivity = p.num("liner.reflectivity", raw.Liner.Reflectivity, s.Liner.Reflectivity, fraction())
	s.Liner.DiffuseFraction = p.num("liner.diffuse_fraction", raw.Liner.DiffuseFraction, s.Liner.DiffuseFraction, fraction())
	if tankOK && sensorOK {
		s.Detector = p.layout(&raw.Layout, tank, m.CathodeDiameter, opt)
	} else if raw.Layout.Coverage == nil && raw.Layout.SensorCSV == nil {
		p.fail("layout", "missing: give layout.coverage or layout.sensor_csv")
	}
	n := 0
	if s.Detector != nil {
		n = s.Detector.NumSensors()
		s.Dead = p.dead(raw.Layout.Dead, n)
	}
	s.Trigger = p.trigger(&raw.Trigger, n)
	return s
}

// defaultName is the file's base name without its extension.
func defaultName(path string) string {
	base := filepath.Base(path)
	name := strings.TrimSuffix(base, filepath.Ext(base))
	if name == "" || name == "." || checkName(name) != nil {
		return "unnamed"
	}
	return name
}

// checkName accepts the names a description may give a detector or a
// sensor: 1 to 100 printable characters.
func checkName(name string) error {
	if name == "" || len(name) > 100 {
		return errors.New("must have 1 to 100 characters")
	}
	for _, r := range name {
		if !unicode.IsPrint(r) {
			return fmt.Errorf("must be printable (character %q)", r)
		}
	}
	return nil
}

func (p *parser) tank(r *rawTank) (geom.Tank, bool) {
	n := len(p.errs)
	size := interval{lo: 0, hi: geom.MaxTankSize, loOpen: true, unit: "cm"}
	var t geom.Tank
	for _, f := range []struct {
		key string
		v   *float64
		dst *float64
	}{{"tank.vessel_radius_cm", r.VesselRadius, &t.Radius}, {"tank.vessel_height_cm", r.VesselHeight, &t.Height}} {
		if f.v == nil {
			p.fail(f.key, "missing (required), allowed range %s", size)
			continue
		}
		*f.dst = p.num(f.key, f.v, 0, size)
	}
	if len(p.errs) > n {
		return t, false
	}
	t.SensorOffset = p.num("tank.sensor_offset_cm", r.SensorOffset, 0,
		interval{lo: 0, hi: math.Min(t.Radius, t.Height/2), hiOpen: true, unit: "cm (the sensor surface must enclose a volume)"})
	if err := t.Validate(); err != nil {
		p.fail("tank", "%v", err)
	}
	return t, len(p.errs) == n
}

// sensorKeys are the keys of [sensor] that set a field of the model.
func sensorKeys() []string {
	return []string{"cathode_diameter_cm", "qe_wavelength_nm", "qe_fraction", "collection_efficiency",
		"acceptance_cos_incidence", "acceptance_relative", "tts_sigma_ns", "spe_width", "spe_low_fraction",
		"spe_low_mean_pe", "dark_rate_hz", "threshold_pe", "gate_ns", "saturation_pe"}
}

func (p *parser) sensor(r *rawSensor) (pmt.Model, bool) {
	n := len(p.errs)
	var m pmt.Model
	if r.Preset != nil {
		var err error
		if m, err = pmt.Preset(*r.Preset); err != nil {
			p.fail("sensor.preset", "%q is not a preset; allowed: %s", *r.Preset, strings.Join(pmt.PresetNames(), ", "))
			return m, false
		}
	} else {
		given := map[string]bool{
			"cathode_diameter_cm": r.CathodeDiameter != nil, "qe_wavelength_nm": r.QEWavelength != nil,
			"qe_fraction": r.QEFraction != nil, "collection_efficiency": r.CollectionEfficiency != nil,
			"acceptance_cos_incidence": r.AcceptanceCos != nil, "acceptance_relative": r.AcceptanceRelative != nil,
			"tts_sigma_ns": r.TTS != nil, "spe_width": r.SPEWidth != nil, "spe_low_fraction": r.SPELowFraction != nil,
			"spe_low_mean_pe": r.SPELowMean != nil, "dark_rate_hz": r.DarkRate != nil, "threshold_pe": r.Threshold != nil,
			"gate_ns": r.Gate != nil, "saturation_pe": r.Saturation != nil,
		}
		var missing []string
		for _, k := range sensorKeys() {
			if !given[k] {
				missing = append(missing, k)
			}
		}
		if len(missing) > 0 {
			p.fail("sensor.preset", "missing: give a preset (%s) or every key of [sensor]; missing %s",
				strings.Join(pmt.PresetNames(), ", "), strings.Join(missing, ", "))
			return m, false
		}
		if r.QEPeak != nil {
			p.fail("sensor.qe_peak", "scales a preset's QE curve; without a preset give qe_wavelength_nm and qe_fraction")
		}
		m.Name = "custom"
	}
	base := m
	m.CathodeDiameter = p.num("sensor.cathode_diameter_cm", r.CathodeDiameter, m.CathodeDiameter, positive("cm"))
	switch {
	case r.QEPeak != nil && (r.QEWavelength != nil || r.QEFraction != nil):
		p.fail("sensor.qe_peak", "give qe_peak or the table qe_wavelength_nm, qe_fraction, not both")
	case r.QEPeak != nil && r.Preset != nil:
		peak := p.num("sensor.qe_peak", r.QEPeak, 0, interval{lo: 0, hi: 1, loOpen: true})
		if peak > 0 {
			m.QE = scaledQE(base.QE, peak)
		}
	case r.QEWavelength != nil || r.QEFraction != nil:
		if c, ok := p.curve("sensor.qe_wavelength_nm", r.QEWavelength, "sensor.qe_fraction", r.QEFraction,
			positive("nm")); ok {
			m.QE = c
		}
	}
	m.CollectionEfficiency = p.num("sensor.collection_efficiency", r.CollectionEfficiency, m.CollectionEfficiency,
		interval{lo: 0, hi: 1, loOpen: true})
	if r.AcceptanceCos != nil || r.AcceptanceRelative != nil {
		if c, ok := p.curve("sensor.acceptance_cos_incidence", r.AcceptanceCos, "sensor.acceptance_relative", r.AcceptanceRelative,
			interval{lo: -1, hi: 1}); ok {
			m.Acceptance = c
		}
	}
	m.TTS = p.num("sensor.tts_sigma_ns", r.TTS, m.TTS, nonNegative("ns"))
	m.SPE.Width = p.num("sensor.spe_width", r.SPEWidth, m.SPE.Width, fraction())
	m.SPE.LowFraction = p.num("sensor.spe_low_fraction", r.SPELowFraction, m.SPE.LowFraction, interval{lo: 0, hi: 1, hiOpen: true})
	m.SPE.LowMean = p.num("sensor.spe_low_mean_pe", r.SPELowMean, m.SPE.LowMean, nonNegative("pe"))
	if m.SPE.LowFraction > 0 && m.SPE.LowMean == 0 {
		p.fail("sensor.spe_low_mean_pe", "0 must be positive when spe_low_fraction = %s is", fmtFloat(m.SPE.LowFraction))
	}
	m.DarkRate = p.num("sensor.dark_rate_hz", r.DarkRate, m.DarkRate, nonNegative("Hz"))
	m.Threshold = p.num("sensor.threshold_pe", r.Threshold, m.Threshold, nonNegative("pe"))
	m.IntegrationWindow = p.num("sensor.gate_ns", r.Gate, m.IntegrationWindow, positive("ns"))
	m.Saturation = p.num("sensor.saturation_pe", r.Saturation, m.Saturation, nonNegative("pe"))
	if m.Saturation > 0 && m.Saturation < m.Threshold {
		p.fail("sensor.saturation_pe", "%s is below threshold_pe = %s; allowed: 0 (no limit) or >= threshold_pe",
			fmtFloat(m.Saturation), fmtFloat(m.Threshold))
	}
	if len(p.errs) > n {
		return m, false
	}
	// The name: an edited preset must not keep the preset's name.
	if r.Preset != nil && !reflect.DeepEqual(m, base) {
		m.Name = base.Name + " (edited)"
	}
	if r.Name != nil {
		m.Name = *r.Name
		if err := checkName(m.Name); err != nil {
			p.fail("sensor.name", "%q %v", m.Name, err)
		} else if preset, err := pmt.Preset(m.Name); err == nil {
			preset.Name = m.Name
			if !reflect.DeepEqual(m, preset) {
				p.fail("sensor.name", "%q is the name of a preset, and this sensor differs from it; choose another name", m.Name)
			}
		}
	}
	if err := m.Validate(); err != nil {
		p.fail("sensor", "%v", err)
	}
	return m, len(p.errs) == n
}

// scaledQE returns the curve c scaled to the maximum peak: every value
// times peak/max written as peak*(y/max), so that the maximum is peak
// exactly and Encode can recognise the scaling.
func scaledQE(c pmt.Curve, peak float64) pmt.Curve {
	xs, ys := c.Points()
	top := c.Max()
	for i := range ys {
		ys[i] = peak * (ys[i] / top)
	}
	s, err := pmt.NewCurve(xs, ys)
	if err != nil {
		return pmt.Curve{} // not reached: the values stay finite
	}
	return s
}

// curve checks a table given as two arrays: x increasing within xr, y in
// [0, 1] with a positive maximum.
func (p *parser) curve(xKey string, xs []float64, yKey string, ys []float64, xr interval) (pmt.Curve, bool) {
	switch {
	case xs == nil:
		p.fail(xKey, "missing: %s needs it", yKey)
		return pmt.Curve{}, false
	case ys == nil:
		p.fail(yKey, "missing: %s needs it", xKey)
		return pmt.Curve{}, false
	case len(xs) != len(ys):
		p.fail(yKey, "has %d values and %s has %d; they must have as many", len(ys), xKey, len(xs))
		return pmt.Curve{}, false
	case len(xs) < 2:
		p.fail(xKey, "has %d values; a table needs at least 2", len(xs))
		return pmt.Curve{}, false
	}
	ok := true
	for i, x := range xs {
		if !xr.contains(x) {
			p.fail(xKey, "[%d] = %s is outside the allowed range %s", i, fmtFloat(x), xr)
			ok = false
		} else if i > 0 && !(x > xs[i-1]) {
			p.fail(xKey, "[%d] = %s must exceed [%d] = %s (values increasing)", i, fmtFloat(x), i-1, fmtFloat(xs[i-1]))
			ok = false
		}
	}
	top := 0.0
	for i, y := range ys {
		if !fraction().contains(y) {
			p.fail(yKey, "[%d] = %s is outside the allowed range %s", i, fmtFloat(y), fraction())
			ok = false
		}
		top = math.Max(top, y)
	}
	if ok && top == 0 {
		p.fail(yKey, "all values are 0; the largest must be in (0, 1]")
		ok = false
	}
	if !ok {
		return pmt.Curve{}, false
	}
	c, err := pmt.NewCurve(xs, ys)
	if err != nil {
		p.fail(xKey, "%v", err)
		return pmt.Curve{}, false
	}
	return c, true
}

func (p *parser) water(r *rawWater) *optics.Water {
	n := len(p.errs)
	c := optics.DefaultWaterConfig()
	band := interval{lo: optics.AbsorptionMinWavelength, hi: optics.AbsorptionMaxWavelength, unit: "nm"}
	c.TemperatureC = p.num("water.temperature_c", r.Temperature, c.TemperatureC,
		interval{lo: optics.IndexMinTemperature, hi: optics.IndexMaxTemperature, unit: "C"})
	c.BandLo = p.num("water.band_lo_nm", r.BandLo, c.BandLo, band)
	c.BandHi = p.num("water.band_hi_nm", r.BandHi, c.BandHi, band)
	if !(c.BandHi > c.BandLo) {
		p.fail("water.band_hi_nm", "%s must exceed band_lo_nm = %s", fmtFloat(c.BandHi), fmtFloat(c.BandLo))
	}
	c.AbsorptionScale = p.num("water.absorption_scale", r.AbsorptionScale, c.AbsorptionScale, nonNegative(""))
	c.RayleighScale = p.num("water.rayleigh_scale", r.RayleighScale, c.RayleighScale, nonNegative(""))
	c.MieLength = p.num("water.mie_length_cm", r.MieLength, c.MieLength, nonNegative("cm"))
	c.MieWavelength = p.num("water.mie_wavelength_nm", r.MieWavelength, c.MieWavelength, positive("nm"))
	c.MieExponent = p.num("water.mie_exponent", r.MieExponent, c.MieExponent, interval{lo: math.Inf(-1), hi: math.Inf(1), loOpen: true, hiOpen: true})
	c.MieG = p.num("water.mie_g", r.MieG, c.MieG, interval{lo: -1, hi: 1, loOpen: true, hiOpen: true})
	c.AttenuationLength = p.num("water.attenuation_length_cm", r.AttenuationLength, c.AttenuationLength, nonNegative("cm"))
	c.AttenuationWavelength = p.num("water.attenuation_wavelength_nm", r.AttenuationWavelength, c.AttenuationWavelength, band)
	if c.AttenuationLength > 0 {
		if r.AttenuationWavelength == nil {
			p.fail("water.attenuation_wavelength_nm", "missing: attenuation_length_cm needs it; allowed range %s", band)
		}
		if r.AbsorptionScale != nil {
			p.fail("water.absorption_scale", "give absorption_scale or attenuation_length_cm, not both: the attenuation length sets the absorption scale")
		}
	}
	if len(p.errs) > n {
		return nil
	}
	w, err := optics.NewWater(c)
	if err != nil {
		key := "water"
		if c.AttenuationLength > 0 && strings.Contains(err.Error(), "AttenuationLength") {
			key = "water.attenuation_length_cm"
		}
		p.fail(key, "%v", err)
		return nil
	}
	return w
}

func (p *parser) layout(r *rawLayout, t geom.Tank, diameter float64, opt options) *geom.Detector {
	switch {
	case r.Coverage != nil && r.SensorCSV != nil:
		p.fail("layout.sensor_csv", "give coverage or sensor_csv, not both")
		return nil
	case r.Coverage != nil:
		// Bound the work and memory of the layout before asking for it:
		// geom's cap lattice grows as (radius/diameter)^2 whatever the
		// coverage, and the sensors as the coverage.
		sensorArea := math.Pi * diameter * diameter / 4
		if packed := t.InnerArea() / (diameter * diameter); packed > 2*float64(opt.maxSensors) {
			p.fail("sensor.cathode_diameter_cm", "%s cm sensors side by side would number %.3g on this tank's sensor surface, more than the layout bound of %d; allowed: at least %.4g cm",
				fmtFloat(diameter), packed, 2*opt.maxSensors, math.Sqrt(t.InnerArea()/(2*float64(opt.maxSensors))))
			return nil
		}
		if limit := float64(opt.maxSensors) * sensorArea / t.InnerArea(); *r.Coverage > limit {
			p.num("layout.coverage", r.Coverage, 0, interval{lo: 0, hi: roundDown(limit), loOpen: true,
				unit: fmt.Sprintf("(at most %d sensors)", opt.maxSensors)})
			return nil
		}
		most, err := geom.MaxCoverage(t, diameter)
		if err != nil {
			p.fail("sensor.cathode_diameter_cm", "%s cm does not fit the tank: %v", fmtFloat(diameter), err)
			return nil
		}
		cov := p.num("layout.coverage", r.Coverage, 0, interval{lo: 0, hi: most, loOpen: true,
			unit: fmt.Sprintf("(the most %s cm sensors reach in this tank)", fmtFloat(diameter))})
		if cov == 0 {
			return nil
		}
		d, err := geom.Layout(t, diameter, cov)
		if err != nil {
			p.fail("layout.coverage", "%v", err)
			return nil
		}
		return d
	case r.SensorCSV != nil:
		if *r.SensorCSV == "" {
			p.fail("layout.sensor_csv", "empty file name")
			return nil
		}
		if opt.loadCSV == nil {
			p.fail("layout.sensor_csv", "%q: this description cannot refer to files", *r.SensorCSV)
			return nil
		}
		d, err := opt.loadCSV(*r.SensorCSV)
		if err != nil {
			p.fail("layout.sensor_csv", "%q: %v", *r.SensorCSV, err)
			return nil
		}
		ok := true
		dt := d.Tank()
		for _, f := range []struct {
			key       string
			csv, desc float64
		}{{"tank.vessel_radius_cm", dt.Radius, t.Radius}, {"tank.vessel_height_cm", dt.Height, t.Height},
			{"tank.sensor_offset_cm", dt.SensorOffset, t.SensorOffset}, {"sensor.cathode_diameter_cm", d.CathodeDiameter(), diameter}} {
			if f.csv != f.desc {
				p.fail(f.key, "%s differs from the sensor CSV %q, which says %s", fmtFloat(f.desc), *r.SensorCSV, fmtFloat(f.csv))
				ok = false
			}
		}
		if !ok {
			return nil
		}
		if d.NumSensors() == 0 {
			p.fail("layout.sensor_csv", "%q lists no sensors", *r.SensorCSV)
			return nil
		}
		return d
	}
	p.fail("layout", "missing: give layout.coverage or layout.sensor_csv")
	return nil
}

// roundDown rounds v > 0 down to 4 significant digits, for messages that
// state a limit.
func roundDown(v float64) float64 {
	e := math.Pow(10, math.Floor(math.Log10(v))-3)
	return math.Floor(v/e) * e
}

func (p *parser) dead(dead []int, n int) []int {
	if dead == nil {
		return nil
	}
	seen := make(map[int]int, len(dead))
	ok := true
	for i, d := range dead {
		if d < 0 || d >= n {
			p.fail("layout.dead_sensors", "[%d] = %d is outside the allowed range [0, %d] (sensor indices)", i, d, n-1)
			ok = false
			continue
		}
		if j, dup := seen[d]; dup {
			p.fail("layout.dead_sensors", "[%d] = %d repeats [%d]", i, d, j)
			ok = false
		}
		seen[d] = i
	}
	if ok && len(dead) >= n {
		p.fail("layout.dead_sensors", "lists all %d sensors", n)
	}
	if len(dead) == 0 {
		return nil
	}
	return slices.Clone(dead)
}

func (p *parser) trigger(r *rawTrigger, sensors int) pmt.Trigger {
	t := DefaultTrigger()
	if r.Hits != nil {
		most := sensors
		if most == 0 { // no detector: its error is reported already
			most = math.MaxInt
		}
		if *r.Hits < 1 || *r.Hits > most {
			p.fail("trigger.hits", "%d is outside the allowed range [1, %d] (hits; at most the number of sensors)", *r.Hits, most)
		} else {
			t.Threshold = *r.Hits
		}
	}
	t.Window = p.num("trigger.window_ns", r.Window, t.Window, positive("ns"))
	t.PreTrigger = p.num("trigger.pre_trigger_ns", r.PreTrigger, t.PreTrigger, nonNegative("ns"))
	t.PostTrigger = p.num("trigger.post_trigger_ns", r.PostTrigger, t.PostTrigger, nonNegative("ns"))
	return t
}
