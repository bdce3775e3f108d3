package main

import (
	"bytes"
	"strings"
	"testing"
)

// TestRun runs a tiny study and checks that it prints a row of figures
// for the energy asked for, and refuses an unknown tank.
func TestRun(t *testing.T) {
	var b bytes.Buffer
	if err := run(&b, "demo", "", []float64{10}, 20, 3, 100); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	if !strings.Contains(out, "pull x") || !strings.Contains(out, "\n    10     20 ") {
		t.Errorf("output lacks the header or the 10 MeV row:\n%s", out)
	}
	if err := run(&b, "cube", "", []float64{10}, 20, 3, 100); err == nil || !strings.Contains(err.Error(), "cube") {
		t.Errorf("unknown tank: error %v", err)
	}
}
