package gen

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sort"
)

type spectrumKind int

const (
	spectrumUnset spectrumKind = iota
	spectrumFixed
	spectrumUniform
	spectrumPowerLaw
	spectrumHistogram
)

// Spectrum is an energy distribution (MeV): a fixed value, a uniform range,
// a power law or a histogram. Build one with FixedEnergy, UniformEnergy,
// PowerLaw or HistogramSpectrum; the zero value is "not set" and fails
// validation. A Spectrum is immutable and safe for concurrent use.
type Spectrum struct {
	kind   spectrumKind
	lo, hi float64 // fixed value in lo
	index  float64 // power-law index gamma of dN/dE ~ E^-gamma
	// histogram: bin edges and the cumulative bin probabilities,
	// cum[i] = P(E < edges[i+1]), cum[len-1] = 1.
	edges, cum []float64
}

// FixedEnergy is the spectrum of the single value e (MeV).
func FixedEnergy(e float64) Spectrum { return Spectrum{kind: spectrumFixed, lo: e, hi: e} }

// UniformEnergy is the flat spectrum on [lo, hi] (MeV).
func UniformEnergy(lo, hi float64) Spectrum { return Spectrum{kind: spectrumUniform, lo: lo, hi: hi} }

// PowerLaw is the spectrum dN/dE ~ E^-index on [lo, hi] (MeV), 0 < lo < hi;
// index 1 is flat in log E. It is sampled by its closed-form inverse CDF.
func PowerLaw(index, lo, hi float64) Spectrum {
	return Spectrum{kind: spectrumPowerLaw, lo: lo, hi: hi, index: index}
}

// HistogramSpectrum is a tabulated spectrum: weights[i] is the relative
// number of particles between edges[i] and edges[i+1] (MeV), flat inside
// each bin, so len(edges) = len(weights)+1. Edges must increase strictly,
// weights be finite and non-negative with a positive sum. It is sampled by
// inverse CDF (binary search of the cumulative sum, then linear in the
// bin). The slices are copied.
func HistogramSpectrum(edges, weights []float64) (Spectrum, error) {
	if len(edges) < 2 || len(edges) != len(weights)+1 {
		return Spectrum{}, fmt.Errorf("gen: HistogramSpectrum: %d edges for %d weights, want weights+1 >= 2", len(edges), len(weights))
	}
	for i, e := range edges {
		if !isFinite(e) || e < 0 {
			return Spectrum{}, fmt.Errorf("gen: HistogramSpectrum: edges[%d] = %g must be finite and >= 0", i, e)
		}
		if i > 0 && !(e > edges[i-1]) {
			return Spectrum{}, fmt.Errorf("gen: HistogramSpectrum: edges[%d] = %g must exceed edges[%d] = %g", i, e, i-1, edges[i-1])
		}
	}
	cum := make([]float64, len(weights))
	sum := 0.0
	for i, w := range weights {
		if !isFinite(w) || w < 0 {
			return Spectrum{}, fmt.Errorf("gen: HistogramSpectrum: weights[%d] = %g must be finite and >= 0", i, w)
		}
		sum += w
		cum[i] = sum
	}
	if !(sum > 0) {
		return Spectrum{}, errors.New("gen: HistogramSpectrum: weights sum to 0")
	}
	for i := range cum {
		cum[i] /= sum
	}
	cum[len(cum)-1] = 1
	return Spectrum{kind: spectrumHistogram, lo: edges[0], hi: edges[len(edges)-1],
		edges: slices.Clone(edges), cum: cum}, nil
}

// Validate reports whether s is a usable energy spectrum; the error names
// the offending parameter and value.
func (s Spectrum) Validate() error {
	bad := func(v float64) bool { return !isFinite(v) }
	switch s.kind {
	case spectrumUnset:
		return errors.New("not set")
	case spectrumFixed:
		if bad(s.lo) || s.lo < 0 {
			return fmt.Errorf("FixedEnergy(%g): energy must be finite and >= 0", s.lo)
		}
	case spectrumUniform:
		if bad(s.lo) || bad(s.hi) || s.lo < 0 || !(s.hi > s.lo) {
			return fmt.Errorf("UniformEnergy(%g, %g): need finite 0 <= lo < hi", s.lo, s.hi)
		}
	case spectrumPowerLaw:
		if bad(s.index) {
			return fmt.Errorf("PowerLaw(%g, %g, %g): index must be finite", s.index, s.lo, s.hi)
		}
		if bad(s.lo) || bad(s.hi) || !(s.lo > 0) || !(s.hi > s.lo) {
			return fmt.Errorf("PowerLaw(%g, %g, %g): need finite 0 < lo < hi", s.index, s.lo, s.hi)
		}
	}
	return nil
}

// Range returns the smallest and largest energy s can give (MeV).
func (s Spectrum) Range() (lo, hi float64) { return s.lo, s.hi }

// Sample draws one energy (MeV).
func (s Spectrum) Sample(rng *rand.Rand) float64 {
	switch s.kind {
	case spectrumFixed:
		return s.lo
	case spectrumUniform:
		return s.lo + (s.hi-s.lo)*rng.Float64()
	case spectrumPowerLaw:
		return s.powerLawQuantile(rng.Float64())
	case spectrumHistogram:
		return s.histogramQuantile(rng.Float64())
	}
	return math.NaN()
}

// powerLawQuantile inverts the CDF of E^-gamma on [lo, hi] at u in [0, 1).
func (s Spectrum) powerLawQuantile(u float64) float64 {
	g1 := 1 - s.index
	if math.Abs(g1) < 1e-12 {
		return s.lo * math.Pow(s.hi/s.lo, u)
	}
	a, b := math.Pow(s.lo, g1), math.Pow(s.hi, g1)
	e := math.Pow(a+u*(b-a), 1/g1)
	return math.Min(math.Max(e, s.lo), s.hi)
}

// histogramQuantile inverts the piecewise-linear CDF at u in [0, 1).
func (s Spectrum) histogramQuantile(u float64) float64 {
	i := sort.SearchFloat64s(s.cum, u)
	for i < len(s.cum)-1 && s.cum[i] <= u { // skip empty bins and exact hits
		i++
	}
	c0 := 0.0
	if i > 0 {
		c0 = s.cum[i-1]
	}
	f := (u - c0) / (s.cum[i] - c0)
	return s.edges[i] + f*(s.edges[i+1]-s.edges[i])
}

// String describes the spectrum, e.g. "UniformEnergy(100, 1000) MeV".
func (s Spectrum) String() string {
	switch s.kind {
	case spectrumFixed:
		return fmt.Sprintf("FixedEnergy(%g) MeV", s.lo)
	case spectrumUniform:
		return fmt.Sprintf("UniformEnergy(%g, %g) MeV", s.lo, s.hi)
	case spectrumPowerLaw:
		return fmt.Sprintf("PowerLaw(%g, %g, %g) MeV", s.index, s.lo, s.hi)
	case spectrumHistogram:
		return fmt.Sprintf("HistogramSpectrum(%d bins, %g-%g) MeV", len(s.cum), s.lo, s.hi)
	}
	return "unset spectrum"
}
