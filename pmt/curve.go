package pmt

import (
	"fmt"
	"math"
)

// Curve is a tabulated function y(x) with linear interpolation between the
// tabulated points. It is used for quantum efficiency against wavelength
// (nm) and for relative angular acceptance against the cosine of the
// incidence angle.
//
// Outside the tabulated range [x0, xN] At returns 0. Both uses are
// response curves that are only known, and only non-zero, over the
// measured band: a photocathode beyond its tabulated wavelengths is taken
// to be blind rather than extrapolated, so a photon outside the band is
// never counted by accident. A table that should be non-zero up to its
// edge must therefore include the edge points.
//
// A Curve is immutable after NewCurve and safe for concurrent use; copies
// share the same tables. The zero Curve is invalid (Valid reports false)
// and evaluates to 0 everywhere.
type Curve struct {
	xs, ys []float64
	maxY   float64

	// Uniform-grid index for O(1) lookup: cell k of width 1/invStep
	// starting at xs[0] holds the index of the tabulated segment that
	// contains the cell's left edge, so At only walks the few knots
	// that fall inside one cell.
	cell    []int32
	invStep float64
}

// cellsPerKnot sets the density of the lookup grid. With several cells per
// knot a lookup walks at most one or two knots for any table whose spacing
// does not vary by more than that factor.
const cellsPerKnot = 4

// NewCurve returns the piecewise-linear curve through (xs[i], ys[i]). The
// xs must be finite and strictly increasing, the ys finite, and there must
// be at least two points of equal count. The inputs are copied.
func NewCurve(xs, ys []float64) (Curve, error) {
	if len(xs) != len(ys) {
		return Curve{}, fmt.Errorf("pmt: Curve has %d x values and %d y values, want equal counts", len(xs), len(ys))
	}
	if len(xs) < 2 {
		return Curve{}, fmt.Errorf("pmt: Curve has %d points, want at least 2", len(xs))
	}
	for i, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return Curve{}, fmt.Errorf("pmt: Curve x[%d] = %v must be finite", i, x)
		}
		if i > 0 && !(x > xs[i-1]) {
			return Curve{}, fmt.Errorf("pmt: Curve x[%d] = %v must be greater than x[%d] = %v", i, x, i-1, xs[i-1])
		}
	}
	// The interpolation takes differences of neighbouring values: they
	// must be finite too, or At would return NaN or Inf between them.
	if span := xs[len(xs)-1] - xs[0]; math.IsInf(span, 0) {
		return Curve{}, fmt.Errorf("pmt: Curve range [%v, %v] is too wide: its length overflows", xs[0], xs[len(xs)-1])
	}
	maxY := math.Inf(-1)
	for i, y := range ys {
		if math.IsNaN(y) || math.IsInf(y, 0) {
			return Curve{}, fmt.Errorf("pmt: Curve y[%d] = %v must be finite", i, y)
		}
		if i > 0 && math.IsInf(y-ys[i-1], 0) {
			return Curve{}, fmt.Errorf("pmt: Curve y[%d] - y[%d] = %v - %v overflows", i, i-1, y, ys[i-1])
		}
		maxY = math.Max(maxY, y)
	}
	c := Curve{
		xs:   append([]float64(nil), xs...),
		ys:   append([]float64(nil), ys...),
		maxY: maxY,
	}
	n := len(xs)
	nCell := cellsPerKnot * (n - 1)
	span := xs[n-1] - xs[0]
	c.invStep = float64(nCell) / span
	if math.IsInf(c.invStep, 0) {
		return Curve{}, fmt.Errorf("pmt: Curve range [%v, %v] is too narrow to tabulate", xs[0], xs[n-1])
	}
	c.cell = make([]int32, nCell)
	seg := 0
	for k := range c.cell {
		left := xs[0] + float64(k)*span/float64(nCell)
		if math.IsInf(left, 0) { // k*span overflowed: a range near MaxFloat64 wide
			left = xs[0] + span*(float64(k)/float64(nCell))
		}
		for seg < n-2 && xs[seg+1] <= left {
			seg++
		}
		c.cell[k] = int32(seg)
	}
	return c, nil
}

// mustCurve builds a curve from a table fixed in this package's source;
// an error there is a programming error caught by the tests.
func mustCurve(xs, ys []float64) Curve {
	c, err := NewCurve(xs, ys)
	if err != nil {
		panic(err)
	}
	return c
}

// Valid reports whether c was built by NewCurve.
func (c Curve) Valid() bool { return len(c.xs) >= 2 }

// At returns the linearly interpolated value at x, or 0 outside the
// tabulated range (and for NaN x). It does not allocate.
func (c Curve) At(x float64) float64 {
	n := len(c.xs)
	if n < 2 || !(x >= c.xs[0] && x <= c.xs[n-1]) {
		return 0
	}
	k := int((x - c.xs[0]) * c.invStep)
	if k >= len(c.cell) {
		k = len(c.cell) - 1
	}
	i := int(c.cell[k])
	for i < n-2 && x > c.xs[i+1] {
		i++
	}
	// Rounding of the cell edges can put x an ulp before its cell's first
	// segment when a knot lies on the edge; step back so that the segment
	// always holds x.
	for i > 0 && x < c.xs[i] {
		i--
	}
	x0, x1 := c.xs[i], c.xs[i+1]
	y0, y1 := c.ys[i], c.ys[i+1]
	d := (y1 - y0) * (x - x0)
	if d-d != 0 || math.Abs(d) < 0x1p-1022 {
		// The product overflowed or fell below the normal range (tables
		// of extreme values, or d = 0, where both forms agree): take the
		// fraction first, which lies in [0, 1] and cannot overflow.
		return y0 + (y1-y0)*((x-x0)/(x1-x0))
	}
	return y0 + d/(x1-x0)
}

// Max returns the largest tabulated y, which for linear interpolation is
// the maximum of the curve over its range (0 for the zero Curve).
func (c Curve) Max() float64 {
	if !c.Valid() {
		return 0
	}
	return c.maxY
}

// Min returns the smallest tabulated y (0 for the zero Curve).
func (c Curve) Min() float64 {
	if !c.Valid() {
		return 0
	}
	m := c.ys[0]
	for _, y := range c.ys[1:] {
		m = math.Min(m, y)
	}
	return m
}

// Range returns the first and last tabulated x (0, 0 for the zero Curve).
func (c Curve) Range() (lo, hi float64) {
	if !c.Valid() {
		return 0, 0
	}
	return c.xs[0], c.xs[len(c.xs)-1]
}

// Points returns copies of the tabulated x and y values.
func (c Curve) Points() (xs, ys []float64) {
	return append([]float64(nil), c.xs...), append([]float64(nil), c.ys...)
}

// Scaled returns the curve with every y multiplied by f (f finite), e.g.
// to set the peak quantum efficiency of a tabulated shape.
func (c Curve) Scaled(f float64) (Curve, error) {
	if !c.Valid() {
		return Curve{}, fmt.Errorf("pmt: Curve.Scaled on an invalid (zero) Curve")
	}
	ys := make([]float64, len(c.ys))
	for i, y := range c.ys {
		ys[i] = f * y
	}
	s, err := NewCurve(c.xs, ys)
	if err != nil {
		return Curve{}, fmt.Errorf("pmt: Curve.Scaled factor %v: %w", f, err)
	}
	return s, nil
}
