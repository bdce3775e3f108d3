package main

import (
	"bytes"
	"context"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"

	"github.com/conelight/conelight/fit/display"
)

func TestRunTiny(t *testing.T) {
	// The study at a tiny size, so that it cannot rot: two coverages, one
	// TTS point, every figure written and decodable.
	dir := t.TempDir()
	var out, progress bytes.Buffer
	o := options{particle: "e-", energy: 10, n: 6, seed: 2, out: dir, coverages: []float64{0.2, 0.3},
		sensors: []string{"medium"}, tts: []float64{2}, formats: []string{"png", "svg"}}
	pts, err := run(context.Background(), &out, &progress, o)
	if err != nil {
		t.Fatal(err)
	}
	if len(pts) != 3 {
		t.Errorf("%d points, want 3 (two coverages, one TTS)", len(pts))
	}
	if n := strings.Count(out.String(), "\nmedium "); n != 3 {
		t.Errorf("table has %d rows:\n%s", n, out.String())
	}
	for _, name := range []string{"coverage", "coverage-tts", "event"} {
		f, err := os.Open(filepath.Join(dir, name+".png"))
		if err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(f)
		f.Close()
		if err != nil {
			t.Fatalf("%s.png: %v", name, err)
		}
		if img.Bounds().Dx() < 500 {
			t.Errorf("%s.png is %v", name, img.Bounds())
		}
		if st, err := os.Stat(filepath.Join(dir, name+".svg")); err != nil || st.Size() < 1000 {
			t.Errorf("%s.svg: %v", name, err)
		}
	}
	w, h := display.PixelSize(13*vg.Inch, 4.5*vg.Inch)
	f, _ := os.Open(filepath.Join(dir, "coverage.png"))
	defer f.Close()
	if cfg, err := png.DecodeConfig(f); err != nil || cfg.Width != w || cfg.Height != h {
		t.Errorf("coverage.png: %+v, %v; want %dx%d", cfg, err, w, h)
	}
	bad := o
	bad.sensors = []string{"huge"}
	if _, err := run(context.Background(), &out, &progress, bad); err == nil || !strings.Contains(err.Error(), "huge") {
		t.Errorf("unknown sensor class: %v", err)
	}
	if _, err := parseList("-tts", "1,-2"); err == nil {
		t.Error("negative list value accepted")
	}
}

func TestRingTiny(t *testing.T) {
	// The ring-fitter path at a tiny size: muons above the low-energy range
	// are ring-fitted, and the table and figure carry the mis-identification.
	dir := t.TempDir()
	var out bytes.Buffer
	o := options{particle: "mu-", energy: 300, n: 5, seed: 3, out: dir, coverages: []float64{0.3},
		sensors: []string{"medium"}, formats: []string{"png"}, quiet: true}
	pts, err := run(context.Background(), &out, &out, o)
	if err != nil {
		t.Fatal(err)
	}
	if pts[0].identified == 0 || !strings.Contains(out.String(), strconv.Itoa(pts[0].misID)+"/"+strconv.Itoa(pts[0].identified)+" ") {
		t.Errorf("no identities in the table:\n%s", out.String())
	}
	w, h := display.PixelSize(4*13*vg.Inch/3, 4.5*vg.Inch)
	f, err := os.Open(filepath.Join(dir, "coverage.png"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if cfg, err := png.DecodeConfig(f); err != nil || cfg.Width != w || cfg.Height != h {
		t.Errorf("coverage.png with the mis-ID panel: %+v, %v; want %dx%d", cfg, err, w, h)
	}
	o.energy = 5
	o.fitter = "ring"
	if _, err := run(context.Background(), &out, &out, o); err == nil || !strings.Contains(err.Error(), "outside the ring fitter") {
		t.Errorf("5 MeV muons with the ring fitter: %v", err)
	}
}

func TestVertexResolutionWorsensWithLowerCoverage(t *testing.T) {
	// The study's trend: with a quarter of the photocathode, fewer photons
	// are detected and the vertex resolution (68% quantile of the distance)
	// must be worse. Both points see the same primaries; the difference is
	// required to exceed 4 standard errors of the two quantiles (errors from
	// resolution.Quantile's order statistics, taken as independent: the
	// shared primaries correlate them positively, so this is conservative).
	if testing.Short() {
		t.Skip("study")
	}
	o := options{particle: "e-", energy: 10, n: 250, seed: 11, out: t.TempDir(), coverages: []float64{0.1, 0.4},
		sensors: []string{"medium"}, quiet: true}
	var out bytes.Buffer
	pts, err := run(context.Background(), &out, &out, o)
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := pts[0].sum.Vertex68, pts[1].sum.Vertex68
	z := (lo.Value - hi.Value) / math.Hypot(lo.Err, hi.Err)
	t.Logf("vertex 68%%: %v at 10%%, %v at 40%%: %.1f sigma", lo, hi, z)
	if z < 4 {
		t.Errorf("vertex 68%% at 10%% coverage %v vs 40%% %v: difference %.1f sigma, want > 4", lo, hi, z)
	}
}
