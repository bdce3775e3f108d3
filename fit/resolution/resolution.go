// Package resolution summarizes the resolution of a reconstruction from
// fitted and true values: the bias, the 68% quantiles of the vertex
// distance and the direction angle, and the energy resolution from a
// Gaussian core fit, each with its statistical uncertainty, so users can
// write regression tests with tolerances derived from the sample size.
//
// Fractions (an efficiency, a mis-identification rate) are binomial
// proportions k/n, reported with the Clopper-Pearson interval: the
// bounds are the proportions at which the observed k lies in a binomial
// tail of probability (1-CL)/2, quantiles of beta distributions; the
// interval covers the true proportion with at least the stated
// probability for every proportion and n. With k = 0 (or k = n) there is
// nothing to measure on one side, and Proportion gives a one-sided upper
// (or lower) limit instead of error bars.
//
// Units are those of the inputs (cm, MeV); angles are returned in degrees.
package resolution

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/stat/distuv"
)

// Estimate is a value with its 1-sigma statistical uncertainty.
type Estimate struct {
	Value, Err float64
}

func (e Estimate) String() string { return fmt.Sprintf("%.4g ± %.2g", e.Value, e.Err) }

// Quantile returns the p-quantile of x (0 < p < 1) and its standard error
// from order statistics: the number of values below the true quantile is
// binomial(n, p), so the order statistics at ranks n p -/+ sqrt(n p (1-p))
// bound a 1-sigma interval (distribution-free confidence interval for a
// quantile, common practice), and half their distance is the error.
// x is not modified. QuantileInterval gives the two bounds.
func Quantile(x []float64, p float64) (Estimate, error) {
	q, err := QuantileInterval(x, p)
	if err != nil {
		return Estimate{}, err
	}
	return q.estimate(), nil
}

// estimate is the quantile with half the interval as its error.
func (q Interval) estimate() Estimate { return Estimate{Value: q.Value, Err: 0.5 * (q.Hi - q.Lo)} }

// Interval is a value with the bounds of its 1-sigma confidence interval,
// for a value whose uncertainty is not symmetric: a small sample's
// quantile or a quantity that cannot be negative.
type Interval struct {
	Value, Lo, Hi float64
}

// String formats the interval as "value +up/-down".
func (q Interval) String() string {
	return fmt.Sprintf("%.4g +%.2g/-%.2g", q.Value, q.Hi-q.Value, q.Value-q.Lo)
}

// QuantileInterval returns the p-quantile of x (0 < p < 1) with the
// order statistics at ranks n p -/+ sqrt(n p (1-p)) as the bounds of its
// 1-sigma interval (see Quantile). Unlike the symmetric error, the bounds
// stay inside the range of the values: a positive quantity keeps a
// positive lower bound, however few the values. x is not modified.
func QuantileInterval(x []float64, p float64) (Interval, error) {
	if !(p > 0 && p < 1) {
		return Interval{}, fmt.Errorf("resolution: quantile p = %v must be in (0, 1)", p)
	}
	if err := checkFinite(x); err != nil {
		return Interval{}, err
	}
	if len(x) < 2 {
		return Interval{}, fmt.Errorf("resolution: %d values, need at least 2", len(x))
	}
	s := slices.Clone(x)
	slices.Sort(s)
	n := float64(len(s))
	at := func(rank float64) float64 {
		// Linear interpolation between order statistics, rank in [0, n-1].
		rank = math.Min(math.Max(rank, 0), n-1)
		i := int(rank)
		if i >= len(s)-1 {
			return s[len(s)-1]
		}
		w := rank - float64(i)
		return s[i]*(1-w) + s[i+1]*w
	}
	centre := n*p - 0.5
	d := math.Sqrt(n * p * (1 - p))
	return Interval{Value: at(centre), Lo: at(centre - d), Hi: at(centre + d)}, nil
}

// Mean returns the mean of x and its standard error s/sqrt(n).
func Mean(x []float64) (Estimate, error) {
	if err := checkFinite(x); err != nil {
		return Estimate{}, err
	}
	if len(x) < 2 {
		return Estimate{}, fmt.Errorf("resolution: %d values, need at least 2", len(x))
	}
	var m, m2 float64
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	for _, v := range x {
		m2 += (v - m) * (v - m)
	}
	sd := math.Sqrt(m2 / float64(len(x)-1))
	return Estimate{Value: m, Err: sd / math.Sqrt(float64(len(x)))}, nil
}

// Gaussian is the result of a Gaussian core fit.
type Gaussian struct {
	Mean, Sigma Estimate
	// Core is the number of values inside the final window.
	Core int
}

