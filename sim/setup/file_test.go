package setup

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/optics"
)

// equalSetup reports the first difference between two setups, or "".
func equalSetup(a, b Setup) string {
	switch {
	case a.Name != b.Name:
		return fmt.Sprintf("Name %q vs %q", a.Name, b.Name)
	case !reflect.DeepEqual(a.Detector, b.Detector):
		return fmt.Sprintf("Detector %v vs %v", a.Detector, b.Detector)
	case !reflect.DeepEqual(a.Sensor, b.Sensor):
		return fmt.Sprintf("Sensor %+v vs %+v", a.Sensor, b.Sensor)
	case a.Water.Config() != b.Water.Config():
		return fmt.Sprintf("Water %+v vs %+v", a.Water.Config(), b.Water.Config())
	case a.Water.AbsorptionScale() != b.Water.AbsorptionScale():
		return fmt.Sprintf("Water absorption scale %v vs %v", a.Water.AbsorptionScale(), b.Water.AbsorptionScale())
	case a.Liner != b.Liner:
		return fmt.Sprintf("Liner %+v vs %+v", a.Liner, b.Liner)
	case !reflect.DeepEqual(a.Dead, b.Dead):
		return fmt.Sprintf("Dead %v vs %v", a.Dead, b.Dead)
	case a.Trigger != b.Trigger:
		return fmt.Sprintf("Trigger %+v vs %+v", a.Trigger, b.Trigger)
	}
	return ""
}

// byHand builds a pure-water setup the way the built-in tanks were built
// in Go before they became description files: an independent check that
// the files describe the same detectors.
func byHand(t *testing.T, name string, tank geom.Tank, m pmt.Model, coverage float64, trig pmt.Trigger) Setup {
	t.Helper()
	det, err := geom.Layout(tank, m.CathodeDiameter, coverage)
	if err != nil {
		t.Fatal(err)
	}
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	return Setup{Name: name, Detector: det, Sensor: m, Water: w, Liner: optics.DefaultLiner(), Trigger: trig}
}

func TestBuiltinTanksUnchanged(t *testing.T) {
	large := DefaultTrigger()
	large.Threshold = 25
	for _, c := range []struct {
		get     func() (Setup, error)
		want    Setup
		sensors int
	}{
		{Demo, byHand(t, "demo", geom.DemoTank(), pmt.Medium(), 0.30, DefaultTrigger()), -1},
		{Large, byHand(t, "large", geom.LargeTank(), pmt.Large(), 0.40, large), 10918},
	} {
		got, err := c.get()
		if err != nil {
			t.Fatal(err)
		}
		if d := equalSetup(got, c.want); d != "" {
			t.Errorf("%s: differs from the Go construction: %s", c.want.Name, d)
		}
		if c.sensors > 0 && got.Detector.NumSensors() != c.sensors {
			t.Errorf("%s: %d sensors, want %d", got.Name, got.Detector.NumSensors(), c.sensors)
		}
	}
}

var update = flag.Bool("update", false, "rewrite the built-in description files in their canonical form (after a change of Encode's comments)")

