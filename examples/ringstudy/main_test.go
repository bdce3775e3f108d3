package main

import (
	"bytes"
	"context"
	"path/filepath"
	"strings"
	"testing"

	"github.com/conelight/conelight/fit/resolution"
)

// TestRunTiny runs the study at a tiny size in the demo tank so that it
// cannot rot: every point gets its figures, the baseline it writes reads
// back and compares with itself without a worsening, and a comparison
// with a baseline of other samples is refused.
func TestRunTiny(t *testing.T) {
	pts, err := parsePoints("e-400,mu-400")
	if err != nil {
		t.Fatal(err)
	}
	o := options{detector: "demo", points: pts, n: 3, wall: 150, seed: 11}
	var out bytes.Buffer
	path := filepath.Join(t.TempDir(), "study.json")
	if err := main1(&out, o, path, "", 3, true); err != nil {
		t.Fatal(err)
	}
	text := out.String()
	for _, want := range []string{"e-400", "mu-400", "pull widths", "Cramer-Rao", "power to detect", "wrote"} {
		if !strings.Contains(text, want) {
			t.Errorf("report lacks %q:\n%s", want, text)
		}
	}
	b, err := resolution.LoadBaseline(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(b.Points) < 2 || b.Points[0].Name != "e-400" || b.Points[1].Name != "mu-400" {
		t.Fatalf("baseline points %+v", b.Points)
	}
	for _, name := range []string{"vertex68", "direction68", "momentum68", "misid", "failed"} {
		if _, ok := figure(b.Points[0], name); !ok {
			t.Errorf("point e-400 lacks figure %s", name)
		}
	}
	c, err := resolution.Compare(b, b, 3)
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Worsened()) != 0 {
		t.Errorf("a baseline worse than itself:\n%s", c)
	}
	// The same points with another seed are other samples: Compare refuses.
	o.seed = 12
	if err := main1(&out, o, "", path, 3, false); err == nil || !strings.Contains(err.Error(), "sample") {
		t.Errorf("comparison across samples: error %v, want one naming the sample", err)
	}
}

func TestParsePoints(t *testing.T) {
	p, err := parsePoints("e-300, mu-1000")
	if err != nil || len(p) != 2 || p[0].pdg != 11 || p[1].pdg != 13 || p[1].p != 1000 {
		t.Fatalf("parsePoints: %+v, %v", p, err)
	}
	for _, bad := range []string{"", "e", "e-", "pi-300", "e-x", "mu-0", "e-20000"} {
		if _, err := parsePoints(bad); err == nil {
			t.Errorf("parsePoints(%q): want an error", bad)
		}
	}
	if _, err := run(context.Background(), &bytes.Buffer{}, options{detector: "demo", points: p, n: 0}); err == nil || !strings.Contains(err.Error(), "-n") {
		t.Errorf("n = 0: error %v, want one naming -n", err)
	}
}

// TestScanTiny runs the diagnostic on two events: the summed curves and
// the minima are printed, and the total at zero shift is the reference.
func TestScanTiny(t *testing.T) {
	pts, _ := parsePoints("e-400")
	var out bytes.Buffer
	if err := scan(context.Background(), &out, options{detector: "demo", points: pts, n: 2, wall: 150, seed: 5}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out.String(), "minimum: charge") || !strings.Contains(out.String(), "      +0        +0.00        +0.00        +0.00") {
		t.Errorf("scan report:\n%s", out.String())
	}
	if x := scanMinimum([]float64{-1, 0, 1, 2}, []float64{4, 1, 0, 1}); x != 1 {
		t.Errorf("scanMinimum of a parabola about 1: %g", x)
	}
}
