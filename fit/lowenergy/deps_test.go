package lowenergy_test

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/conelight/conelight/fit/internal/sample"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/setup"
)

// TestEmbeddedTablesFresh fails when an embedded table set no longer
// matches the code: its recorded provenance hash (dependencies on the
// detector it was made for, lowenergy.TablesVersion, physics constants)
// differs from the one the code computes for that detector today.
func TestEmbeddedTablesFresh(t *testing.T) {
	for _, name := range lowenergy.EmbeddedTableNames() {
		tab, err := lowenergy.EmbeddedTables(name)
		if err != nil {
			t.Fatal(err)
		}
		cfg := embeddedConfig(t, name)
		deps, err := lowenergy.DependenciesOf(cfg.Setup)
		if err != nil {
			t.Fatal(err)
		}
		want := deps.Meta()["hash"]
		if got := tab.Meta["hash"]; got != want {
			t.Errorf("embedded tables %q are stale: recorded hash %q, the code gives %q for the detector they were made for; regenerate with: go generate ./fit/lowenergy", name, got, want)
		}
	}
}

// embeddedConfig returns the detector the embedded set name was made
// for: "demo" or "large", or "<demo|large>-<sensor class>-<coverage %>"
// for the tank lined anew (gentables -sensor).
func embeddedConfig(t *testing.T, name string) sim.Config {
	t.Helper()
	parts := strings.Split(name, "-")
	var cfg sim.Config
	var err error
	switch parts[0] {
	case "demo":
		cfg, err = sim.DemoConfig(1)
	case "large":
		cfg, err = sample.LargeConfig(1)
	default:
		t.Fatalf("embedded table set %q: no detector known for it in this test", name)
	}
	if err != nil {
		t.Fatal(err)
	}
	if len(parts) == 1 {
		return cfg
	}
	if len(parts) != 3 {
		t.Fatalf("embedded table set %q: want base-sensor-coverage", name)
	}
	switch parts[1] {
	case "small":
		cfg.Sensor = pmt.Small()
	case "medium":
		cfg.Sensor = pmt.Medium()
	case "large":
		cfg.Sensor = pmt.Large()
	default:
		t.Fatalf("embedded table set %q: unknown sensor class %q", name, parts[1])
	}
	// The go:generate lines reline at the base detector's own coverage
	// (gentables without -coverage); the name shows it rounded.
	cov := cfg.Detector.Coverage()
	if pc, err := strconv.ParseFloat(parts[2], 64); err != nil || math.Abs(pc-100*cov) > 0.5 {
		t.Fatalf("embedded table set %q: coverage %q in the name, the base detector has %.1f%%", name, parts[2], 100*cov)
	}
	if cfg.Detector, err = geom.Layout(cfg.Detector.Tank(), cfg.Sensor.CathodeDiameter, cov); err != nil {
		t.Fatal(err)
	}
	cfg.Dead = nil
	return cfg
}

// TestTablesChosenByDependencies checks that New picks the embedded
// tables by the sensor, coverage and water, never by the tank: the large
// tank lined with the demo's medium sensors at 30% gets the demo tables
// without warning, and the demo tank lined with small sensors at 15%
// (no built-in set) gets a warning naming the mismatch and the command
// that makes tables.
func TestTablesChosenByDependencies(t *testing.T) {
	lined := func(tank geom.Tank, m pmt.Model, coverage float64) setup.Setup {
		det, err := geom.Layout(tank, m.CathodeDiameter, coverage)
		if err != nil {
			t.Fatal(err)
		}
		return setup.Setup{Detector: det, Sensor: m}
	}
	cases := []struct {
		name   string
		s      setup.Setup
		tables string
		warn   string
	}{
		{"demo", lined(geom.DemoTank(), pmt.Medium(), 0.30), "demo", ""},
		{"large", lined(geom.LargeTank(), pmt.Large(), 0.40), "large", ""},
		{"large tank, medium sensors at 30%", lined(geom.LargeTank(), pmt.Medium(), 0.30), "demo", ""},
		{"demo tank, small sensors at 15%", lined(geom.DemoTank(), pmt.Small(), 0.15), "", "photocathode coverage"},
	}
	for _, c := range cases {
		f, err := lowenergy.New(lowenergy.Config{Setup: c.s})
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		w := f.TablesWarning()
		if c.tables != "" && f.Tables().Name != c.tables {
			t.Errorf("%s: tables %q, want %q", c.name, f.Tables().Name, c.tables)
		}
		if c.warn == "" && w != "" {
			t.Errorf("%s: unexpected warning %q", c.name, w)
		}
		if c.warn != "" && (!strings.Contains(w, c.warn) || !strings.Contains(w, "gentables")) {
			t.Errorf("%s: warning %q, want one naming %q and the gentables command", c.name, w, c.warn)
		}
	}
}
