package resolution

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// binomTail returns P(X <= k) and P(X >= k) for X ~ binomial(n, p) by
// direct summation of the probabilities (log binomial coefficients from
// math.Lgamma), independent of the beta-quantile route the code takes.
func binomTail(k, n int, p float64) (le, ge float64) {
	for j := 0; j <= n; j++ {
		lc, _ := math.Lgamma(float64(n + 1))
		l1, _ := math.Lgamma(float64(j + 1))
		l2, _ := math.Lgamma(float64(n - j + 1))
		pr := math.Exp(lc - l1 - l2 + float64(j)*math.Log(p) + float64(n-j)*math.Log1p(-p))
		if p == 0 || p == 1 { // 0 * log(0) terms: all probability at one end
			pr = 0
			if (p == 0 && j == 0) || (p == 1 && j == n) {
				pr = 1
			}
		}
		if j <= k {
			le += pr
		}
		if j >= k {
			ge += pr
		}
	}
	return le, ge
}

// The bounds solve the defining equations of Clopper and Pearson (1934):
// P(X >= k | Lo) = P(X <= k | Hi) = (1-CL)/2, checked by summing the
// binomial probabilities directly.
func TestClopperPearsonDefinition(t *testing.T) {
	for _, c := range []struct {
		k, n int
		cl   float64
	}{{1, 10, 0.95}, {3, 10, 0.95}, {7, 16, OneSigmaCL}, {15, 16, 0.9}, {40, 200, 0.99}} {
		b, err := ClopperPearson(c.k, c.n, c.cl)
		if err != nil {
			t.Fatal(err)
		}
		a := (1 - c.cl) / 2
		_, ge := binomTail(c.k, c.n, b.Lo)
		le, _ := binomTail(c.k, c.n, b.Hi)
		if math.Abs(ge-a) > 1e-9 || math.Abs(le-a) > 1e-9 {
			t.Errorf("%d/%d at %g: P(X>=k|Lo=%g) = %g, P(X<=k|Hi=%g) = %g, want %g", c.k, c.n, c.cl, b.Lo, ge, b.Hi, le, a)
		}
		if !(b.Lo < b.Value && b.Value < b.Hi) || b.Bound != Central {
			t.Errorf("%v: value not inside a central interval", b)
		}
	}
}

// Published values: the 95% Clopper-Pearson interval of 3/10 is
// [0.0667, 0.6525] (standard textbook example, from memory, to the four
// digits quoted); the "rule of three" (Hanley and Lippman-Hand, JAMA 249
// (1983) 1743): the 95% upper limit for 0 of n is about 3/n for large n,
// exactly 1 - 0.05^(1/n).
func TestClopperPearsonValues(t *testing.T) {
	b, _ := ClopperPearson(3, 10, 0.95)
	if math.Abs(b.Lo-0.0667) > 5e-5 || math.Abs(b.Hi-0.6525) > 5e-5 {
		t.Errorf("3/10 at 95%%: [%.4f, %.4f], want [0.0667, 0.6525]", b.Lo, b.Hi)
	}
	for _, n := range []int{1, 16, 300} {
		u, err := Upper(0, n, 0.95)
		if err != nil {
			t.Fatal(err)
		}
		if want := 1 - math.Pow(0.05, 1/float64(n)); math.Abs(u.Hi-want) > 1e-12 || u.Lo != 0 || u.Bound != UpperLimit {
			t.Errorf("0/%d 95%% upper limit %v, want %g", n, u, want)
		}
		l, _ := Lower(n, n, 0.95)
		if want := math.Pow(0.05, 1/float64(n)); math.Abs(l.Lo-want) > 1e-12 || l.Hi != 1 || l.Bound != LowerLimit {
			t.Errorf("%d/%d 95%% lower limit %v, want %g", n, n, l, want)
		}
	}
	u, _ := Upper(0, 300, 0.95)
	if math.Abs(u.Hi-3.0/300) > 0.001*3/300+3.0/300*3/300 {
		t.Errorf("rule of three: 0/300 limit %g, want about %g", u.Hi, 3.0/300)
	}
	// One-sided limits at k > 0 solve P(X <= k | Hi) = 1 - CL.
	u, _ = Upper(2, 16, 0.9)
	if le, _ := binomTail(2, 16, u.Hi); math.Abs(le-0.1) > 1e-9 {
		t.Errorf("2/16 90%% upper limit %g: P(X<=2) = %g, want 0.1", u.Hi, le)
	}
	l, _ := Lower(14, 16, 0.9)
	if _, ge := binomTail(14, 16, l.Lo); math.Abs(ge-0.1) > 1e-9 {
		t.Errorf("14/16 90%% lower limit %g: P(X>=14) = %g, want 0.1", l.Lo, ge)
	}
}

