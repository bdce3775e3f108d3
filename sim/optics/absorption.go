package optics

import (
	"bufio"
	_ "embed"
	"fmt"
	"strconv"
	"strings"
	"sync"
)

// absorptionData is the pure-water absorption table with its sources in
// the header (data/absorption.txt; testdata/optics/README.md points here).
//
//go:embed data/absorption.txt
var absorptionData string

// Range of the pure-water absorption table (nm).
const (
	AbsorptionMinWavelength = 200.0
	AbsorptionMaxWavelength = 700.0
)

// absorptionTable holds the parsed table: wavelengths (nm, increasing)
// and coefficients (1/cm). Parsed once, never written afterwards.
var absorptionTable = sync.OnceValues(func() (tabulated, error) {
	return parseAbsorption(absorptionData)
})

// tabulated is a piecewise-linear function given at increasing x.
type tabulated struct{ x, y []float64 }

// at interpolates linearly; x must lie within the table.
func (t tabulated) at(x float64) float64 {
	lo, hi := 0, len(t.x)-1
	for hi-lo > 1 {
		mid := (lo + hi) / 2
		if t.x[mid] <= x {
			lo = mid
		} else {
			hi = mid
		}
	}
	f := (x - t.x[lo]) / (t.x[hi] - t.x[lo])
	return t.y[lo] + f*(t.y[hi]-t.y[lo])
}

// parseAbsorption reads "wavelength_nm a_per_m source" lines, skipping
// '#' comments, and converts a to 1/cm.
func parseAbsorption(text string) (tabulated, error) {
	var t tabulated
	sc := bufio.NewScanner(strings.NewReader(text))
	for line := 1; sc.Scan(); line++ {
		s := strings.TrimSpace(sc.Text())
		if s == "" || strings.HasPrefix(s, "#") {
			continue
		}
		f := strings.Fields(s)
		if len(f) != 3 {
			return t, fmt.Errorf("optics: absorption table line %d: want 3 fields, got %q", line, s)
		}
		l, err1 := strconv.ParseFloat(f[0], 64)
		a, err2 := strconv.ParseFloat(f[1], 64)
		if err1 != nil || err2 != nil || !(a > 0) {
			return t, fmt.Errorf("optics: absorption table line %d: bad values %q", line, s)
		}
		if n := len(t.x); n > 0 && !(l > t.x[n-1]) {
			return t, fmt.Errorf("optics: absorption table line %d: wavelength %g not increasing", line, l)
		}
		t.x = append(t.x, l)
		t.y = append(t.y, a/100) // 1/m -> 1/cm
	}
	if len(t.x) < 2 || t.x[0] != AbsorptionMinWavelength || t.x[len(t.x)-1] != AbsorptionMaxWavelength {
		return t, fmt.Errorf("optics: absorption table must span %g..%g nm", AbsorptionMinWavelength, AbsorptionMaxWavelength)
	}
	return t, sc.Err()
}

// PureWaterAbsorption returns the absorption coefficient (1/cm) of pure
// water at wavelength lambdaNM (nm), interpolated linearly in the
// embedded table (Pope and Fry 1997 for 380-700 nm, Smith and Baker 1981
// below; see data/absorption.txt). The absorption length is its inverse.
func PureWaterAbsorption(lambdaNM float64) (float64, error) {
	if !(lambdaNM >= AbsorptionMinWavelength && lambdaNM <= AbsorptionMaxWavelength) {
		return 0, fmt.Errorf("optics: lambdaNM = %g outside the absorption table %g..%g nm", lambdaNM, AbsorptionMinWavelength, AbsorptionMaxWavelength)
	}
	t, err := absorptionTable()
	if err != nil {
		return 0, err
	}
	return t.at(lambdaNM), nil
}
