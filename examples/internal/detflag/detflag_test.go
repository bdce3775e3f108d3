package detflag

import (
	"context"
	"flag"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

func TestLoad(t *testing.T) {
	fs := flag.NewFlagSet("x", flag.ContinueOnError)
	spec := Register(fs, "demo")
	if err := fs.Parse(nil); err != nil {
		t.Fatal(err)
	}
	demo, err := Load(*spec)
	if err != nil || demo.Name != "demo" {
		t.Fatalf("default: %q, %v", demo.Name, err)
	}
	example := filepath.Join("..", "..", "..", "testdata", "setup", "example.toml")
	if s, err := Load(example); err != nil || s.Name != "example pool" {
		t.Errorf("example file: %q, %v", s.Name, err)
	}
	if s, err := Load(""); err != nil || s.Name != Default {
		t.Errorf("empty value: %q, %v; want the %s tank", s.Name, err, Default)
	}
	for _, bad := range []string{"nowhere.toml", "huge"} {
		if _, err := Load(bad); err == nil || !strings.Contains(err.Error(), "large") {
			t.Errorf("Load(%q) error %v, want one naming the built-in descriptions", bad, err)
		}
	}
	// A file's errors come through with their line.
	path := filepath.Join(t.TempDir(), "bad.toml")
	if err := os.WriteFile(path, []byte("[tank]\nvessel_radius_cm = -1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Load(path); err == nil || !strings.Contains(err.Error(), "line 2") {
		t.Errorf("bad file: error %v, want one giving line 2", err)
	}
}

// The simulator accepts the configuration of a description as it is.
func TestSimConfig(t *testing.T) {
	s, err := Load("demo")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := sim.New(SimConfig(s, 1)); err != nil {
		t.Fatal(err)
	}
}

// An event file gives back the detector of the run that wrote it: sensors,
// sensor model, trigger, water (here set by an attenuation length, with
// Mie scattering) and liner.
func TestLoadEventFile(t *testing.T) {
	s, err := Load("demo")
	if err != nil {
		t.Fatal(err)
	}
	c := optics.DefaultWaterConfig()
	c.TemperatureC, c.RayleighScale, c.MieLength, c.MieG = 12.5, 1.1, 15000, 0.8
	c.AttenuationLength, c.AttenuationWavelength = 5000, 430
	if s.Water, err = optics.NewWater(c); err != nil {
		t.Fatal(err)
	}
	s.Liner = optics.Liner{Reflectivity: 0.2, DiffuseFraction: 0.7}
	s.Trigger.Threshold = 8
	s.Sensor.TTS = 0.9
	s.Sensor.Name = "Medium (edited)"
	sm, err := sim.New(SimConfig(s, 5))
	if err != nil {
		t.Fatal(err)
	}
	g, err := gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{{PDG: phys.Electron, Ekin: gen.FixedEnergy(20), Direction: gen.Isotropic()}},
		Vertex:    gen.InFiducial(s.Detector.Tank(), 100),
	})
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "run7.root")
	if _, err := sm.WriteRun(context.Background(), g, sim.RunOptions{Count: 2}, path); err != nil {
		t.Fatal(err)
	}
	got, err := Load(path)
	if err != nil {
		t.Fatal(err)
	}
	if got.Name != "run7" {
		t.Errorf("name %q, want run7", got.Name)
	}
	if !reflect.DeepEqual(got.Detector.Sensors(), s.Detector.Sensors()) || got.Detector.Tank() != s.Detector.Tank() {
		t.Errorf("detector %v, want %v", got.Detector, s.Detector)
	}
	if !reflect.DeepEqual(got.Sensor, s.Sensor) {
		t.Errorf("sensor %+v, want %+v", got.Sensor, s.Sensor)
	}
	if got.Trigger != s.Trigger || got.Liner != s.Liner {
		t.Errorf("trigger %+v liner %+v, want %+v %+v", got.Trigger, got.Liner, s.Trigger, s.Liner)
	}
	if got.Water.Config() != s.Water.Config() || got.Water.AbsorptionScale() != s.Water.AbsorptionScale() {
		t.Errorf("water %+v (absorption x%g), want %+v (x%g)", got.Water.Config(), got.Water.AbsorptionScale(), s.Water.Config(), s.Water.AbsorptionScale())
	}
	// Text the reader does not know is an error, not a guess.
	if _, err := waterFromRun("T=20 C, clear"); err == nil || !strings.Contains(err.Error(), "clear") {
		t.Errorf("unknown water text: error %v", err)
	}
	if _, err := linerFromRun("liner reflectivity 1.5 (diffuse 0.5), photon prescale 1"); err == nil {
		t.Error("liner reflectivity 1.5: no error")
	}
}
