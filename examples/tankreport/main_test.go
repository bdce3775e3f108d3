package main

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/setup"
)

func TestRunDemo(t *testing.T) {
	var out bytes.Buffer
	path := filepath.Join(t.TempDir(), "demo.csv")
	if err := run(&out, "demo", 0.3, path); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out.String(), "wrote") {
		t.Errorf("report does not mention the CSV file:\n%s", out.String())
	}
	det, err := geom.LoadSensorCSV(path)
	if err != nil {
		t.Fatal(err)
	}
	// The file must give back the layout the report printed.
	want, err := geom.Layout(geom.DemoTank(), det.CathodeDiameter(), 0.3)
	if err != nil {
		t.Fatal(err)
	}
	if det.NumSensors() != want.NumSensors() {
		t.Errorf("CSV holds %d sensors, layout has %d", det.NumSensors(), want.NumSensors())
	}
	if err := run(&out, "nowhere", 0, ""); err == nil || !strings.Contains(err.Error(), "nowhere") {
		t.Errorf("unknown tank: error %v", err)
	}
}

func TestReportDescription(t *testing.T) {
	var out bytes.Buffer
	if err := report(&out, "demo", yieldOptions{Events: 10, Ekin: 10, Seed: 1}, ""); err != nil {
		t.Fatal(err)
	}
	text := out.String()
	for _, want := range []string{"description demo: valid", "light yield:", "demo     suits", "large    does not suit"} {
		if !strings.Contains(text, want) {
			t.Errorf("report lacks %q:\n%s", want, text)
		}
	}
	// The dark hits per readout window, worked out by hand: sensors x rate x
	// P(one photoelectron reaches the threshold) x window.
	s, err := setup.Demo()
	if err != nil {
		t.Fatal(err)
	}
	m := s.Sensor
	want := float64(s.Detector.NumSensors()) * m.DarkRate * (1 - m.SPE.CDF(m.Threshold)) * 1400e-9
	if !strings.Contains(text, fmt.Sprintf("-> %.3g hits per 1400 ns readout window", want)) {
		t.Errorf("report does not give %.3g dark hits per readout window:\n%s", want, text)
	}

	bad := filepath.Join(t.TempDir(), "bad.toml")
	if err := os.WriteFile(bad, []byte("[tank]\nvessel_radius_cm = 560\nvessel_height_cm = 1160\n[sensor]\npreset = \"Medium\"\n[layout]\ncoverage = 0.99\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	err = report(&out, bad, yieldOptions{Ekin: 10}, "")
	if err == nil || !strings.Contains(err.Error(), "line 7: layout.coverage") {
		t.Errorf("coverage beyond the tank: error %v, want one naming layout.coverage on line 7", err)
	}
	if err := report(&out, "demo", yieldOptions{Events: -1, Ekin: 10}, ""); err == nil {
		t.Error("-events -1: no error")
	}
}

// The light yield is proportional to the collection efficiency: halving it
// halves the photoelectrons, within the statistical errors (4 sigma).
func TestYieldScalesWithEfficiency(t *testing.T) {
	if testing.Short() {
		t.Skip("simulates 2 x 100 electrons")
	}
	s, err := setup.Demo()
	if err != nil {
		t.Fatal(err)
	}
	yo := yieldOptions{Events: 100, Ekin: 10, Seed: 7}
	full, err := simulateYield(s, yo)
	if err != nil {
		t.Fatal(err)
	}
	s.Sensor.CollectionEfficiency /= 2
	half, err := simulateYield(s, yo)
	if err != nil {
		t.Fatal(err)
	}
	z := (half.perMeV - full.perMeV/2) / math.Hypot(half.perMeVErr, full.perMeVErr/2)
	t.Logf("full %.2f ± %.2f, half %.2f ± %.2f pe/MeV, z = %.2f", full.perMeV, full.perMeVErr, half.perMeV, half.perMeVErr, z)
	if math.Abs(z) > 4 {
		t.Errorf("half efficiency gives %.2f ± %.2f pe/MeV, want half of %.2f ± %.2f (z = %.1f)", half.perMeV, half.perMeVErr, full.perMeV, full.perMeVErr, z)
	}
}

// Pull test of the light yield's standard error: independent runs scatter
// about their common mean by their stated errors. With the error
// estimated from n events the pulls have a t-like spread, variance
// (n-1)/(n-3); the standard deviation of K pulls is known to about
// 1/sqrt(2K), and the test allows 4 of that.
func TestYieldErrorPull(t *testing.T) {
	if testing.Short() {
		t.Skip("simulates 40 x 20 electrons")
	}
	s, err := setup.Demo()
	if err != nil {
		t.Fatal(err)
	}
	const runs, n = 40, 20
	ys := make([]yield, runs)
	var grand float64
	for k := range ys {
		if ys[k], err = simulateYield(s, yieldOptions{Events: n, Ekin: 10, Seed: uint64(100 + k)}); err != nil {
			t.Fatal(err)
		}
		grand += ys[k].perMeV / runs
	}
	pulls := make([]float64, runs)
	for k, y := range ys {
		// The grand mean shares 1/runs of each run: scale that out.
		pulls[k] = (y.perMeV - grand) / (y.perMeVErr * math.Sqrt(1-1.0/runs))
	}
	_, sd := stat.MeanStdDev(pulls, nil)
	want := math.Sqrt(float64(n-1) / float64(n-3))
	tol := 4 * want / math.Sqrt(2*runs)
	t.Logf("pull sd %.3f, expected %.3f ± %.3f (%d runs of %d electrons)", sd, want, want/math.Sqrt(2*runs), runs, n)
	if math.Abs(sd-want) > tol {
		t.Errorf("pull sd %.3f, want %.3f within %.3f", sd, want, tol)
	}
}

// -save writes the detector as a description that reads back to it.
func TestReportSave(t *testing.T) {
	path := filepath.Join(t.TempDir(), "demo-copy.toml")
	var out bytes.Buffer
	if err := report(&out, "demo", yieldOptions{Ekin: 10}, path); err != nil {
		t.Fatal(err)
	}
	got, err := setup.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	want, err := setup.Demo()
	if err != nil {
		t.Fatal(err)
	}
	if got.Name != "demo" || got.Detector.NumSensors() != want.Detector.NumSensors() || got.Sensor.Name != want.Sensor.Name || got.Trigger != want.Trigger {
		t.Errorf("saved description reads back as %q, %d sensors of %q, trigger %+v", got.Name, got.Detector.NumSensors(), got.Sensor.Name, got.Trigger)
	}
}
