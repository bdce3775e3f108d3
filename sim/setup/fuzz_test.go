package setup

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// fuzzOptions keep the fuzz target's layouts to the size of the large
// tank, so that it spends its time on parsing.
var fuzzOptions = options{maxSensors: 12000}

func FuzzParse(f *testing.F) {
	for _, name := range BuiltinNames() {
		data, _ := builtin.ReadFile("builtin/" + name + ".toml")
		f.Add(data)
	}
	if data, err := os.ReadFile(filepath.Join("..", "..", "testdata", "setup", "example.toml")); err == nil {
		f.Add(data)
	}
	f.Add([]byte(good))
	f.Add([]byte(strings.Replace(good, "coverage = 0.3", "coverage = 0.9", 1)))
	f.Add([]byte("[tank]\nvessel_radius_cm = 1\nvessel_height_cm = 1\n[sensor]\npreset = \"Small\"\n[layout]\ncoverage = 0.01\n"))
	f.Add([]byte(strings.Replace(good, "coverage = 0.3", "sensor_csv = \"x.csv\"", 1)))
	f.Add([]byte("a = { b = 1 }\n[[c]]\n'''x\ny = 1'''"))
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 1<<14 {
			return // larger inputs only slow the search; the size is not the point
		}
		s, err := parse(data, "fuzz.toml", fuzzOptions)
		if err != nil {
			if s.Detector != nil {
				t.Errorf("error %v with a detector", err)
			}
			return
		}
		if err := s.Check(); err != nil {
			t.Errorf("parsed setup fails Check: %v", err)
		}
		// A description that parses round-trips.
		var buf bytes.Buffer
		if err := Encode(&buf, s); err != nil {
			if errors.Is(err, ErrNeedsCSV) {
				return
			}
			t.Fatalf("Encode of a parsed setup: %v", err)
		}
		back, err := parse(buf.Bytes(), "fuzz.toml", fuzzOptions)
		if err != nil {
			t.Fatalf("Parse of Encode: %v\n%s", err, buf.Bytes())
		}
		if d := equalSetup(back, s); d != "" {
			t.Errorf("round trip differs: %s", d)
		}
	})
}
