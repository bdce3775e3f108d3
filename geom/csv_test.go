package geom

import (
	"bytes"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

func sameDetector(t *testing.T, got, want *Detector) {
	t.Helper()
	if got.Tank() != want.Tank() || got.CathodeDiameter() != want.CathodeDiameter() {
		t.Fatalf("read back %v, want %v", got, want)
	}
	if !reflect.DeepEqual(got.Sensors(), want.Sensors()) {
		t.Fatalf("sensors differ after the round trip")
	}
}

func TestSensorCSVRoundTrip(t *testing.T) {
	d, err := Layout(DemoTank(), 20, 0.3)
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteSensorCSV(&buf, d); err != nil {
		t.Fatal(err)
	}
	back, err := ReadSensorCSV(&buf)
	if err != nil {
		t.Fatal(err)
	}
	sameDetector(t, back, d)

	dir := t.TempDir()
	path := filepath.Join(dir, "sensors.csv")
	if err := os.WriteFile(path, []byte("stale"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := SaveSensorCSV(path, d); err != nil {
		t.Fatal(err)
	}
	back, err = LoadSensorCSV(path)
	if err != nil {
		t.Fatal(err)
	}
	sameDetector(t, back, d)
	// The atomic write leaves no temporary file behind.
	if names, _ := filepath.Glob(filepath.Join(dir, "*")); len(names) != 1 {
		t.Errorf("directory holds %v, want only sensors.csv", names)
	}
	if err := SaveSensorCSV(filepath.Join(dir, "missing", "x.csv"), d); err == nil {
		t.Error("SaveSensorCSV into a missing directory: no error")
	}
}

func TestSensorCSVErrors(t *testing.T) {
	const head = "# demo\n@format conelight-sensors 1\n@tank_radius 560\n@tank_height 1160\n@sensor_offset 60\n@cathode_diameter 50\nx,y,z,dx,dy,dz\n"
	// Lines 1-7 are the head; rows start at line 8.
	for _, tc := range []struct {
		name, text, want string
	}{
		{"valid", head + "500,0,0,-1,0,0\n\n# comment\n 0 , 0 , 520 , 0 , 0 , -1 \n", ""},
		{"bad number", head + "500,0,0,-1,0,abc\n", `geom: sensor CSV line 8: field dz: "abc" is not a number`},
		{"field count", head + "500,0,0,-1,0\n", "line 8: 5 fields, want 6"},
		{"off the surface", head + "500,0,0,-1,0,0\n400,0,0,-1,0,0\n", "line 9: sensor 1: Pos = (400, 0, 0)"},
		{"zero direction", head + "500,0,0,0,0,0\n", "line 8: sensor 0: Dir = (0, 0, 0)"},
		{"overlap", head + "500,0,0,-1,0,0\n# gap\n500,0,10,-1,0,0\n", "line 10: sensors 0 and 1 overlap"},
		{"bad tank", strings.Replace(head, "@tank_radius 560", "@tank_radius -560", 1), "geom: sensor CSV line 3: Tank.Radius = -560"},
		{"directive value", strings.Replace(head, "@tank_height 1160", "@tank_height tall", 1), `line 4: directive @tank_height: "tall" is not a number`},
		{"unknown directive", strings.Replace(head, "# demo", "@colour blue", 1), "line 1: unknown directive @colour"},
		{"repeated directive", strings.Replace(head, "# demo", "@cathode_diameter 20", 1), "line 6: directive @cathode_diameter repeats line 1"},
		{"missing directive", strings.Replace(head, "@sensor_offset 60\n", "", 1), "line 6: missing directive @sensor_offset"},
		{"wrong format", strings.Replace(head, "sensors 1", "sensors 2", 1), `line 2: @format "conelight-sensors 2"`},
		{"missing format", strings.Replace(head, "@format conelight-sensors 1\n", "", 1), "line 6: missing @format"},
		{"bad header", strings.Replace(head, "dx,dy,dz", "u,v,w", 1), `line 7: header row "x,y,z,u,v,w"`},
		{"directive after header", head + "@tank_radius 3\n", "line 8: directive"},
		{"empty", "", "line 1: end of input before the header row"},
		{"bad offset", strings.Replace(head, "@sensor_offset 60", "@sensor_offset NaN", 1), "line 5: Tank.SensorOffset = NaN"},
		{"offset too deep", strings.Replace(head, "@sensor_offset 60", "@sensor_offset 600", 1), "line 5: Tank.SensorOffset = 600 leaves no volume"},
		{"bad height", strings.Replace(head, "@tank_height 1160", "@tank_height +Inf", 1), "line 4: Tank.Height = +Inf"},
		{"bad diameter", strings.Replace(head, "@cathode_diameter 50", "@cathode_diameter 0", 1), "line 6: cathode diameter = 0"},
	} {
		_, err := ReadSensorCSV(strings.NewReader(tc.text))
		checkErr(t, tc.name, err, tc.want)
	}
	// A file's errors carry its name.
	path := filepath.Join(t.TempDir(), "sensors.csv")
	if err := os.WriteFile(path, []byte(head+"500,0,0,-1,0,0\n0,0,520,0,0,x\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := LoadSensorCSV(path); err == nil || !strings.Contains(err.Error(), "sensors.csv line 9: field dz: \"x\" is not a number") {
		t.Errorf("LoadSensorCSV: error %v", err)
	}
	if _, err := LoadSensorCSV(filepath.Join(t.TempDir(), "none.csv")); err == nil {
		t.Error("LoadSensorCSV of a missing file: no error")
	}
}
