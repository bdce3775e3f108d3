package pmt

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

func TestNewCurveErrors(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	tests := []struct {
		name   string
		xs, ys []float64
		want   string
	}{
		{"count mismatch", []float64{1, 2}, []float64{1}, "2 x values and 1 y values"},
		{"one point", []float64{1}, []float64{1}, "1 points"},
		{"no points", nil, nil, "0 points"},
		{"equal x", []float64{1, 1}, []float64{0, 1}, "x[1] = 1 must be greater than x[0] = 1"},
		{"decreasing x", []float64{1, 3, 2}, []float64{0, 1, 2}, "x[2] = 2 must be greater"},
		{"NaN x", []float64{1, nan}, []float64{0, 1}, "x[1] = NaN must be finite"},
		{"Inf x", []float64{-inf, 1}, []float64{0, 1}, "x[0] = -Inf must be finite"},
		{"NaN y", []float64{1, 2}, []float64{nan, 1}, "y[0] = NaN must be finite"},
		{"Inf y", []float64{1, 2}, []float64{0, inf}, "y[1] = +Inf must be finite"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := NewCurve(tc.xs, tc.ys)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("NewCurve error = %v, want one containing %q", err, tc.want)
			}
		})
	}
}

// interpolateBrute is an independent linear-interpolation reference: a
// linear scan for the bracketing segment.
func interpolateBrute(xs, ys []float64, x float64) float64 {
	if !(x >= xs[0] && x <= xs[len(xs)-1]) {
		return 0
	}
	for i := 0; i+1 < len(xs); i++ {
		if x <= xs[i+1] {
			f := (x - xs[i]) / (xs[i+1] - xs[i])
			return ys[i]*(1-f) + ys[i+1]*f
		}
	}
	return ys[len(ys)-1]
}

func TestCurveAtMatchesBruteForce(t *testing.T) {
	// Independent calculation: the grid-indexed lookup must agree with a
	// linear scan, on uniform and strongly non-uniform tables.
	rng := rand.New(rand.NewPCG(1, 2))
	tables := map[string][]float64{
		"uniform":    {0, 1, 2, 3, 4, 5},
		"clustered":  {0, 0.001, 0.002, 0.5, 10, 10.0001, 11, 100},
		"two points": {-1, 1},
	}
	for name, xs := range tables {
		ys := make([]float64, len(xs))
		for i := range ys {
			ys[i] = rng.NormFloat64()
		}
		c, err := NewCurve(xs, ys)
		if err != nil {
			t.Fatal(err)
		}
		lo, hi := xs[0], xs[len(xs)-1]
		probe := append([]float64(nil), xs...)
		for range 2000 {
			probe = append(probe, lo-1+(hi-lo+2)*rng.Float64())
		}
		for _, x := range probe {
			got, want := c.At(x), interpolateBrute(xs, ys, x)
			if math.Abs(got-want) > 1e-12*(1+math.Abs(want)) {
				t.Errorf("%s: At(%v) = %v, want %v", name, x, got, want)
			}
		}
		if got := c.At(math.NaN()); got != 0 {
			t.Errorf("%s: At(NaN) = %v, want 0", name, got)
		}
	}
}

func TestCurveAccessors(t *testing.T) {
	c, err := NewCurve([]float64{300, 400, 500}, []float64{0.1, 0.3, 0.2})
	if err != nil {
		t.Fatal(err)
	}
	if lo, hi := c.Range(); lo != 300 || hi != 500 {
		t.Errorf("Range = %v, %v, want 300, 500", lo, hi)
	}
	if c.Max() != 0.3 || c.Min() != 0.1 {
		t.Errorf("Max, Min = %v, %v, want 0.3, 0.1", c.Max(), c.Min())
	}
	xs, ys := c.Points()
	xs[0], ys[0] = -1, -1 // copies: must not change c
	if c.At(300) != 0.1 {
		t.Errorf("Points returned shared storage: At(300) = %v", c.At(300))
	}
	s, err := c.Scaled(2)
	if err != nil || s.At(450) != 2*c.At(450) || s.Max() != 0.6 {
		t.Errorf("Scaled(2): At(450) = %v, Max = %v, err %v", s.At(450), s.Max(), err)
	}
	if _, err := c.Scaled(math.NaN()); err == nil {
		t.Error("Scaled(NaN) gave no error")
	}
	var zero Curve
	if zero.Valid() || zero.At(1) != 0 || zero.Max() != 0 {
		t.Error("zero Curve must be invalid and evaluate to 0")
	}
	if _, err := zero.Scaled(1); err == nil {
		t.Error("Scaled on zero Curve gave no error")
	}
}
