package main

import (
	"os"
	"strings"
	"testing"
)

// TestREADMEUpToDate fails when a measured table in the README differs
// from what the readme step renders from the baselines and the code.
func TestREADMEUpToDate(t *testing.T) {
	text, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	_, changed, err := renderBlocks(text, "../..")
	if err != nil {
		t.Fatal(err)
	}
	if changed != 0 {
		t.Errorf("%d README block(s) are stale: run go run ./examples/regen -steps readme", changed)
	}
}

func TestRenderBlocksRefuses(t *testing.T) {
	for _, tc := range []struct{ name, text, want string }{
		{"unknown block", "<!-- begin generated nope: go run ./examples/regen -steps readme -->\n<!-- end generated nope -->", `block "nope" has no renderer`},
		{"no end", "<!-- begin generated tanks: go run ./examples/regen -steps readme -->\nx", "no end marker"},
		{"missing block", "nothing here", "no block"},
	} {
		_, _, err := renderBlocks([]byte(tc.text), "../..")
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want an error containing %q", tc.name, err, tc.want)
		}
	}
}
