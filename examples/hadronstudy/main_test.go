package main

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestRun: a tiny study writes its report, saying it is at truth level,
// and its four plots.
func TestRun(t *testing.T) {
	dir := t.TempDir()
	var out bytes.Buffer
	o := options{n: 20, seed: 1, gd: 0.001, windowUS: 500, searchUS: 20, minPE: 10, neutronMeV: 2, out: dir}
	if err := run(o, &out); err != nil {
		t.Fatal(err)
	}
	text := out.String()
	for _, want := range []string{"TRUTH LEVEL", "single-pion-like", "after the primary window", "pure water captured", "0.1% Gd", "mean capture time"} {
		if !strings.Contains(text, want) {
			t.Errorf("report lacks %q:\n%s", want, text)
		}
	}
	for _, f := range []string{"decay-time.png", "capture-time.png", "capture-pe.png", "capture-distance.png"} {
		if st, err := os.Stat(filepath.Join(dir, f)); err != nil || st.Size() == 0 {
			t.Errorf("%s: %v", f, err)
		}
	}
	o.gd = 0.5
	if err := run(o, &out); err == nil || !strings.Contains(err.Error(), "-gd = 0.5") {
		t.Errorf("-gd 0.5: %v", err)
	}
}

// TestUsage: -h says what the program does and that tagging is at truth
// level.
func TestUsage(t *testing.T) {
	var b bytes.Buffer
	usage.Write(&b, flag.NewFlagSet("hadronstudy", flag.ContinueOnError))
	if s := b.String(); !strings.Contains(s, "hadronstudy") || !strings.Contains(s, "sub-event readout") {
		t.Errorf("usage:\n%s", s)
	}
}
