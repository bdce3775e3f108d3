package main

import (
	"bytes"
	"context"
	"image/png"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/plot/vg"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/display"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/fit/ring"
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

func TestReconstructTiny(t *testing.T) {
	// Reconstruction at a tiny size: low-energy electrons and one
	// ring-fitted muon, the table rows and every figure written; the PNGs
	// decode at the size they were drawn at.
	dir := t.TempDir()
	var out, progress bytes.Buffer
	o := options{particles: []string{"e-", "mu-"}, energies: []float64{30, 300}, n: 5, seed: 4, out: dir, ringFit: 1}
	if err := run(context.Background(), &out, &progress, o); err != nil {
		t.Fatal(err)
	}
	s := out.String()
	for _, row := range []string{"e-           30 low-energy", "mu-         300 ring"} {
		if !strings.Contains(s, row) {
			t.Errorf("no row %q in\n%s", row, s)
		}
	}
	for _, f := range []struct {
		name string
		w, h vg.Length
	}{{"event", 8 * vg.Inch, 7.5 * vg.Inch}, {"residuals", 6 * vg.Inch, 4 * vg.Inch}, {"charge-angle", 6 * vg.Inch, 4 * vg.Inch}, {"resolution", 10 * vg.Inch, 8 * vg.Inch}, {"pulls", 10 * vg.Inch, 4 * vg.Inch}} {
		r, err := os.Open(filepath.Join(dir, f.name+".png"))
		if err != nil {
			t.Fatal(err)
		}
		cfg, err := png.DecodeConfig(r)
		r.Close()
		w, h := display.PixelSize(f.w, f.h)
		if err != nil || cfg.Width != w || cfg.Height != h {
			t.Errorf("%s.png: %dx%d, %v; want %dx%d", f.name, cfg.Width, cfg.Height, err, w, h)
		}
		if st, err := os.Stat(filepath.Join(dir, f.name+".svg")); err != nil || st.Size() < 1000 {
			t.Errorf("%s.svg: %v", f.name, err)
		}
	}
}

func TestRingPulls(t *testing.T) {
	// Pulls are (fit - true) / uncertainty per coordinate and for the
	// kinetic energy, and only from fits with valid uncertainties.
	r := ring.Result{ErrorsValid: true, Track: fit.Track{Vertex: r3.Vector{X: 10, Y: -4, Z: 3}, Ekin: 330},
		Errors: fit.Errors{Vertex: r3.Vector{X: 5, Y: 2, Z: 1}, Ekin: 15}}
	tr := resolution.Sample{Vertex: r3.Vector{X: 0, Y: 0, Z: 0}, Energy: 300}
	v, e, ok := ringPulls(&r, tr)
	if !ok || v != [3]float64{2, -2, 3} || e != 2 {
		t.Errorf("ringPulls = %v, %v, %v; want [2 -2 3], 2, true", v, e, ok)
	}
	r.ErrorsValid = false
	if _, _, ok := ringPulls(&r, tr); ok {
		t.Error("pulls from a fit without valid uncertainties")
	}
}