// Coverage by simulation: for several true proportions, draw k from n
// Bernoulli trials M times and count how often each interval holds the
// truth. Clopper-Pearson guarantees at least CL for every p, so the
// observed fraction must not fall below CL by more than 4 binomial
// standard errors sqrt(CL (1-CL) / M). The exact coverage (summed
// binomial probabilities) must be at least CL.
func TestCoverage(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	const m = 20000
	for _, n := range []int{16, 60} {
		// The intervals of every possible k, computed once.
		type intervals struct{ central, upper, lower, report Binomial }
		of := make([]intervals, n+1)
		for k := range of {
			of[k].central, _ = ClopperPearson(k, n, OneSigmaCL)
			of[k].upper, _ = Upper(k, n, 0.9)
			of[k].lower, _ = Lower(k, n, 0.9)
			of[k].report, _ = Proportion(k, n)
		}
		for _, p := range []float64{0.005, 0.05, 0.2, 0.5, 0.9, 0.99} {
			var central, upper, lower, report int
			for range m {
				k := 0
				for range n {
					if rng.Float64() < p {
						k++
					}
				}
				c, u, l, r := of[k].central, of[k].upper, of[k].lower, of[k].report
				if c.Lo <= p && p <= c.Hi {
					central++
				}
				if p <= u.Hi {
					upper++
				}
				if p >= l.Lo {
					lower++
				}
				if r.Lo <= p && p <= r.Hi {
					report++
				}
			}
			for _, c := range []struct {
				name    string
				covered int
				cl      float64
			}{{"central", central, OneSigmaCL}, {"upper", upper, 0.9}, {"lower", lower, 0.9}} {
				tol := 4 * math.Sqrt(c.cl*(1-c.cl)/m)
				if f := float64(c.covered) / m; f < c.cl-tol {
					t.Errorf("n = %d, p = %g: %s interval covers %.4f of %d, want >= %.4f - %.4f", n, p, c.name, f, m, c.cl, tol)
				}
			}
			// Proportion switches between a 68% central interval and a 90%
			// limit on the data, so it guarantees only the smaller level.
			tol := 4 * math.Sqrt(OneSigmaCL*(1-OneSigmaCL)/m)
			if f := float64(report) / m; f < OneSigmaCL-tol {
				t.Errorf("n = %d, p = %g: Proportion covers %.4f", n, p, f)
			}
			// Exact coverage of the central interval.
			var exact float64
			for k := 0; k <= n; k++ {
				if c := of[k].central; c.Lo <= p && p <= c.Hi {
					le, _ := binomTail(k, n, p)
					le1, _ := binomTail(k-1, n, p)
					exact += le - le1
				}
			}
			if exact < OneSigmaCL-1e-9 {
				t.Errorf("n = %d, p = %g: exact coverage %.5f below %.5f", n, p, exact, OneSigmaCL)
			}
		}
	}
}

func TestProportion(t *testing.T) {
	for _, c := range []struct {
		k, n  int
		bound Bound
		cl    float64
		text  string
	}{
		{0, 16, UpperLimit, LimitCL, "0/16 < 13 % (90% CL)"},
		{16, 16, LowerLimit, LimitCL, "16/16 > 87 % (90% CL)"},
		{3, 16, Central, OneSigmaCL, "3/16 = 19 +"},
	} {
		b, err := Proportion(c.k, c.n)
		if err != nil {
			t.Fatal(err)
		}
		if b.Bound != c.bound || b.CL != c.cl || !strings.HasPrefix(b.Percent(), c.text) {
			t.Errorf("Proportion(%d, %d) = %v, %q; want %v at %g, %q", c.k, c.n, b, b.Percent(), c.bound, c.cl, c.text)
		}
	}
	for _, bad := range [][2]int{{-1, 4}, {5, 4}, {0, 0}} {
		if _, err := Proportion(bad[0], bad[1]); err == nil || !strings.Contains(err.Error(), "proportion") {
			t.Errorf("Proportion(%d, %d): %v", bad[0], bad[1], err)
		}
	}
	if _, err := ClopperPearson(1, 4, 1); err == nil || !strings.Contains(err.Error(), "confidence level") {
		t.Errorf("CL 1 accepted: %v", err)
	}
}