// The embedded files are in canonical form: Encode writes them back byte
// for byte, so they round-trip exactly.
func TestBuiltinFilesCanonical(t *testing.T) {
	for _, name := range BuiltinNames() {
		s, err := Builtin(name)
		if err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		if err := Encode(&buf, s); err != nil {
			t.Fatal(err)
		}
		want, _ := builtin.ReadFile("builtin/" + name + ".toml")
		if *update && !bytes.Equal(buf.Bytes(), want) {
			if err := os.WriteFile(filepath.Join("builtin", name+".toml"), buf.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
			t.Logf("rewrote builtin/%s.toml", name)
			continue
		}
		if !bytes.Equal(buf.Bytes(), want) {
			t.Errorf("%s: Encode differs from the embedded file (a deliberate change of Encode: go test ./sim/setup -run TestBuiltinFilesCanonical -update):\n%s", name, buf.Bytes())
		}
	}
	if _, err := Builtin("nope"); err == nil || !strings.Contains(err.Error(), "demo") {
		t.Errorf("Builtin(nope) error %v, want one naming the built-in descriptions", err)
	}
}

// variants returns setups that exercise every key of the file.
func variants(t *testing.T) []Setup {
	t.Helper()
	demo, err := Demo()
	if err != nil {
		t.Fatal(err)
	}
	var out []Setup
	add := func(name string, edit func(*Setup)) {
		s := demo
		s.Name = name
		edit(&s)
		out = append(out, s)
	}
	add("demo-as-is", func(*Setup) {})
	add("edited sensor", func(s *Setup) {
		s.Sensor.TTS = 1.0
		s.Sensor.DarkRate = 2500
		s.Sensor.Name = "Medium (edited)"
	})
	add("qe peak", func(s *Setup) {
		s.Sensor.QE = scaledQE(s.Sensor.QE, 0.31)
		s.Sensor.Name = "high QE"
	})
	add("full curves", func(s *Setup) {
		m := pmt.Small()
		m.Name = "tube X"
		m.CathodeDiameter = 12.5
		var err error
		if m.QE, err = pmt.NewCurve([]float64{300, 400, 500, 600}, []float64{0.1, 0.3, 0.2, 0.05}); err != nil {
			t.Fatal(err)
		}
		if m.Acceptance, err = pmt.NewCurve([]float64{-0.2, 0.4, 1}, []float64{0, 0.8, 1}); err != nil {
			t.Fatal(err)
		}
		m.CollectionEfficiency, m.TTS, m.SPE = 0.9, 0.45, pmt.SPE{Width: 0.4, LowFraction: 0.2, LowMean: 0.15}
		m.DarkRate, m.Threshold, m.IntegrationWindow, m.Saturation = 120, 0.2, 40, 0
		s.Sensor = m
		if s.Detector, err = geom.Layout(geom.DemoTank(), m.CathodeDiameter, 0.123); err != nil {
			t.Fatal(err)
		}
	})
	add("murky water", func(s *Setup) {
		c := optics.DefaultWaterConfig()
		c.TemperatureC, c.BandLo, c.BandHi = 13.5, 280, 650
		c.RayleighScale, c.MieLength, c.MieWavelength, c.MieExponent, c.MieG = 1.2, 9000, 450, 1.5, 0.85
		c.AttenuationLength, c.AttenuationWavelength = 4500, 420
		w, err := optics.NewWater(c)
		if err != nil {
			t.Fatal(err)
		}
		s.Water = w
	})
	add("scaled absorption", func(s *Setup) {
		c := optics.DefaultWaterConfig()
		c.AbsorptionScale = 2.5
		w, err := optics.NewWater(c)
		if err != nil {
			t.Fatal(err)
		}
		s.Water = w
	})
	add("white liner, dead sensors, slow trigger", func(s *Setup) {
		s.Liner = optics.Liner{Reflectivity: 0.9, DiffuseFraction: 1}
		s.Dead = []int{17, 3, 250}
		s.Trigger = pmt.Trigger{Threshold: 7, Window: 150.5, PreTrigger: 0, PostTrigger: 2500}
	})
	add("small tank, no offset", func(s *Setup) {
		var err error
		if s.Detector, err = geom.Layout(geom.Tank{Radius: 150, Height: 300}, s.Sensor.CathodeDiameter, 0.17); err != nil {
			t.Fatal(err)
		}
	})
	return out
}

func TestRoundTrip(t *testing.T) {
	for _, s := range variants(t) {
		var first bytes.Buffer
		if err := Encode(&first, s); err != nil {
			t.Fatalf("%s: Encode: %v", s.Name, err)
		}
		got, err := Parse(first.Bytes(), "x.toml")
		if err != nil {
			t.Fatalf("%s: Parse of Encode: %v\n%s", s.Name, err, first.Bytes())
		}
		if d := equalSetup(got, s); d != "" {
			t.Errorf("%s: Setup -> file -> Setup differs: %s\n%s", s.Name, d, first.Bytes())
		}
		var second bytes.Buffer
		if err := Encode(&second, got); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(first.Bytes(), second.Bytes()) {
			t.Errorf("%s: file -> Setup -> file differs:\n%s\nvs\n%s", s.Name, first.Bytes(), second.Bytes())
		}
	}
}

// A layout that is not a coverage layout goes to a sensor CSV beside the
// description; Load reads both back, and Save writes the same bytes again.
func TestSaveSensorCSV(t *testing.T) {
	s, err := Demo()
	if err != nil {
		t.Fatal(err)
	}
	sensors := s.Detector.Sensors()
	s.Detector, err = geom.NewDetector(s.Detector.Tank(), s.Detector.CathodeDiameter(), sensors[1:])
	if err != nil {
		t.Fatal(err)
	}
	s.Name = "demo less one"
	if err := Encode(&bytes.Buffer{}, s); !errors.Is(err, ErrNeedsCSV) {
		t.Fatalf("Encode of a hand layout: error %v, want ErrNeedsCSV", err)
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "tank.toml")
	if err := Save(path, s); err != nil {
		t.Fatal(err)
	}
	first, _ := os.ReadFile(path)
	if !bytes.Contains(first, []byte(`sensor_csv = "tank.toml.sensors.csv"`)) {
		t.Fatalf("saved description does not name its CSV:\n%s", first)
	}
	got, err := Load(path)
	if err != nil {
		t.Fatal(err)
	}
	if d := equalSetup(got, s); d != "" {
		t.Errorf("Save -> Load differs: %s", d)
	}
	if err := Save(path, got); err != nil {
		t.Fatal(err)
	}
	if second, _ := os.ReadFile(path); !bytes.Equal(first, second) {
		t.Errorf("second Save differs:\n%s\nvs\n%s", first, second)
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 2 {
		t.Errorf("directory holds %d files, want the description and its CSV", len(ents))
	}
}

// Preset with edits: the edited sensor does not keep the preset's name.
func TestPresetEditRenamed(t *testing.T) {
	const text = `
[tank]
vessel_radius_cm = 560
vessel_height_cm = 1160
sensor_offset_cm = 60
[sensor]
preset = "Medium"
tts_sigma_ns = 0.9
[layout]
coverage = 0.3
`
	s, err := Parse([]byte(text), "dir/mytank.toml")
	if err != nil {
		t.Fatal(err)
	}
	if s.Sensor.Name != "Medium (edited)" || s.Sensor.TTS != 0.9 {
		t.Errorf("sensor %q TTS %v, want \"Medium (edited)\" 0.9", s.Sensor.Name, s.Sensor.TTS)
	}
	if s.Name != "mytank" {
		t.Errorf("name %q, want the file name mytank", s.Name)
	}
	unedited := strings.Replace(text, "tts_sigma_ns = 0.9", "", 1)
	if s, err := Parse([]byte(unedited), "x.toml"); err != nil || s.Sensor.Name != "Medium" {
		t.Errorf("unedited preset: name %q, %v; want Medium", s.Sensor.Name, err)
	}
}

// A sensor CSV is found relative to the description, and must agree with
// its tank.
func TestSensorCSVRelative(t *testing.T) {
	dir := t.TempDir()
	if err := os.Mkdir(filepath.Join(dir, "layouts"), 0o755); err != nil {
		t.Fatal(err)
	}
	det, err := geom.Layout(geom.DemoTank(), pmt.Medium().CathodeDiameter, 0.2)
	if err != nil {
		t.Fatal(err)
	}
	if err := geom.SaveSensorCSV(filepath.Join(dir, "layouts", "demo20.csv"), det); err != nil {
		t.Fatal(err)
	}
	text := `
[tank]
vessel_radius_cm = 560
vessel_height_cm = 1160
sensor_offset_cm = 60
[sensor]
preset = "Medium"
[layout]
sensor_csv = "layouts/demo20.csv"
`
	path := filepath.Join(dir, "t.toml")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	s, err := Load(path)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(s.Detector, det) {
		t.Errorf("detector from the CSV differs from the one written")
	}
	bad := strings.Replace(text, "vessel_radius_cm = 560", "vessel_radius_cm = 600", 1)
	if err := os.WriteFile(path, []byte(bad), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = Load(path)
	wantError(t, err, "tank.vessel_radius_cm", 3, "which says 560")
}

// wantError fails unless err has an *Error about key on line, with a
// message containing each of the fragments.
func wantError(t *testing.T, err error, key string, line int, fragments ...string) {
	t.Helper()
	if err == nil {
		t.Errorf("no error, want one about %s line %d", key, line)
		return
	}
	var found *Error
	for _, e := range flatten(err) {
		if fe, ok := e.(*Error); ok && fe.Key == key {
			found = fe
			break
		}
	}
	if found == nil {
		t.Errorf("error %q names no key %s", err, key)
		return
	}
	if found.Line != line {
		t.Errorf("error %q: line %d, want %d", found, found.Line, line)
	}
	msg := found.Error()
	if !strings.Contains(msg, fmt.Sprintf("line %d: ", line)) && line > 0 {
		t.Errorf("message %q does not give the line %d", msg, line)
	}
	for _, f := range fragments {
		if !strings.Contains(msg, f) {
			t.Errorf("message %q lacks %q", msg, f)
		}
	}
}

func flatten(err error) []error {
	if j, ok := err.(interface{ Unwrap() []error }); ok {
		var out []error
		for _, e := range j.Unwrap() {
			out = append(out, flatten(e)...)
		}
		return out
	}
	return []error{err}
}

// good is a valid description; the bad files below edit one line of it.
// Line numbers: 1 is the comment.
const good = `# a valid tank
name = "t"
[tank]
vessel_radius_cm = 560
vessel_height_cm = 1160
sensor_offset_cm = 60
[sensor]
preset = "Medium"
tts_sigma_ns = 1.1
[layout]
coverage = 0.3
dead_sensors = [1, 2]
[water]
temperature_c = 15
[liner]
reflectivity = 0.1
[trigger]
hits = 12
`

func TestGoodParses(t *testing.T) {
	if _, err := Parse([]byte(good), "good.toml"); err != nil {
		t.Fatal(err)
	}
}

// One test per class of bad file: each names the key, its line and the
// allowed values.
func TestBadFiles(t *testing.T) {
	for _, c := range []struct {
		class    string
		old, new string
		key      string
		line     int
		frags    []string
	}{
		{"unknown key", "tts_sigma_ns = 1.1", "tts_ns = 1.1", "sensor.tts_ns", 9, []string{"unknown key", "tts_sigma_ns"}},
		{"wrong unit", "vessel_radius_cm = 560", "vessel_radius_m = 5.6", "tank.vessel_radius_m", 4, []string{"unknown key", "did you mean vessel_radius_cm "}},
		{"unit left out", "tts_sigma_ns = 1.1", "tts_sigma = 1.1", "sensor.tts_sigma", 9, []string{"did you mean tts_sigma_ns "}},
		{"unknown table", "[liner]", "[lining]", "lining", 15, []string{"[liner]"}},
		{"missing required key", "vessel_height_cm = 1160\n", "", "tank.vessel_height_cm", 3, []string{"missing (required)", "(0, 1e+06] cm"}},
		{"missing layout", "coverage = 0.3\n", "", "layout", 10, []string{"coverage or layout.sensor_csv"}},
		{"out of range", "reflectivity = 0.1", "reflectivity = 1.5", "liner.reflectivity", 16, []string{"1.5", "[0, 1]"}},
		{"negative", "tts_sigma_ns = 1.1", "tts_sigma_ns = -1", "sensor.tts_sigma_ns", 9, []string{"[0, inf) ns"}},
		{"not a number", "temperature_c = 15", "temperature_c = 1e999", "water.temperature_c", 14, nil},
		{"nan", "temperature_c = 15", "temperature_c = nan", "water.temperature_c", 14, []string{"[0, 100] C"}},
		{"wrong type", "temperature_c = 15", `temperature_c = "15 C"`, "water.temperature_c", 14, []string{"string", "the key is the water temperature, C, in [0, 100]"}},
		{"layout does not fit the tank", "coverage = 0.3", "coverage = 0.9", "layout.coverage", 11, []string{"(0, 0.7"}},
		{"tank too large for the sensor size", "vessel_radius_cm = 560", "vessel_radius_cm = 56000", "sensor.cathode_diameter_cm", 7, []string{"at least 1"}},
		{"sensor does not fit the tank", "tts_sigma_ns = 1.1", "cathode_diameter_cm = 2000", "sensor.cathode_diameter_cm", 9, []string{"does not fit"}},
		{"offset leaves no volume", "sensor_offset_cm = 60", "sensor_offset_cm = 600", "tank.sensor_offset_cm", 6, []string{"[0, 560) cm"}},
		{"unknown preset", `preset = "Medium"`, `preset = "Huge"`, "sensor.preset", 8, []string{"Large, Medium, Small"}},
		{"edited preset keeps its name", `preset = "Medium"`, "preset = \"Medium\"\nname = \"Medium\"", "sensor.name", 9, []string{"name of a preset"}},
		{"dead sensor out of range", "dead_sensors = [1, 2]", "dead_sensors = [1, 99999]", "layout.dead_sensors", 12, []string{"[1] = 99999", "[0, "}},
		{"dead sensor repeated", "dead_sensors = [1, 2]", "dead_sensors = [2, 2]", "layout.dead_sensors", 12, []string{"repeats"}},
		{"trigger beyond the sensors", "hits = 12", "hits = 100000", "trigger.hits", 18, []string{"[1, "}},
		{"bad format version", `name = "t"`, "name = \"t\"\nformat_version = 2", "format_version", 3, []string{"allowed: 1"}},
		{"curve not increasing", "tts_sigma_ns = 1.1", "qe_wavelength_nm = [300, 300]\nqe_fraction = [0.1, 0.2]", "sensor.qe_wavelength_nm", 9, []string{"[1] = 300 must exceed [0] = 300"}},
		{"curve lengths", "tts_sigma_ns = 1.1", "acceptance_cos_incidence = [0, 0.5, 1]\nacceptance_relative = [0.5, 1]", "sensor.acceptance_relative", 10, []string{"2 values", "has 3"}},
		{"qe and qe_peak", "tts_sigma_ns = 1.1", "qe_peak = 0.3\nqe_wavelength_nm = [300, 400]\nqe_fraction = [0.1, 0.2]", "sensor.qe_peak", 9, []string{"not both"}},
		{"saturation below threshold", "tts_sigma_ns = 1.1", "saturation_pe = 0.1", "sensor.saturation_pe", 9, []string{"below threshold_pe"}},
		{"attenuation without wavelength", "temperature_c = 15", "attenuation_length_cm = 5000", "water.attenuation_wavelength_nm", 13, []string{"missing", "[200, 700] nm"}},
		{"attenuation below scattering", "temperature_c = 15", "attenuation_length_cm = 1e9\nattenuation_wavelength_nm = 400", "water.attenuation_length_cm", 14, []string{"scattering"}},
		{"syntax", "hits = 12", "hits = = 12", "trigger.hits", 18, nil},
		{"duplicate key", "hits = 12", "hits = 12\nhits = 13", "trigger.hits", 19, nil},
		{"no preset, not every key", `preset = "Medium"`, `cathode_diameter_cm = 20`, "sensor.preset", 7, []string{"missing", "qe_fraction"}},
	} {
		t.Run(c.class, func(t *testing.T) {
			if !strings.Contains(good, c.old) {
				t.Fatalf("test: %q not in the good file", c.old)
			}
			text := strings.Replace(good, c.old, c.new, 1)
			_, err := Parse([]byte(text), "bad.toml")
			if c.class == "syntax" || c.class == "duplicate key" || c.class == "not a number" {
				// The TOML library words these; check the line and key only.
				if err == nil || !strings.Contains(err.Error(), fmt.Sprintf("line %d", c.line)) {
					t.Errorf("error %v, want one on line %d", err, c.line)
				}
				return
			}
			wantError(t, err, c.key, c.line, c.frags...)
		})
	}
}

func TestTooManySensors(t *testing.T) {
	text := strings.Replace(good, "vessel_radius_cm = 560", "vessel_radius_cm = 10000", 1)
	text = strings.Replace(text, "coverage = 0.3", "coverage = 0.6", 1)
	_, err := Parse([]byte(text), "bad.toml")
	wantError(t, err, "layout.coverage", 11, "at most 1000000 sensors", "(0, 0.4")
}

// Every problem of a file is reported, not only the first.
func TestBadFileAllErrors(t *testing.T) {
	text := strings.Replace(good, "reflectivity = 0.1", "reflectivity = 2", 1)
	text = strings.Replace(text, "tts_sigma_ns = 1.1", "tts_sigma_ns = -1", 1)
	_, err := Parse([]byte(text), "bad.toml")
	wantError(t, err, "liner.reflectivity", 16)
	wantError(t, err, "sensor.tts_sigma_ns", 9)
}
