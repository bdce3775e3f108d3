package optics

import (
	"math"
	"os"
	"strings"
	"testing"
)

func TestAbsorptionTableValues(t *testing.T) {
	cases := []struct{ lambda, perMetre float64 }{
		// Pope and Fry, Appl. Opt. 36 (1997) 8710 (from memory).
		{380, 0.01137}, {400, 0.00663}, {417.5, 0.00442}, {450, 0.00922},
		{500, 0.0204}, {550, 0.0565}, {600, 0.2224}, {650, 0.340}, {700, 0.624},
		// Smith and Baker, Appl. Opt. 20 (1981) 177 (from memory).
		{250, 0.559}, {300, 0.141}, {350, 0.0463},
	}
	for _, c := range cases {
		a, err := PureWaterAbsorption(c.lambda)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(a*100/c.perMetre-1) > 1e-9 {
			t.Errorf("a(%g nm) = %g /m, want %g /m", c.lambda, a*100, c.perMetre)
		}
	}
	// Linear interpolation halfway between two Pope-Fry entries.
	a, _ := PureWaterAbsorption(401.25)
	if want := (0.00663 + 0.00579) / 2; math.Abs(a*100/want-1) > 1e-9 {
		t.Errorf("a(401.25) = %g /m, want %g", a*100, want)
	}
}

func TestAbsorptionMinimum(t *testing.T) {
	// Pope and Fry (1997): pure water absorbs least near 417.5 nm,
	// about 0.0044 /m, an absorption length of order 200 m (DESIGN.md;
	// common practice quotes 100-200 m for very pure water).
	best, bestL := math.Inf(1), 0.0
	for l := AbsorptionMinWavelength; l <= AbsorptionMaxWavelength; l += 0.5 {
		a, err := PureWaterAbsorption(l)
		if err != nil {
			t.Fatal(err)
		}
		if a < best {
			best, bestL = a, l
		}
	}
	if bestL < 410 || bestL > 420 {
		t.Errorf("absorption minimum at %g nm, want 410-420 nm", bestL)
	}
	if length := 1 / best / 100; length < 150 || length > 300 {
		t.Errorf("absorption length at minimum %g m, want of order 200 m", length)
	}
}

func TestAbsorptionBadInput(t *testing.T) {
	for _, l := range []float64{199, 701, math.NaN(), math.Inf(-1)} {
		if _, err := PureWaterAbsorption(l); err == nil {
			t.Errorf("PureWaterAbsorption(%g) gave no error", l)
		}
	}
	for _, bad := range []string{
		"200 1 X\n700\n",            // too few fields
		"200 1 X\n150 1 X\n",        // not increasing
		"200 -1 X\n700 1 X\n",       // negative
		"200 1 X\n600 1 X\n",        // short range
		"# only a comment\n",        // empty
		"200 1 X\n700 abc X\n",      // not a number
		"200 1 X\n450 1 X\n700 0 X", // zero absorption
	} {
		if _, err := parseAbsorption(bad); err == nil {
			t.Errorf("parseAbsorption(%q) gave no error", bad)
		}
	}
}

func TestAbsorptionTestdataPointer(t *testing.T) {
	// testdata/optics holds a README pointing here instead of a copy.
	b, err := os.ReadFile("../../testdata/optics/README.md")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), "sim/optics/data/absorption.txt") {
		t.Error("testdata/optics/README.md does not point to the embedded table")
	}
	if !strings.Contains(absorptionData, "Pope and Fry") || !strings.Contains(absorptionData, "Smith and Baker") {
		t.Error("embedded table header does not name its sources")
	}
}
