package main

import (
	"os"
	"os/exec"
	"strings"
	"testing"

	"fmt"
)

// runMainEnv, when set to 1 in the environment of this test binary, makes
// it run the program instead of the tests, so the test sees exactly what
// a user sees.
const runMainEnv = "CONELIGHT_QUICKSTART_MAIN"

func TestMain(m *testing.M) {
	if os.Getenv(runMainEnv) == "1" {
		main()
		os.Exit(0)
	}
	os.Exit(m.Run())
}

// TestQuickstart runs the README's first program and checks what it
// prints: five reconstructed 10 MeV electrons whose energies agree with the
// truth within four of their reported errors and whose vertices lie within
// 1.5 m of the truth (the vertex 68% of the low-energy fit at 10 MeV in
// the demo tank is a few tens of cm; these bounds catch a broken fit, not a
// small change of resolution).
func TestQuickstart(t *testing.T) {
	cmd := exec.Command(os.Args[0], "-detector", "../../sim/setup/builtin/demo.toml")
	cmd.Env = append(os.Environ(), runMainEnv+"=1")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("quickstart failed: %v\n%s", err, out)
	}
	lines := strings.Split(strings.TrimSpace(string(out)), "\n")
	if len(lines) != 5 {
		t.Fatalf("got %d lines, want 5:\n%s", len(lines), out)
	}
	for i, l := range lines {
		var n, hits int
		var dv, da, e, de float64
		if _, err := fmt.Sscanf(l, "event %d: %d hits, vertex off by %f cm, direction off by %f deg, E = %f +- %f MeV", &n, &hits, &dv, &da, &e, &de); err != nil {
			t.Fatalf("line %d %q: %v", i, l, err)
		}
		if n != i || hits <= 0 || dv > 150 || de <= 0 || (e-10)*(e-10) > 16*de*de {
			t.Errorf("line %d out of bounds: %q", i, l)
		}
	}
}
