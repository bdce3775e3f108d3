package setup

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// examplePath is the commented example description that shows every key.
var examplePath = filepath.Join("..", "..", "testdata", "setup", "example.toml")

func TestExampleFileParses(t *testing.T) {
	s, err := Load(examplePath)
	if err != nil {
		t.Fatal(err)
	}
	if s.Name != "example pool" || s.Sensor.Name != "Medium, faster electronics" || len(s.Dead) != 3 {
		t.Errorf("example read as %q, sensor %q, %d dead sensors", s.Name, s.Sensor.Name, len(s.Dead))
	}
}

// Every key of the schema appears in the example, set or (for the
// alternatives a file chooses between) commented out in its table, and
// the example names no key the schema lacks.
func TestExampleFileShowsEveryKey(t *testing.T) {
	data, err := os.ReadFile(examplePath)
	if err != nil {
		t.Fatal(err)
	}
	keyLine := regexp.MustCompile(`^(?:#\s*)?([a-z_]+) = `)
	shown := make(map[string]bool)
	table := ""
	for _, line := range strings.Split(string(data), "\n") {
		if strings.HasPrefix(line, "[") {
			table = strings.Trim(line, "[] ")
			continue
		}
		if m := keyLine.FindStringSubmatch(line); m != nil {
			key := m[1]
			if table != "" {
				key = table + "." + key
			}
			shown[key] = true
		}
	}
	known := make(map[string]bool)
	for _, k := range schema() {
		known[k.key] = true
		if !shown[k.key] {
			t.Errorf("key %s does not appear in %s", k.key, examplePath)
		}
	}
	for k := range shown {
		if !known[k] {
			t.Errorf("%s shows %s, which is not a key of the schema", examplePath, k)
		}
	}
}

// The alternatives commented out in the example are valid too.
func TestExampleFileAlternatives(t *testing.T) {
	data, err := os.ReadFile(examplePath)
	if err != nil {
		t.Fatal(err)
	}
	text := string(data)
	for _, c := range []struct {
		name string
		drop []string // lines to remove (by prefix)
		use  []string // commented lines to uncomment (by prefix after "# ")
	}{
		{"qe_peak", []string{"qe_wavelength_nm", "qe_fraction"}, []string{"qe_peak"}},
		{"attenuation", []string{"absorption_scale"}, []string{"attenuation_length_cm", "attenuation_wavelength_nm"}},
	} {
		var out []string
		for _, line := range strings.Split(text, "\n") {
			keep := true
			for _, d := range c.drop {
				keep = keep && !strings.HasPrefix(line, d+" ")
			}
			for _, u := range c.use {
				if strings.HasPrefix(line, "# "+u+" ") {
					line = strings.TrimPrefix(line, "# ")
				}
			}
			if keep {
				out = append(out, line)
			}
		}
		if _, err := Parse([]byte(strings.Join(out, "\n")), examplePath); err != nil {
			t.Errorf("%s: %v", c.name, err)
		}
	}
}

// The description files shown in the README parse.
func TestReadmeDescriptions(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	blocks := regexp.MustCompile("(?s)```toml\n(.*?)```").FindAllSubmatch(data, -1)
	if len(blocks) == 0 {
		t.Fatal("README shows no description file")
	}
	for i, b := range blocks {
		if _, err := Parse(b[1], "README.toml"); err != nil {
			t.Errorf("README description %d: %v", i, err)
		}
	}
}
