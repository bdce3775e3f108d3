package resolution

import (
	"bytes"
	"math"
	"math/rand/v2"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func testBaseline() *Baseline {
	return &Baseline{
		Format:      BaselineFormat,
		Description: "test",
		Points: []Point{{
			Name:   "e-10",
			Sample: SampleSpec{PDG: 11, Ekin: 10, Events: 100, Seed: 7, Detector: "demo"},
			Figures: []Figure{
				EstimateFigure("vertex68", "cm", Estimate{30, 2}, Larger, 0),
				EstimateFigure("pull_x", "", Estimate{1.05, 0.07}, Away, 1),
				FractionFigure("misid", 1, 100, Larger),
			},
		}},
	}
}

func TestBaselineRoundTrip(t *testing.T) {
	b := testBaseline()
	path := filepath.Join(t.TempDir(), "b.json")
	if err := b.Save(path); err != nil {
		t.Fatal(err)
	}
	got, err := LoadBaseline(path)
	if err != nil {
		t.Fatal(err)
	}
	c, err := Compare(b, got, 3)
	if err != nil {
		t.Fatal(err)
	}
	for _, ch := range c.Changes {
		if ch.Old != ch.New {
			t.Errorf("%s/%s: %+v read back as %+v", ch.Point, ch.Figure, ch.Old, ch.New)
		}
		if ch.Worse {
			t.Errorf("%s/%s flagged against itself", ch.Point, ch.Figure)
		}
	}
}

func TestReadBaselineRefuses(t *testing.T) {
	for _, tc := range []struct{ name, json, want string }{
		{"unknown key", `{"format":1,"points":[],"colour":1}`, `unknown field "colour"`},
		{"format", `{"format":9,"points":[]}`, "format = 9"},
		{"repeated point", `{"format":1,"points":[{"name":"a"},{"name":"a"}]}`, `points[1].name = "a"`},
		{"bad worse", `{"format":1,"points":[{"name":"a","figures":[{"name":"v","value":1,"err":1,"worse":"up"}]}]}`, `point "a" figure "v": worse = "up"`},
		{"negative err", `{"format":1,"points":[{"name":"a","figures":[{"name":"v","value":1,"err":-1,"worse":"larger"}]}]}`, `err = -1`},
		{"k > n", `{"format":1,"points":[{"name":"a","figures":[{"name":"f","value":1,"err":0,"worse":"larger","k":3,"n":2}]}]}`, `k = 3, n = 2`},
	} {
		_, err := ReadBaseline(strings.NewReader(tc.json))
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want an error containing %q", tc.name, err, tc.want)
		}
	}
}

func TestCompareRefusesMismatch(t *testing.T) {
	b := testBaseline()
	n := testBaseline()
	n.Points[0].Sample.Seed = 8
	if _, err := Compare(b, n, 3); err == nil || !strings.Contains(err.Error(), "sample") {
		t.Errorf("changed sample: got %v", err)
	}
	n = testBaseline()
	n.Points[0].Figures = n.Points[0].Figures[:2]
	if _, err := Compare(b, n, 3); err == nil {
		t.Error("missing figure not refused")
	}
}

// TestFisherTea checks the exact test against the classic 2x2 example of
// Fisher (The Design of Experiments, 1935): three of four right against
// one of four, one-sided p = 17/70.
func TestFisherTea(t *testing.T) {
	if p := fisherOneSided(1, 4, 3, 4, Larger); math.Abs(p-17.0/70) > 1e-12 {
		t.Errorf("p = %v, want 17/70 = %v", p, 17.0/70)
	}
	if p := fisherOneSided(3, 4, 1, 4, Smaller); math.Abs(p-17.0/70) > 1e-12 {
		t.Errorf("smaller: p = %v, want 17/70", p)
	}
}

func TestCompareFractions(t *testing.T) {
	for _, tc := range []struct {
		k1, n1, k2, n2 int
		worse          bool
	}{
		{0, 100, 1, 100, false}, // one event is never 3 sigma
		{0, 100, 0, 100, false},
		{1, 16, 4, 16, false}, // the old ring baseline's blind spot: 1/16 -> 4/16 is p = 0.17
		{0, 300, 12, 300, true},
		{5, 300, 1, 300, false}, // an improvement
	} {
		b, n := testBaseline(), testBaseline()
		b.Points[0].Figures[2] = FractionFigure("misid", tc.k1, tc.n1, Larger)
		n.Points[0].Figures[2] = FractionFigure("misid", tc.k2, tc.n2, Larger)
		c, err := Compare(b, n, 3)
		if err != nil {
			t.Fatal(err)
		}
		if got := c.Changes[2].Worse; got != tc.worse {
			t.Errorf("%d/%d -> %d/%d: worse = %v (%.2f sigma), want %v", tc.k1, tc.n1, tc.k2, tc.n2, got, c.Changes[2].Sigmas, tc.worse)
		}
	}
}

// TestCompareCalibrated measures Compare on pairs of 68% quantiles of
// normal samples: with no change it must flag at the one-sided normal
// rate of its level, and with a 15% worsening at the rate Power
// predicts, both within 4 binomial standard errors of the trials.
func TestCompareCalibrated(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	const events, trials, level = 400, 2000, 2.0
	measure := func(scale float64) Figure {
		x := make([]float64, events)
		for i := range x {
			x[i] = math.Abs(rng.NormFloat64()) * scale
		}
		q, err := Quantile(x, 0.68)
		if err != nil {
			t.Fatal(err)
		}
		return EstimateFigure("v68", "cm", q, Larger, 0)
	}
	rate := func(scale float64) (float64, float64) {
		flagged := 0
		var rel float64
		for range trials {
			old, now := measure(1), measure(scale)
			s, err := worsening(old, now)
			if err != nil {
				t.Fatal(err)
			}
			if s >= level {
				flagged++
			}
			rel += old.Err / old.Value
		}
		return float64(flagged) / trials, rel / trials
	}
	check := func(what string, got, want float64) {
		t.Helper()
		sd := math.Sqrt(want * (1 - want) / trials)
		t.Logf("%s: flagged %.4f of %d, expected %.4f +- %.4f", what, got, trials, want, sd)
		if math.Abs(got-want) > 4*sd {
			t.Errorf("%s: flagged %.4f of %d, want %.4f +- %.4f", what, got, trials, want, sd)
		}
	}
	got, _ := rate(1)
	check("no change", got, 1-distuv.UnitNormal.CDF(level))
	got, rel := rate(1.15)
	check("15% worse", got, Power(rel, 0.15, level))
}

func TestComparisonString(t *testing.T) {
	b, n := testBaseline(), testBaseline()
	n.Points[0].Figures[0].Value = 45
	c, err := Compare(b, n, 3)
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Worsened()) != 1 || !strings.Contains(c.String(), "WORSE") {
		t.Errorf("a 5.3 sigma rise not reported:\n%s", c)
	}
	var buf bytes.Buffer
	buf.WriteString(c.String())
	if !strings.Contains(buf.String(), "1/100") {
		t.Errorf("fraction not printed as k/n:\n%s", c)
	}
}
