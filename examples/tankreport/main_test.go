package main

import (
	"bytes"
	"path/filepath"
	"strings"
	"testing"

	"github.com/conelight/conelight/geom"
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
