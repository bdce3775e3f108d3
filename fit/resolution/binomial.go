package resolution

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// OneSigmaCL is the confidence level of a central 1-sigma interval of a
// normal distribution, erf(1/sqrt 2) = 0.6827: the level of the error
// bars of a plot.
var OneSigmaCL = math.Erf(1 / math.Sqrt2)

// LimitCL is the confidence level at which a proportion with no (or
// only) successes is reported as a one-sided limit (90%, common practice
// in particle physics).
const LimitCL = 0.9

// Bound says which kind of confidence interval a Binomial holds.
type Bound int

// The kinds of interval.
const (
	// Central is a two-sided interval [Lo, Hi] with at most (1-CL)/2 of
	// probability on either side.
	Central Bound = iota
	// UpperLimit is the one-sided interval [0, Hi].
	UpperLimit
	// LowerLimit is the one-sided interval [Lo, 1].
	LowerLimit
)

func (b Bound) String() string {
	switch b {
	case Central:
		return "central"
	case UpperLimit:
		return "upper limit"
	case LowerLimit:
		return "lower limit"
	}
	return fmt.Sprintf("Bound(%d)", int(b))
}

// Binomial is a proportion measured as K successes in N trials, with a
// Clopper-Pearson confidence interval [Lo, Hi] at confidence level CL.
type Binomial struct {
	K, N int
	CL   float64
	// Value is K/N.
	Value float64
	// Lo and Hi bound the interval; an upper limit has Lo = 0, a lower
	// limit Hi = 1.
	Lo, Hi float64
	Bound  Bound
}

func checkBinomial(k, n int, cl float64) error {
	if n <= 0 || k < 0 || k > n {
		return fmt.Errorf("resolution: proportion %d of %d: need 0 <= k <= n and n > 0", k, n)
	}
	if !(cl > 0 && cl < 1) {
		return fmt.Errorf("resolution: confidence level = %v must be in (0, 1)", cl)
	}
	return nil
}

// The Clopper-Pearson bounds (Clopper and Pearson, Biometrika 26 (1934)
// 404): the lower bound at tail probability a is the p for which
// P(X >= k | p) = a, the upper bound the p for which P(X <= k | p) = a,
// X ~ binomial(n, p). Through the identity of the binomial tail with the
// regularized incomplete beta function they are quantiles of beta
// distributions.
func cpLower(k, n int, a float64) float64 {
	if k == 0 {
		return 0
	}
	if k == n {
		return math.Pow(a, 1/float64(n)) // closed form of P(X = n) = p^n = a
	}
	return distuv.Beta{Alpha: float64(k), Beta: float64(n - k + 1)}.Quantile(a)
}

func cpUpper(k, n int, a float64) float64 {
	if k == n {
		return 1
	}
	if k == 0 {
		return 1 - math.Pow(a, 1/float64(n)) // closed form of P(X = 0) = (1-p)^n = a
	}
	return distuv.Beta{Alpha: float64(k + 1), Beta: float64(n - k)}.Quantile(1 - a)
}

// ClopperPearson returns the central Clopper-Pearson ("exact") interval
// of the proportion k/n at confidence level cl: each bound leaves at most
// (1-cl)/2 of binomial probability beyond it, so the interval covers the
// true proportion with probability at least cl for every true value. At
// k = 0 the interval is [0, Hi], at k = n [Lo, 1], still central (use
// Proportion to report those as one-sided limits).
func ClopperPearson(k, n int, cl float64) (Binomial, error) {
	if err := checkBinomial(k, n, cl); err != nil {
		return Binomial{}, err
	}
	a := (1 - cl) / 2
	return Binomial{K: k, N: n, CL: cl, Value: float64(k) / float64(n), Lo: cpLower(k, n, a), Hi: cpUpper(k, n, a), Bound: Central}, nil
}

// Upper returns the one-sided Clopper-Pearson upper limit on the
// proportion from k successes in n trials at confidence level cl: the p
// at which P(X <= k | p) = 1 - cl. For k = 0 it is 1 - (1-cl)^(1/n).
func Upper(k, n int, cl float64) (Binomial, error) {
	if err := checkBinomial(k, n, cl); err != nil {
		return Binomial{}, err
	}
	return Binomial{K: k, N: n, CL: cl, Value: float64(k) / float64(n), Hi: cpUpper(k, n, 1-cl), Bound: UpperLimit}, nil
}

// Lower returns the one-sided Clopper-Pearson lower limit on the
// proportion from k successes in n trials at confidence level cl: the p
// at which P(X >= k | p) = 1 - cl. For k = n it is (1-cl)^(1/n).
func Lower(k, n int, cl float64) (Binomial, error) {
	if err := checkBinomial(k, n, cl); err != nil {
		return Binomial{}, err
	}
	return Binomial{K: k, N: n, CL: cl, Value: float64(k) / float64(n), Lo: cpLower(k, n, 1-cl), Hi: 1, Bound: LowerLimit}, nil
}

// Proportion reports k/n as a measured fraction is reported in physics:
// the central Clopper-Pearson interval at OneSigmaCL when 0 < k < n, and
// the one-sided limit at LimitCL when there is nothing to measure on one
// side: an upper limit for k = 0, a lower limit for k = n.
func Proportion(k, n int) (Binomial, error) {
	if err := checkBinomial(k, n, LimitCL); err != nil {
		return Binomial{}, err
	}
	switch k {
	case 0:
		return Upper(k, n, LimitCL)
	case n:
		return Lower(k, n, LimitCL)
	}
	return ClopperPearson(k, n, OneSigmaCL)
}

// Percent formats b in percent: "3/16 = 19 +15/-10 % (68.3% CL, Clopper-Pearson)",
// "0/16 < 13 % (90% CL)", "16/16 > 87 % (90% CL)".
func (b Binomial) Percent() string {
	cl := fmt.Sprintf("%.3g%% CL", 100*b.CL)
	switch b.Bound {
	case UpperLimit:
		return fmt.Sprintf("%d/%d < %.2g %% (%s)", b.K, b.N, 100*b.Hi, cl)
	case LowerLimit:
		return fmt.Sprintf("%d/%d > %.2g %% (%s)", b.K, b.N, 100*b.Lo, cl)
	}
	return fmt.Sprintf("%d/%d = %.2g +%.2g/-%.2g %% (%s, Clopper-Pearson)", b.K, b.N, 100*b.Value, 100*(b.Hi-b.Value), 100*(b.Value-b.Lo), cl)
}

// String formats b as a fraction: "3/16 = 0.19 [0.10, 0.32] (68.3% CL
// central, Clopper-Pearson)".
func (b Binomial) String() string {
	return fmt.Sprintf("%d/%d = %.3g [%.3g, %.3g] (%.3g%% CL %v, Clopper-Pearson)", b.K, b.N, b.Value, b.Lo, b.Hi, 100*b.CL, b.Bound)
}
