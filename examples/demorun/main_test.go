package main

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestRunTiny(t *testing.T) {
	// The main job at a tiny size, so that it cannot rot: two samples of
	// four events, files written and read back, a line per sample.
	dir := t.TempDir()
	var out, progress bytes.Buffer
	o := options{particles: []string{"e-", "mu-"}, energies: []float64{30}, n: 4, seed: 3, out: dir}
	if err := run(context.Background(), &out, &progress, o); err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"e-_30MeV.root", "mu-_30MeV.root"} {
		if st, err := os.Stat(filepath.Join(dir, f)); err != nil || st.Size() == 0 {
			t.Errorf("%s: %v", f, err)
		}
	}
	if got := strings.Count(out.String(), ".root"); got != 2 {
		t.Errorf("table has %d sample lines:\n%s", got, out.String())
	}
	if !strings.Contains(progress.String(), "4/4 events") {
		t.Errorf("no final progress line: %q", progress.String())
	}
	if err := run(context.Background(), &out, &progress, options{particles: []string{"pion"}, energies: []float64{1}, n: 1, out: dir}); err == nil || !strings.Contains(err.Error(), "pion") {
		t.Errorf("unknown particle: %v", err)
	}
	if _, err := parseEnergies("10,abc"); err == nil {
		t.Error("bad energy list accepted")
	}
}