// GaussianCore fits the core of the distribution of x by iterated
// truncation: the mean and standard deviation of the values within
// nSigma standard deviations of the mean, repeated until stable, the
// width corrected for the truncation of a normal distribution at
// +-nSigma (the variance of a normal truncated at +-k sigma is
// sigma^2 (1 - 2 k phi(k) / (2 Phi(k) - 1)), textbook property of the
// truncated normal). Errors: sigma/sqrt(n) on the mean and sigma/sqrt(2n)
// on the width (large-sample normal theory), n the core size.
func GaussianCore(x []float64, nSigma float64) (Gaussian, error) {
	if !(nSigma >= 1) || math.IsInf(nSigma, 0) {
		return Gaussian{}, fmt.Errorf("resolution: nSigma = %v must be finite and at least 1", nSigma)
	}
	if err := checkFinite(x); err != nil {
		return Gaussian{}, err
	}
	if len(x) < 5 {
		return Gaussian{}, fmt.Errorf("resolution: %d values, need at least 5", len(x))
	}
	unit := distuv.UnitNormal
	k := nSigma
	shrink := math.Sqrt(1 - 2*k*unit.Prob(k)/(2*unit.CDF(k)-1))
	// Start from the median and the half width of the central 68%.
	q16, _ := Quantile(x, 0.16)
	q50, _ := Quantile(x, 0.5)
	q84, _ := Quantile(x, 0.84)
	mean, sigma := q50.Value, 0.5*(q84.Value-q16.Value)
	if !(sigma > 0) {
		return Gaussian{}, errors.New("resolution: the values have no spread")
	}
	n := 0
	for range 100 {
		var s, s2 float64
		n = 0
		for _, v := range x {
			if math.Abs(v-mean) <= k*sigma {
				s += v
				s2 += v * v
				n++
			}
		}
		if n < 5 {
			return Gaussian{}, fmt.Errorf("resolution: only %d values in the core", n)
		}
		m := s / float64(n)
		sd := math.Sqrt(math.Max(s2/float64(n)-m*m, 0)*float64(n)/float64(n-1)) / shrink
		done := math.Abs(m-mean) < 1e-6*sigma && math.Abs(sd-sigma) < 1e-6*sigma
		mean, sigma = m, sd
		if done {
			break
		}
	}
	fn := float64(n)
	return Gaussian{
		Mean:  Estimate{mean, sigma / math.Sqrt(fn)},
		Sigma: Estimate{sigma, sigma / math.Sqrt(2*fn)},
		Core:  n,
	}, nil
}

// Sample is one reconstructed or true event: vertex (cm), unit direction
// and kinetic energy (MeV).
type Sample struct {
	Vertex r3.Vector
	Dir    r3.Vector
	Energy float64
}

// Summary is the resolution of a set of fitted events against the truth.
type Summary struct {
	N int
	// Bias is the mean of fitted minus true vertex per coordinate (cm) and
	// LongitudinalBias its mean projection on the true direction (cm).
	Bias             [3]Estimate
	LongitudinalBias Estimate
	// Vertex68 is the 68% quantile of the vertex distance (cm).
	Vertex68 Estimate
	// Direction68 is the 68% quantile of the angle between fitted and true
	// direction (degrees).
	Direction68 Estimate
	// Vertex68Interval and Direction68Interval are the same quantiles
	// with their asymmetric 1-sigma bounds (QuantileInterval), the form
	// to report for small samples.
	Vertex68Interval, Direction68Interval Interval
	// EnergyBias and EnergyResolution are the mean and width of the
	// Gaussian core of (E_fit - E_true) / E_true.
	EnergyBias, EnergyResolution Estimate
}

// Summarize compares fitted with true samples, pairwise. A sample with a
// zero true direction is left out of the direction summary; a
// non-positive true energy is an error.
func Summarize(fitted, truth []Sample) (Summary, error) {
	if len(fitted) != len(truth) {
		return Summary{}, fmt.Errorf("resolution: %d fitted and %d true samples", len(fitted), len(truth))
	}
	n := len(fitted)
	if n < 5 {
		return Summary{}, fmt.Errorf("resolution: %d samples, need at least 5", n)
	}
	var dx [3][]float64
	var long, dist, angle, rel []float64
	for i := range n {
		f, t := fitted[i], truth[i]
		if !(t.Energy > 0) {
			return Summary{}, fmt.Errorf("resolution: truth[%d].Energy = %v must be positive", i, t.Energy)
		}
		d := f.Vertex.Sub(t.Vertex)
		dx[0], dx[1], dx[2] = append(dx[0], d.X), append(dx[1], d.Y), append(dx[2], d.Z)
		dist = append(dist, d.Norm())
		if t.Dir.Norm() > 0 && f.Dir.Norm() > 0 {
			u := t.Dir.Normalize()
			long = append(long, d.Dot(u))
			angle = append(angle, f.Dir.Normalize().Angle(u).Degrees())
		}
		rel = append(rel, (f.Energy-t.Energy)/t.Energy)
	}
	var s Summary
	s.N = n
	var err error
	for k := range 3 {
		if s.Bias[k], err = Mean(dx[k]); err != nil {
			return Summary{}, err
		}
	}
	if s.Vertex68Interval, err = QuantileInterval(dist, 0.68); err != nil {
		return Summary{}, err
	}
	s.Vertex68 = s.Vertex68Interval.estimate()
	if len(angle) >= 2 {
		if s.LongitudinalBias, err = Mean(long); err != nil {
			return Summary{}, err
		}
		if s.Direction68Interval, err = QuantileInterval(angle, 0.68); err != nil {
			return Summary{}, err
		}
		s.Direction68 = s.Direction68Interval.estimate()
	}
	g, err := GaussianCore(rel, 2)
	if err != nil {
		return Summary{}, err
	}
	s.EnergyBias, s.EnergyResolution = g.Mean, g.Sigma
	return s, nil
}

func checkFinite(x []float64) error {
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("resolution: value[%d] = %v must be finite", i, v)
		}
	}
	return nil
}
