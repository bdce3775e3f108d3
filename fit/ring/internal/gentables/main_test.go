package main

import (
	"compress/gzip"
	"encoding/gob"
	"os"
	"strings"
	"testing"

	"github.com/conelight/conelight/fit/ring/internal/profile"
)

// TestTablesCurrent fails when the emission tables that package ring
// embeds were made from other constants than the code's: the hash of the
// constants written into the file by the generator must equal the hash
// that configure computes now (water, band, refractive index, the
// electron and muon physics settings, the energy ladders and event
// counts, the binning, the generator's version).
func TestTablesCurrent(t *testing.T) {
	st, err := configure(defaultScale)
	if err != nil {
		t.Fatal(err)
	}
	fh, err := os.Open("../../profiles.gob.gz")
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	zr, err := gzip.NewReader(fh)
	if err != nil {
		t.Fatal(err)
	}
	var f profile.File
	if err := gob.NewDecoder(zr).Decode(&f); err != nil {
		t.Fatal(err)
	}
	want := st.file.Provenance
	if f.Provenance.Hash != want.Hash || f.Provenance.Version != want.Version {
		t.Errorf("fit/ring/profiles.gob.gz is stale (generator version %d, constants hash %.12s; the code has version %d, hash %.12s): run\n\tgo generate ./fit/ring\nconstants that differ:\n%s",
			f.Provenance.Version, f.Provenance.Hash, want.Version, want.Hash, lineDiff(f.Provenance.Constants, want.Constants))
	}
}

// lineDiff lists the lines of b that are not in a.
func lineDiff(a, b string) string {
	have := map[string]bool{}
	for _, l := range strings.Split(a, "\n") {
		have[l] = true
	}
	var out []string
	for _, l := range strings.Split(b, "\n") {
		if !have[l] {
			out = append(out, "\t"+l)
		}
	}
	return strings.Join(out, "\n")
}
