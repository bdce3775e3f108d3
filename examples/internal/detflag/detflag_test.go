package detflag

import (
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/conelight/conelight/sim"
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
	for _, bad := range []string{"", "nowhere.toml", "huge"} {
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
